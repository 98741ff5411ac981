import { writeFileSync } from 'node:fs';
import { join } from 'node:path';
import { afterEach, beforeEach, describe, expect, it } from 'vitest';
import { Run, type RunInput } from '@localis/shared';
import { failure } from '../../test/cli-error-of';
import { tempConfigDir } from '../../test/cli-harness';
import { FAKE_TOKEN, FakeRunsPortal } from '../../test/fake-runs-portal';
import type { Output } from './output';
import { runIdempotencyKey } from './run-input';
import { addRun, listRuns, type AddRunOptions } from './runs';

let config: ReturnType<typeof tempConfigDir>;
let portal: FakeRunsPortal;
let io: Output & { outs: string[]; notes: string[] };
beforeEach(async () => {
  config = tempConfigDir();
  portal = await new FakeRunsPortal().start();
  const outs: string[] = [];
  const notes: string[] = [];
  io = { outs, notes, out: (text) => void outs.push(text), note: (text) => void notes.push(text) };
});
afterEach(async () => {
  config.remove();
  await portal.stop();
});

const env = (token = FAKE_TOKEN) => ({ LOCALIS_URL: portal.url, LOCALIS_TOKEN: token, LOCALIS_CONFIG_DIR: config.dir });

/** The worked example: 128 cores for 12 hours, 1 536 core-hours. */
const FLAGS = {
  job: '4711',
  machine: 'cluster-a',
  start: '2027-02-01T08:00:00Z',
  end: '2027-02-01T20:00:00Z',
  cores: '128',
  code: 'tmm',
  codeVersion: '1.4.2',
};
const RUN: RunInput = {
  externalJobId: '4711',
  machine: 'cluster-a',
  startedAt: '2027-02-01T08:00:00.000Z',
  endedAt: '2027-02-01T20:00:00.000Z',
  cores: 128,
  codeName: 'tmm',
  codeVersion: '1.4.2',
  parameters: { sizes: [], disorder: [], energies: [], seeds: [] },
};
const options = (extra: Partial<AddRunOptions> = {}): AddRunOptions => ({ campaign: portal.campaignId, json: false, profile: 'default', ...FLAGS, ...extra });
const fileOptions = (path: string, extra: Partial<AddRunOptions> = {}): AddRunOptions => ({ campaign: portal.campaignId, json: false, profile: 'default', file: path, ...extra });

function file(name: string, content: unknown): string {
  const path = join(config.dir, name);
  writeFileSync(path, typeof content === 'string' ? content : JSON.stringify(content, null, 2));
  return path;
}

describe('addRun', () => {
  describe('sending', () => {
    it('should send the same key for the same run written in another zone and key order', async () => {
      const { codeVersion, ...rest } = RUN;
      const written = { codeVersion, ...rest, startedAt: '2027-02-01T09:00:00+01:00', endedAt: '2027-02-01T21:00:00+01:00' };
      await addRun(fileOptions(file('run.json', written)), io, env());
      expect(portal.requests[0]).toMatchObject({ method: 'POST', idempotencyKey: runIdempotencyKey(portal.campaignId, RUN), body: RUN });
    });

    it('should use the key given with --idempotency-key', async () => {
      await addRun(options({ idempotencyKey: 'batch-4711-attempt-1' }), io, env());
      expect(portal.requests[0].idempotencyKey).toBe('batch-4711-attempt-1');
    });

    it('should say a retry was answered from the earlier attempt, and charge once', async () => {
      await addRun(options(), io, env());
      expect(io.notes).toEqual([]);
      await addRun(options(), io, env());
      expect(io.notes).toEqual(['this run was recorded by an earlier attempt with the same Idempotency-Key; it is charged once, not again.']);
      expect(portal.runs).toHaveLength(1);
      expect(io.outs[1]).toContain('Remaining grant: 8,464 of 10,000 core-hours');
    });

    it("should carry the portal's refusal when a given key is reused for a different run", async () => {
      await addRun(options({ idempotencyKey: 'batch-17' }), io, env());
      const e = await failure(addRun(options({ idempotencyKey: 'batch-17', job: '4712' }), io, env()));
      expect(e).toMatchObject({ exitCode: 1, message: expect.stringMatching(/^This Idempotency-Key was used for a different request/) });
      expect(portal.runs).toHaveLength(1);
    });

    it('should refuse a key with spaces or over 200 characters before sending', async () => {
      expect((await failure(addRun(options({ idempotencyKey: 'my key' }), io, env()))).exitCode).toBe(2);
      expect((await failure(addRun(options({ idempotencyKey: 'k'.repeat(201) }), io, env()))).message).toMatch(/1 to 200 visible ASCII characters/);
      expect(portal.requests).toEqual([]);
    });

    it('should accept the campaign id in capitals and send it in lower case', async () => {
      await addRun(options({ campaign: portal.campaignId.toUpperCase() }), io, env());
      expect(portal.requests[0].path).toBe(`/api/v1/campaigns/${portal.campaignId}/runs`);
    });
  });

  describe('output', () => {
    it('should print the run, its wall-clock and the remaining grant', async () => {
      await addRun(options({ sizes: '12,16' }), io, env());
      expect(io.outs).toHaveLength(1);
      expect(io.outs[0]).toContain('Recorded run 4711 on cluster-a: 1,536 core-hours charged');
      expect(io.outs[0]).toMatch(/ended\s+2027-02-01 20:00:00 UTC \(12 h\)/);
      expect(io.outs[0]).toMatch(/sizes L\s+12, 16/);
      expect(io.outs[0]).not.toMatch(/disorder W/);
      expect(io.outs[0]).toContain('Remaining grant: 8,464 of 10,000 core-hours (used 1,536)');
      expect(io.notes).toEqual([]);
    });

    it("should print the portal's answer as JSON with --json and not read the ledger", async () => {
      await addRun(options({ json: true }), io, env());
      expect(Run.parse(JSON.parse(io.outs[0]))).toMatchObject({ externalJobId: '4711', coreHours: 1536, campaignId: portal.campaignId });
      expect(portal.requests.map((r) => r.method)).toEqual(['POST']);
    });

    it('should still print the run, with a note, when the ledger cannot be read afterwards', async () => {
      portal.script(`GET /api/v1/campaigns/${portal.campaignId}/ledger`, { status: 403, body: { error: { code: 'forbidden', message: 'Your roles do not allow this.' } } });
      await addRun(options(), io, env());
      expect(io.outs[0]).toContain('Recorded run 4711');
      expect(io.outs[0]).not.toContain('Remaining grant');
      expect(io.notes).toEqual(['the run is recorded, but the remaining grant could not be read: Your roles do not allow this.']);
    });

    it('should refuse an answer that is not a run, as from a wrong --url', async () => {
      portal.script(`POST /api/v1/campaigns/${portal.campaignId}/runs`, { status: 201, body: { ok: true } });
      const e = await failure(addRun(options(), io, env()));
      expect(e.message).toMatch(/is not what this CLI expects/);
      expect(e.exitCode).toBe(1);
    });
  });

  describe('local checks', () => {
    it('should name every missing option and send nothing', async () => {
      const e = await failure(addRun({ campaign: portal.campaignId, json: false, profile: 'default', job: '4711', cores: '4' }, io, env()));
      expect(e).toMatchObject({ exitCode: 2, message: 'a run needs --machine, --start, --end, --code, --code-version; nothing was sent.' });
      expect(portal.requests).toEqual([]);
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
      const e = await failure(addRun(fileOptions(file('run.json', { ...RUN, parameters: { size: [12] } })), io, env()));
      expect(e.exitCode).toBe(2);
      expect(e.message).toMatch(/run\.json is not a valid run; nothing was sent:$/);
      expect(e.details).toEqual([{ path: ['parameters'], message: 'Unrecognized key: "size"' }]);
    });

    it('should refuse a run file holding an array, and one that is not JSON', async () => {
      expect((await failure(addRun(fileOptions(file('runs.json', [RUN])), io, env()))).message).toMatch(/holds an array, not a run/);
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
      const e = await failure(addRun(fileOptions(file('run.json', RUN), { cores: '4', codeVersion: '2' }), io, env()));
      expect(e).toMatchObject({ exitCode: 2, message: 'give the run either with --file or with options, not both (--file came with --cores, --code-version).' });
    });

    it('should refuse a campaign id that is not one', async () => {
      const e = await failure(addRun(options({ campaign: 'ising-2027' }), io, env()));
      expect(e.exitCode).toBe(2);
      expect(e.message).toMatch(/^--campaign "ising-2027" is not a campaign id/);
      expect(portal.requests).toEqual([]);
    });

    it('should report a bad run before asking for a token, so it shows on a node with no sign-in', async () => {
      const e = await failure(addRun(options({ cores: '0' }), io, { LOCALIS_CONFIG_DIR: config.dir }));
      expect(e.exitCode).toBe(2);
    });
  });

  describe('refusals by the portal', () => {
    it('should carry the reason when the run needs more than the grant has left', async () => {
      const e = await failure(addRun(options({ cores: '1000' }), io, env()));
      expect(e).toMatchObject({ exitCode: 1, message: 'This run needs 12000 core-hours; the campaign has 10000 left.' });
    });

    it('should carry the details of a 422 with their paths', async () => {
      portal.script(`POST /api/v1/campaigns/${portal.campaignId}/runs`, {
        status: 422,
        body: { error: { code: 'invalid', message: 'Some fields of the body are not valid.', details: [{ path: ['machine'], message: 'the campaign runs on cluster-b' }] } },
      });
      const e = await failure(addRun(options(), io, env()));
      expect(e).toMatchObject({ exitCode: 1, message: 'Some fields of the body are not valid.', details: [{ path: ['machine'], message: 'the campaign runs on cluster-b' }] });
    });

    it('should exit 3 when the token is refused', async () => {
      const e = await failure(addRun(options(), io, env('lcs_wrongwrongwrongwrong')));
      expect(e).toMatchObject({ exitCode: 3, message: 'This API token is not known.' });
    });
  });
});

describe('listRuns', () => {
  const list = (extra: { limit?: string; json?: boolean; campaign?: string } = {}) =>
    listRuns({ campaign: portal.campaignId, json: false, profile: 'default', ...extra }, io, env());

  it('should ask for only the latest runs with --limit and say how many there are', async () => {
    portal.seed(5);
    await list({ limit: '2' });
    expect(portal.requests.map((r) => r.path)).toEqual([`/api/v1/campaigns/${portal.campaignId}/runs?sort=-startedAt&limit=2&offset=0`]);
    expect(io.outs[0].split('\n').at(-1)).toBe('the latest 2 of 5 runs: 2 core-hours charged');
  });

  it('should stop at exactly one page when the runs fill it', async () => {
    portal.seed(200);
    await list();
    expect(portal.requests).toHaveLength(1);
    expect(io.outs[0].split('\n').at(-1)).toBe('200 runs: 200 core-hours charged');
  });

  it('should show a refunded column and count refunds off the total when a run was refunded', async () => {
    portal.seed(2);
    portal.runs[0].refundedCoreHours = 0.25;
    await list();
    const lines = io.outs[0].split('\n');
    expect(lines[0]).toMatch(/core-hours\s+refunded\s+code$/);
    expect(lines[2]).toMatch(/\s1\s+0\.25\s+tmm 1\.4\.2$/);
    expect(lines.at(-1)).toBe('2 runs: 1.75 core-hours charged after refunds');
  });

  it('should say so when nothing is recorded yet', async () => {
    await list();
    expect(io.outs).toEqual(['No runs are recorded for this campaign yet.']);
  });

  it("should carry the portal's message for a campaign it does not know", async () => {
    const e = await failure(list({ campaign: '3c000000-0000-4000-8000-00000000dead' }));
    expect(e).toMatchObject({ exitCode: 1, message: 'The campaign was not found.' });
  });

  it('should refuse a --limit that is not a positive whole number before sending', async () => {
    for (const limit of ['0', '-3', '2.5', 'ten']) {
      const e = await failure(list({ limit }));
      expect(e).toMatchObject({ exitCode: 2, message: `--limit takes a whole number of runs, 1 or more (read "${limit}").` });
    }
    expect(portal.requests).toEqual([]);
  });

  it('should refuse a page that is not a page of runs', async () => {
    portal.script(`GET /api/v1/campaigns/${portal.campaignId}/runs`, { status: 200, body: { items: [{ id: 1 }], total: 1 } });
    const e = await failure(list());
    expect(e.message).toMatch(/is not what this CLI expects/);
  });
});
