import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { syntheticScalingTable, type Analysis, type AnalysisList, type ProvenanceEntryList } from '@localis/shared';
import { goodArchive } from '@localis/shared/node';
import { startTestApp, type TestApp } from '../../test/harness';
import { makeCampaignWorld, type CampaignWorld } from '../../test/campaign-world';
import { uploadArchive, type ApiCall, bearerCaller, settled } from '../../test/archive-upload';
import { ArchiveBusy, createArchiveVerifier } from '../archives/archive-verification';
import { AnalysisRow, ArchiveRow } from '../db/models';
import { createAnalysisRunner } from './analysis-runner';

let t: TestApp;
let w: CampaignWorld;
let campaignId: string;
let researcher: ApiCall;

const SIZES = [8, 12, 16, 20];
const WS = [15.5, 15.75, 16, 16.25, 16.5, 16.75, 17, 17.25, 17.5];

const caller = (token: string): ApiCall => bearerCaller(t.url, token);

/** Run an analysis here (the stack's worker may take it first; then this waits for it). */
async function runAnalysis(id: string): Promise<AnalysisRow> {
  await createAnalysisRunner(t.db).run(id);
  return settled(() => AnalysisRow.findByPk(id), ['queued', 'running']);
}

beforeAll(async () => {
  t = await startTestApp({ TOKEN_RATE_PER_MINUTE: '100000' });
  w = await makeCampaignWorld(t, { label: 'analyses' });
  campaignId = await w.granted(100_000);
  researcher = caller(w.tokens.researcher);
}, 120_000);
afterAll(async () => t.close());

describe('scaling analyses of verified archives', () => {
  let automatic: AnalysisRow;

  beforeAll(async () => {
    // Lambda from a known scaling law (W_c = 16.5, nu = 1.57, Lambda_c = 0.576) with 0.3 % noise.
    const points = syntheticScalingTable({ criticalX: 16.5, nu: 1.57, criticalValue: 0.576, sizes: SIZES, xs: WS, relativeError: 0.003, seed: 7 });
    const tableText = ['L,W,E,lambda,lambda_err', ...points.map((p) => `${p.L},${p.x},0,${p.value},${p.error}`)].join('\n') + '\n';
    const { archive } = await goodArchive({ campaignId, runIds: [], machine: w.machine, spec: { sizes: SIZES, disorder: { values: WS }, energies: [0] }, tableText });
    const received = await uploadArchive(researcher, campaignId, 'lambda-sweep.tar.gz', archive);
    await createArchiveVerifier(t.db, t.services.objectStore).verify(received.id).catch((e) => {
      if (!(e instanceof ArchiveBusy)) throw e;
    });
    const verified = await settled(() => ArchiveRow.findByPk(received.id), ['received', 'checking']);
    expect(verified.state, JSON.stringify(verified.problems)).toBe('verified');
    const queued = await AnalysisRow.findOne({ where: { campaignId }, order: [['createdAt', 'DESC']] });
    expect(queued, 'a verified archive queues an analysis').not.toBeNull();
    automatic = await runAnalysis(queued!.id);
  }, 120_000);

  it('should recover the critical point and exponent of the law the data came from', async () => {
    const { items } = (await (await researcher('GET', `/campaigns/${campaignId}/analyses`)).json()) as AnalysisList;
    const done = items.find((a) => a.id === automatic.id)!;
    expect(done.state, done.error ?? '').toBe('done');
    expect(done.points).toBe(SIZES.length * WS.length);
    const r = done.result!;
    expect(r.Wc.lo).toBeLessThan(16.5);
    expect(r.Wc.hi).toBeGreaterThan(16.5);
    expect(Math.abs(r.nu.value - 1.57)).toBeLessThan(0.15);
    expect(r.model.sizes).toEqual(SIZES);
    expect(r.intervals.method).toBe('bootstrap');
    // The measured points come back as given, and the energy "auto" chose is kept with the request.
    expect(r.measured).toHaveLength(SIZES.length * WS.length);
    expect(done.request).toMatchObject({ observable: 'lambda', energy: 0 });
  });

  it('should record the analysis in the provenance log, derived from the archive', async () => {
    const { items } = (await (await researcher('GET', `/campaigns/${campaignId}/provenance`)).json()) as ProvenanceEntryList;
    const entry = items.find((e) => e.kind === 'analysis-computed' && e.subjectId === automatic.id)!;
    expect(entry.record.wasDerivedFrom.map((d) => d.used)).toEqual(automatic.archiveIds.map((id) => `localis:archive/${id}`));
  });

  it('should run again on request with fixed orders, and fail with the reason when the sizes leave too little', async () => {
    const res = await researcher('POST', `/campaigns/${campaignId}/analyses`, { orders: { nr: 2 }, bootstrap: 0 });
    expect(res.status).toBe(202);
    const asked = (await res.json()) as Analysis;
    expect(asked.state).toBe('queued');
    const again = await runAnalysis(asked.id);
    expect(again.state, again.error ?? '').toBe('done');
    expect((again.result as unknown as Analysis['result'])!.model.chosenBy).toBe('user');

    const few = (await (await researcher('POST', `/campaigns/${campaignId}/analyses`, { sizes: [8, 12, 96], bootstrap: 0 })).json()) as Analysis;
    const failed = await runAnalysis(few.id);
    expect(failed.state).toBe('failed');
    expect(failed.error).toMatch(/size/i);
    expect(failed.result).toBeNull();
  });

  it('should refuse requests it cannot run, with what to change', async () => {
    const two = await researcher('POST', `/campaigns/${campaignId}/analyses`, { sizes: [8, 12] });
    expect(two.status).toBe(422);
    expect(JSON.stringify(await two.json())).toMatch(/at least three sizes/);
    expect((await researcher('POST', `/campaigns/${campaignId}/analyses`, { bootstrap: 100_000 })).status).toBe(422);
    expect((await caller(w.tokens.outsider)('POST', `/campaigns/${campaignId}/analyses`, {})).status).toBe(404);
    expect((await caller(w.tokens.reviewer)('POST', `/campaigns/${campaignId}/analyses`, {})).status).toBe(403);
  });
});
