import {
  disorderValues,
  GOAL_LABELS,
  METHOD_LABELS,
  MODEL_LABELS,
  SYMMETRY_CLASS_SIGNATURE,
  type CampaignSpec,
  type EstimateReport,
} from '@localis/shared';

/**
 * The estimate as a reader at a terminal wants it: what was estimated, a table per size L, the
 * total, what the speed rests on, the assumptions and the notices. One fact per line, so
 * `localis estimate spec.json | grep Total` works.
 */
export function formatEstimate(spec: CampaignSpec, report: EstimateReport): string {
  const jobs = report.rows[0]?.jobs ?? 0;
  const lines = [
    `${METHOD_LABELS[spec.method]}, d = ${spec.dimension}, class ${spec.symmetryClass} (${SYMMETRY_CLASS_SIGNATURE[spec.symmetryClass].name}), ${MODEL_LABELS[spec.model]}`,
    `Goal: ${GOAL_LABELS[spec.goal]}`,
    `Grid: ${describeDisorder(spec)} × ${describeList('E', spec.energies, 'energies')} × ${plural(spec.realizations, 'realization')} = ${plural(jobs, 'job')} per size`,
    '',
    ...table(
      ['L', 'points', 'jobs', 'operations/job', 'core-hours', 'share', 'peak memory', 'fits node'],
      report.rows.map((r) => [
        String(r.size),
        count(r.points),
        count(r.jobs),
        scientific(r.operations),
        coreHours(r.coreHours),
        percent(r.share),
        bytes(r.peakMemoryBytes),
        r.fitsNode ? 'yes' : 'no',
      ]),
      // The last column is text: left-aligned, and no trailing spaces.
      [true, true, true, true, true, true, true, false],
    ),
    '',
    `Total: ${coreHours(report.totalCoreHours)} core-hours`,
    `Peak memory per job: ${bytes(report.peakMemoryBytes)}; a node has ${bytes(report.nodeMemoryBytes)}` +
      (report.fitsNode ? '' : `, too little at L = ${report.rows.filter((r) => !r.fitsNode).map((r) => r.size).join(', ')}`),
    `Rate: ${describeRate(report)}`,
    '',
    'Assumptions:',
    ...report.assumptions.map((a) => `  - ${a}`),
    '',
    ...(report.notices.length
      ? ['Notices:', ...report.notices.map((n) => `  [${n.severity}] ${n.message} (${n.code})`)]
      : ['Notices: none']),
  ];
  return lines.join('\n');
}

function describeRate(report: EstimateReport): string {
  if (report.rate.source === 'default') {
    return `default, ${(report.rate.flopsPerCore / 1e9).toFixed(1)} GFLOP/s sustained per core (no pilot timings; calibrate it with --pilot <csv>)`;
  }
  const { fit } = report.rate;
  return (
    `pilot fit of ${plural(fit.points, 'timing')} (L from ${fit.sizeRange.min} to ${fit.sizeRange.max}): ` +
    `core-seconds per job = ${scientific(fit.prefactor)} × L^${fit.exponent.toFixed(2)}, R² = ${fit.rSquared.toFixed(3)} ` +
    `(the method's asymptotic exponent is ${report.sizeExponent})`
  );
}

function describeDisorder(spec: CampaignSpec): string {
  const ws = disorderValues(spec.disorder);
  if (spec.disorder.values) return describeList('W', ws, 'disorder values');
  if (ws.length === 1) return `W = ${ws[0]}`;
  return `W from ${ws[0]} to ${ws[ws.length - 1]} in steps of ${spec.disorder.step} (${ws.length} values)`;
}

/** A short list in full (`E = -1, 0, 1`), a long one by its ends. */
function describeList(symbol: string, values: readonly number[], noun: string): string {
  if (values.length <= 5) return `${symbol} = ${values.join(', ')}`;
  return `${values.length.toLocaleString('en')} ${noun} from ${Math.min(...values)} to ${Math.max(...values)}`;
}

function plural(n: number, noun: string): string {
  return `${count(n)} ${noun}${n === 1 ? '' : 's'}`;
}

function count(n: number): string {
  return n.toLocaleString('en');
}

/** 2.61e12: the trade's way to write operation counts, without JavaScript's `e+`. */
function scientific(x: number): string {
  return x.toExponential(2).replace('e+', 'e');
}

/** Whole core-hours once they are many; three significant digits below that; absurd or tiny ones in exponent form. */
function coreHours(x: number): string {
  if (x === 0) return '0';
  if (x >= 1e10) return scientific(x);
  if (x >= 1000) return Math.round(x).toLocaleString('en');
  if (x < 0.001) return scientific(x);
  return x.toLocaleString('en', { maximumSignificantDigits: 3 });
}

function percent(share: number): string {
  if (share > 0 && share < 0.001) return '< 0.1 %';
  return `${(share * 100).toFixed(1)} %`;
}

const BYTE_UNITS = ['B', 'KiB', 'MiB', 'GiB', 'TiB', 'PiB', 'EiB'] as const;

/** Binary units, three significant digits: node memory is sold and reported in GiB. */
function bytes(n: number): string {
  const exp = n < 1024 ? 0 : Math.min(BYTE_UNITS.length - 1, Math.floor(Math.log(n) / Math.log(1024)));
  return `${(n / 1024 ** exp).toLocaleString('en', { maximumSignificantDigits: 3 })} ${BYTE_UNITS[exp]}`;
}

/** Columns padded to their widest cell; `right[i]` right-aligns the numbers of column i. */
export function table(header: string[], rows: string[][], right: boolean[]): string[] {
  const widths = header.map((h, i) => Math.max(h.length, ...rows.map((r) => r[i].length)));
  const line = (cells: string[]) =>
    '  ' + cells.map((c, i) => (right[i] ? c.padStart(widths[i]) : i === cells.length - 1 ? c : c.padEnd(widths[i]))).join('  ');
  return [line(header), ...rows.map(line)];
}
