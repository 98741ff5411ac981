import { chiSquareProbability } from './chi-square';
import { choleskyFactor, choleskySolve } from './dense-matrix';
import { levenbergMarquardt, type LevenbergMarquardtResult } from './levenberg-marquardt';
import { SeededRandom } from './random';
import { evaluateScaling, normalizeOrders, ordersLabel, scalingJacobian, scalingLayout, type ScalingLayout, type ScalingOrders } from './scaling-model';
import { ScalingFitCancelled, ScalingFitError } from './scaling-fit-error';
import { groupBySize, sameX, validateScalingTable, type ScalingObservable, type ScalingPoint, type ScalingTable, type ScalingVariable, type TableLabels } from './scaling-table';

/**
 * Finite-size scaling fits (the model is in `scaling-model.ts`): weighted least squares on
 * ln(value) with sigma = error / value, by Levenberg–Marquardt; goodness of fit from the
 * chi-square probability; 95 % intervals from a parametric bootstrap.
 */

/** Where the fit starts; unset entries come from the data (x_c) or the defaults (nu = 1.5, y = 2). */
export interface ScalingStart {
  criticalX?: number;
  nu?: number;
  y?: number;
}

export interface ScalingFitOptions extends TableLabels {
  orders: Partial<ScalingOrders> & { nr: number };
  start?: ScalingStart;
  maxIterations?: number;
}

export interface FittedParameter {
  name: string;
  value: number;
  /** From the covariance matrix at the minimum (linearized); the bootstrap gives the honest intervals. */
  standardError: number;
}

export interface ScalingFit {
  orders: ScalingOrders;
  variable: ScalingVariable;
  observable: ScalingObservable;
  /** All fitted parameters in the order of `scaling-model.ts`. */
  parameters: FittedParameter[];
  criticalX: number;
  nu: number;
  /** Irrelevant exponent; null without an irrelevant correction. */
  y: number | null;
  /** exp(a_00): Lambda_c or g_c. */
  criticalValue: number;
  chi2: number;
  dof: number;
  /** Goodness-of-fit probability Q(dof/2, chi2/2). */
  p: number;
  iterations: number;
  points: number;
}

export const DEFAULT_START_NU = 1.5;
export const DEFAULT_START_Y = 2;
/**
 * Irrelevant-correction models are badly conditioned (y and the a_1j trade off along a long
 * valley) and can need several hundred iterations; an iteration costs well under a millisecond.
 */
export const DEFAULT_MAX_ITERATIONS = 1000;
/** Bootstrap refits start at the central minimum and need few iterations; one that wanders is counted as failed. */
export const DEFAULT_BOOTSTRAP_MAX_ITERATIONS = 300;

/**
 * Starting critical point: the crossing of the two largest sizes (the one nearest the middle of
 * the range if noise gives several), else of the next pair down, else where the two largest
 * sizes come closest, else the middle of the range.
 */
export function startingCriticalX(table: ScalingTable): number {
  const groups = groupBySize(table.points);
  const middle = (table.xs[0] + table.xs[table.xs.length - 1]) / 2;
  let closest: { x: number; gap: number } | null = null;
  for (let g = groups.length - 1; g >= 1; g--) {
    const small = groups[g - 1].points;
    const large = groups[g].points;
    const shared: { x: number; d: number }[] = [];
    for (const p of small) {
      const q = large.find((r) => sameX(r.x, p.x));
      if (q) shared.push({ x: p.x, d: q.value - p.value });
    }
    const found: number[] = [];
    for (let k = 0; k + 1 < shared.length; k++) {
      const { x: x0, d: d0 } = shared[k];
      const { x: x1, d: d1 } = shared[k + 1];
      if (d0 === 0) found.push(x0);
      else if (d0 * d1 < 0) found.push(x0 + ((x1 - x0) * d0) / (d0 - d1));
    }
    if (found.length) return found.reduce((best, x) => (Math.abs(x - middle) < Math.abs(best - middle) ? x : best));
    if (closest === null) {
      for (const s of shared) if (closest === null || Math.abs(s.d) < closest.gap) closest = { x: s.x, gap: Math.abs(s.d) };
    }
  }
  return closest?.x ?? middle;
}

/**
 * With x_c, nu, y, b and c held, F is linear in the a_ij: solving that weighted linear problem
 * gives the LM a start on the right scale instead of zeros, which matters for the higher orders.
 */
function linearCoefficients(layout: ScalingLayout, p: Float64Array, table: ScalingTable, lnValue: ArrayLike<number>): boolean {
  const { nr, ni } = layout.orders;
  const n = table.L.length;
  const count = (nr + 1) * (ni + 1);
  const jac = new Float64Array(n * layout.count);
  scalingJacobian(layout, p, table.L, table.x, jac);
  const a = new Float64Array(count * count);
  const rhs = new Float64Array(count);
  for (let k = 0; k < n; k++) {
    const w = 1 / (table.lnSigma[k] * table.lnSigma[k]);
    for (let i = 0; i < count; i++) {
      const ji = jac[k * layout.count + layout.a + i];
      rhs[i] += w * ji * lnValue[k];
      for (let j = 0; j < count; j++) a[i * count + j] += w * ji * jac[k * layout.count + layout.a + j];
    }
  }
  if (!choleskyFactor(a, count, 1e-12)) return false;
  choleskySolve(a, count, rhs);
  if (!rhs.every(Number.isFinite)) return false;
  for (let i = 0; i < count; i++) p[layout.a + i] = rhs[i];
  return true;
}

function initialParameters(layout: ScalingLayout, table: ScalingTable, start: ScalingStart | undefined): Float64Array {
  const p = new Float64Array(layout.count);
  p[0] = start?.criticalX ?? startingCriticalX(table);
  p[1] = start?.nu ?? DEFAULT_START_NU;
  if (layout.y >= 0) p[layout.y] = start?.y ?? DEFAULT_START_Y;
  if (!linearCoefficients(layout, p, table, table.lnValue)) {
    let sw = 0;
    let s = 0;
    for (let k = 0; k < table.L.length; k++) {
      const w = 1 / table.lnSigma[k] ** 2;
      sw += w;
      s += w * table.lnValue[k];
    }
    p[layout.a] = s / sw;
  }
  return p;
}

function runFit(layout: ScalingLayout, table: ScalingTable, lnValue: ArrayLike<number>, initial: Float64Array, maxIterations: number): LevenbergMarquardtResult {
  return levenbergMarquardt(
    {
      model: (p, out) => evaluateScaling(layout, p, table.L, table.x, out),
      jacobian: (p, out) => scalingJacobian(layout, p, table.L, table.x, out),
      data: lnValue,
      sigma: table.lnSigma,
    },
    initial,
    { maxIterations },
  );
}

/** A fit on an already validated table; the analysis and the bootstrap call this. */
export function fitScalingTable(table: ScalingTable, orders: ScalingOrders, options: { start?: ScalingStart; maxIterations?: number } = {}): ScalingFit {
  const layout = scalingLayout(orders, table.variable);
  const n = table.L.length;
  const dof = n - layout.count;
  if (dof <= 0) {
    throw new ScalingFitError(
      'no-degrees-of-freedom',
      `The model (${ordersLabel(orders)}) has ${layout.count} parameters but the table has only ${n} points, which leaves ${dof} degrees of freedom. ` +
        'Lower the orders or add points.',
    );
  }
  const maxIterations = options.maxIterations ?? DEFAULT_MAX_ITERATIONS;
  const result = runFit(layout, table, table.lnValue, initialParameters(layout, table, options.start), maxIterations);
  if (!result.converged) {
    const why =
      result.stop === 'max-iterations'
        ? `did not converge in ${maxIterations} iterations`
        : result.stop === 'not-finite-start'
          ? 'cannot start: the model is not finite at the starting values'
          : 'stalled before reaching a minimum';
    throw new ScalingFitError(
      'not-converged',
      `The fit of the model (${ordersLabel(orders)}) ${why} (chi-square ${result.chi2.toPrecision(4)}). ` +
        (orders.ni > 0
          ? 'The irrelevant correction is probably not resolved by these sizes (y and the a1j run away together); try ni = 0, or add smaller sizes.'
          : `Try lower orders, a narrower ${table.variable} range around the transition, or a starting ${table.variable}c nearer the crossings.`),
    );
  }
  if (!result.covariance) {
    throw new ScalingFitError(
      'not-determined',
      `The data do not determine every parameter of the model (${ordersLabel(orders)}): some are degenerate at the best fit. ` +
        (orders.ni > 0
          ? 'The irrelevant correction is probably not resolved by these sizes; try ni = 0 or lower mi.'
          : 'Lower nr or mr, or add sizes and points.'),
    );
  }
  return toFit(layout, table, result);
}

function toFit(layout: ScalingLayout, table: ScalingTable, result: LevenbergMarquardtResult): ScalingFit {
  const p = result.parameters;
  const dof = table.L.length - layout.count;
  return {
    orders: layout.orders,
    variable: table.variable,
    observable: table.observable,
    parameters: layout.names.map((name, j) => ({ name, value: p[j], standardError: result.standardErrors[j] })),
    criticalX: p[0],
    nu: p[1],
    y: layout.y >= 0 ? p[layout.y] : null,
    criticalValue: Math.exp(p[layout.a]),
    chi2: result.chi2,
    dof,
    p: chiSquareProbability(result.chi2, dof),
    iterations: result.iterations,
    points: table.L.length,
  };
}

/** Validate the table, then fit it with the given orders. */
export function fitScaling(points: readonly ScalingPoint[], options: ScalingFitOptions): ScalingFit {
  const orders = normalizeOrders(options.orders);
  const table = validateScalingTable(points, options);
  return fitScalingTable(table, orders, options);
}

// ---------------------------------------------------------------------------------------------
// Parametric bootstrap

export interface Interval {
  value: number;
  lo: number;
  hi: number;
}

export interface ScalingBootstrap {
  /** Refits asked for. */
  samples: number;
  /** Refits that did not converge (left out of the intervals). */
  failed: number;
  seed: number;
  level: 0.95;
  criticalX: Interval;
  nu: Interval;
  criticalValue: Interval;
  y: Interval | null;
}

export interface BootstrapOptions {
  samples?: number;
  seed?: number;
  maxIterations?: number;
  onProgress?: (done: number, total: number) => void;
  /** Asked before every refit; true stops the bootstrap with `ScalingFitCancelled`. */
  isCancelled?: () => boolean;
}

export const DEFAULT_BOOTSTRAP_SAMPLES = 200;
export const DEFAULT_BOOTSTRAP_SEED = 1;

/** Percentile by linear interpolation between order statistics (the common "type 7" definition). */
export function percentile(sorted: readonly number[], q: number): number {
  if (sorted.length === 0) return Number.NaN;
  const h = (sorted.length - 1) * q;
  const lo = Math.floor(h);
  const hi = Math.min(lo + 1, sorted.length - 1);
  return sorted[lo] + (h - lo) * (sorted[hi] - sorted[lo]);
}

function interval(value: number, draws: number[]): Interval {
  const sorted = [...draws].sort((a, b) => a - b);
  return { value, lo: percentile(sorted, 0.025), hi: percentile(sorted, 0.975) };
}

/**
 * The bootstrap as a sequence of steps, one refit each, so that a synchronous caller can run it
 * through and an asynchronous one can yield to its event loop between refits (progress messages,
 * cancellation). Each resampled data set draws ln(value) from a normal around the measured one
 * with sigma = error / value, the same error model the fit weights by, so a resampled value can
 * never turn negative; every refit starts from the central fit, which keeps them to a few
 * iterations.
 */
export function* bootstrapSteps(table: ScalingTable, fit: ScalingFit, options: BootstrapOptions = {}): Generator<number, ScalingBootstrap, void> {
  const samples = options.samples ?? DEFAULT_BOOTSTRAP_SAMPLES;
  const seed = options.seed ?? DEFAULT_BOOTSTRAP_SEED;
  if (!Number.isInteger(samples) || samples < 2) {
    throw new ScalingFitError('bootstrap-failed', `The bootstrap needs a whole number of at least 2 samples, got ${samples}.`);
  }
  const layout = scalingLayout(fit.orders, table.variable);
  const central = Float64Array.from(fit.parameters, (q) => q.value);
  const rng = new SeededRandom(seed);
  const n = table.L.length;
  const resampled = new Float64Array(n);
  const draws = { criticalX: [] as number[], nu: [] as number[], criticalValue: [] as number[], y: [] as number[] };
  let failed = 0;
  const maxIterations = options.maxIterations ?? DEFAULT_BOOTSTRAP_MAX_ITERATIONS;
  for (let s = 0; s < samples; s++) {
    for (let k = 0; k < n; k++) resampled[k] = table.lnValue[k] + table.lnSigma[k] * rng.normal();
    const result = runFit(layout, table, resampled, central, maxIterations);
    if (result.converged) {
      const p = result.parameters;
      draws.criticalX.push(p[0]);
      draws.nu.push(p[1]);
      draws.criticalValue.push(Math.exp(p[layout.a]));
      if (layout.y >= 0) draws.y.push(p[layout.y]);
    } else failed++;
    yield s + 1;
  }
  if (failed * 2 > samples) {
    throw new ScalingFitError(
      'bootstrap-failed',
      `${failed} of ${samples} bootstrap refits of the model (${ordersLabel(fit.orders)}) did not converge, so the model is not stable on this data. Lower the orders or narrow the ${table.variable} range.`,
    );
  }
  return {
    samples,
    failed,
    seed,
    level: 0.95,
    criticalX: interval(fit.criticalX, draws.criticalX),
    nu: interval(fit.nu, draws.nu),
    criticalValue: interval(fit.criticalValue, draws.criticalValue),
    y: fit.y === null ? null : interval(fit.y, draws.y),
  };
}

/** 95 % intervals for x_c, nu, the critical value (and y) from a parametric bootstrap of a finished fit. */
export function bootstrapScaling(points: readonly ScalingPoint[], fit: ScalingFit, options: BootstrapOptions = {}): ScalingBootstrap {
  const table = validateScalingTable(points, { variable: fit.variable, observable: fit.observable });
  const steps = bootstrapSteps(table, fit, options);
  const total = options.samples ?? DEFAULT_BOOTSTRAP_SAMPLES;
  let done = 0;
  for (;;) {
    if (options.isCancelled?.()) throw new ScalingFitCancelled(done, total);
    const step = steps.next();
    if (step.done) return step.value;
    done = step.value;
    options.onProgress?.(done, total);
  }
}
