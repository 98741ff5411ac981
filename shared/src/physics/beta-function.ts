import { ScalingFitError } from './scaling-fit-error';
import { groupBySize, sameX, validatePoints, type ScalingPoint, type TableLabels } from './scaling-table';

/**
 * The numerical beta function beta = d ln g / d ln L (Abrahams et al., PRL 42, 673 (1979)) from two
 * successive sizes L1 < L2 at the same x: beta = (ln g2 - ln g1) / (ln L2 - ln L1), paired with
 * ln g at the geometric mean size sqrt(L1 L2), where the straight line in ln L gives
 * (ln g1 + ln g2) / 2. Errors by first-order propagation with sigma(ln g) = error / g, the two
 * sizes independent. For transfer-matrix data Lambda stands in for g.
 */
export interface BetaPoint {
  x: number;
  /** The two sizes, smaller first. */
  sizes: [number, number];
  /** Their geometric mean. */
  size: number;
  lnValue: number;
  lnValueError: number;
  beta: number;
  betaError: number;
}

/** Beta at every x that two successive sizes share; pairs in order of size, points of a pair in order of x. */
export function numericalBeta(points: readonly ScalingPoint[], labels: TableLabels = {}): BetaPoint[] {
  const groups = groupBySize(validatePoints(points, labels));
  if (groups.length < 2) {
    throw new ScalingFitError('too-few-sizes', `The beta function needs at least two sizes L; the table has ${groups.length}.`);
  }
  const out: BetaPoint[] = [];
  for (let g = 0; g + 1 < groups.length; g++) {
    const small = groups[g];
    const large = groups[g + 1];
    const dlnL = Math.log(large.L) - Math.log(small.L);
    for (const p of small.points) {
      const q = large.points.find((r) => sameX(r.x, p.x));
      if (!q) continue;
      const s1 = p.error / p.value;
      const s2 = q.error / q.value;
      const combined = Math.hypot(s1, s2);
      out.push({
        x: p.x,
        sizes: [small.L, large.L],
        size: Math.sqrt(small.L * large.L),
        lnValue: (Math.log(p.value) + Math.log(q.value)) / 2,
        lnValueError: combined / 2,
        beta: (Math.log(q.value) - Math.log(p.value)) / dlnL,
        betaError: combined / dlnL,
      });
    }
  }
  return out;
}
