import { writeFileSync } from 'node:fs';
import { join } from 'node:path';
import { afterAll, afterEach, beforeAll, beforeEach, describe, expect, it } from 'vitest';
import { EXAMPLE_CAMPAIGN_SPEC } from '@localis/shared';
import { goodArchive, FIXTURE_SPEC } from '@localis/shared/node';
import { runCli, tempConfigDir } from '../../test/cli-harness';
import { startFakePortal, type FakePortal } from '../lib/upload-fake-portal';

// The real `localis verify` in a child process: offline with LOCALIS_URL at a closed port, and
// `--log` against the stand-in portal of lib/upload-fake-portal.ts (whose log is a real RFC 6962
// tree). The way through the running stack is in upload.command.test.ts.

let config: ReturnType<typeof tempConfigDir>;
beforeEach(() => {
  config = tempConfigDir();
});
afterEach(() => config.remove());

const NOWHERE = { LOCALIS_URL: 'http://127.0.0.1:4' };
const cli = (args: string[], env: Record<string, string>) => runCli(args, { configDir: config.dir, env });

describe('localis verify <archive>, offline', () => {
  it('should pass a good archive against its plan, and exit 1 naming each problem outside it', async () => {
    const archive = join(config.dir, 'results.tar.gz');
    writeFileSync(archive, (await goodArchive()).archive);
    const spec = join(config.dir, 'spec.json');
    writeFileSync(spec, JSON.stringify({ ...EXAMPLE_CAMPAIGN_SPEC, ...FIXTURE_SPEC }));
    const ok = await cli(['verify', archive, '--campaign-spec', spec], NOWHERE);
    expect(ok.code, ok.stderr).toBe(0);
    expect(ok.stdout).toContain(`  ok    campaign's plan (${spec}): sizes, disorder and energies; runs are checked by the portal\n`);
    expect(ok.stdout.trimEnd().split('\n').at(-1)).toBe('No problems found.');

    writeFileSync(spec, JSON.stringify({ ...EXAMPLE_CAMPAIGN_SPEC, ...FIXTURE_SPEC, sizes: [6, 8] }));
    const outside = await cli(['verify', archive, '--campaign-spec', spec], NOWHERE);
    expect(outside.code).toBe(1);
    expect(outside.stderr).toMatch(/^localis: results\.tar\.gz has 2 problems:\n {2}outside-spec results\/lambda\.csv: .*L not among the planned sizes 6, 8.*\n {2}outside-spec manifest\.json: manifest\.json: parameters outside the campaign's plan: sizes 10 are not among the planned 6, 8\n$/);
  });

  it('should exit 2 for a file that is not an archive', async () => {
    const text = join(config.dir, 'notes.txt');
    writeFileSync(text, 'x');
    const r = await cli(['verify', text], NOWHERE);
    expect(r.code).toBe(2);
    expect(r.stderr).toBe('localis: notes.txt is not a result archive: its name must end in .tar.gz, .tgz, .tar or .zip.\n');
  });
});

describe('localis verify --log against a stand-in portal (no stack needed)', () => {
  let portal: FakePortal;
  beforeAll(async () => {
    portal = await startFakePortal();
  });
  afterAll(() => portal.close());

  it('should save the head the first time and prove the log only grew the second time', async () => {
    const env = { LOCALIS_URL: portal.url, LOCALIS_TOKEN: portal.token };
    portal.appendRecord();
    const first = await cli(['verify', '--log'], env);
    expect(first.code, first.stderr).toBe(0);
    expect(first.stdout).toContain('no saved head for this portal');
    portal.appendRecord();
    portal.appendRecord();
    const second = await cli(['verify', '--log'], env);
    expect(second.code, second.stderr).toBe(0);
    expect(second.stdout).toMatch(/ {2}ok {4}consistent with the saved head of 1 entries \(.*\): the log only grew, by 2 entries/);
    portal.rotateKey();
    const third = await cli(['verify', '--log'], env);
    expect(third.code).toBe(1);
    expect(third.stderr).toMatch(/^localis: the provenance log check failed:\n {2}signing-key: the portal signs with key/);
  });
});
