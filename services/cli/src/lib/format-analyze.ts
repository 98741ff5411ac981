import { DEFAULT_ACCEPT_P, observableName, ordersLabel, type Interval, type ScalingAnalysis } from '@localis/shared';

export interface AnalysisContext {
  /** How the table is named: its path, or "standard input". */
  name: string;
  energy: number | null;
  bootstrap: number;
}

export const SCREENING_NOTE =
  'This is a screening analysis of the given data, not a publication-grade study: check that W_c and nu stay put ' +
  'across the scan, under a narrower W range and without the smallest size before quoting them.';

/**
 * The analysis as a reader at a terminal wants it: the critical point and exponent with their 95 %
 * intervals first, then the fit's quality and model, the scan, the crossings and the warnings.
 * One fact per line, so `localis analyze table.csv | grep nu` works.
 */
export function formatAnalysis(a: ScalingAnalysis, ctx: AnalysisContext): string {
  const { model } = a;
  const v = model.variable;
  const obs = observableName(model.observable);
  const at = ctx.energy === null ? '' : ` at E = ${num(ctx.energy)}`;
  const chosen =
    model.chosenBy === 'user' ? 'given with --orders' : `chosen by the scan: the simplest with p >= ${DEFAULT_ACCEPT_P}, else the best`;
  const intervals =
    a.intervals.method === 'bootstrap'
      ? `bootstrap, ${a.intervals.samples} samples${a.intervals.failed ? ` (${a.intervals.failed} failed)` : ''}, seed ${a.intervals.seed}`
      : 'linearized from the covariance matrix (--bootstrap 0)';

  const lines = [
    `Finite-size scaling of ${obs} against ${v}${at}, ${ctx.name}`,
    `Data: sizes L = ${model.sizes.join(', ')}; ${v} from ${num(model.range.min)} to ${num(model.range.max)}; ${model.points} points`,
    '',
    `${v}_c = ${withInterval(a.Wc)}`,
    `nu = ${withInterval(a.nu)}`,
    `${obs}_c = ${withInterval(a.critical)}`,
    ...(a.y ? [`y = ${withInterval(a.y)}  (irrelevant exponent)`] : []),
    `chi²/dof = ${num(a.chi2)}/${a.dof} = ${a.dof > 0 ? (a.chi2 / a.dof).toFixed(2) : '-'}, p = ${num(a.p)}`,
    `Model: ${ordersLabel(model)}, ${model.parameters} parameters (${chosen})`,
    `Intervals: 95 %, ${intervals}`,
    '',
    `Model scan (p >= ${DEFAULT_ACCEPT_P} fits the data within their errors; * = reported):`,
    ...table(
      ['', 'nr', 'ni', 'mr', 'mi', 'params', `${v}_c`, 'nu', `${obs}_c`, 'chi²/dof', 'p'],
      a.scan.map((r) => [
        r.selected ? '*' : '',
        String(r.orders.nr),
        String(r.orders.ni),
        String(r.orders.mr),
        String(r.orders.mi),
        String(r.parameters),
        ...(r.error
          ? ['-', '-', '-', '-', `not fitted: ${r.error.reason}`]
          : [num(r.Wc), num(r.nu), num(r.critical), r.dof > 0 && r.chi2 !== null ? (r.chi2 / r.dof).toFixed(2) : '-', num(r.p)]),
      ]),
      [false, true, true, true, true, true, true, true, true, true, false],
    ),
    '',
  ];

  if (a.crossings.length) {
    lines.push('Crossings of successive sizes:');
    for (const c of a.crossings) {
      lines.push(`  L = ${c.sizes[0]} and ${c.sizes[1]}: ${v} = ${withError(c.x, c.xError)}, ${obs} = ${withError(c.value, c.valueError)}`);
    }
    const drift = a.crossingDrift;
    if (drift.slopeVsInverseSize) {
      lines.push(
        `  Drift with size: ${drift.direction === 'none' ? 'none beyond two standard errors' : drift.direction} ` +
          `(slope against 1/L ${withError(drift.slopeVsInverseSize.value, drift.slopeVsInverseSize.error)})`,
      );
    }
  } else {
    lines.push('Crossings of successive sizes: none in this range.');
  }
  lines.push(`Beta function: ${a.beta.length} points (in --json).`, '');

  if (a.warnings.length) {
    lines.push('Warnings:');
    for (const w of a.warnings) lines.push(`  [warning] ${w}`);
    lines.push('');
  }
  lines.push(SCREENING_NOTE);
  return lines.join('\n');
}

/** The one line redrawn on a terminal's stderr while the fits run. */
export function formatAnalyzeProgress(done: number, total: number): string {
  return `localis analyze: ${Math.floor((100 * done) / Math.max(1, total))} %  fit ${done} of ${total}`;
}

function withInterval(i: Interval): string {
  return `${num(i.value)}  (95 %: ${num(i.lo)} to ${num(i.hi)})`;
}

/** The value to the digits its error allows: two significant digits of the error. */
function withError(value: number, err: number): string {
  if (!Number.isFinite(value)) return String(value);
  if (!(err > 0) || !Number.isFinite(err)) return num(value);
  const decimals = Math.min(15, Math.max(0, 1 - Math.floor(Math.log10(err))));
  return `${value.toFixed(decimals)} ± ${err.toFixed(decimals)}`;
}

function num(v: number | null): string {
  if (v === null) return '-';
  if (!Number.isFinite(v)) return String(v);
  return Number(v.toPrecision(4)).toString();
}

function table(header: string[], rows: string[][], right: boolean[]): string[] {
  const widths = header.map((h, i) => Math.max(h.length, ...rows.map((r) => r[i].length)));
  const line = (cells: string[]) =>
    ('  ' + cells.map((c, i) => (right[i] ? c.padStart(widths[i]) : i === cells.length - 1 ? c : c.padEnd(widths[i]))).join('  ')).trimEnd();
  return [line(header), ...rows.map(line)];
}
