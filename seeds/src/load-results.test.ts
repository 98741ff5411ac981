import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { loadSettings, type ScalingAnalysis } from '@localis/shared';
import { AnalysisRow, ArchiveRow, openDatabase, ProvenanceEntryRow, Run, SpotCheckRecord, type Database } from '@localis/api/db';
import { DEMO_ARCHIVES, PILOT_3D_CAMPAIGN, STRIPS_2D_CAMPAIGN } from './results-scenario';

/**
 * The demo's result archives end to end: `npm test` loaded the scenario before the suites, so
 * the test stack's worker has been checking the archives, analysing the campaigns and
 * spot-checking the archives since it started. This waits for it and checks what came out.
 */
const settings = loadSettings(process.env);
let db: Database;
beforeAll(() => {
  db = openDatabase(settings, { poolMax: 2 });
});
afterAll(async () => db.close());

async function eventually<T>(what: string, find: () => Promise<T | null | undefined>, seconds = 300): Promise<T> {
  for (let i = 0; i < seconds * 2; i++) {
    const found = await find();
    if (found) return found;
    await new Promise((r) => setTimeout(r, 500));
  }
  throw new Error(`waited ${seconds} s for ${what}`);
}

const archivesOf = (campaignId: string) => ArchiveRow.findAll({ where: { campaignId, kind: 'results' }, order: [['fileName', 'ASC']] });
/** The campaign's newest finished analysis that read all its demo archives. */
async function finishedAnalysis(campaignId: string): Promise<AnalysisRow | null> {
  const ids = (await archivesOf(campaignId)).map((a) => a.id).sort();
  const rows = await AnalysisRow.findAll({ where: { campaignId, state: ['done', 'failed'] }, order: [['createdAt', 'DESC']] });
  return rows.find((r) => [...r.archiveIds].sort().join() === ids.join()) ?? null;
}

describe('the demo result archives', () => {
  let archives: ArchiveRow[];

  beforeAll(async () => {
    archives = await eventually('the demo archives to be checked', async () => {
      const rows = await ArchiveRow.findAll({ where: { fileName: DEMO_ARCHIVES.map((p) => p.fileName), kind: 'results' } });
      return rows.length === DEMO_ARCHIVES.length && rows.every((r) => r.state === 'verified' || r.state === 'rejected') ? rows : null;
    });
  }, 320_000);

  it('should be verified, each naming the runs that made it and its kernel inputs', async () => {
    for (const plan of DEMO_ARCHIVES) {
      const a = archives.find((x) => x.fileName === plan.fileName)!;
      expect(a.state, JSON.stringify(a.problems)).toBe('verified');
      const runs = await Run.findAll({ where: { id: a.manifest!.runIds } });
      expect(runs.map((r) => r.externalJobId).sort()).toEqual([...plan.runJobIds].sort());
      expect(a.manifest!.files.map((f) => f.path).sort()).toEqual(['kernel-runs.json', 'lambda.csv']);
      expect(a.manifest!.parameters.sizes).toEqual(plan.sizes.map((s) => s.L));
      expect((a.points ?? []).length).toBe(plan.sizes.length * plan.disorder.length);
      const entry = await ProvenanceEntryRow.findOne({ where: { kind: 'archive-verified', subjectId: a.id } });
      expect(entry, `${plan.fileName} is in the provenance log`).not.toBeNull();
    }
  });

  it('should analyse the 3D pilot from both archives together, with the critical disorder near the published one', async () => {
    const analysis = await eventually('the 3D pilot analysis', () => finishedAnalysis(PILOT_3D_CAMPAIGN));
    expect(analysis.state, analysis.error ?? '').toBe('done');
    const r = analysis.result as unknown as ScalingAnalysis;
    expect(r.model.sizes).toEqual([4, 6, 8]);
    // W_c = 16.54 (Slevin & Ohtsuki, PRL 82, 382 (1999); REFERENCES.md). Bars of L <= 8 carry large
    // corrections to scaling, so a screening fit is asked only to land within 1 of it.
    expect(Math.abs(r.Wc.value - 16.54)).toBeLessThan(1);
    expect(r.Wc.lo).toBeLessThanOrEqual(r.Wc.value);
    expect(r.Wc.hi).toBeGreaterThanOrEqual(r.Wc.value);
    expect(r.nu.value).toBeGreaterThan(0);
    expect(r.dof).toBeGreaterThan(0);
  });

  it('should show the 2D strips localizing: Lambda falls with L at every W, and beta is negative throughout', async () => {
    const [strips] = await archivesOf(STRIPS_2D_CAMPAIGN);
    const points = strips!.points as { L: number; W: number; value: number }[];
    const ws = [...new Set(points.map((p) => p.W))];
    // d = 2, class AI: every state localized (Abrahams et al. 1979; REFERENCES.md, common knowledge).
    for (const W of ws) {
      const byL = points.filter((p) => p.W === W).sort((a, b) => a.L - b.L).map((p) => p.value);
      for (let i = 1; i < byL.length; i++) expect(byL[i], `W = ${W}`).toBeLessThan(byL[i - 1]!);
    }
    const analysis = await eventually('the 2D strips analysis', () => finishedAnalysis(STRIPS_2D_CAMPAIGN));
    if (analysis.state === 'done') {
      const r = analysis.result as unknown as ScalingAnalysis;
      expect(r.beta.length).toBeGreaterThan(0);
      for (const b of r.beta) expect(b.beta, `W = ${b.x}`).toBeLessThan(0);
    } else {
      // No critical point to fit: the analysis says why in words, and keeps no result.
      expect(analysis.error).toBeTruthy();
      expect(analysis.result).toBeNull();
    }
  });

  it('should spot-check every demo archive and find its points reproduced within 3 standard errors', async () => {
    for (const a of archives) {
      const check = await eventually(`the spot-check of ${a.fileName}`, async () => {
        const s = await SpotCheckRecord.findOne({ where: { archiveId: a.id } });
        return s && ['done', 'not-applicable', 'failed'].includes(s.state) ? s : null;
      });
      expect(check.state, check.reason ?? '').toBe('done');
      expect(check.rows).toHaveLength(3);
      expect(check.flagged, JSON.stringify(check.rows.map((r) => r.z))).toBe(0);
    }
  });
});
