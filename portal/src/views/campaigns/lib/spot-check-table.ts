import { SPOT_CHECK_LIMIT, type SpotCheck, type SpotCheckRow, type SpotCheckState } from '@localis/shared';
import { formatCount } from '../../../lib/formatters';
import { decimalsFor, formatFixed, formatSignificant } from './analysis-format';
import type { AnalysisTable, Row } from './analysis-tables';

/**
 * The reproducibility spot-checks as the analysis page shows them: per archive, the points the
 * worker recomputed with Localis's transfer-matrix kernel beside the archive's own, z in combined
 * standard errors, and the `localis tmm` command that repeats each point; all rows as one table
 * for the CSV and JSON downloads.
 */

/** States the worker has still to finish: the page asks again while one is shown. */
const MOVING_SPOT_CHECK_STATES: readonly SpotCheckState[] = ['queued', 'running'];

export function isSpotCheckMoving(check: Pick<SpotCheck, 'state'>): boolean {
  return MOVING_SPOT_CHECK_STATES.includes(check.state);
}

export const SPOT_CHECK_STATE_WORDS: Record<SpotCheckState, string> = {
  queued: 'Waiting for the worker',
  running: 'Running',
  done: 'Done',
  'not-applicable': 'Not applicable',
  failed: 'Failed',
};

export const SPOT_CHECK_STATE_SEVERITY: Record<SpotCheckState, 'secondary' | 'info' | 'success' | 'danger'> = {
  queued: 'secondary',
  running: 'info',
  done: 'success',
  'not-applicable': 'secondary',
  failed: 'danger',
};

/**
 * The command that repeats one point on anyone's machine. Numbers are written in full (the
 * shortest text that reads back to the same double) and with an ASCII minus: it is run, not read.
 */
export function spotCheckCommand(row: Pick<SpotCheckRow, 'dimension' | 'L' | 'W' | 'E' | 'precision' | 'seed'>): string {
  return `localis tmm --dim ${row.dimension} --width ${row.L} --disorder ${row.W} --energy ${row.E} --precision ${row.precision} --seed ${row.seed}`;
}

/** z with two decimals and its sign always written ("+1.24", "−3.40", "0.00"): a difference reads both ways. */
export function formatZ(z: number): string {
  if (Number.isNaN(z)) return '—';
  if (!Number.isFinite(z)) return z > 0 ? '+∞' : '−∞';
  const text = formatFixed(z, 2);
  if (text === '0.00') return text;
  return z > 0 ? `+${text}` : text;
}

/** Decimals shared by the reported and the recomputed value of a row, so they compare digit by digit. */
export function rowDecimals(row: Pick<SpotCheckRow, 'reportedErr' | 'recomputedErr'>): number {
  const errors = [row.reportedErr, row.recomputedErr].filter((e) => Number.isFinite(e) && e > 0);
  return decimalsFor(errors.length ? Math.min(...errors) : Number.NaN);
}

/** "0.5734 ± 0.0021" */
export function formatWithError(value: number, error: number, decimals: number): string {
  return `${formatFixed(value, decimals)} ± ${formatFixed(error, decimals)}`;
}

/** W and E as the table shows them: up to six significant digits, no trailing noise. */
export function formatParameter(value: number): string {
  return formatSignificant(value, 6);
}

/** "2 of 3 points within 3 standard errors; 1 flagged." Null while there is nothing to count. */
export function spotCheckSummary(rows: readonly Pick<SpotCheckRow, 'flagged'>[]): string | null {
  if (!rows.length) return null;
  const flagged = rows.filter((r) => r.flagged).length;
  const within = `${rows.length - flagged} of ${formatCount(rows.length, 'point')} within ${SPOT_CHECK_LIMIT} standard errors`;
  return flagged ? `${within}; ${flagged} flagged.` : `${within}.`;
}

/** Over all the campaign's archives: "Over 2 archives, 5 of 6 points within 3 standard errors; 1 flagged." */
export function campaignSpotCheckSummary(checks: readonly Pick<SpotCheck, 'rows'>[]): string | null {
  const checked = checks.filter((c) => c.rows.length);
  const summary = spotCheckSummary(checked.flatMap((c) => c.rows));
  return summary && `Over ${formatCount(checked.length, 'archive')}, ${summary}`;
}

/** How far a running check is, in whole percent; null before the worker has planned its points. */
export function spotCheckPercent(progress: SpotCheck['progress']): number | null {
  if (!progress || progress.total <= 0) return null;
  return Math.min(100, Math.max(0, Math.floor((progress.done / progress.total) * 100)));
}

const SPOT_CHECK_COLUMNS = [
  'archive',
  'archiveId',
  'L',
  'W',
  'E',
  'reported',
  'reportedErr',
  'recomputed',
  'recomputedErr',
  'z',
  'flagged',
  'dimension',
  'precision',
  'seed',
  'slices',
  'seconds',
  'command',
] as const;

/**
 * Every recomputed point of every archive, newest archive first, as a table for the downloads:
 * the raw numbers (no digit lost), which archive each comes from, and the command that repeats it.
 */
export function spotCheckTable(checks: readonly SpotCheck[]): AnalysisTable {
  const rows: Row[] = checks.flatMap((check) =>
    check.rows.map((r) => ({
      archive: check.archiveFileName,
      archiveId: check.archiveId,
      L: r.L,
      W: r.W,
      E: r.E,
      reported: r.reported,
      reportedErr: r.reportedErr,
      recomputed: r.recomputed,
      recomputedErr: r.recomputedErr,
      z: r.z,
      flagged: r.flagged,
      dimension: r.dimension,
      precision: r.precision,
      seed: r.seed,
      slices: r.slices,
      seconds: r.seconds,
      command: spotCheckCommand(r),
    })),
  );
  return {
    id: 'spot-checks',
    caption: 'Reproducibility spot-checks: Lambda points of each archive recomputed with the Localis transfer-matrix kernel',
    columns: SPOT_CHECK_COLUMNS.map((key) => ({ key, label: key })),
    rows,
  };
}

/** The spot-checks as JSON: the campaign, how z is defined and where the flag starts, and the rows keyed like the CSV. */
export function spotCheckJson(table: AnalysisTable, campaignId: string): string {
  const keys = table.columns.map((c) => c.key);
  const rows = table.rows.map((row) => Object.fromEntries(keys.map((k) => [k, row[k] ?? null])));
  const definition = `z = (recomputed - reported) / sqrt(reportedErr^2 + recomputedErr^2); flagged when |z| > ${SPOT_CHECK_LIMIT}`;
  return `${JSON.stringify({ campaignId, table: table.id, caption: table.caption, definition, limit: SPOT_CHECK_LIMIT, columns: keys, rows }, null, 2)}\n`;
}
