import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { runTransferMatrix, SPOT_CHECK_LIMIT, type ProvenanceEntryList, type SpotCheck, type SpotCheckList } from '@localis/shared';
import { goodArchive } from '@localis/shared/node';
import { startTestApp, type TestApp } from '../../test/harness';
import { makeCampaignWorld, type CampaignWorld } from '../../test/campaign-world';
import { uploadArchive, type ApiCall, bearerCaller, settled } from '../../test/archive-upload';
import { ArchiveBusy, createArchiveVerifier } from '../archives/archive-verification';
import { ArchiveRow, SpotCheckRecord } from '../db/models';
import { createSpotCheckRunner } from './spot-check-runner';

let t: TestApp;
let w: CampaignWorld;
let campaignId: string;
let researcher: ApiCall;

/** The smallest size of the campaign's plan (3D, class AI, box disorder), where spot-checks recompute. */
const SMALLEST = 8;
const WS = [15, 16.5, 18];
/** Coarse on purpose: the spot-check matches the archive's precision, and 3 % keeps each point near a second. */
const PRECISION = 0.03;

const caller = (token: string): ApiCall => bearerCaller(t.url, token);

/** Upload a table as an archive, verify it, and run its spot-check here (the stack's worker may take either first). */
async function spotCheckOf(fileName: string, tableText: string, sizes: number[]): Promise<SpotCheckRecord> {
  const { archive } = await goodArchive({ campaignId, runIds: [], machine: w.machine, spec: { sizes, disorder: { values: WS }, energies: [0] }, tableText });
  const received = await uploadArchive(researcher, campaignId, fileName, archive);
  await createArchiveVerifier(t.db, t.services.objectStore).verify(received.id).catch((e) => {
    if (!(e instanceof ArchiveBusy)) throw e;
  });
  const verified = await settled(() => ArchiveRow.findByPk(received.id), ['received', 'checking']);
  expect(verified.state, JSON.stringify(verified.problems)).toBe('verified');
  const queued = await SpotCheckRecord.findOne({ where: { archiveId: received.id } });
  expect(queued, 'a verified result archive queues its spot-check').not.toBeNull();
  await createSpotCheckRunner(t.db).run(queued!.id);
  return settled(() => SpotCheckRecord.findByPk(queued!.id), ['queued', 'running']);
}

/** Lambda at the smallest size from our kernel, and made-up larger sizes the check never recomputes. */
function lambdaTable(scale = 1): string {
  const rows = WS.map((W, i) => {
    const r = runTransferMatrix({ dimension: 3, width: SMALLEST, disorder: W, precision: PRECISION, seed: 1000 + i });
    return `${SMALLEST},${W},0,${r.lambda * scale},${r.lambdaErr * scale}`;
  });
  const larger = [12, 16].flatMap((L) => WS.map((W) => `${L},${W},0,${(0.58 - (W - 16.5) * 0.02).toFixed(4)},0.003`));
  return ['L,W,E,lambda,lambda_err', ...rows, ...larger].join('\n') + '\n';
}

beforeAll(async () => {
  t = await startTestApp({ TOKEN_RATE_PER_MINUTE: '100000' });
  w = await makeCampaignWorld(t, { label: 'spot-checks' });
  campaignId = await w.granted(100_000);
  researcher = caller(w.tokens.researcher);
}, 120_000);
afterAll(async () => t.close());

describe('reproducibility spot-checks of verified archives', () => {
  let honest: SpotCheckRecord;
  let tampered: SpotCheckRecord;
  const honestTable = lambdaTable();

  beforeAll(async () => {
    honest = await spotCheckOf('honest.tar.gz', honestTable, [SMALLEST, 12, 16]);
    // The same runs with every Lambda at the smallest size raised by 20 %: well beyond the errors.
    const raised = honestTable.replace(/^8,([\d.]+),0,([\d.e-]+),/gm, (_m, W: string, v: string) => `8,${W},0,${Number(v) * 1.2},`);
    tampered = await spotCheckOf('tampered.tar.gz', raised, [SMALLEST, 12, 16]);
  }, 240_000);

  it('should recompute the ends and the middle of the smallest size and find an honest archive within 3 standard errors', async () => {
    const { items } = (await (await researcher('GET', `/campaigns/${campaignId}/spot-checks`)).json()) as SpotCheckList;
    const check = items.find((s) => s.id === honest.id)!;
    expect(check.state, check.reason ?? '').toBe('done');
    expect(check.archiveFileName).toBe('honest.tar.gz');
    expect(check.rows.map((r) => [r.L, r.W, r.E])).toEqual(WS.map((W) => [SMALLEST, W, 0]));
    expect(check.flagged).toBe(0);
    for (const row of check.rows) {
      expect(Math.abs(row.z)).toBeLessThanOrEqual(SPOT_CHECK_LIMIT);
      expect(row.z).toBeCloseTo((row.recomputed - row.reported) / Math.hypot(row.reportedErr, row.recomputedErr), 10);
      // The archive's own precision is asked of the kernel (3 %), recorded with the seed so anyone can repeat it.
      expect(row.precision).toBeGreaterThanOrEqual(row.reportedErr / row.reported);
      expect(row.precision).toBeLessThan((row.reportedErr / row.reported) * 1.1);
      expect(row.dimension).toBe(3);
      expect(row.slices).toBeGreaterThan(0);
    }
    const first = check.rows[0]!;
    const again = runTransferMatrix({ dimension: 3, width: first.L, disorder: first.W, energy: first.E, precision: first.precision, seed: first.seed });
    expect(again.lambda).toBe(first.recomputed);
    expect(check.progress).toBeNull();
  });

  it('should flag every point of an archive whose values were changed', async () => {
    const check = (await SpotCheckRecord.findByPk(tampered.id))!;
    expect(check.state).toBe('done');
    expect(check.flagged).toBe(3);
    for (const row of check.rows) {
      expect(row.flagged).toBe(true);
      expect(row.z).toBeLessThan(-SPOT_CHECK_LIMIT);
    }
  });

  it('should record a done spot-check in the provenance log, derived from its archive', async () => {
    const { items } = (await (await researcher('GET', `/campaigns/${campaignId}/provenance`)).json()) as ProvenanceEntryList;
    const entry = items.find((e) => e.kind === 'spot-check-computed' && e.subjectId === honest.id)!;
    expect(entry, 'a provenance entry for the spot-check').toBeDefined();
    expect(entry.record.wasDerivedFrom).toEqual([{ generated: `localis:spot-check/${honest.id}`, used: `localis:archive/${honest.archiveId}` }]);
  });

  it('should not run twice: a finished spot-check is skipped and keeps its rows', async () => {
    const before = (await SpotCheckRecord.findByPk(honest.id))!;
    expect(await createSpotCheckRunner(t.db).run(honest.id)).toBe('skipped');
    const after = (await SpotCheckRecord.findByPk(honest.id))!;
    expect(after.rows).toEqual(before.rows);
    expect(after.finishedAt?.getTime()).toBe(before.finishedAt?.getTime());
  });

  it('should say plainly why an archive of conductances cannot be spot-checked', async () => {
    const table = ['L,W,E,g,g_err', ...[8, 12, 16].flatMap((L) => WS.map((W) => `${L},${W},0,${(1.2 - W * 0.05).toFixed(3)},0.01`))].join('\n') + '\n';
    const check = await spotCheckOf('conductance.tar.gz', table, [8, 12, 16]);
    expect(check.state).toBe('not-applicable');
    expect(check.reason).toMatch(/no Lambda points.*computes Lambda only/);
    expect(check.rows).toEqual([]);
  });

  it('should answer 404 for a campaign that does not exist', async () => {
    const res = await researcher('GET', '/campaigns/00000000-0000-4000-8000-000000000000/spot-checks');
    expect(res.status).toBe(404);
    const body = (await res.json()) as { error: { message: string } };
    expect(body.error.message).toMatch(/campaign/i);
  });
});

describe('the spot-check list', () => {
  it('should give the contract shape', async () => {
    const { items } = (await (await researcher('GET', `/campaigns/${campaignId}/spot-checks`)).json()) as { items: SpotCheck[] };
    const { SpotCheckList } = await import('@localis/shared');
    expect(() => SpotCheckList.parse({ items })).not.toThrow();
  });
});
