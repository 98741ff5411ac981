import { afterEach, beforeEach, describe, expect, it } from 'vitest';
import { Run, RunInput } from '@localis/shared';
import { runCli, tempConfigDir } from '../../test/cli-harness';
import { FAKE_TOKEN, FakeRunsPortal } from '../../test/fake-runs-portal';
import { runIdempotencyKey } from '../lib/run-input';

// The real `localis` in a child process, against a fake of the portal's runs routes on loopback:
// the wiring, exit codes and streams. The rest of the behaviour is tested in process, faster, in
// lib/runs.test.ts and lib/run-input.test.ts.
let config: ReturnType<typeof tempConfigDir>;
let portal: FakeRunsPortal;
beforeEach(async () => {
  config = tempConfigDir();
  portal = await new FakeRunsPortal().start();
});
afterEach(async () => {
  config.remove();
  await portal.stop();
});

const signedIn = () => ({ LOCALIS_URL: portal.url, LOCALIS_TOKEN: FAKE_TOKEN });
const cli = (args: string[], opts: { input?: string; env?: Record<string, string> } = {}) =>
  runCli(args, { configDir: config.dir, input: opts.input, env: opts.env ?? signedIn() });

/** The worked example: 128 cores for 12 hours, 1 536 core-hours. */
const RUN_OPTIONS = [
  '--job', '4711', '--machine', 'cluster-a', '--start', '2027-02-01T08:00:00Z', '--end', '2027-02-01T20:00:00Z',
  '--cores', '128', '--code', 'tmm', '--code-version', '1.4.2', '--sizes', '12,16', '--disorder', '16.5,17', '--energies', '0', '--seeds', '1,2',
];
const RUN_JSON: RunInput = {
  externalJobId: '4711',
  machine: 'cluster-a',
  startedAt: '2027-02-01T08:00:00.000Z',
  endedAt: '2027-02-01T20:00:00.000Z',
  cores: 128,
  codeName: 'tmm',
  codeVersion: '1.4.2',
  parameters: { sizes: [12, 16], disorder: [16.5, 17], energies: [0], seeds: [1, 2] },
};
const add = (...args: string[]) => cli(['runs', 'add', '--campaign', portal.campaignId, ...args]);
const posts = () => portal.requests.filter((r) => r.method === 'POST');

describe('localis runs add', () => {
  describe('a valid run', () => {
    it('should send the run with its derived Idempotency-Key and print the core-hours charged and the remaining grant', async () => {
      const r = await add(...RUN_OPTIONS);
      expect(r.code, r.stderr).toBe(0);
      expect(r.stderr).toBe('');
      expect(posts()).toEqual([
        { method: 'POST', path: `/api/v1/campaigns/${portal.campaignId}/runs`, idempotencyKey: runIdempotencyKey(portal.campaignId, RUN_JSON), body: RUN_JSON },
      ]);
      expect(r.stdout).toContain('Recorded run 4711 on cluster-a: 1,536 core-hours charged');
      expect(r.stdout).toMatch(/started\s+2027-02-01 08:00:00 UTC/);
      expect(r.stdout).toMatch(/ended\s+2027-02-01 20:00:00 UTC \(12 h\)/);
      expect(r.stdout).toMatch(/sizes L\s+12, 16/);
      expect(r.stdout).toMatch(new RegExp(`run id\\s+${portal.runs[0].id}`));
      expect(r.stdout).toContain('Remaining grant: 8,464 of 10,000 core-hours (used 1,536)');
    });

    it('should charge once when the same command is sent again, as after a network failure', async () => {
      expect((await add(...RUN_OPTIONS)).code).toBe(0);
      const again = await add(...RUN_OPTIONS);
      expect(again.code, again.stderr).toBe(0);
      expect(again.stderr).toBe('localis: this run was recorded by an earlier attempt with the same Idempotency-Key; it is charged once, not again.\n');
      expect(again.stdout).toContain('Recorded run 4711 on cluster-a: 1,536 core-hours charged');
      expect(portal.runs).toHaveLength(1);
      const [first, second] = posts();
      expect(second.idempotencyKey).toBe(first.idempotencyKey);
      expect(again.stdout).toContain('Remaining grant: 8,464 of 10,000 core-hours');
    });

    it('should read the run from standard input when --file is -, and send the core-hours given', async () => {
      const r = await cli(['runs', 'add', '--campaign', portal.campaignId, '--file', '-'], { input: JSON.stringify({ ...RUN_JSON, coreHours: 1500.5, parameters: undefined }) });
      expect(r.code, r.stderr).toBe(0);
      expect(posts()[0].body).toMatchObject({ coreHours: 1500.5, parameters: { sizes: [] } });
      expect(r.stdout).toContain('1,500.5 core-hours charged');
    });
  });

  describe('invalid runs', () => {
    it('should list each problem with its field and option, exit 2 and send nothing', async () => {
      const options = RUN_OPTIONS.map((o) => ({ '128': '0', '2027-02-01T20:00:00Z': '2027-02-01T07:00:00Z', '12,16': '12,x' })[o] ?? o);
      const r = await add(...options);
      expect(r.code).toBe(2);
      expect(r.stdout).toBe('');
      expect(r.stderr).toContain('localis: the run is not valid; nothing was sent:\n');
      expect(r.stderr).toContain('  parameters.sizes[1]: "x" is not a number (--sizes "12,x")\n');
      expect(r.stderr).toContain('  cores: a run uses at least 1 core (--cores "0")\n');
      expect(r.stderr).toContain('  endedAt: a run must end after it starts (--end "2027-02-01T07:00:00Z")\n');
      expect(portal.requests).toEqual([]);
    });

    it('should exit 2 when --campaign is missing', async () => {
      const r = await cli(['runs', 'add', ...RUN_OPTIONS]);
      expect(r.code).toBe(2);
      expect(r.stderr).toContain("localis: required option '--campaign <id>' not specified");
    });
  });

  describe('refusals by the portal', () => {
    it('should print the portal\'s reason and exit 1 when the job is already recorded', async () => {
      await add(...RUN_OPTIONS);
      const r = await add(...RUN_OPTIONS.map((o) => (o === '128' ? '64' : o)));
      expect(r.code).toBe(1);
      expect(r.stderr).toBe('localis: Job 4711 is already recorded on cluster-a.\n');
      expect(portal.runs).toHaveLength(1);
    });

    it('should exit 3 and send nothing when not signed in', async () => {
      const r = await cli(['runs', 'add', '--campaign', portal.campaignId, ...RUN_OPTIONS], { env: { LOCALIS_URL: portal.url } });
      expect(r.code).toBe(3);
      expect(r.stderr).toContain('localis: you are not signed in.');
      expect(portal.requests).toEqual([]);
    });
  });
});

describe('localis runs list', () => {
  const list = (...args: string[]) => cli(['runs', 'list', '--campaign', portal.campaignId, ...args]);

  it('should read every page and print a row per run, newest first, with the total charged', async () => {
    portal.seed(250);
    const r = await list();
    expect(r.code, r.stderr).toBe(0);
    expect(portal.requests.map((q) => q.path)).toEqual([
      `/api/v1/campaigns/${portal.campaignId}/runs?sort=-startedAt&limit=200&offset=0`,
      `/api/v1/campaigns/${portal.campaignId}/runs?sort=-startedAt&limit=200&offset=200`,
    ]);
    const lines = r.stdout.trimEnd().split('\n');
    expect(lines[0]).toMatch(/^\s+job\s+machine\s+started \(UTC\)\s+wall-clock\s+cores\s+core-hours\s+code$/);
    expect(lines[1]).toMatch(/^\s+9249\s+cluster-a\s+2027-02-11 09:00:00\s+30 min\s+2\s+1\s+tmm 1\.4\.2$/);
    expect(lines).toHaveLength(1 + 250 + 2);
    expect(lines.at(-1)).toBe('250 runs: 250 core-hours charged');
  });

  it('should print the runs as one JSON array with --json', async () => {
    portal.seed(3);
    const r = await list('--json');
    expect(r.code, r.stderr).toBe(0);
    const runs = Run.array().parse(JSON.parse(r.stdout));
    expect(runs.map((run) => run.externalJobId)).toEqual(['9002', '9001', '9000']);
  });
});
