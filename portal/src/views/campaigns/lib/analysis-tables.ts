import type { Interval, ScalingAnalysis } from '@localis/shared';
import { decimalsFor, formatChi2, formatFixed, formatProbability, formatSignificant, observableSymbol } from './analysis-format';

/**
 * The numbers of an analysis as tables: what the page shows beside each chart and below the fit,
 * and what the CSV and JSON downloads hold. Rows keep the raw numbers (the downloads lose no
 * digit); each column says how the screen writes them.
 */

export type Cell = number | string | boolean | null;
export type Row = Record<string, Cell>;

export interface TableColumn {
  /** The CSV header and JSON key: plain ASCII a program can use ("Wc", "chi2"). */
  key: string;
  /** The screen's heading: the symbol, with `sub` set as its subscript ("W" + "c"). */
  label: string;
  sub?: string;
  /** Right-aligned, tabular figures. */
  numeric?: boolean;
  /** The row's heading (the scope="row" cell). */
  rowHeader?: boolean;
  format?: (value: Cell, row: Row) => string;
}

export interface AnalysisTable {
  /** For the file name: localis-<campaign>-<id>.csv. */
  id: string;
  caption: string;
  columns: TableColumn[];
  rows: Row[];
}

/** How a cell reads on screen: its column's format, else numbers at four significant digits. */
export function cellText(column: TableColumn, row: Row): string {
  const value = row[column.key] ?? null;
  if (column.format) return column.format(value, row);
  if (value === null) return '—';
  if (typeof value === 'number') return formatSignificant(value);
  if (typeof value === 'boolean') return value ? 'yes' : 'no';
  return value;
}

/** The observable's name in CSV headers and JSON keys. */
export function observableKey(observable: ScalingAnalysis['model']['observable']): 'Lambda' | 'g' {
  return observable === 'lambda' ? 'Lambda' : 'g';
}

/** A column of values written with the decimals that two significant digits of `spread` need. */
const withDecimals = (decimals: number) => (value: Cell) => formatFixed(typeof value === 'number' ? value : null, decimals);
const whole = (value: Cell) => (typeof value === 'number' ? String(value) : '—');
const mean = (values: number[]) => values.reduce((s, v) => s + v, 0) / Math.max(1, values.length);
/** Decimals for a value column from its typical error. */
const decimalsOfErrors = (errors: number[]) => decimalsFor(mean(errors.filter((e) => Number.isFinite(e) && e > 0)) || 0);

function intervalRow(quantity: string, name: string, interval: Interval): Row {
  return { quantity, name, value: interval.value, lo: interval.lo, hi: interval.hi };
}

/** W_c, nu, the critical value and y with their 95 % intervals; chi², dof and p are in the figures beside. */
export function parametersTable(result: ScalingAnalysis): AnalysisTable {
  const v = result.model.variable;
  const rows = [
    intervalRow(`${v}c`, `critical ${v === 'W' ? 'disorder' : 'energy'}`, result.Wc),
    intervalRow('nu', 'critical exponent', result.nu),
    intervalRow(`${observableKey(result.model.observable)}c`, `critical ${observableSymbol(result.model.observable)}`, result.critical),
    ...(result.y ? [intervalRow('y', 'irrelevant exponent', result.y)] : []),
  ];
  const decimals = new Map(rows.map((r) => [r.quantity, decimalsFor(((r.hi as number) - (r.lo as number)) / 2)]));
  const fixed = (value: Cell, row: Row) => {
    const places = decimals.get(row.quantity as string);
    if (typeof value !== 'number') return '—';
    return places === undefined ? formatSignificant(value) : formatFixed(value, places);
  };
  // How well the model fits, in the same file: a parameter table without its chi² is not read alone.
  rows.push(
    { quantity: 'chi2', name: 'chi-square of the fit', value: result.chi2, lo: null, hi: null },
    { quantity: 'dof', name: 'degrees of freedom', value: result.dof, lo: null, hi: null },
    { quantity: 'p', name: 'goodness-of-fit probability', value: result.p, lo: null, hi: null },
  );
  return {
    id: 'parameters',
    caption: `Fitted critical parameters with 95 % intervals (${result.intervals.method}${result.intervals.method === 'bootstrap' ? `, ${result.intervals.samples} refits` : ''})`,
    columns: [
      { key: 'quantity', label: 'Quantity', rowHeader: true },
      { key: 'name', label: 'Meaning' },
      { key: 'value', label: 'Estimate', numeric: true, format: fixed },
      { key: 'lo', label: '95 % from', numeric: true, format: fixed },
      { key: 'hi', label: 'to', numeric: true, format: fixed },
    ],
    rows,
  };
}

/** Every model the scan tried, simple to rich, the reported one marked. */
export function scanTable(result: ScalingAnalysis): AnalysisTable {
  const v = result.model.variable;
  const rows: Row[] = result.scan.map((r) => ({
    nr: r.orders.nr,
    ni: r.orders.ni,
    mr: r.orders.mr,
    mi: r.orders.mi,
    parameters: r.parameters,
    [`${v}c`]: r.Wc,
    nu: r.nu,
    critical: r.critical,
    y: r.y,
    chi2: r.chi2,
    dof: r.dof,
    p: r.p,
    chosen: r.selected,
    note: r.error?.message ?? null,
  }));
  // Each estimate to the decimals the reported model's interval supports, so the models compare digit by digit.
  const half = (i: Interval | undefined) => (i ? (i.hi - i.lo) / 2 : Number.NaN);
  const fixed = (interval: Interval | undefined, fallback: number) => {
    const decimals = interval ? decimalsFor(half(interval)) : fallback;
    return (value: Cell) => formatFixed(typeof value === 'number' ? value : null, decimals);
  };
  return {
    id: 'model-scan',
    caption: 'Models tried by the scan, from the fewest parameters; the one reported is marked',
    columns: [
      { key: 'nr', label: 'n', sub: 'r', numeric: true, format: whole },
      { key: 'ni', label: 'n', sub: 'i', numeric: true, format: whole },
      { key: 'mr', label: 'm', sub: 'r', numeric: true, format: whole },
      { key: 'mi', label: 'm', sub: 'i', numeric: true, format: whole },
      { key: 'parameters', label: 'Parameters', numeric: true, format: whole },
      { key: `${v}c`, label: v, sub: 'c', numeric: true, format: fixed(result.Wc, 3) },
      { key: 'nu', label: 'ν', numeric: true, format: fixed(result.nu, 3) },
      { key: 'critical', label: observableSymbol(result.model.observable), sub: 'c', numeric: true, format: fixed(result.critical, 4) },
      { key: 'y', label: 'y', numeric: true, format: fixed(result.y, 2) },
      { key: 'chi2', label: 'χ²', numeric: true, format: (value) => formatChi2(typeof value === 'number' ? value : null) },
      { key: 'dof', label: 'dof', numeric: true, format: whole },
      { key: 'p', label: 'p', numeric: true, format: (value) => formatProbability(typeof value === 'number' ? value : null) },
      { key: 'chosen', label: 'Reported', format: (value) => (value ? 'reported' : '') },
      { key: 'note', label: 'Note', format: (value) => (typeof value === 'string' ? value : '') },
    ],
    rows,
  };
}

/** Where the curves of successive sizes cross, with the errors propagated from the points. */
export function crossingsTable(result: ScalingAnalysis): AnalysisTable {
  const v = result.model.variable;
  const o = observableKey(result.model.observable);
  const symbol = observableSymbol(result.model.observable);
  const xDecimals = decimalsOfErrors(result.crossings.map((c) => c.xError));
  const valueDecimals = decimalsOfErrors(result.crossings.map((c) => c.valueError));
  return {
    id: 'crossings',
    caption: `Crossings of successive sizes: where ${symbol}(${v}) of L₁ and L₂ meet`,
    columns: [
      { key: 'L1', label: 'L', sub: '1', numeric: true, rowHeader: true, format: whole },
      { key: 'L2', label: 'L', sub: '2', numeric: true, format: whole },
      { key: v, label: v, sub: '×', numeric: true, format: withDecimals(xDecimals) },
      { key: `${v}Error`, label: `± ${v}`, numeric: true, format: withDecimals(xDecimals) },
      { key: o, label: symbol, sub: '×', numeric: true, format: withDecimals(valueDecimals) },
      { key: `${o}Error`, label: `± ${symbol}`, numeric: true, format: withDecimals(valueDecimals) },
    ],
    rows: result.crossings.map((c) => ({ L1: c.sizes[0], L2: c.sizes[1], [v]: c.x, [`${v}Error`]: c.xError, [o]: c.value, [`${o}Error`]: c.valueError })),
  };
}

/** How the crossing moves from one pair of sizes to the next. */
export function driftTable(result: ScalingAnalysis): AnalysisTable {
  const v = result.model.variable;
  const decimals = decimalsOfErrors(result.crossingDrift.shifts.map((s) => s.shiftError));
  const size = (value: Cell) => (typeof value === 'number' ? formatSignificant(value, 3) : '—');
  return {
    id: 'crossing-drift',
    caption: `Shift of the crossing ${v} from one pair of sizes to the next (pairs named by the geometric mean of their sizes)`,
    columns: [
      { key: 'fromSize', label: 'From L', numeric: true, rowHeader: true, format: size },
      { key: 'toSize', label: 'to L', numeric: true, format: size },
      { key: 'shift', label: `Δ${v}`, numeric: true, format: (value) => signed(value, decimals) },
      { key: 'shiftError', label: `± Δ${v}`, numeric: true, format: withDecimals(decimals) },
    ],
    rows: result.crossingDrift.shifts.map((s) => ({ fromSize: s.from, toSize: s.to, shift: s.shift, shiftError: s.shiftError })),
  };
}

function signed(value: Cell, decimals: number): string {
  if (typeof value !== 'number') return '—';
  const text = formatFixed(value, decimals);
  return value > 0 && text !== formatFixed(0, decimals) ? `+${text}` : text;
}

/**
 * The points the fit used, by size: the chart of the observable against W. They are the measured
 * ones; an analysis stored before results carried them falls back on the collapse, whose values
 * are corrected when the model has an irrelevant term (`correctedPoints` says so).
 */
export function pointsTable(result: ScalingAnalysis): AnalysisTable {
  const v = result.model.variable;
  const o = observableKey(result.model.observable);
  const symbol = observableSymbol(result.model.observable);
  const points = [...measuredPoints(result)].sort((a, b) => a.L - b.L || a.x - b.x);
  const decimals = decimalsOfErrors(points.map((p) => p.error));
  return {
    id: 'points',
    caption: `${symbol} against ${v} for each size L, with standard errors${correctedPoints(result) ? ' (the fitted irrelevant correction taken out)' : ''}`,
    columns: [
      { key: 'L', label: 'L', numeric: true, rowHeader: true, format: whole },
      { key: v, label: v, numeric: true, format: (value) => formatSignificant(typeof value === 'number' ? value : null, 6) },
      { key: o, label: symbol, numeric: true, format: withDecimals(decimals) },
      { key: `${o}Error`, label: `± ${symbol}`, numeric: true, format: withDecimals(decimals) },
    ],
    rows: points.map((p) => ({ L: p.L, [v]: p.x, [o]: p.value, [`${o}Error`]: p.error })),
  };
}

/** The measured points, or the collapse's for a result stored without them. */
export function measuredPoints(result: ScalingAnalysis): { L: number; x: number; value: number; error: number }[] {
  return result.measured ?? result.collapse.points;
}

/** True when the points shown against W are not the measured ones but corrected for the irrelevant term. */
export function correctedPoints(result: ScalingAnalysis): boolean {
  return !result.measured && result.model.ni > 0;
}

/** The collapse: each point on the scaling variable psi = chi_r(w) L^(1/nu). */
export function collapseTable(result: ScalingAnalysis): AnalysisTable {
  const v = result.model.variable;
  const o = observableKey(result.model.observable);
  const symbol = observableSymbol(result.model.observable);
  const points = [...result.collapse.points].sort((a, b) => a.L - b.L || a.x - b.x);
  const decimals = decimalsOfErrors(points.map((p) => p.error));
  return {
    id: 'collapse',
    caption: `Each point on the scaling variable ψ, sizes in order`,
    columns: [
      { key: 'L', label: 'L', numeric: true, rowHeader: true, format: whole },
      { key: v, label: v, numeric: true, format: (value) => formatSignificant(typeof value === 'number' ? value : null, 6) },
      { key: 'psi', label: 'ψ', numeric: true },
      { key: o, label: symbol, numeric: true, format: withDecimals(decimals) },
      { key: `${o}Error`, label: `± ${symbol}`, numeric: true, format: withDecimals(decimals) },
    ],
    rows: points.map((p) => ({ L: p.L, [v]: p.x, psi: p.scalingVariable, [o]: p.value, [`${o}Error`]: p.error })),
  };
}

/** The fitted scaling function sampled along psi: the curve of the collapse chart. */
export function collapseCurveTable(result: ScalingAnalysis): AnalysisTable {
  const o = observableKey(result.model.observable);
  const symbol = observableSymbol(result.model.observable);
  return {
    id: 'collapse-curve',
    caption: `The fitted scaling function ${symbol}(ψ), sampled evenly over the points' range`,
    columns: [
      { key: 'psi', label: 'ψ', numeric: true, rowHeader: true },
      { key: o, label: symbol, numeric: true },
    ],
    rows: result.collapse.curve.map((c) => ({ psi: c.scalingVariable, [o]: c.value })),
  };
}

/** The numerical beta function from successive sizes at the same W. */
export function betaTable(result: ScalingAnalysis): AnalysisTable {
  const v = result.model.variable;
  const o = observableKey(result.model.observable);
  const symbol = observableSymbol(result.model.observable);
  const ln = `ln${o}`;
  const lnDecimals = decimalsOfErrors(result.beta.map((b) => b.lnValueError));
  const betaDecimals = decimalsOfErrors(result.beta.map((b) => b.betaError));
  return {
    id: 'beta',
    caption: `β = d ln ${symbol} / d ln L from successive sizes at the same ${v}`,
    columns: [
      { key: 'L1', label: 'L', sub: '1', numeric: true, rowHeader: true, format: whole },
      { key: 'L2', label: 'L', sub: '2', numeric: true, format: whole },
      { key: v, label: v, numeric: true, format: (value) => formatSignificant(typeof value === 'number' ? value : null, 6) },
      { key: ln, label: `ln ${symbol}`, numeric: true, format: withDecimals(lnDecimals) },
      { key: `${ln}Error`, label: `± ln ${symbol}`, numeric: true, format: withDecimals(lnDecimals) },
      { key: 'beta', label: 'β', numeric: true, format: withDecimals(betaDecimals) },
      { key: 'betaError', label: '± β', numeric: true, format: withDecimals(betaDecimals) },
    ],
    rows: result.beta.map((b) => ({ L1: b.sizes[0], L2: b.sizes[1], [v]: b.x, [ln]: b.lnValue, [`${ln}Error`]: b.lnValueError, beta: b.beta, betaError: b.betaError })),
  };
}
