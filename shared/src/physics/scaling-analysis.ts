import { numericalBeta, type BetaPoint } from './beta-function';
import { crossingDrift, findCrossings, type Crossing, type CrossingDrift } from './crossings';
import { dataCollapse, type DataCollapse } from './data-collapse';
import {
  bootstrapSteps,
  DEFAULT_BOOTSTRAP_SAMPLES,
  DEFAULT_BOOTSTRAP_SEED,
  fitScalingTable,
  type FittedParameter,
  type Interval,
  type ScalingBootstrap,
  type ScalingFit,
  type ScalingStart,
} from './scaling-fit';
import { ScalingFitCancelled, ScalingFitError, type ScalingFitReason } from './scaling-fit-error';
import { normalizeOrders, ordersLabel, scalingLayout, type ScalingOrders } from './scaling-model';
import { validateScalingTable, type ScalingObservable, type ScalingPoint, type ScalingTable, type ScalingVariable, type TableLabels } from './scaling-table';

/**
 * The whole scaling analysis of one table, in the shape `localis analyze --json` prints and the
 * worker stores: the fit (orders given, or chosen from a scan), 95 % intervals, the model scan,
 * crossings with their drift, and the numerical beta function.
 */

/**
 * Models tried when the user gives no orders, simplest first: the relevant variable alone at
 * growing orders, then with an irrelevant correction. Small on purpose: each is one fit, and
 * what the user needs from the scan is whether W_c and nu stay put as the model grows.
 */
export const DEFAULT_SCAN_ORDERS: readonly ScalingOrders[] = [
  { nr: 2, ni: 0, mr: 1, mi: 0 },
  { nr: 3, ni: 0, mr: 1, mi: 0 },
  { nr: 2, ni: 0, mr: 2, mi: 0 },
  { nr: 3, ni: 0, mr: 2, mi: 0 },
  { nr: 3, ni: 0, mr: 3, mi: 0 },
  { nr: 2, ni: 1, mr: 1, mi: 0 },
  { nr: 3, ni: 1, mr: 1, mi: 0 },
  { nr: 3, ni: 1, mr: 2, mi: 0 },
  { nr: 3, ni: 1, mr: 2, mi: 1 },
];

/** A model is acceptable at or above this goodness-of-fit probability (REFERENCES: "about > 0.1"). */
export const DEFAULT_ACCEPT_P = 0.1;
const Z95 = 1.959963984540054;

export interface AnalyzeOptions extends TableLabels {
  /** The model to report; without it the scan chooses (the simplest model with p >= acceptP). */
  orders?: Partial<ScalingOrders> & { nr: number };
  /** Models to scan; default DEFAULT_SCAN_ORDERS; false for no scan (then `orders` is needed). */
  scan?: readonly (Partial<ScalingOrders> & { nr: number })[] | false;
  /** Bootstrap refits; default 200; 0 gives linearized intervals from the covariance matrix instead. */
  bootstrap?: number;
  seed?: number;
  start?: ScalingStart;
  /** Iteration cap of the scan's and the chosen model's fits (the bootstrap refits have their own). */
  maxIterations?: number;
  acceptP?: number;
  /** Told after every fit (scan, central fit and each bootstrap refit). */
  onProgress?: (done: number, total: number) => void;
  /** Asked before every fit; true stops the analysis with `ScalingFitCancelled`. */
  isCancelled?: () => boolean;
}

export interface ModelScanRow {
  orders: ScalingOrders;
  parameters: number;
  Wc: number | null;
  nu: number | null;
  critical: number | null;
  y: number | null;
  chi2: number | null;
  dof: number;
  p: number | null;
  /** Why this model could not be fitted; the other numbers are then null. */
  error?: { reason: ScalingFitReason; message: string };
  /** The model the analysis reports. */
  selected: boolean;
}

export interface ScalingAnalysis {
  model: ScalingOrders & {
    chosenBy: 'user' | 'scan';
    parameters: number;
    observable: ScalingObservable;
    variable: ScalingVariable;
    sizes: number[];
    range: { min: number; max: number };
    points: number;
  };
  /** The critical point (W_c, or E_c for an energy table). */
  Wc: Interval;
  nu: Interval;
  /** The critical value of the observable, exp(a_00). */
  critical: Interval;
  /** The irrelevant exponent, when the model has one. */
  y?: Interval;
  chi2: number;
  dof: number;
  p: number;
  parameters: FittedParameter[];
  intervals: { method: 'bootstrap' | 'linearized'; level: 0.95; samples: number; failed: number; seed: number | null };
  scan: ModelScanRow[];
  crossings: Crossing[];
  crossingDrift: CrossingDrift;
  beta: BetaPoint[];
  /** The points on the chosen model's scaling variable, irrelevant correction removed, with the fitted curve. */
  collapse: DataCollapse;
  /** The measured points the fit used, as given (for plotting the observable against W). */
  measured: ScalingPoint[];
  /** Things a reader should know before trusting the numbers, in words. */
  warnings: string[];
}

const key = (o: ScalingOrders) => `${o.nr},${o.ni},${o.mr},${o.mi}`;

/** Fewer parameters first, then by nr, ni, mr, mi: the table reads from simple to rich models. */
function compareRows(a: ModelScanRow, b: ModelScanRow): number {
  return a.parameters - b.parameters || a.orders.nr - b.orders.nr || a.orders.ni - b.orders.ni || a.orders.mr - b.orders.mr || a.orders.mi - b.orders.mi;
}

function scanRow(orders: ScalingOrders, table: ScalingTable, outcome: ScalingFit | ScalingFitError): ModelScanRow {
  const parameters = scalingLayout(orders, table.variable).count;
  if (outcome instanceof ScalingFitError) {
    return {
      orders,
      parameters,
      Wc: null,
      nu: null,
      critical: null,
      y: null,
      chi2: null,
      dof: table.L.length - parameters,
      p: null,
      error: { reason: outcome.reason, message: outcome.message },
      selected: false,
    };
  }
  return {
    orders,
    parameters,
    Wc: outcome.criticalX,
    nu: outcome.nu,
    critical: outcome.criticalValue,
    y: outcome.y,
    chi2: outcome.chi2,
    dof: outcome.dof,
    p: outcome.p,
    selected: false,
  };
}

function tryFit(table: ScalingTable, orders: ScalingOrders, options: AnalyzeOptions): ScalingFit | ScalingFitError {
  try {
    return fitScalingTable(table, orders, options);
  } catch (error) {
    if (error instanceof ScalingFitError) return error;
    throw error;
  }
}

/** The simplest acceptable model; if none is acceptable, the best one (and a warning says so). */
function choose(rows: ModelScanRow[], acceptP: number): { row: ModelScanRow; acceptable: boolean } | null {
  const fitted = rows.filter((r) => r.p !== null);
  if (fitted.length === 0) return null;
  const acceptable = fitted.filter((r) => (r.p as number) >= acceptP);
  if (acceptable.length) {
    const fewest = Math.min(...acceptable.map((r) => r.parameters));
    const best = acceptable.filter((r) => r.parameters === fewest).reduce((a, b) => ((b.p as number) > (a.p as number) ? b : a));
    return { row: best, acceptable: true };
  }
  return { row: fitted.reduce((a, b) => ((b.p as number) > (a.p as number) ? b : a)), acceptable: false };
}

function linearized(fit: ScalingFit, index: number, value: number, transform: (v: number) => number = (v) => v): Interval {
  const { value: raw, standardError } = fit.parameters[index];
  return { value, lo: transform(raw - Z95 * standardError), hi: transform(raw + Z95 * standardError) };
}

const fmt = (v: number) => Number(v.toPrecision(4)).toString();

export interface AnalysisProgress {
  done: number;
  total: number;
}

/**
 * The analysis as steps (one per fit), so `analyzeTable` can run it straight through and
 * `analyzeTableAsync` can let its event loop breathe between fits.
 */
export function* analysisSteps(points: readonly ScalingPoint[], options: AnalyzeOptions = {}): Generator<AnalysisProgress, ScalingAnalysis, void> {
  const table = validateScalingTable(points, options);
  const labels: TableLabels = { variable: table.variable, observable: table.observable };
  const userOrders = options.orders ? normalizeOrders(options.orders) : null;
  const scanOrders: ScalingOrders[] = [];
  if (options.scan !== false) {
    for (const o of [...(options.scan ?? DEFAULT_SCAN_ORDERS).map(normalizeOrders), ...(userOrders ? [userOrders] : [])]) {
      if (!scanOrders.some((s) => key(s) === key(o))) scanOrders.push(o);
    }
  }
  if (!userOrders && scanOrders.length === 0) {
    throw new ScalingFitError('bad-orders', 'Give the expansion orders, or a list of orders to scan; with neither there is no model to fit.');
  }
  const samples = options.bootstrap ?? DEFAULT_BOOTSTRAP_SAMPLES;
  if (!Number.isInteger(samples) || samples < 0 || samples === 1) {
    throw new ScalingFitError('bootstrap-failed', `The bootstrap needs 0 (linearized intervals) or at least 2 samples, got ${samples}.`);
  }
  const acceptP = options.acceptP ?? DEFAULT_ACCEPT_P;
  const total = scanOrders.length + (userOrders && options.scan === false ? 1 : 0) + samples;
  let done = 0;

  const outcomes = new Map<string, ScalingFit | ScalingFitError>();
  for (const orders of scanOrders) {
    outcomes.set(key(orders), tryFit(table, orders, options));
    yield { done: ++done, total };
  }
  if (userOrders && !outcomes.has(key(userOrders))) {
    outcomes.set(key(userOrders), tryFit(table, userOrders, options));
    yield { done: ++done, total };
  }
  const scan = scanOrders.map((o) => scanRow(o, table, outcomes.get(key(o)) as ScalingFit | ScalingFitError)).sort(compareRows);

  const warnings: string[] = [];
  let fit: ScalingFit;
  if (userOrders) {
    const outcome = outcomes.get(key(userOrders)) as ScalingFit | ScalingFitError;
    if (outcome instanceof ScalingFitError) throw outcome;
    fit = outcome;
  } else {
    const chosen = choose(scan, acceptP);
    if (!chosen) {
      const first = scan.find((r) => r.error)?.error?.message ?? '';
      throw new ScalingFitError(
        'not-converged',
        `None of the ${scan.length} scanned models could be fitted to this table. The first reason: ${first}`,
      );
    }
    if (!chosen.acceptable) {
      warnings.push(
        `No scanned model reaches p >= ${acceptP}; the best, (${ordersLabel(chosen.row.orders)}), has p = ${fmt(chosen.row.p as number)}. ` +
          `Its numbers describe the data poorly: check the errors, or narrow the ${table.variable} range.`,
      );
    }
    fit = outcomes.get(key(chosen.row.orders)) as ScalingFit;
  }
  for (const row of scan) row.selected = key(row.orders) === key(fit.orders);
  if (userOrders && fit.p < acceptP) {
    warnings.push(
      `The model (${ordersLabel(fit.orders)}) has p = ${fmt(fit.p)}, below ${acceptP}: it does not describe the data within their errors. The scan shows other orders.`,
    );
  }
  const xMin = table.xs[0];
  const xMax = table.xs[table.xs.length - 1];
  if (fit.criticalX < xMin || fit.criticalX > xMax) {
    warnings.push(
      `The fitted ${table.variable}c = ${fmt(fit.criticalX)} lies outside the data (${table.variable} from ${fmt(xMin)} to ${fmt(xMax)}): it is an extrapolation; add points around it.`,
    );
  }

  const layout = scalingLayout(fit.orders, table.variable);
  let Wc: Interval;
  let nu: Interval;
  let critical: Interval;
  let y: Interval | undefined;
  let intervals: ScalingAnalysis['intervals'];
  if (samples > 0) {
    const steps = bootstrapSteps(table, fit, { samples, seed: options.seed ?? DEFAULT_BOOTSTRAP_SEED });
    let boot: ScalingBootstrap;
    for (;;) {
      const step = steps.next();
      if (step.done) {
        boot = step.value;
        break;
      }
      yield { done: ++done, total };
    }
    Wc = boot.criticalX;
    nu = boot.nu;
    critical = boot.criticalValue;
    y = boot.y ?? undefined;
    intervals = { method: 'bootstrap', level: 0.95, samples: boot.samples, failed: boot.failed, seed: boot.seed };
    if (boot.failed > 0.05 * boot.samples) {
      warnings.push(`${boot.failed} of ${boot.samples} bootstrap refits did not converge and are left out; the intervals may be too narrow.`);
    }
  } else {
    Wc = linearized(fit, 0, fit.criticalX);
    nu = linearized(fit, 1, fit.nu);
    critical = linearized(fit, layout.a, fit.criticalValue, Math.exp);
    y = layout.y >= 0 ? linearized(fit, layout.y, fit.y as number) : undefined;
    intervals = { method: 'linearized', level: 0.95, samples: 0, failed: 0, seed: null };
  }

  const crossings = findCrossings(table.points, labels);
  if (crossings.length === 0) {
    warnings.push(`No two successive sizes cross in this ${table.variable} range; the transition may lie outside it.`);
  }
  return {
    model: {
      ...fit.orders,
      chosenBy: userOrders ? 'user' : 'scan',
      parameters: layout.count,
      observable: table.observable,
      variable: table.variable,
      sizes: table.sizes,
      range: { min: xMin, max: xMax },
      points: table.L.length,
    },
    Wc,
    nu,
    critical,
    ...(y ? { y } : {}),
    chi2: fit.chi2,
    dof: fit.dof,
    p: fit.p,
    parameters: fit.parameters,
    intervals,
    scan,
    crossings,
    crossingDrift: crossingDrift(crossings),
    beta: numericalBeta(table.points, labels),
    collapse: dataCollapse(table.points, fit),
    measured: table.points.map((p) => ({ L: p.L, x: p.x, value: p.value, error: p.error })),
    warnings,
  };
}

/** Run the whole analysis synchronously (CLI, tests); progress and cancel are checked between fits. */
export function analyzeTable(points: readonly ScalingPoint[], options: AnalyzeOptions = {}): ScalingAnalysis {
  const steps = analysisSteps(points, options);
  let last: AnalysisProgress = { done: 0, total: 0 };
  for (;;) {
    if (options.isCancelled?.()) throw new ScalingFitCancelled(last.done, last.total);
    const step = steps.next();
    if (step.done) return step.value;
    last = step.value;
    options.onProgress?.(last.done, last.total);
  }
}

export interface AnalyzeAsyncOptions extends AnalyzeOptions {
  /** How to hand control back to the event loop; default a zero timeout (works in Node and the browser). */
  pause?: () => Promise<void>;
  /** Pause at most this often, in milliseconds of work; default 20. */
  pauseEveryMs?: number;
}

/**
 * The same analysis for the worker and the browser: between fits it pauses now and then, so
 * progress reaches the user and a cancel request set by another event gets seen.
 */
export async function analyzeTableAsync(points: readonly ScalingPoint[], options: AnalyzeAsyncOptions = {}): Promise<ScalingAnalysis> {
  const pause = options.pause ?? (() => new Promise<void>((resolve) => setTimeout(resolve, 0)));
  const every = options.pauseEveryMs ?? 20;
  const steps = analysisSteps(points, options);
  let last: AnalysisProgress = { done: 0, total: 0 };
  let since = Date.now();
  for (;;) {
    if (options.isCancelled?.()) throw new ScalingFitCancelled(last.done, last.total);
    const step = steps.next();
    if (step.done) return step.value;
    last = step.value;
    options.onProgress?.(last.done, last.total);
    if (Date.now() - since >= every) {
      await pause();
      since = Date.now();
    }
  }
}
