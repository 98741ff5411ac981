import { ScalingFitError } from './scaling-fit-error';
import { groupBySize, sameX, validatePoints, type ScalingPoint, type TableLabels } from './scaling-table';

/**
 * Where the curves value(x) of two successive sizes cross. Between two grid points x0 < x1 shared
 * by both sizes, with differences d = value(L2) - value(L1) of opposite sign, the crossing of the
 * straight segments is at x* = x0 + (x1 - x0) t, t = d0 / (d0 - d1), where the value is
 * v* = a0 + t (a1 - a0) (a = the smaller size's values). Errors follow from first-order
 * propagation of the four point errors, taken as independent.
 */
export interface Crossing {
  /** The two sizes, smaller first. */
  sizes: [number, number];
  /** Their geometric mean, the size a crossing is plotted at. */
  size: number;
  x: number;
  xError: number;
  value: number;
  valueError: number;
}

export interface CrossingShift {
  /** Geometric-mean sizes of the two pairs. */
  from: number;
  to: number;
  shift: number;
  shiftError: number;
}

/** How the crossing moves as the sizes grow: what irrelevant corrections do to a naive estimate of the critical point. */
export interface CrossingDrift {
  /** One crossing per pair of successive sizes, in order of size (where noise gives several, the one nearest the others). */
  path: Crossing[];
  /** Change of x from one pair's crossing to the next. */
  shifts: CrossingShift[];
  /** Weighted least-squares slope of x against 1/L (L the pairs' geometric mean), with its error; null below two pairs. */
  slopeVsInverseSize: { value: number; error: number } | null;
  /** 'none' when the slope is within two standard errors of zero. */
  direction: 'towards larger x' | 'towards smaller x' | 'none';
}

function crossingIn(
  sizes: [number, number],
  x0: number,
  x1: number,
  a: [ScalingPoint, ScalingPoint],
  b: [ScalingPoint, ScalingPoint],
): Crossing {
  const d0 = b[0].value - a[0].value;
  const d1 = b[1].value - a[1].value;
  const D = d0 - d1;
  const t = d0 / D;
  const span = x1 - x0;
  // dt/dd0 = -d1/D², dt/dd1 = d0/D²; d0 = b0 - a0, d1 = b1 - a1.
  const dtd0 = -d1 / (D * D);
  const dtd1 = d0 / (D * D);
  const xGrad = [-span * dtd0, -span * dtd1, span * dtd0, span * dtd1]; // a0, a1, b0, b1
  const slope = a[1].value - a[0].value;
  const vGrad = [1 - t - slope * dtd0, t - slope * dtd1, slope * dtd0, slope * dtd1];
  const errs = [a[0].error, a[1].error, b[0].error, b[1].error];
  let xVar = 0;
  let vVar = 0;
  for (let i = 0; i < 4; i++) {
    xVar += (xGrad[i] * errs[i]) ** 2;
    vVar += (vGrad[i] * errs[i]) ** 2;
  }
  return {
    sizes,
    size: Math.sqrt(sizes[0] * sizes[1]),
    x: x0 + span * t,
    xError: Math.sqrt(xVar),
    value: a[0].value + t * slope,
    valueError: Math.sqrt(vVar),
  };
}

/** Crossings of every pair of successive sizes, pairs in order of size, crossings of a pair in order of x. */
export function findCrossings(points: readonly ScalingPoint[], labels: TableLabels = {}): Crossing[] {
  const groups = groupBySize(validatePoints(points, labels));
  if (groups.length < 2) {
    throw new ScalingFitError('too-few-sizes', `Crossings need at least two sizes L; the table has ${groups.length}.`);
  }
  const out: Crossing[] = [];
  for (let g = 0; g + 1 < groups.length; g++) {
    const small = groups[g];
    const large = groups[g + 1];
    // Only grid points both sizes have: a crossing between unmatched points would be an artefact.
    const shared: [ScalingPoint, ScalingPoint][] = [];
    for (const p of small.points) {
      const q = large.points.find((r) => sameX(r.x, p.x));
      if (q) shared.push([p, q]);
    }
    const sizes: [number, number] = [small.L, large.L];
    const d = shared.map(([p, q]) => q.value - p.value);
    for (let k = 0; k + 1 < shared.length; k++) {
      const [a0, b0] = shared[k];
      const [a1, b1] = shared[k + 1];
      const opposite = d[k] * d[k + 1] < 0;
      // A crossing exactly on a grid point belongs to the interval that starts there (or, at the
      // last point, to the one that ends there), counted once; equal curves over an interval are not a crossing.
      const startsHere = d[k] === 0 && d[k + 1] !== 0 && (k === 0 || d[k - 1] !== 0);
      const endsHere = d[k + 1] === 0 && d[k] !== 0 && k + 2 === shared.length;
      if (opposite || startsHere || endsHere) out.push(crossingIn(sizes, a0.x, a1.x, [a0, a1], [b0, b1]));
    }
  }
  return out;
}

/** Drift of the crossings with size; see `CrossingDrift`. */
export function crossingDrift(crossings: readonly Crossing[]): CrossingDrift {
  const byPair = new Map<string, Crossing[]>();
  for (const c of crossings) {
    const key = `${c.sizes[0]}:${c.sizes[1]}`;
    byPair.set(key, [...(byPair.get(key) ?? []), c]);
  }
  const pairs = [...byPair.values()].sort((a, b) => a[0].size - b[0].size);
  const all = crossings.map((c) => c.x).sort((a, b) => a - b);
  const median = all.length ? all[Math.floor((all.length - 1) / 2)] : 0;
  const path: Crossing[] = [];
  for (const candidates of pairs) {
    const anchor = path.length ? path[path.length - 1].x : median;
    path.push(candidates.reduce((best, c) => (Math.abs(c.x - anchor) < Math.abs(best.x - anchor) ? c : best)));
  }
  const shifts = path.slice(1).map((c, i) => ({
    from: path[i].size,
    to: c.size,
    shift: c.x - path[i].x,
    shiftError: Math.hypot(c.xError, path[i].xError),
  }));

  let slopeVsInverseSize: CrossingDrift['slopeVsInverseSize'] = null;
  if (path.length >= 2) {
    let sw = 0;
    let su = 0;
    let sx = 0;
    let suu = 0;
    let sux = 0;
    for (const c of path) {
      // A crossing known exactly (zero error) would get infinite weight; floor it at a tiny share of its x.
      const w = 1 / Math.max(c.xError, 1e-12 * Math.max(1, Math.abs(c.x))) ** 2;
      const u = 1 / c.size;
      sw += w;
      su += w * u;
      sx += w * c.x;
      suu += w * u * u;
      sux += w * u * c.x;
    }
    const det = sw * suu - su * su;
    if (det > 0) slopeVsInverseSize = { value: (sw * sux - su * sx) / det, error: Math.sqrt(sw / det) };
  }
  let direction: CrossingDrift['direction'] = 'none';
  if (slopeVsInverseSize && Math.abs(slopeVsInverseSize.value) > 2 * slopeVsInverseSize.error) {
    // x moves opposite to the slope as 1/L shrinks.
    direction = slopeVsInverseSize.value < 0 ? 'towards larger x' : 'towards smaller x';
  }
  return { path, shifts, slopeVsInverseSize, direction };
}
