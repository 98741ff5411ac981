import { readFileSync } from 'node:fs';
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import type { Ledger, RunImportResult } from '@localis/shared';
import { startTestApp, type TestApp } from '../../test/harness';
import { makeCampaignWorld, type CampaignWorld } from '../../test/campaign-world';
import { Run } from '../db/models';

let t: TestApp;
let w: CampaignWorld;
let campaignId: string;

const call = (token: string, method: string, path: string, body?: unknown) =>
  fetch(`${t.url}/api/v1${path}`, {
    method,
    headers: { authorization: `Bearer ${token}`, ...(body !== undefined ? { 'content-type': 'application/json' } : {}) },
    body: body === undefined ? undefined : JSON.stringify(body),
  });
const importRuns = (csv: string, extra: Record<string, unknown> = {}, dryRun = false) =>
  call(w.tokens.researcher, 'POST', `/campaigns/${campaignId}/runs/import${dryRun ? '?dryRun=true' : ''}`, { csv, defaults: { codeName: 'tmm-bar', codeVersion: '3f2c1e9' }, ...extra });

let job = 0;
const jobId = () => `${Date.now()}${++job}`;
const HEADER = 'JobID,JobName,Partition,Start,End,AllocCPUS,State';
const line = (id: string, start = '2027-02-01T08:00:00', end = '2027-02-01T20:00:00', cores = '128') => `${id},tmm-bar,compute,${start},${end},${cores},COMPLETED`;
const IGNORE = { mapping: { Partition: 'ignore', State: 'ignore' } };

beforeAll(async () => {
  // Scripts hammer the api here on purpose; the per-token rate limit is not what these tests are about.
  t = await startTestApp({ TOKEN_RATE_PER_MINUTE: '100000' });
  w = await makeCampaignWorld(t, { label: 'import' });
  campaignId = await w.granted(100_000);
});
afterAll(async () => t.close());

describe('scheduler CSV import', () => {
  it('should preview with guessed columns, report unknown ones, and write nothing', async () => {
    const csv = [HEADER, line(jobId()), line(jobId())].join('\n');
    const res = await importRuns(csv, {}, true);
    expect(res.status).toBe(200);
    const preview = (await res.json()) as RunImportResult;
    expect(preview.mapping).toMatchObject({ JobID: 'externalJobId', JobName: 'codeName', Start: 'startedAt', End: 'endedAt', AllocCPUS: 'cores' });
    expect(preview.unknownColumns).toEqual(['Partition', 'State']);
    expect(preview.summary).toMatchObject({ rows: 2, valid: 2, coreHours: 3072 });
    expect(preview.ledger).toMatchObject({ remaining: 100_000, after: 96_928, allowed: true });
    expect(await Run.count({ where: { campaignId } })).toBe(0);
  });

  it('should refuse to commit while columns are unknown, with 422 naming them', async () => {
    const res = await importRuns([HEADER, line(jobId())].join('\n'));
    expect(res.status).toBe(422);
    const body = (await res.json()) as { error: { message: string; details: { path: unknown[]; message: string }[] } };
    expect(body.error.message).toMatch(/Nothing was written/);
    expect(body.error.details.map((d) => d.message).join(' ')).toMatch(/column "Partition" is not known/);
  });

  it('should commit every row in one transaction once mapped, and debit the ledger', async () => {
    const ids = [jobId(), jobId(), jobId()];
    const res = await importRuns([HEADER, ...ids.map((id) => line(id))].join('\r\n'), IGNORE);
    expect(res.status, await res.clone().text()).toBe(201);
    const result = (await res.json()) as RunImportResult;
    expect(result).toMatchObject({ committed: true, summary: { rows: 3, valid: 3 } });
    expect(result.runIds).toHaveLength(3);
    const ledger = (await (await call(w.tokens.pi, 'GET', `/campaigns/${campaignId}/ledger`)).json()) as Ledger;
    expect(ledger.used).toBe(3 * 1536);
    expect((await Run.findAll({ where: { externalJobId: ids } })).every((r) => r.source === 'import')).toBe(true);
  });

  it('should commit nothing when one row is broken, and say which line and why', async () => {
    const before = await Run.count({ where: { campaignId } });
    const csv = [HEADER, line(jobId()), line(jobId(), '2027-02-30T08:00:00'), line(jobId(), undefined, '2027-02-01T07:00:00'), line(jobId(), undefined, undefined, '-4')].join('\n');
    const preview = (await (await importRuns(csv, IGNORE, true)).json()) as RunImportResult;
    expect(preview.summary).toMatchObject({ rows: 4, valid: 1, withErrors: 3 });
    expect(preview.rows[1].errors.join(' ')).toMatch(/2027-02-30/);
    expect(preview.rows[2].errors.join(' ')).toMatch(/end after it starts/);
    expect(preview.rows[3].errors.join(' ')).toMatch(/at least 1 core/);
    const res = await importRuns(csv, IGNORE);
    expect(res.status).toBe(422);
    const details = ((await res.json()) as { error: { details: { path: unknown[] }[] } }).error.details;
    expect(details.map((d) => d.path)).toEqual([['csv', 3], ['csv', 4], ['csv', 5]]);
    expect(await Run.count({ where: { campaignId } })).toBe(before);
  });

  it('should flag duplicates in the file and jobs already recorded', async () => {
    const recorded = jobId();
    expect((await importRuns([HEADER, line(recorded)].join('\n'), IGNORE)).status).toBe(201);
    const twice = jobId();
    const preview = (await (await importRuns([HEADER, line(twice), line(twice), line(recorded)].join('\n'), IGNORE, true)).json()) as RunImportResult;
    expect(preview.rows.map((r) => r.duplicate)).toEqual([null, 'in-file', 'recorded']);
    expect(preview.summary.duplicates).toBe(2);
    expect((await importRuns([HEADER, line(twice), line(twice)].join('\n'), IGNORE)).status).toBe(422);
  });

  it('should read elapsed time and a zone offset, and refuse what would overdraw the grant', async () => {
    const small = await w.granted(100);
    const csv = ['JobID,Start,Elapsed,NCPUS', `${jobId()},2027-02-01T08:00:00+01:00,01:00:00,64`, `${jobId()},2027-02-01T09:00:00Z,1-00:00:00,1`].join('\n');
    const res = await call(w.tokens.pi, 'POST', `/campaigns/${small}/runs/import?dryRun=true`, { csv, defaults: { codeName: 'tmm-bar', codeVersion: 'v1' } });
    const preview = (await res.json()) as RunImportResult;
    expect(preview.rows.map((r) => [r.startedAt, r.coreHours])).toEqual([['2027-02-01T07:00:00.000Z', 64], ['2027-02-01T09:00:00.000Z', 24]]);
    expect(preview.ledger).toMatchObject({ remaining: 100, after: 12, allowed: true });
    const tooBig = ['JobID,Start,Elapsed,NCPUS', `${jobId()},2027-02-01T08:00:00Z,02:00:00,64`].join('\n');
    const refused = await call(w.tokens.pi, 'POST', `/campaigns/${small}/runs/import`, { csv: tooBig, defaults: { codeName: 'tmm-bar', codeVersion: 'v1' } });
    expect(refused.status).toBe(409);
    expect(((await refused.json()) as { error: { message: string } }).error.message).toMatch(/Nothing was written/);
  });

  it('should import the demo scheduler export shipped with the scenario', async () => {
    const csv = readFileSync(new URL('../../../../seeds/data/scheduler-export.csv', import.meta.url), 'utf8');
    const preview = (await (await importRuns(csv, IGNORE, true)).json()) as RunImportResult;
    expect(preview.summary.rows).toBeGreaterThan(0);
    expect(preview.missingFields).toEqual([]);
  });
});
