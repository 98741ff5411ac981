import { writeFileSync } from 'node:fs';
import { join } from 'node:path';
import { afterEach, beforeEach, describe, expect, it } from 'vitest';
import { EXAMPLE_CAMPAIGN_SPEC, type ArchiveProblem } from '@localis/shared';
import { checkArchive, bufferSource, goodArchive, FIXTURE_CAMPAIGN_ID, FIXTURE_SPEC } from '@localis/shared/node';
import { tempConfigDir } from '../../test/cli-harness';
import { failure } from '../../test/cli-error-of';
import { offlineContext, offlineProblems, readOfflineCampaign } from './verify-spec';

let folder: ReturnType<typeof tempConfigDir>;
beforeEach(() => {
  folder = tempConfigDir();
});
afterEach(() => folder.remove());

const specWith = (grid: object) => ({ ...EXAMPLE_CAMPAIGN_SPEC, ...grid });
const write = (name: string, value: unknown) => {
  const path = join(folder.dir, name);
  writeFileSync(path, typeof value === 'string' ? value : JSON.stringify(value));
  return path;
};

describe('the campaign spec of an offline check', () => {
  it('should read a spec as `localis estimate` takes it, knowing no campaign id or machine', async () => {
    const c = await readOfflineCampaign(write('spec.json', specWith(FIXTURE_SPEC)));
    expect(c).toMatchObject({ spec: FIXTURE_SPEC, id: null, machine: null });
  });

  it('should read the campaign as the portal answers it, with its id and machine', async () => {
    const c = await readOfflineCampaign(write('campaign.json', { id: FIXTURE_CAMPAIGN_ID, machine: 'cluster-a', title: 'x', spec: specWith(FIXTURE_SPEC) }));
    expect(c).toMatchObject({ spec: FIXTURE_SPEC, id: FIXTURE_CAMPAIGN_ID, machine: 'cluster-a' });
  });

  it('should list what is wrong with a spec that is not valid, exit code 2', async () => {
    const e = await failure(readOfflineCampaign(write('bad.json', specWith({ sizes: [0] }))));
    expect(e.exitCode).toBe(2);
    expect(e.details.map((d) => d.path.join('.'))).toContain('sizes.0');
  });

  it('should compare a good archive with its plan and find nothing wrong', async () => {
    const { archive: bytes } = await goodArchive({ machine: 'cluster-a' });
    const c = await readOfflineCampaign(write('spec.json', specWith(FIXTURE_SPEC)));
    const result = await checkArchive(bufferSource(bytes, 'tar.gz'), { campaign: offlineContext(c) });
    expect(offlineProblems(result.problems, c)).toEqual([]);
  });

  it('should find sizes outside the plan, but not a campaign id or machine it was not given', async () => {
    const { archive: bytes } = await goodArchive({ campaignId: '00000000-0000-4000-8000-00000000abcd', machine: 'elsewhere' });
    const c = await readOfflineCampaign(write('spec.json', specWith({ ...FIXTURE_SPEC, sizes: [6, 8] })));
    const result = await checkArchive(bufferSource(bytes, 'tar.gz'), { campaign: offlineContext(c) });
    const problems = offlineProblems(result.problems, c);
    expect(problems.map((p) => p.code).sort()).toEqual(['outside-spec', 'outside-spec']);
    expect(problems.every((p) => !p.message.includes('machine'))).toBe(true);
  });

  it('should keep the campaign id and machine findings when the campaign gave them', () => {
    const problems: ArchiveProblem[] = [
      { code: 'campaign-mismatch', message: 'manifest.json names campaign x' },
      { code: 'outside-spec', message: 'manifest.json names machine y; the campaign is on cluster-a' },
    ];
    expect(offlineProblems(problems, { name: 'c.json', spec: FIXTURE_SPEC, id: FIXTURE_CAMPAIGN_ID, machine: 'cluster-a' })).toEqual(problems);
    expect(offlineProblems(problems, null)).toEqual(problems);
  });
});
