import { createHash } from 'node:crypto';
import { analyzeTableAsync, ScalingFitError, type AnalysisRequest, type ScalingAnalysis, type ScalingPoint } from '@localis/shared';
import type { Database } from '../db';
import { appendProvenance } from '../provenance/provenance.service';
import { analysisRecord } from '../provenance/provenance-records';
import { analysesRepository, type StoredPoint } from './analyses.repository';

/** Progress is written at most this often: a bootstrap refit takes milliseconds. */
const PROGRESS_EVERY_MS = 1000;
/** The analysis code, named in the provenance log. */
export const ANALYSIS_CODE = { name: 'localis-scaling', version: '1' };

export type AnalysisOutcome = 'done' | 'failed' | 'skipped';

/** The energy most points share (ties: the lowest), when the request names none. */
function commonEnergy(points: StoredPoint[]): number | undefined {
  const counts = new Map<number, number>();
  for (const p of points) counts.set(p.E, (counts.get(p.E) ?? 0) + 1);
  return [...counts.entries()].sort((a, b) => b[1] - a[1] || a[0] - b[0])[0]?.[0];
}

/** The request's table: one observable at one energy, the sizes asked for, W as the variable. */
export function tableOf(points: StoredPoint[], request: AnalysisRequest): { observable: 'lambda' | 'g'; energy: number | undefined; points: ScalingPoint[] } {
  const observable = request.observable ?? (points.some((p) => p.kind === 'lambda') ? 'lambda' : 'g');
  const ofKind = points.filter((p) => p.kind === observable);
  const energy = request.energy ?? commonEnergy(ofKind);
  const sizes = request.sizes ? new Set(request.sizes) : null;
  return {
    observable,
    energy,
    points: ofKind.filter((p) => Math.abs(p.E - (energy ?? 0)) <= 1e-9 * Math.max(1, Math.abs(p.E)) && (!sizes || sizes.has(p.L))).map((p) => ({ L: p.L, x: p.W, value: p.value, error: p.err })),
  };
}

/**
 * Run one queued analysis: the points of the campaign's verified archives, the fit and its
 * bootstrap (progress written as it goes), then the result and its provenance entry in one
 * transaction. A table the fit cannot use ends `failed` with the reason in words, no result.
 * Idempotent: a finished analysis is skipped.
 */
export function createAnalysisRunner(db: Database) {
  async function take(id: string) {
    return db.transaction(async (tx) => {
      const a = await analysesRepository.findLocked(id, tx);
      if (!a || a.state === 'done' || a.state === 'failed') return null;
      await a.update({ state: 'running', startedAt: new Date(), progress: { done: 0, total: 0 } }, { transaction: tx });
      return a;
    });
  }

  async function finish(id: string, outcome: { result: ScalingAnalysis; archives: { id: string; fileName: string }[]; points: number } | { error: string; archives: { id: string; fileName: string }[]; points: number }): Promise<AnalysisOutcome> {
    return db.transaction(async (tx) => {
      const a = await analysesRepository.findLocked(id, tx);
      if (!a || a.state !== 'running') return 'skipped';
      const finishedAt = new Date();
      if ('error' in outcome) {
        await a.update({ state: 'failed', error: outcome.error, archiveIds: outcome.archives.map((x) => x.id), points: outcome.points, progress: null, finishedAt }, { transaction: tx });
        return 'failed';
      }
      await a.update({ state: 'done', result: outcome.result as unknown as Record<string, unknown>, archiveIds: outcome.archives.map((x) => x.id), points: outcome.points, progress: null, finishedAt }, { transaction: tx });
      const full = (await analysesRepository.find(id, tx))!;
      const requestedBy = (full as unknown as { requestedBy?: { name: string } | null }).requestedBy;
      const record = analysisRecord({
        id,
        campaignId: a.campaignId,
        archives: outcome.archives,
        result: outcome.result,
        code: ANALYSIS_CODE,
        requestedBy: a.requestedByPersonId && requestedBy ? { personId: a.requestedByPersonId, name: requestedBy.name } : null,
        startedAt: a.startedAt!.toISOString(),
        at: finishedAt.toISOString(),
      });
      await appendProvenance([{ record, subjectId: id }], tx);
      return 'done';
    });
  }

  return {
    async run(analysisId: string): Promise<AnalysisOutcome> {
      const a = await take(analysisId);
      if (!a) return 'skipped';
      const { archives, points } = await analysesRepository.pointsOfCampaign(a.campaignId);
      const request = a.request as AnalysisRequest;
      const table = tableOf(points, request);
      // What "auto" came to is kept with the analysis, so the page can say which energy was fitted.
      await analysesRepository.resolveRequest(analysisId, { ...request, observable: table.observable, ...(table.energy === undefined ? {} : { energy: table.energy }) });
      if (!table.points.length) {
        return finish(analysisId, { error: `No ${table.observable === 'lambda' ? 'Lambda' : 'g'} points${table.energy === undefined ? '' : ` at E = ${table.energy}`} in the campaign's verified archives${request.sizes ? ` for L = ${request.sizes.join(', ')}` : ''}.`, archives, points: 0 });
      }
      let last = 0;
      try {
        const result = await analyzeTableAsync(table.points, {
          variable: 'W',
          observable: table.observable,
          ...(request.orders ? { orders: request.orders, scan: false } : {}),
          bootstrap: request.bootstrap,
          // Seeded by the analysis id: the same analysis run again gives the same intervals.
          seed: createHash('sha256').update(analysisId).digest().readUInt32BE(0),
          onProgress: (done, total) => {
            const now = Date.now();
            if (now - last < PROGRESS_EVERY_MS && done < total) return;
            last = now;
            void analysesRepository.setProgress(analysisId, { done, total }).catch(() => undefined);
          },
        });
        return finish(analysisId, { result, archives, points: table.points.length });
      } catch (e) {
        if (e instanceof ScalingFitError) {
          const details = e.details?.map((d) => d.message).join('; ');
          return finish(analysisId, { error: details ? `${e.message} (${details})` : e.message, archives, points: table.points.length });
        }
        await analysesRepository.requeue(analysisId).catch(() => undefined);
        throw e;
      }
    },
  };
}
export type AnalysisRunner = ReturnType<typeof createAnalysisRunner>;
