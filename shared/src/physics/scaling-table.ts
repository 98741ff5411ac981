import type { ErrorDetail } from '../errors/app-error';
import { ScalingFitError } from './scaling-fit-error';

/** One measured point: size L, control parameter x (W or E), the observable (Lambda or g) and its standard error. */
export interface ScalingPoint {
  L: number;
  x: number;
  value: number;
  error: number;
}

/** The control parameter the table runs over: disorder W at fixed E, or energy E at fixed W. */
export type ScalingVariable = 'W' | 'E';
/** The observable: Lambda = xi / L from the transfer matrix, or the dimensionless conductance g. */
export type ScalingObservable = 'lambda' | 'g';

export interface TableLabels {
  variable?: ScalingVariable;
  observable?: ScalingObservable;
}

/** A validated table, sorted by L then x, with the fitted quantities precomputed. */
export interface ScalingTable {
  points: ScalingPoint[];
  L: Float64Array;
  x: Float64Array;
  /** ln(value): the quantity the scaling function describes. */
  lnValue: Float64Array;
  /** error / value: the standard error of ln(value) to first order. */
  lnSigma: Float64Array;
  /** Distinct sizes, ascending. */
  sizes: number[];
  /** Distinct x values, ascending. */
  xs: number[];
  variable: ScalingVariable;
  observable: ScalingObservable;
}

export function observableName(observable: ScalingObservable): string {
  return observable === 'lambda' ? 'Lambda' : 'g';
}

/** Two x values closer than this (relative) are the same grid point. */
export function sameX(a: number, b: number): boolean {
  return Math.abs(a - b) <= 1e-9 * Math.max(1, Math.abs(a), Math.abs(b));
}

function describePoint(p: Partial<ScalingPoint>, index: number, variable: ScalingVariable): string {
  return `point ${index + 1} (L = ${p?.L}, ${variable} = ${p?.x})`;
}

/**
 * Check each point on its own and against the others (no repeats); the size and grid checks that
 * a fit needs come on top in `validateScalingTable`. Every problem is listed in the details, the
 * message names the first so a person can go straight to it.
 */
export function validatePoints(points: readonly ScalingPoint[], labels: TableLabels = {}): ScalingPoint[] {
  const variable = labels.variable ?? 'W';
  const name = observableName(labels.observable ?? 'lambda');
  if (!Array.isArray(points) || points.length === 0) {
    throw new ScalingFitError('empty-table', `The table has no points. Give one row per (L, ${variable}) with ${name} and its error.`);
  }
  const problems: ErrorDetail[] = [];
  const field = (index: number, key: keyof ScalingPoint, message: string) => problems.push({ path: ['points', index, key], message });
  points.forEach((p, i) => {
    const at = describePoint(p, i, variable);
    if (p === null || typeof p !== 'object') {
      problems.push({ path: ['points', i], message: `point ${i + 1} is not a row with L, ${variable}, ${name} and error` });
      return;
    }
    if (!(Number.isFinite(p.L) && p.L > 0)) field(i, 'L', `${at}: the size L must be a positive number, got ${p.L}`);
    if (!Number.isFinite(p.x)) field(i, 'x', `${at}: ${variable} must be a finite number, got ${p.x}`);
    if (!(Number.isFinite(p.value) && p.value > 0)) {
      field(i, 'value', `${at}: ${name} must be a positive number (its logarithm is fitted), got ${p.value}`);
    }
    if (!(Number.isFinite(p.error) && p.error > 0)) {
      field(i, 'error', `${at}: the error of ${name} must be a positive number (its standard error), got ${p.error}`);
    }
  });
  if (problems.length === 0) {
    const seen = new Map<number, { x: number; index: number }[]>();
    points.forEach((p, i) => {
      const row = seen.get(p.L) ?? [];
      const twin = row.find((q) => sameX(q.x, p.x));
      if (twin) {
        problems.push({
          path: ['points', i],
          message: `${describePoint(p, i, variable)} repeats point ${twin.index + 1}: keep one row per (L, ${variable}), averaging repeated runs first`,
        });
      } else row.push({ x: p.x, index: i });
      seen.set(p.L, row);
    });
    if (problems.length) {
      throw new ScalingFitError('duplicate-point', `The table has ${problems.length} repeated (L, ${variable}) rows; the first: ${problems[0].message}.`, problems);
    }
  }
  if (problems.length) {
    const more = problems.length > 1 ? ` (and ${problems.length - 1} more problems, listed in the details)` : '';
    throw new ScalingFitError('bad-point', `The table has bad values: ${problems[0].message}${more}.`, problems);
  }
  return [...points].sort((a, b) => a.L - b.L || a.x - b.x).map((p) => ({ L: p.L, x: p.x, value: p.value, error: p.error }));
}

/** Distinct values of a sorted-or-not list, ascending, merging values within `sameX`. */
export function distinctSorted(values: Iterable<number>): number[] {
  const sorted = [...values].sort((a, b) => a - b);
  const out: number[] = [];
  for (const v of sorted) if (out.length === 0 || !sameX(out[out.length - 1], v)) out.push(v);
  return out;
}

/** Points of each size, sizes ascending, each size's points ascending in x. */
export function groupBySize(points: readonly ScalingPoint[]): { L: number; points: ScalingPoint[] }[] {
  const bySize = new Map<number, ScalingPoint[]>();
  for (const p of points) {
    const row = bySize.get(p.L) ?? [];
    row.push(p);
    bySize.set(p.L, row);
  }
  return [...bySize.entries()].sort((a, b) => a[0] - b[0]).map(([L, row]) => ({ L, points: row.sort((a, b) => a.x - b.x) }));
}

/** Everything a finite-size scaling fit needs of its table: valid points, at least three sizes, more than one x. */
export function validateScalingTable(points: readonly ScalingPoint[], labels: TableLabels = {}): ScalingTable {
  const variable = labels.variable ?? 'W';
  const observable = labels.observable ?? 'lambda';
  const clean = validatePoints(points, labels);
  const sizes = distinctSorted(clean.map((p) => p.L));
  if (sizes.length < 3) {
    throw new ScalingFitError(
      'too-few-sizes',
      `A finite-size scaling fit needs at least three sizes L; the table has ${sizes.length} (${sizes.join(', ')}). Add results for more sizes.`,
    );
  }
  const xs = distinctSorted(clean.map((p) => p.x));
  if (xs.length < 2) {
    throw new ScalingFitError(
      'one-x',
      `A finite-size scaling fit needs more than one value of ${variable}; every point has ${variable} = ${xs[0]}. Add points on both sides of the transition.`,
    );
  }
  return {
    points: clean,
    L: Float64Array.from(clean, (p) => p.L),
    x: Float64Array.from(clean, (p) => p.x),
    lnValue: Float64Array.from(clean, (p) => Math.log(p.value)),
    lnSigma: Float64Array.from(clean, (p) => p.error / p.value),
    sizes,
    xs,
    variable,
    observable,
  };
}
