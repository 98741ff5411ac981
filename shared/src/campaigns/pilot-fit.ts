import type { ErrorDetail } from '../errors/app-error';
import { PilotTiming, pilotSetProblems } from './campaign-spec.schema';

/**
 * Pilot timings calibrate the cost model to a machine: a power law core-seconds = A × L^b fitted
 * by ordinary least squares on (ln L, ln core-seconds). Each pilot is one job with the campaign's
 * own settings (precision, moments, …) at size L.
 */
export interface PilotFit {
  points: number;
  prefactor: number;
  exponent: number;
  /** Coefficient of determination of the log–log fit. */
  rSquared: number;
  /** Per pilot: measured and fitted core-seconds, and ln(measured / fitted). */
  residuals: { size: number; coreSeconds: number; fitted: number; logResidual: number }[];
  sizeRange: { min: number; max: number };
}

/** Fit needs two distinct sizes; the schema checks this before a fit is ever asked for. */
export function fitPilotTimings(timings: readonly PilotTiming[]): PilotFit {
  const xs = timings.map((t) => Math.log(t.size));
  const ys = timings.map((t) => Math.log(t.seconds * t.cores));
  const n = xs.length;
  const mx = xs.reduce((a, b) => a + b, 0) / n;
  const my = ys.reduce((a, b) => a + b, 0) / n;
  let sxx = 0;
  let sxy = 0;
  let syy = 0;
  for (let i = 0; i < n; i++) {
    sxx += (xs[i] - mx) ** 2;
    sxy += (xs[i] - mx) * (ys[i] - my);
    syy += (ys[i] - my) ** 2;
  }
  if (sxx === 0) throw new Error('pilot timings need at least two different sizes');
  const exponent = sxy / sxx;
  const intercept = my - exponent * mx;
  const residuals = timings.map((t, i) => {
    const fittedLog = intercept + exponent * xs[i];
    return { size: t.size, coreSeconds: t.seconds * t.cores, fitted: Math.exp(fittedLog), logResidual: ys[i] - fittedLog };
  });
  const sse = residuals.reduce((s, r) => s + r.logResidual ** 2, 0);
  const sizes = timings.map((t) => t.size);
  return {
    points: n,
    prefactor: Math.exp(intercept),
    exponent,
    // All times equal (syy = 0) is a perfect, flat fit.
    rSquared: syy === 0 ? 1 : 1 - sse / syy,
    residuals,
    sizeRange: { min: Math.min(...sizes), max: Math.max(...sizes) },
  };
}

export const PILOT_COLUMNS = ['size', 'seconds', 'cores'] as const;

/**
 * Read a pilot-timings CSV (a header with size, seconds and cores in any order, extra columns
 * allowed). Problems carry the path they would have in the spec and the CSV line, so the form,
 * the api and the CLI report them alike.
 */
export function parsePilotCsv(text: string): { timings: PilotTiming[]; problems: ErrorDetail[] } {
  const lines = text.replace(/^\uFEFF/, '').split(/\r?\n/);
  const problems: ErrorDetail[] = [];
  const headerIndex = lines.findIndex((l) => l.trim() !== '' && !l.trim().startsWith('#'));
  if (headerIndex < 0) return { timings: [], problems: [{ path: ['pilotTimings'], message: 'the pilot CSV is empty; it needs a header line size,seconds,cores and one line per pilot job' }] };
  const header = lines[headerIndex].split(',').map((h) => h.trim().toLowerCase());
  const missing = PILOT_COLUMNS.filter((c) => !header.includes(c));
  if (missing.length) {
    return {
      timings: [],
      problems: [{ path: ['pilotTimings'], message: `the pilot CSV needs the columns ${PILOT_COLUMNS.join(', ')}; missing: ${missing.join(', ')} (header read: ${header.join(', ') || 'nothing'})` }],
    };
  }
  const col = Object.fromEntries(PILOT_COLUMNS.map((c) => [c, header.indexOf(c)])) as Record<(typeof PILOT_COLUMNS)[number], number>;
  const timings: PilotTiming[] = [];
  let rowIndex = -1;
  for (let i = headerIndex + 1; i < lines.length; i++) {
    const line = lines[i].trim();
    if (line === '' || line.startsWith('#')) continue;
    rowIndex++;
    const cells = line.split(',').map((c) => c.trim());
    const row = Object.fromEntries(PILOT_COLUMNS.map((c) => [c, cells[col[c]] === undefined || cells[col[c]] === '' ? Number.NaN : Number(cells[col[c]])]));
    const parsed = PilotTiming.safeParse(row);
    if (parsed.success) {
      timings.push(parsed.data);
      continue;
    }
    for (const issue of parsed.error.issues) {
      const field = String(issue.path[0] ?? '');
      const raw = cells[col[field as keyof typeof col]];
      const message = raw === undefined || raw === '' || Number.isNaN(Number(raw)) ? `${field} must be a number (read "${raw ?? ''}")` : issue.message;
      problems.push({ path: ['pilotTimings', rowIndex, field], message: `line ${i + 1}: ${message}` });
    }
  }
  if (problems.length === 0) problems.push(...pilotSetProblems(timings));
  return { timings, problems };
}
