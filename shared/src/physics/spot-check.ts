import { CONSERVATIVE_OPERATIONS_PER_SECOND, expectedTransferMatrixRun } from './transfer-matrix';

/**
 * Reproducibility spot-check: a point of an archive recomputed with our own kernel, compared in
 * units of the combined standard error, z = (recomputed - reported) / sqrt(err_r^2 + err_k^2).
 * Beyond SPOT_CHECK_LIMIT standard errors a point is flagged (common practice: 3 sigma).
 */
export const SPOT_CHECK_LIMIT = 3;

export interface SpotCheckPoint {
  L: number;
  x: number;
  reported: number;
  reportedErr: number;
  recomputed: number;
  recomputedErr: number;
}

export interface SpotCheckComparison extends SpotCheckPoint {
  /** Difference in combined standard errors. */
  z: number;
  flagged: boolean;
}

export function compareSpotCheck(points: readonly SpotCheckPoint[]): { rows: SpotCheckComparison[]; flagged: number } {
  const rows = points.map((p) => {
    const combined = Math.hypot(p.reportedErr, p.recomputedErr);
    const z = combined > 0 ? (p.recomputed - p.reported) / combined : p.recomputed === p.reported ? 0 : Number.POSITIVE_INFINITY;
    return { ...p, z, flagged: !(Math.abs(z) <= SPOT_CHECK_LIMIT) };
  });
  return { rows, flagged: rows.filter((r) => r.flagged).length };
}

/** Points recomputed per archive: the ends and the middle of its smallest size's W range. */
export const SPOT_CHECK_POINTS = 3;
/** Kernel time per point at its conservative speed: a whole check stays within a minute or two of one core. */
export const SPOT_CHECK_SECONDS_PER_POINT = 20;
/** A recomputation coarser than this says too little to be worth the core time. */
export const COARSEST_SPOT_CHECK_PRECISION = 0.05;

export interface SpotCheckCandidate {
  L: number;
  W: number;
  E: number;
  value: number;
  err: number;
}

export interface SpotCheckTarget {
  dimension: 1 | 2 | 3;
  L: number;
  W: number;
  E: number;
  reported: number;
  reportedErr: number;
  /** Relative precision asked of the kernel: the archive's own, or the finest the time budget allows. */
  precision: number;
}

export type SpotCheckPlan = { targets: SpotCheckTarget[] } | { notApplicable: string };

/**
 * Which points of an archive's Lambda table to recompute, and how finely. The kernel computes the
 * Anderson model with box disorder, real hopping (class AI), periodic transverse boundaries; other
 * campaigns get a reason instead. The smallest size is the cheapest to recompute and, being
 * the most numerous in realizations, the likeliest to expose a wrong code path.
 */
export function planSpotCheck(campaign: { model: string; dimension: number; symmetryClass: string }, lambdaPoints: readonly SpotCheckCandidate[]): SpotCheckPlan {
  if (campaign.model !== 'anderson-box') return { notApplicable: `the kernel computes the Anderson model with box disorder; this campaign's model is ${campaign.model}` };
  if (campaign.symmetryClass !== 'AI') return { notApplicable: `the kernel has real hopping (class AI); this campaign is in class ${campaign.symmetryClass}` };
  const dimension = campaign.dimension;
  if (dimension !== 1 && dimension !== 2 && dimension !== 3) return { notApplicable: `the kernel works in 1, 2 or 3 dimensions, not ${dimension}` };
  const usable = lambdaPoints.filter((p) => Number.isFinite(p.value) && p.value > 0 && Number.isFinite(p.err) && p.err > 0 && Number.isInteger(p.L) && p.L >= 1);
  if (!usable.length) return { notApplicable: 'the archive has no Lambda points with positive errors (the kernel computes Lambda only)' };

  const L = Math.min(...usable.map((p) => p.L));
  const ofSize = usable.filter((p) => p.L === L);
  const energy = mostCommon(ofSize.map((p) => p.E));
  const byW = new Map<number, SpotCheckCandidate>();
  for (const p of ofSize) if (p.E === energy && !byW.has(p.W)) byW.set(p.W, p);
  const ordered = [...byW.values()].sort((a, b) => a.W - b.W);
  const picked = new Set<number>();
  for (let i = 0; i < Math.min(SPOT_CHECK_POINTS, ordered.length); i++) picked.add(Math.round((i * (ordered.length - 1)) / Math.max(1, SPOT_CHECK_POINTS - 1)));

  const finest = finestAffordablePrecision(dimension, L);
  if (finest > COARSEST_SPOT_CHECK_PRECISION) {
    return { notApplicable: `recomputing Lambda at L = ${L} in d = ${dimension} even to ${COARSEST_SPOT_CHECK_PRECISION * 100} % would take more than ${SPOT_CHECK_SECONDS_PER_POINT} s a point` };
  }
  return {
    targets: [...picked].sort((a, b) => a - b).map((i) => {
      const p = ordered[i]!;
      return { dimension, L, W: p.W, E: p.E, reported: p.value, reportedErr: p.err, precision: roundUpToTwoFigures(Math.max(p.err / p.value, finest)) };
    }),
  };
}

/** The smallest relative precision whose expected run fits SPOT_CHECK_SECONDS_PER_POINT (slices ~ L / eps^2). */
function finestAffordablePrecision(dimension: 1 | 2 | 3, L: number): number {
  const { operationsPerSlice } = expectedTransferMatrixRun({ dimension, width: L, slices: 1 });
  return Math.sqrt((L * operationsPerSlice) / (SPOT_CHECK_SECONDS_PER_POINT * CONSERVATIVE_OPERATIONS_PER_SECOND));
}

/** 0.0146303 -> 0.015: a precision a person can type back into `localis tmm`, never finer than asked. */
function roundUpToTwoFigures(x: number): number {
  const scale = 10 ** (Math.floor(Math.log10(x)) - 1);
  return Number((Math.ceil(x / scale - 1e-9) * scale).toPrecision(2));
}

function mostCommon(values: number[]): number {
  const counts = new Map<number, number>();
  for (const v of values) counts.set(v, (counts.get(v) ?? 0) + 1);
  return [...counts.entries()].sort((a, b) => b[1] - a[1] || a[0] - b[0])[0]![0];
}
