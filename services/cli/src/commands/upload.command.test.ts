import type { ChildProcess } from 'node:child_process';
import { randomBytes } from 'node:crypto';
import { mkdirSync, mkdtempSync, rmSync, statSync, writeFileSync } from 'node:fs';
import { open } from 'node:fs/promises';
import { tmpdir } from 'node:os';
import { join } from 'node:path';
import { afterAll, afterEach, beforeAll, beforeEach, describe, expect, it } from 'vitest';
import { Archive, CampaignSpec, disorderValues, StoredParts } from '@localis/shared';
import { demoToken, runCli, tempConfigDir, type CliResult } from '../../test/cli-harness';
import { QUANTUM_TRANSPORT, runsOf } from '../../test/demo-runs';
import { startFakePortal, type FakePortal } from '../lib/upload-fake-portal';

// The real `localis upload` (and `pack`, `verify`) in a child process. The checks made before
// anything is sent run against a closed port; the interrupted-and-resumed upload runs against the
// stand-in portal of lib/upload-fake-portal.ts, always; the whole way through the running test
// stack (api, object-store fake, worker) runs when PUBLIC_URL is set.

const MiB = 1024 ** 2;
/** Nothing listens on port 4: a request the CLI should not send would fail with exit 1, not 2. */
const NOWHERE = 'http://127.0.0.1:4';
const FIXTURE_CAMPAIGN = '3f1c9a52-7d4e-4b8a-9c61-2e5f0a7b8d90';

let config: ReturnType<typeof tempConfigDir>;
beforeEach(() => {
  config = tempConfigDir();
});
afterEach(() => config.remove());

const cli = (args: string[], env: Record<string, string>, onSpawn?: (child: ChildProcess) => void) => runCli(args, { configDir: config.dir, env, onSpawn });

/** A folder of results: a small lambda table over the given grid and `rawFiles` files of random bytes. */
async function resultsFolder(root: string, grid: { sizes: number[]; disorder: number[]; energies: number[] }, rawFiles: number, rawBytes: number): Promise<string> {
  const dir = join(root, 'results');
  mkdirSync(join(dir, 'raw'), { recursive: true });
  const lines = ['L,W,E,lambda,lambda_err'];
  for (const L of grid.sizes) for (const W of grid.disorder) for (const E of grid.energies) lines.push(`${L},${W},${E},${(0.6 - 0.01 * (W - 17)).toFixed(4)},0.0012`);
  writeFileSync(join(dir, 'lambda.csv'), `${lines.join('\n')}\n`);
  // Written in 8 MiB pieces: a 1 GiB folder must not sit in the test's memory.
  const chunk = Buffer.allocUnsafe(8 * MiB);
  for (let i = 1; i <= rawFiles; i++) {
    const file = await open(join(dir, 'raw', `block-${i}.bin`), 'w');
    for (let written = 0; written < rawBytes; written += chunk.length) {
      const n = Math.min(chunk.length, rawBytes - written);
      await file.write(randomBytes(n), 0, n);
    }
    await file.close();
  }
  return dir;
}

const packArgs = (dir: string, campaignId: string, machine: string, grid: { sizes: number[]; disorder: number[]; energies: number[] }, runIds: string[]) => [
  'pack', dir, '--campaign', campaignId, '--code-name', 'tmm-anderson', '--code-version', 'cli-test', '--code-commit', '0123abcd', '--machine', machine,
  '--sizes', grid.sizes.join(','), '--disorder', grid.disorder.join(','), '--energies', grid.energies.join(','), '--realizations', '100', '--seeds', '1,2',
  ...(runIds.length ? ['--runs', runIds.join(',')] : []),
];

/** The archive id the CLI announces on stderr when it starts an upload. */
async function archiveIdOf(stderr: () => string, timeoutMs = 60_000): Promise<string> {
  const deadline = Date.now() + timeoutMs;
  for (;;) {
    const id = / as archive ([0-9a-f-]{36})\./.exec(stderr())?.[1];
    if (id) return id;
    if (Date.now() > deadline) throw new Error(`the upload announced no archive:\n${stderr()}`);
    await new Promise((r) => setTimeout(r, 50));
  }
}

/**
 * Starts an upload at a slow pace (one part at a time, 8 MB/s), presses Ctrl-C once the store holds
 * `partsBeforeKill` parts, and answers what the interrupted run printed and which parts were stored.
 */
async function interruptedUpload(args: string[], env: Record<string, string>, storedParts: (archiveId: string) => Promise<number[]>, partsBeforeKill = 2) {
  let stderr = '';
  let child: ChildProcess | undefined;
  const running = cli([...args, '--parallel', '1', '--limit-rate', '8'], env, (c) => {
    child = c;
    c.stderr!.on('data', (d: string) => (stderr += d));
  });
  const archiveId = await archiveIdOf(() => stderr);
  for (;;) {
    if ((await storedParts(archiveId)).length >= partsBeforeKill) break;
    await new Promise((r) => setTimeout(r, 200));
  }
  child!.kill('SIGINT');
  const result = await running;
  // A part whose last bytes were in flight may still be written: let the store settle.
  await new Promise((r) => setTimeout(r, 500));
  return { result, archiveId, stored: await storedParts(archiveId) };
}

describe('localis upload, before anything is sent', () => {
  const offline = { LOCALIS_URL: NOWHERE, LOCALIS_TOKEN: 'lcs_nevertobesentnevertobesent' };

  it('should exit 2 when --campaign is missing or the file is not an archive', async () => {
    const file = join(config.dir, 'results.rar');
    writeFileSync(file, 'x');
    const missing = await cli(['upload', file], offline);
    expect(missing.code).toBe(2);
    expect(missing.stderr).toContain("localis: required option '--campaign <id>' not specified");
    const wrong = await cli(['upload', file, '--campaign', FIXTURE_CAMPAIGN], offline);
    expect(wrong.code).toBe(2);
    expect(wrong.stderr).toBe('localis: results.rar cannot be uploaded as a result archive: its name must end in .tar.gz, .tar, .zip (or .tgz).\n`localis pack` writes a result archive from a folder of results.\n');
    expect(wrong.stdout).toBe('');
  });

  it('should exit 3 and send nothing when not signed in', async () => {
    const file = join(config.dir, 'results.tar');
    writeFileSync(file, 'x');
    const r = await cli(['upload', file, '--campaign', FIXTURE_CAMPAIGN], { LOCALIS_URL: NOWHERE });
    expect(r.code).toBe(3);
    expect(r.stderr).toContain('localis: you are not signed in.');
  });

  it('should show the options and examples with --help', async () => {
    const r = await cli(['upload', '--help'], {});
    expect(r.code).toBe(0);
    for (const option of ['--campaign <id>', '--run <id>', '--no-wait', '--stats', '--limit-rate <MB/s>', '--parallel <n>']) expect(r.stdout).toContain(option);
    expect(r.stdout).toContain('$ localis upload results.tar.gz --campaign');
  });
});

describe('localis upload against a stand-in portal (no stack needed)', () => {
  let portal: FakePortal;
  beforeAll(async () => {
    portal = await startFakePortal({ checkDelayMs: 20 });
  });
  afterAll(() => portal.close());

  it('should be interrupted by Ctrl-C with exit code 130 and, run again, send only the missing parts', async () => {
    const env = { LOCALIS_URL: portal.url, LOCALIS_TOKEN: portal.token };
    const dir = await resultsFolder(config.dir, { sizes: [8, 12], disorder: [17], energies: [0] }, 3, 8 * MiB);
    const packed = await cli([...packArgs(dir, FIXTURE_CAMPAIGN, 'fjell', { sizes: [8, 12], disorder: [17], energies: [0] }, []), '--format', 'tar'], {});
    expect(packed.code, packed.stderr).toBe(0);
    const archive = `${dir}.tar`;
    const size = statSync(archive).size;

    const stored = async (id: string) => [...(portal.archives.get(id)?.parts.keys() ?? [])];
    const first = await interruptedUpload(['upload', archive, '--campaign', FIXTURE_CAMPAIGN], env, stored);
    expect(first.result.code, first.result.stderr).toBe(130);
    expect(first.result.stderr).toContain(`localis: interrupted; the parts sent so far are kept (archive ${first.archiveId}).\nRun the same command again to send the rest.\n`);
    expect(first.stored.length).toBeGreaterThanOrEqual(2);
    expect(first.stored.length).toBeLessThan(4);

    const again = await cli(['upload', archive, '--campaign', FIXTURE_CAMPAIGN, '--json', '--stats'], env);
    expect(again.code, again.stderr).toBe(0);
    const json = JSON.parse(again.stdout);
    expect(json.archive).toMatchObject({ id: first.archiveId, state: 'verified', partCount: 4 });
    expect(json.upload.resumed).toBe(true);
    expect(json.upload.partsAlreadyStored).toBe(first.stored.length);
    expect(json.upload.sentBytes + json.upload.alreadyStoredBytes).toBe(size);
    expect(json.stats.peakRssBytes).toBeLessThan(250e6);
    expect(portal.puts.filter((p) => p.archiveId === first.archiveId && p.status === 200).map((p) => p.partNumber).sort()).toEqual([1, 2, 3, 4]);
  }, 60_000);
});

describe.skipIf(!process.env.PUBLIC_URL)('localis pack, upload and verify against the portal', () => {
  const campaign = QUANTUM_TRANSPORT;
  const token = () => demoToken(campaign.recorder);
  const env = () => ({ LOCALIS_URL: process.env.PUBLIC_URL!, LOCALIS_TOKEN: token() });
  const apiGet = async (path: string): Promise<unknown> => {
    const res = await fetch(`${process.env.PUBLIC_URL}/api/v1${path}`, { headers: { authorization: `Bearer ${token()}`, accept: 'application/json' } });
    if (!res.ok) throw new Error(`GET ${path} answered ${res.status}: ${await res.text()}`);
    return res.json();
  };
  const storedParts = async (archiveId: string) => StoredParts.parse(await apiGet(`/archives/${archiveId}/parts`)).parts.map((p) => p.partNumber);

  /** Large files go to the OS temp folder, and are removed after. */
  let work: string;
  beforeAll(() => {
    work = mkdtempSync(join(tmpdir(), 'localis-cli-upload-'));
  });
  afterAll(() => rmSync(work, { recursive: true, force: true }));

  /** What the campaign planned, read from the portal: a valid grid for the manifest and the tables. */
  async function plannedGrid() {
    const c = (await apiGet(`/campaigns/${campaign.id}`)) as { id: string; machine: string; spec: unknown };
    const spec = CampaignSpec.parse(c.spec);
    const grid = { sizes: spec.sizes.slice(0, 3), disorder: disorderValues(spec.disorder).slice(0, 2), energies: spec.energies.slice(0, 1) };
    return { campaign: c, grid };
  }

  /**
   * A run of the campaign for the manifest to name. The demo scenario's runs are used rather than a
   * new one: recording a run charges the grant, which runs.test.ts compares before and after while
   * this file runs beside it.
   */
  async function aRunOfTheCampaign(): Promise<string> {
    const runs = await runsOf(campaign);
    if (!runs.length) throw new Error(`the demo campaign "${campaign.title}" has no runs to name`);
    return runs[runs.length - 1].id;
  }

  let peakRssOf40MiB: number | null = null;

  it('should pack ~40 MiB, upload it, survive Ctrl-C, resume with only the missing parts, reach verified, and pass verify and verify --log twice', async () => {
    const { campaign: c, grid } = await plannedGrid();
    const runId = await aRunOfTheCampaign();
    const root = join(work, 'forty');
    const dir = await resultsFolder(root, grid, 5, 8 * MiB);
    const packed = await cli([...packArgs(dir, campaign.id, c.machine, grid, [runId]), '--json'], {});
    expect(packed.code, packed.stderr).toBe(0);
    const { path: archive, sizeBytes, sha256 } = JSON.parse(packed.stdout) as { path: string; sizeBytes: number; sha256: string };
    expect(archive).toBe(`${dir}.tar.gz`);
    expect(sizeBytes).toBeGreaterThan(40 * MiB);

    const upload = ['upload', archive, '--campaign', campaign.id, '--run', runId];
    const first = await interruptedUpload(upload, env(), storedParts);
    expect(first.result.code, first.result.stderr).toBe(130);
    expect(first.result.stderr).toContain(`interrupted; the parts sent so far are kept (archive ${first.archiveId})`);
    expect(first.stored.length).toBeGreaterThanOrEqual(2);
    expect(first.stored.length).toBeLessThan(Math.ceil(sizeBytes / (8 * MiB)));

    const again = await cli([...upload, '--json', '--stats'], env());
    expect(again.code, again.stderr).toBe(0);
    const json = JSON.parse(again.stdout);
    const uploaded = Archive.parse(json.archive);
    const partCount = Math.ceil(sizeBytes / (8 * MiB)); // 6: five of 8 MiB and the rest
    expect(uploaded).toMatchObject({ id: first.archiveId, state: 'verified', declaredSha256: sha256, sizeBytes, partCount, runIds: [runId], problems: [] });
    expect(json.upload).toMatchObject({ resumed: true, partCount });
    expect(json.upload.partsAlreadyStored).toBeGreaterThanOrEqual(first.stored.length);
    expect(json.upload.partsSent + json.upload.partsAlreadyStored).toBe(partCount);
    expect(json.upload.sentBytes + json.upload.alreadyStoredBytes).toBe(sizeBytes);
    expect(again.stderr).toContain(`going on with archive ${first.archiveId}`);
    expect(json.stats.peakRssBytes).toBeLessThan(250e6);
    peakRssOf40MiB = json.stats.peakRssBytes;

    // The campaign as the portal answers it doubles as the spec: id, machine and grid are compared too.
    const campaignFile = join(root, 'campaign.json');
    writeFileSync(campaignFile, JSON.stringify(c));
    const verified = await cli(['verify', archive, '--campaign-spec', campaignFile], env());
    expect(verified.code, verified.stderr).toBe(0);
    expect(verified.stdout).toContain(`SHA-256 ${sha256}`);
    expect(verified.stdout).toMatch(/ {2}ok {4}campaign's plan \(.*campaign\.json\): campaign id, machine, sizes, disorder and energies/);
    expect(verified.stdout).toMatch(/ {2}ok {4}key [0-9a-f]{16} \(Ed25519\) pinned now, on first use/);
    expect(verified.stdout).toMatch(/ {2}ok {4}log entry \d+ \(archive-verified, .*\) names this file's SHA-256/);
    expect(verified.stdout).toMatch(/ {2}ok {4}inclusion proof: leaf \d+ is in the tree of [\d,]+ entries/);
    expect(verified.stdout).toMatch(/ {2}ok {4}the head of [\d,]+ entries .* is signed by key [0-9a-f]{16}/);
    expect(verified.stdout).toContain('No problems: this file is the archive the portal verified and logged.');

    const log1 = await cli(['verify', '--log'], env());
    expect(log1.code, log1.stderr).toBe(0);
    expect(log1.stdout).toMatch(/ {2}ok {4}the head of [\d,]+ entries .* is signed by key/);
    expect(log1.stdout).toContain('no saved head for this portal');
    const log2 = await cli(['verify', '--log'], env());
    expect(log2.code, log2.stderr).toBe(0);
    expect(log2.stdout).toMatch(/ {2}ok {4}key [0-9a-f]{16} is the one pinned on/);
    expect(log2.stdout).toMatch(/ {2}ok {4}(consistent with|same log as) the saved head of [\d,]+ entries/);
  }, 180_000);

  it('should upload 1 GiB in flat memory: peak RSS below 250 MB, as for 40 MiB', async () => {
    const { campaign: c, grid } = await plannedGrid();
    const root = join(work, 'gib');
    const dir = await resultsFolder(root, grid, 8, 128 * MiB);
    // tar, not tar.gz: random bytes do not compress, and gzip would only cost time here.
    const packed = await cli([...packArgs(dir, campaign.id, c.machine, grid, []), '--format', 'tar', '--json'], {});
    expect(packed.code, packed.stderr).toBe(0);
    rmSync(dir, { recursive: true, force: true });
    const { path: archive, sizeBytes } = JSON.parse(packed.stdout) as { path: string; sizeBytes: number };
    expect(sizeBytes).toBeGreaterThanOrEqual(1024 * MiB);

    const r: CliResult = await cli(['upload', archive, '--campaign', campaign.id, '--no-wait', '--stats', '--json'], env());
    expect(r.code, r.stderr).toBe(0);
    const json = JSON.parse(r.stdout);
    expect(['received', 'checking', 'verified']).toContain(json.archive.state);
    const parts = Math.ceil(sizeBytes / (8 * MiB));
    expect(json.upload).toMatchObject({ partCount: parts, partsSent: parts, sentBytes: sizeBytes, resumed: false });
    const peak = json.stats.peakRssBytes as number;
    const mb = (bytes: number | null) => (bytes === null ? 'n/a' : `${(bytes / 1e6).toFixed(1)} MB`);
    console.log(`localis upload peak RSS: ${mb(peakRssOf40MiB)} for ~40 MiB, ${mb(peak)} for ${(sizeBytes / 1024 ** 3).toFixed(2)} GiB (${json.stats.megabytesPerSecond} MB/s)`);
    expect(peak).toBeLessThan(250e6);
  }, 180_000);
});
