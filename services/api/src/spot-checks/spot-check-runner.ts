import { createHash } from 'node:crypto';
import { compareSpotCheck, planSpotCheck, type SpotCheckRow, type SpotCheckTarget, type TransferMatrixResult } from '@localis/shared';
import { KernelThreadFailure, startTransferMatrixThread } from '@localis/shared/node';
import type { Database } from '../db';
import { appendProvenance } from '../provenance/provenance.service';
import { spotCheckRecord } from '../provenance/provenance-records';
import { spotChecksRepository } from './spot-checks.repository';

/** The kernel, as the provenance log names it. */
export const SPOT_CHECK_CODE = { name: 'localis-transfer-matrix', version: '1' };

export type SpotCheckOutcome = 'done' | 'not-applicable' | 'failed' | 'skipped';

/**
 * A seed per point from the point itself: whoever checks the same point again (a retried job,
 * another installation, `localis tmm`) gets the same numbers. 31 bits, as the CLI takes them.
 */
export function spotCheckSeed(target: Pick<SpotCheckTarget, 'dimension' | 'L' | 'W' | 'E' | 'reported'>): number {
  return createHash('sha256').update(`spot-check:${target.dimension}:${target.L}:${target.W}:${target.E}:${target.reported}`).digest().readUInt32BE(0) >>> 1;
}

const sentence = (text: string) => `${text.charAt(0).toUpperCase()}${text.slice(1)}.`;

/**
 * Run one queued spot-check: plan the points (or say why the kernel cannot check this archive),
 * recompute each on the kernel's thread with progress stored as it goes, then keep the rows and a
 * provenance entry in one transaction. Idempotent: a finished spot-check is skipped, a retried one
 * recomputes the same seeded points.
 */
export function createSpotCheckRunner(db: Database) {
  async function take(id: string) {
    return db.transaction(async (tx) => {
      const s = await spotChecksRepository.findLocked(id, tx);
      if (!s || (s.state !== 'queued' && s.state !== 'running')) return null;
      await s.update({ state: 'running', startedAt: new Date(), progress: { done: 0, total: 0 } }, { transaction: tx });
      return s;
    });
  }

  async function finish(id: string, outcome: { state: 'not-applicable' | 'failed'; reason: string } | { state: 'done'; rows: SpotCheckRow[]; flagged: number; fileName: string }): Promise<SpotCheckOutcome> {
    return db.transaction(async (tx) => {
      const s = await spotChecksRepository.findLocked(id, tx);
      if (!s || s.state !== 'running') return 'skipped';
      const finishedAt = new Date();
      if (outcome.state !== 'done') {
        await s.update({ state: outcome.state, reason: outcome.reason, progress: null, finishedAt }, { transaction: tx });
        return outcome.state;
      }
      await s.update({ state: 'done', rows: outcome.rows, flagged: outcome.flagged, progress: null, finishedAt }, { transaction: tx });
      const record = spotCheckRecord({
        id,
        campaignId: s.campaignId,
        archive: { id: s.archiveId, fileName: outcome.fileName },
        points: outcome.rows.length,
        flagged: outcome.flagged,
        code: SPOT_CHECK_CODE,
        startedAt: s.startedAt!.toISOString(),
        at: finishedAt.toISOString(),
      });
      await appendProvenance([{ record, subjectId: id }], tx);
      return 'done';
    });
  }

  function recompute(target: SpotCheckTarget, seed: number): Promise<TransferMatrixResult> {
    return startTransferMatrixThread({ dimension: target.dimension, width: target.L, disorder: target.W, energy: target.E, precision: target.precision, seed }).result;
  }

  return {
    async run(spotCheckId: string): Promise<SpotCheckOutcome> {
      const s = await take(spotCheckId);
      if (!s) return 'skipped';
      try {
        const subject = await spotChecksRepository.subjectOf(s);
        const lambda = subject.points.filter((p) => p.kind === 'lambda').map((p) => ({ L: p.L, W: p.W, E: p.E, value: p.value, err: p.err }));
        const plan = planSpotCheck(subject.campaign, lambda);
        if ('notApplicable' in plan) return await finish(spotCheckId, { state: 'not-applicable', reason: sentence(plan.notApplicable) });

        const total = plan.targets.length;
        await spotChecksRepository.setProgress(spotCheckId, { done: 0, total });
        const computed: { target: SpotCheckTarget; seed: number; result: TransferMatrixResult }[] = [];
        for (const [index, target] of plan.targets.entries()) {
          const seed = spotCheckSeed(target);
          computed.push({ target, seed, result: await recompute(target, seed) });
          await spotChecksRepository.setProgress(spotCheckId, { done: index + 1, total });
        }
        const { rows, flagged } = compareSpotCheck(computed.map(({ target, result }) => ({ L: target.L, x: target.W, reported: target.reported, reportedErr: target.reportedErr, recomputed: result.lambda, recomputedErr: result.lambdaErr })));
        return await finish(spotCheckId, {
          state: 'done',
          fileName: subject.fileName,
          flagged,
          rows: rows.map((row, i) => {
            const { target, seed, result } = computed[i]!;
            return {
              L: target.L, W: target.W, E: target.E,
              reported: row.reported, reportedErr: row.reportedErr, recomputed: row.recomputed, recomputedErr: row.recomputedErr,
              // JSON has no infinity: a zero combined error with different values is flagged with the largest z there is.
              z: Number.isFinite(row.z) ? row.z : Number.MAX_VALUE * Math.sign(row.recomputed - row.reported),
              flagged: row.flagged,
              dimension: target.dimension, precision: target.precision, seed, slices: result.slices, seconds: result.seconds,
            };
          }),
        });
      } catch (e) {
        if (e instanceof KernelThreadFailure) return finish(spotCheckId, { state: 'failed', reason: `The kernel failed: ${e.message}.` });
        await spotChecksRepository.requeue(spotCheckId).catch(() => undefined);
        throw e;
      }
    },
  };
}
export type SpotCheckRunner = ReturnType<typeof createSpotCheckRunner>;
