import { afterEach, beforeEach, describe, expect, it } from 'vitest';
import { formatCoreHours, Run, toMilli } from '@localis/shared';
import { demoToken, runCli, tempConfigDir } from '../../test/cli-harness';
import { DEVICE_MODELLING, entriesOfJob, ledgerOf, runsOf, tinyRun } from '../../test/demo-runs';

// The real `localis` in a child process: the wiring, exit codes and streams. The checks made
// before anything is sent need no portal; the rest talks to the running api (`PUBLIC_URL`) as a
// member of a granted demo campaign. More cases run in process in lib/runs.test.ts.
let config: ReturnType<typeof tempConfigDir>;
beforeEach(() => {
  config = tempConfigDir();
});
afterEach(() => config.remove());

/** Nothing listens on port 4: a request the CLI should not send would fail with exit 1, not 2 or 3. */
const NOWHERE = 'http://127.0.0.1:4';
const cli = (args: string[], opts: { input?: string; env?: Record<string, string> } = {}) =>
  runCli(args, { configDir: config.dir, input: opts.input, env: opts.env });

/** The worked example: 128 cores for 12 hours. */
const RUN_OPTIONS = [
  '--job', '4711', '--machine', 'cluster-a', '--start', '2027-02-01T08:00:00Z', '--end', '2027-02-01T20:00:00Z',
  '--cores', '128', '--code', 'tmm', '--code-version', '1.4.2', '--sizes', '12,16', '--disorder', '16.5,17', '--energies', '0', '--seeds', '1,2',
];

describe('localis runs add, before anything is sent', () => {
  const offline = { LOCALIS_URL: NOWHERE, LOCALIS_TOKEN: 'lcs_nevertobesentnevertobesent' };

  it('should list each problem with its field and option, exit 2 and send nothing', async () => {
    const options = RUN_OPTIONS.map((o) => ({ '128': '0', '2027-02-01T20:00:00Z': '2027-02-01T07:00:00Z', '12,16': '12,x' })[o] ?? o);
    const r = await cli(['runs', 'add', '--campaign', DEVICE_MODELLING.id, ...options], { env: offline });
    expect(r.code).toBe(2);
    expect(r.stdout).toBe('');
    expect(r.stderr).toContain('localis: the run is not valid; nothing was sent:\n');
    expect(r.stderr).toContain('  parameters.sizes[1]: "x" is not a number (--sizes "12,x")\n');
    expect(r.stderr).toContain('  cores: a run uses at least 1 core (--cores "0")\n');
    expect(r.stderr).toContain('  endedAt: a run must end after it starts (--end "2027-02-01T07:00:00Z")\n');
    expect(r.stderr).not.toContain('cannot reach');
  });

  it('should exit 2 when --campaign is missing', async () => {
    const r = await cli(['runs', 'add', ...RUN_OPTIONS], { env: offline });
    expect(r.code).toBe(2);
    expect(r.stderr).toContain("localis: required option '--campaign <id>' not specified");
  });

  it('should exit 3 and send nothing when not signed in', async () => {
    const r = await cli(['runs', 'add', '--campaign', DEVICE_MODELLING.id, ...RUN_OPTIONS], { env: { LOCALIS_URL: NOWHERE } });
    expect(r.code).toBe(3);
    expect(r.stderr).toContain('localis: you are not signed in.');
  });
});

describe.skipIf(!process.env.PUBLIC_URL)('localis runs against the portal', () => {
  const campaign = DEVICE_MODELLING;
  const signedIn = () => ({ LOCALIS_URL: process.env.PUBLIC_URL!, LOCALIS_TOKEN: demoToken(campaign.recorder) });
  const add = (options: string[]) => cli(['runs', 'add', '--campaign', campaign.id, ...options], { env: signedIn() });
  const listJson = async () => {
    const r = await cli(['runs', 'list', '--campaign', campaign.id, '--json'], { env: signedIn() });
    expect(r.code, r.stderr).toBe(0);
    return Run.array().parse(JSON.parse(r.stdout));
  };
  const ch = (x: number) => formatCoreHours(toMilli(x));

  describe('localis runs add', () => {
    it('should record the run, print the core-hours charged and the remaining grant, and debit the ledger', async () => {
      const run = tinyRun(campaign.machine);
      const job = run.input.externalJobId;
      const before = await ledgerOf(campaign);
      const r = await add(run.options);
      expect(r.code, r.stderr).toBe(0);
      expect(r.stderr).toBe('');
      expect(r.stdout).toContain(`Recorded run ${job} on ${campaign.machine}: 0.01 core-hours charged`);
      expect(r.stdout).toMatch(/ended\s+\d{4}-\d\d-\d\d \d\d:\d\d:\d\d UTC \(36 s\)/);

      const after = await ledgerOf(campaign);
      expect(toMilli(after.remaining)).toBe(toMilli(before.remaining) - 10);
      const [debit, ...more] = entriesOfJob(after, job);
      expect(more).toEqual([]);
      expect(debit).toMatchObject({ kind: 'debit', coreHours: -0.01, overdraft: false });
      expect(r.stdout).toMatch(new RegExp(`run id\\s+${debit.runId}\n`));
      expect(r.stdout).toContain(`Remaining grant: ${ch(after.remaining)} of ${ch(after.granted)} core-hours (used ${ch(after.used)}`);
    });

    it('should be replayed by the portal and charge nothing more when the very same command is run again', async () => {
      const run = tinyRun(campaign.machine);
      const job = run.input.externalJobId;
      const first = await add(run.options);
      expect(first.code, first.stderr).toBe(0);
      const afterFirst = await ledgerOf(campaign);

      const again = await add(run.options);
      expect(again.code, again.stderr).toBe(0);
      expect(again.stderr).toBe('localis: this run was recorded by an earlier attempt with the same Idempotency-Key; it is charged once, not again.\n');
      expect(again.stdout).toContain(`Recorded run ${job} on ${campaign.machine}: 0.01 core-hours charged`);
      expect(again.stdout).toContain(`Remaining grant: ${ch(afterFirst.remaining)} of ${ch(afterFirst.granted)} core-hours`);
      // The replay is the first answer: the same run id.
      expect(again.stdout.match(/run id\s+(\S+)/)?.[1]).toBe(first.stdout.match(/run id\s+(\S+)/)?.[1]);

      const afterAgain = await ledgerOf(campaign);
      expect(afterAgain.remaining).toBe(afterFirst.remaining);
      expect(entriesOfJob(afterAgain, job)).toHaveLength(1);
      expect((await listJson()).filter((r) => r.externalJobId === job)).toHaveLength(1);
    });

    it('should read the run from standard input when --file is -, and charge the core-hours given', async () => {
      const run = tinyRun(campaign.machine);
      const { parameters: _left, ...withoutParameters } = run.input;
      const r = await cli(['runs', 'add', '--campaign', campaign.id, '--file', '-'], { env: signedIn(), input: JSON.stringify({ ...withoutParameters, coreHours: 0.005 }) });
      expect(r.code, r.stderr).toBe(0);
      expect(r.stdout).toContain(`Recorded run ${run.input.externalJobId} on ${campaign.machine}: 0.005 core-hours charged`);
      expect(entriesOfJob(await ledgerOf(campaign), run.input.externalJobId)).toEqual([expect.objectContaining({ kind: 'debit', coreHours: -0.005 })]);
    });

    it("should print the portal's reason and its field, exit 1 and record nothing when the run is on another machine", async () => {
      const run = tinyRun('fjell');
      const before = await ledgerOf(campaign);
      const r = await add(run.options);
      expect(r.code).toBe(1);
      expect(r.stdout).toBe('');
      expect(r.stderr).toBe(
        `localis: "${campaign.title}" was granted core-hours on ${campaign.machine}; a run on fjell cannot be charged to it.\n` +
          `  machine: runs of this campaign are on ${campaign.machine}\n`,
      );
      expect((await ledgerOf(campaign)).remaining).toBe(before.remaining);
      expect((await runsOf(campaign)).some((r) => r.externalJobId === run.input.externalJobId)).toBe(false);
    });

    it("should print the portal's reason, exit 1 and charge nothing more when the job id is recorded already", async () => {
      const run = tinyRun(campaign.machine);
      const job = run.input.externalJobId;
      expect((await add(run.options)).code).toBe(0);
      const afterFirst = await ledgerOf(campaign);
      // Another body (2 cores), so another Idempotency-Key: the portal's duplicate check answers.
      const r = await add(run.options.map((o, i) => (run.options[i - 1] === '--cores' ? '2' : o)));
      expect(r.code).toBe(1);
      expect(r.stdout).toBe('');
      expect(r.stderr).toBe(`localis: Job ${job} on ${campaign.machine} is recorded already; a job is charged once.\n`);
      const afterSecond = await ledgerOf(campaign);
      expect(afterSecond.remaining).toBe(afterFirst.remaining);
      expect(entriesOfJob(afterSecond, job)).toHaveLength(1);
    });

    it('should exit 3 with the portal\'s message when the token is refused', async () => {
      const r = await cli(['runs', 'add', '--campaign', campaign.id, ...tinyRun(campaign.machine).options], {
        env: { LOCALIS_URL: process.env.PUBLIC_URL!, LOCALIS_TOKEN: 'lcs_notarealtokennotarealtoken' },
      });
      expect(r.code).toBe(3);
      expect(r.stderr).toContain('This API token is not known.');
    });
  });

  describe('localis runs list', () => {
    it('should print the runs as one JSON array with --json, the new run among them, newest first', async () => {
      const run = tinyRun(campaign.machine);
      expect((await add(run.options)).code).toBe(0);
      const runs = await listJson();
      expect(runs.filter((r) => r.externalJobId === run.input.externalJobId)).toEqual([
        expect.objectContaining({ ...run.input, campaignId: campaign.id, coreHours: 0.01, refundedCoreHours: 0, source: 'api' }),
      ]);
      const starts = runs.map((r) => r.startedAt);
      expect(starts).toEqual([...starts].sort().reverse());
      expect(runs.map((r) => r.id).sort()).toEqual((await runsOf(campaign)).map((r) => r.id).sort());
    });

    it('should print a row per run with the total charged', async () => {
      const run = tinyRun(campaign.machine);
      expect((await add(run.options)).code).toBe(0);
      const r = await cli(['runs', 'list', '--campaign', campaign.id], { env: signedIn() });
      expect(r.code, r.stderr).toBe(0);
      const runs = await runsOf(campaign);
      const lines = r.stdout.trimEnd().split('\n');
      expect(lines[0]).toMatch(/^\s*job\s+machine\s+started \(UTC\)\s+wall-clock\s+cores\s+core-hours\s+(refunded\s+)?code$/);
      expect(lines).toHaveLength(1 + runs.length + 2);
      const start = run.input.startedAt.replace('T', ' ').replace('.000Z', '');
      expect(lines.filter((line) => line.includes(run.input.externalJobId))).toEqual([
        expect.stringMatching(new RegExp(`^\\s*${run.input.externalJobId}\\s+${campaign.machine}\\s+${start}\\s+36 s\\s+1\\s+0\\.01\\s+tmm cli-test$`)),
      ]);
      const charged = runs.reduce((sum, x) => sum + toMilli(x.coreHours) - toMilli(x.refundedCoreHours), 0);
      expect(lines.at(-1)).toMatch(new RegExp(`^${runs.length.toLocaleString('en')} runs: ${formatCoreHours(charged).replace(/\./g, '\\.')} core-hours charged( after refunds)?$`));
    });
  });
});
