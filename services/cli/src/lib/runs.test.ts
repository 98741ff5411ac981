import { writeFileSync } from 'node:fs';
import { join } from 'node:path';
import { afterEach, beforeEach, describe, expect, it } from 'vitest';
import { formatCoreHours, Run, toMilli } from '@localis/shared';
import { failure } from '../../test/cli-error-of';
import { demoToken, tempConfigDir } from '../../test/cli-harness';
import { COMMITTEE_MEMBER, entriesOfJob, ledgerOf, QUANTUM_TRANSPORT, runsOf, SUBMITTED_PROPOSAL, tinyRun } from '../../test/demo-runs';
import { WORKED_EXAMPLE_FLAGS, WORKED_EXAMPLE_RUN } from '../../test/worked-example-run';
import type { Output } from './output';
import { addRun, listRuns, type AddRunOptions, type ListRunsOptions } from './runs';

let config: ReturnType<typeof tempConfigDir>;
let io: Output & { outs: string[]; notes: string[] };
beforeEach(() => {
  config = tempConfigDir();
  const outs: string[] = [];
  const notes: string[] = [];
  io = { outs, notes, out: (text) => void outs.push(text), note: (text) => void notes.push(text) };
});
afterEach(() => config.remove());

function file(name: string, content: unknown): string {
  const path = join(config.dir, name);
  writeFileSync(path, typeof content === 'string' ? content : JSON.stringify(content, null, 2));
  return path;
}

const ch = (x: number) => formatCoreHours(toMilli(x));

/**
 * Checks made before anything is sent, so they hold on a login node without network. Nothing
 * listens on port 4: had the CLI sent a request, it would fail with exit 1 ("cannot reach").
 */
describe('runs, before anything is sent', () => {
  const env = () => ({ LOCALIS_URL: 'http://127.0.0.1:4', LOCALIS_TOKEN: 'lcs_nevertobesentnevertobesent', LOCALIS_CONFIG_DIR: config.dir });
  const CAMPAIGN = QUANTUM_TRANSPORT.id;
  const options = (extra: Partial<AddRunOptions> = {}): AddRunOptions => ({ campaign: CAMPAIGN, json: false, profile: 'default', ...WORKED_EXAMPLE_FLAGS, ...extra });
  const fileOptions = (path: string, extra: Partial<AddRunOptions> = {}): AddRunOptions => ({ campaign: CAMPAIGN, json: false, profile: 'default', file: path, ...extra });

  describe('addRun', () => {
    it('should refuse a key with spaces or over 200 characters', async () => {
      expect((await failure(addRun(options({ idempotencyKey: 'my key' }), io, env()))).exitCode).toBe(2);
      const e = await failure(addRun(options({ idempotencyKey: 'k'.repeat(201) }), io, env()));
      expect(e).toMatchObject({ exitCode: 2, message: expect.stringMatching(/1 to 200 visible ASCII characters/) });
    });

    it('should name every missing option', async () => {
      const e = await failure(addRun({ campaign: CAMPAIGN, json: false, profile: 'default', job: '4711', cores: '4' }, io, env()));
      expect(e).toMatchObject({ exitCode: 2, message: 'a run needs --machine, --start, --end, --code, --code-version; nothing was sent.' });
    });

    it('should refuse fractional cores and a time without a zone, with the options read and a hint on zones', async () => {
      const e = await failure(addRun(options({ cores: '2.5', start: '2027-02-01T08:00:00' }), io, env()));
      expect(e.exitCode).toBe(2);
      expect(e.details).toEqual(
        expect.arrayContaining([
          { path: ['cores'], message: 'cores is a whole number (--cores "2.5")' },
          { path: ['startedAt'], message: 'startedAt must be a date and time, e.g. 2027-02-01T08:00:00Z (--start "2027-02-01T08:00:00")' },
        ]),
      );
      expect(e.hint).toMatch(/^Times need a zone/);
    });

    it('should refuse a run file with a misspelt key at its path', async () => {
      const e = await failure(addRun(fileOptions(file('run.json', { ...WORKED_EXAMPLE_RUN, parameters: { size: [12] } })), io, env()));
      expect(e.exitCode).toBe(2);
      expect(e.message).toMatch(/run\.json is not a valid run; nothing was sent:$/);
      expect(e.details).toEqual([{ path: ['parameters'], message: 'Unrecognized key: "size"' }]);
    });

    it('should refuse a run file holding an array, and one that is not JSON', async () => {
      expect((await failure(addRun(fileOptions(file('runs.json', [WORKED_EXAMPLE_RUN])), io, env()))).message).toMatch(/holds an array, not a run/);
      const e = await failure(addRun(fileOptions(file('run.json', '{"cores": 4,}')), io, env()));
      expect(e.exitCode).toBe(2);
      expect(e.message).toMatch(/is not valid JSON: line 1/);
    });

    it('should exit 1 when the run file cannot be read', async () => {
      const e = await failure(addRun(fileOptions(join(config.dir, 'missing.json')), io, env()));
      expect(e.exitCode).toBe(1);
      expect(e.message).toMatch(/cannot read the run .*missing\.json: no such file/);
    });

    it('should refuse --file together with run options', async () => {
      const e = await failure(addRun(fileOptions(file('run.json', WORKED_EXAMPLE_RUN), { cores: '4', codeVersion: '2' }), io, env()));
      expect(e).toMatchObject({ exitCode: 2, message: 'give the run either with --file or with options, not both (--file came with --cores, --code-version).' });
    });

    it('should refuse a campaign id that is not one', async () => {
      const e = await failure(addRun(options({ campaign: 'ising-2027' }), io, env()));
      expect(e.exitCode).toBe(2);
      expect(e.message).toMatch(/^--campaign "ising-2027" is not a campaign id/);
    });

    it('should report a bad run before asking for a token, so it shows on a node with no sign-in', async () => {
      const e = await failure(addRun(options({ cores: '0' }), io, { LOCALIS_CONFIG_DIR: config.dir }));
      expect(e.exitCode).toBe(2);
    });
  });

  describe('listRuns', () => {
    it('should refuse a --limit that is not a positive whole number', async () => {
      for (const limit of ['0', '-3', '2.5', 'ten']) {
        const e = await failure(listRuns({ campaign: CAMPAIGN, json: false, profile: 'default', limit }, io, env()));
        expect(e).toMatchObject({ exitCode: 2, message: `--limit takes a whole number of runs, 1 or more (read "${limit}").` });
      }
    });
  });
});

/** Against the running api (`PUBLIC_URL`), as a member of the Quantum Transport group. */
describe.skipIf(!process.env.PUBLIC_URL)('runs against the portal', () => {
  const campaign = QUANTUM_TRANSPORT;
  const env = (email = campaign.recorder) => ({ LOCALIS_URL: process.env.PUBLIC_URL!, LOCALIS_TOKEN: demoToken(email), LOCALIS_CONFIG_DIR: config.dir });
  const withRun = (run: ReturnType<typeof tinyRun>, extra: Partial<AddRunOptions> = {}): AddRunOptions => {
    const i = run.input;
    return { campaign: campaign.id, json: false, profile: 'default', job: i.externalJobId, machine: i.machine, start: i.startedAt, end: i.endedAt, cores: String(i.cores), code: i.codeName, codeVersion: i.codeVersion, ...extra };
  };
  const REPLAYED = 'this run was recorded by an earlier attempt with the same Idempotency-Key; it is charged once, not again.';

  describe('addRun', () => {
    it('should print the run, its wall-clock and lists, and the remaining grant', async () => {
      const run = tinyRun(campaign.machine);
      await addRun(withRun(run, { sizes: '12,16' }), io, env());
      const ledger = await ledgerOf(campaign);
      expect(io.outs).toHaveLength(1);
      expect(io.outs[0]).toContain(`Recorded run ${run.input.externalJobId} on ${campaign.machine}: 0.01 core-hours charged`);
      expect(io.outs[0]).toMatch(/ended\s+.* UTC \(36 s\)/);
      expect(io.outs[0]).toMatch(/sizes L\s+12, 16/);
      expect(io.outs[0]).not.toMatch(/disorder W/);
      expect(io.outs[0]).toContain(`Remaining grant: ${ch(ledger.remaining)} of ${ch(ledger.granted)} core-hours (used ${ch(ledger.used)}`);
      expect(io.notes).toEqual([]);
    });

    it('should derive the same key for the same run written in another zone and key order, so the portal charges it once', async () => {
      const run = tinyRun(campaign.machine);
      await addRun(withRun(run), io, env());
      const afterFirst = await ledgerOf(campaign);
      const { codeVersion, ...rest } = run.input;
      const inBerlin = (iso: string) => new Date(new Date(iso).getTime() + 3_600_000).toISOString().replace('.000Z', '+01:00');
      const written = { codeVersion, ...rest, startedAt: inBerlin(run.input.startedAt), endedAt: inBerlin(run.input.endedAt) };
      await addRun({ campaign: campaign.id, json: false, profile: 'default', file: file('run.json', written) }, io, env());
      expect(io.notes).toEqual([REPLAYED]);
      const afterSecond = await ledgerOf(campaign);
      expect(afterSecond.remaining).toBe(afterFirst.remaining);
      expect(entriesOfJob(afterSecond, run.input.externalJobId)).toHaveLength(1);
    });

    it('should replay a run sent again with the key given by --idempotency-key, and carry the refusal when the key is reused for another run', async () => {
      const run = tinyRun(campaign.machine);
      const key = `batch-${run.input.externalJobId}-attempt-1`;
      await addRun(withRun(run, { idempotencyKey: key }), io, env());
      await addRun(withRun(run, { idempotencyKey: key }), io, env());
      expect(io.notes).toEqual([REPLAYED]);

      const other = tinyRun(campaign.machine);
      const e = await failure(addRun(withRun(other, { idempotencyKey: key }), io, env()));
      expect(e).toMatchObject({ exitCode: 1, message: expect.stringMatching(/^This Idempotency-Key was used for a different request/) });
      const jobs = (await runsOf(campaign)).map((r) => r.externalJobId);
      expect(jobs.filter((j) => j === run.input.externalJobId)).toHaveLength(1);
      expect(jobs).not.toContain(other.input.externalJobId);
    });

    it("should print the portal's answer as JSON with --json, for a campaign id given in capitals", async () => {
      const run = tinyRun(campaign.machine);
      await addRun(withRun(run, { campaign: campaign.id.toUpperCase(), json: true }), io, env());
      expect(io.outs).toHaveLength(1);
      expect(Run.parse(JSON.parse(io.outs[0]))).toMatchObject({ externalJobId: run.input.externalJobId, coreHours: 0.01, campaignId: campaign.id, source: 'api' });
      expect(io.notes).toEqual([]);
    });
  });

  describe('refusals by the portal', () => {
    it('should carry the reason and charge nothing when the run needs more than the grant has left', async () => {
      const run = tinyRun(campaign.machine);
      const before = await ledgerOf(campaign);
      const e = await failure(addRun(withRun(run, { coreHours: String(Math.ceil(before.remaining) + 1_000_000) }), io, env()));
      expect(e.exitCode).toBe(1);
      expect(e.message).toMatch(new RegExp(`^Run ${run.input.externalJobId} needs .+ but "${campaign.title}" has .+ left; .*Ask the office for an adjustment`));
      expect((await ledgerOf(campaign)).remaining).toBe(before.remaining);
    });

    it('should carry the details with their paths when the run is on another machine', async () => {
      const e = await failure(addRun(withRun(tinyRun('skerry-gpu')), io, env()));
      expect(e).toMatchObject({
        exitCode: 1,
        message: `"${campaign.title}" was granted core-hours on ${campaign.machine}; a run on skerry-gpu cannot be charged to it.`,
        details: [{ path: ['machine'], message: `runs of this campaign are on ${campaign.machine}` }],
      });
    });

    it('should carry the reason when the person may see the campaign but is not of its group', async () => {
      const e = await failure(addRun(withRun(tinyRun(campaign.machine)), io, env(COMMITTEE_MEMBER)));
      expect(e).toMatchObject({ exitCode: 1, message: `Runs of "${campaign.title}" are recorded by members of Quantum Transport or the consortium office.` });
    });

    it('should carry the reason when the campaign is not granted', async () => {
      const run = tinyRun(SUBMITTED_PROPOSAL.input.machine);
      const e = await failure(addRun(withRun(run, { campaign: SUBMITTED_PROPOSAL.id }), io, env('ines.albrecht@brennmoor.example')));
      expect(e).toMatchObject({ exitCode: 1, message: expect.stringMatching(/^".+" is .+, not granted; runs are charged to only a granted campaign\.$/) });
    });

    it('should exit 3 when the token is refused', async () => {
      const e = await failure(addRun(withRun(tinyRun(campaign.machine)), io, { ...env(), LOCALIS_TOKEN: 'lcs_wrongwrongwrongwrong' }));
      expect(e).toMatchObject({ exitCode: 3, message: expect.stringMatching(/^This API token is not known\./) });
    });
  });

  describe('listRuns', () => {
    const list = (extra: Partial<ListRunsOptions> = {}, email?: string) => listRuns({ campaign: campaign.id, json: false, profile: 'default', ...extra }, io, env(email));

    it('should show only the latest runs with --limit and say how many there are', async () => {
      await addRun(withRun(tinyRun(campaign.machine)), io, env());
      const all = await runsOf(campaign);
      await list({ limit: '2' });
      const lines = io.outs[1].split('\n');
      expect(lines).toHaveLength(1 + 2 + 2);
      const charged = all.slice(0, 2).reduce((sum, r) => sum + toMilli(r.coreHours) - toMilli(r.refundedCoreHours), 0);
      expect(lines.at(-1)).toBe(`the latest 2 of ${all.length.toLocaleString('en')} runs: ${formatCoreHours(charged)} core-hours charged`);
    });

    it('should show a refunded column and count refunds off the total when a run was refunded', async () => {
      const runs = await runsOf(campaign);
      const refunded = runs.filter((r) => r.refundedCoreHours > 0);
      // The demo scenario refunds one run of this campaign (a failed node).
      expect(refunded.length).toBeGreaterThan(0);
      await list();
      const lines = io.outs[0].split('\n');
      expect(lines[0]).toMatch(/core-hours\s+refunded\s+code$/);
      expect(lines).toHaveLength(1 + runs.length + 2);
      for (const r of refunded) {
        expect(lines.find((line) => line.trimStart().startsWith(`${r.externalJobId} `))).toMatch(new RegExp(`\\s${ch(r.refundedCoreHours).replace(/\./g, '\\.')}\\s+${r.codeName} ${r.codeVersion}$`));
      }
      const charged = runs.reduce((sum, r) => sum + toMilli(r.coreHours) - toMilli(r.refundedCoreHours), 0);
      expect(lines.at(-1)).toBe(`${runs.length.toLocaleString('en')} runs: ${formatCoreHours(charged)} core-hours charged after refunds`);
    });

    it('should say so when nothing is recorded yet', async () => {
      await list({ campaign: SUBMITTED_PROPOSAL.id }, 'ines.albrecht@brennmoor.example');
      expect(io.outs).toEqual(['No runs are recorded for this campaign yet.']);
    });

    it("should carry the portal's message for a campaign it does not know, or one the person may not see", async () => {
      expect(await failure(list({ campaign: '3c000000-0000-4000-8000-00000000dead' }))).toMatchObject({ exitCode: 1, message: 'The campaign was not found.' });
      expect(await failure(list({}, 'sofia.lindqvist@orrin-qd.example'))).toMatchObject({ exitCode: 1, message: 'The campaign was not found.' });
    });
  });
});

