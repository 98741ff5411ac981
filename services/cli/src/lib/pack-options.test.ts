import { mkdirSync, writeFileSync } from 'node:fs';
import { join } from 'node:path';
import { afterEach, beforeEach, describe, expect, it } from 'vitest';
import { tempConfigDir } from '../../test/cli-harness';
import { failure } from '../../test/cli-error-of';
import { planPack, type PackOptions } from './pack-options';

let folder: ReturnType<typeof tempConfigDir>;
let results: string;
beforeEach(() => {
  folder = tempConfigDir();
  results = join(folder.dir, 'results');
  mkdirSync(results);
  writeFileSync(join(results, 'lambda.csv'), 'L,W,E,lambda,lambda_err\n8,17,0,0.5,0.001\n');
});
afterEach(() => folder.remove());

const CAMPAIGN = '3f1c9a52-7d4e-4b8a-9c61-2e5f0a7b8d90';
const RUN = 'a1b2c3d4-0001-4e5f-8a9b-0c1d2e3f4a5b';
const options = (more: Partial<PackOptions> = {}): PackOptions => ({
  campaign: CAMPAIGN,
  codeName: 'tmm-anderson',
  codeVersion: '2.3.1',
  codeCommit: '9F3E2A1C',
  machine: 'fjell',
  sizes: '8,12,16',
  disorder: '17 17.5',
  energies: '0',
  realizations: '1000',
  seeds: '1,2',
  runs: RUN,
  json: false,
  ...more,
});

describe('localis pack options', () => {
  it('should make the manifest from the options, and write the archive beside the folder as tar.gz', () => {
    const plan = planPack(results, options(), new Date('2026-12-01T10:00:00Z'));
    expect(plan).toEqual({
      dir: results,
      out: `${results}.tar.gz`,
      format: 'tar.gz',
      json: false,
      manifest: {
        campaignId: CAMPAIGN,
        runIds: [RUN],
        code: { name: 'tmm-anderson', version: '2.3.1', commit: '9f3e2a1c' },
        machine: 'fjell',
        parameters: { sizes: [8, 12, 16], disorder: [17, 17.5], energies: [0], realizations: 1000, seeds: [1, 2] },
        createdAt: '2026-12-01T10:00:00.000Z',
      },
    });
  });

  it('should take the format from --out, or --format, and refuse the two disagreeing', async () => {
    expect(planPack(results, options({ out: join(folder.dir, 'w17.zip') }))).toMatchObject({ format: 'zip', out: join(folder.dir, 'w17.zip') });
    expect(planPack(results, options({ format: 'tar' }))).toMatchObject({ format: 'tar', out: `${results}.tar` });
    expect(planPack(results, options({ out: join(folder.dir, 'w.tgz') }))).toMatchObject({ format: 'tar.gz' });
    const e = await failure(Promise.resolve().then(() => planPack(results, options({ out: join(folder.dir, 'w.zip'), format: 'tar' }))));
    expect(e).toMatchObject({ exitCode: 2, message: expect.stringContaining('names a .zip file, but --format is tar') });
    expect((await failure(Promise.resolve().then(() => planPack(results, options({ out: join(folder.dir, 'w.rar') }))))).exitCode).toBe(2);
  });

  it('should refuse to write the archive inside the folder it packs', async () => {
    const e = await failure(Promise.resolve().then(() => planPack(results, options({ out: join(results, 'again.tar.gz') }))));
    expect(e.exitCode).toBe(2);
    expect(e.message).toContain('inside the folder being packed');
  });

  it('should name every missing option at once', async () => {
    const e = await failure(Promise.resolve().then(() => planPack(results, { json: false, campaign: CAMPAIGN, sizes: '8' })));
    expect(e.exitCode).toBe(2);
    expect(e.message).toBe('a manifest needs --code-name, --code-version, --code-commit, --machine, --disorder, --energies, --realizations.');
  });

  it('should list each value that is not valid with its field and option', async () => {
    const e = await failure(
      Promise.resolve().then(() => planPack(results, options({ campaign: 'nope', codeCommit: 'xyz', sizes: '8,x,0', realizations: 'many', runs: 'a,b' }))),
    );
    expect(e.exitCode).toBe(2);
    expect(e.message).toBe('the manifest would not be valid; nothing was written:');
    const lines = e.details.map((d) => `${d.path.join('.')}: ${d.message}`);
    expect(lines).toContain('parameters.sizes.1: "x" is not a number (--sizes "8,x,0")');
    expect(lines).toContainEqual(expect.stringMatching(/^campaignId: .* \(--campaign "nope"\)$/));
    expect(lines).toContainEqual(expect.stringMatching(/^code\.commit: code\.commit is a hexadecimal commit id of 7 to 64 digits \(--code-commit "xyz"\)$/));
    expect(lines).toContainEqual(expect.stringMatching(/^parameters\.sizes\.1: sizes are at least 1 \(--sizes "8,x,0"\)$/));
    expect(lines).toContainEqual(expect.stringMatching(/^parameters\.realizations: .* \(--realizations "many"\)$/));
    expect(lines).toContainEqual(expect.stringMatching(/^runIds\.0: each run id is a UUID \(--runs "a,b"\)$/));
  });

  it('should refuse a folder that does not exist or is a file', async () => {
    expect((await failure(Promise.resolve().then(() => planPack(join(folder.dir, 'missing'), options())))).message).toContain('no such folder');
    expect((await failure(Promise.resolve().then(() => planPack(join(results, 'lambda.csv'), options())))).exitCode).toBe(2);
  });
});
