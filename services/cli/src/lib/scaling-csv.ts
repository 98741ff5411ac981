import { distinctSorted, sameX, type ErrorDetail, type ScalingObservable, type ScalingPoint } from '@localis/shared';
import { CliError, EXIT } from './cli-error';

/** One row of a scaling table as read: the point, its energy (when the table has an E column) and its line. */
export interface ScalingRow {
  point: ScalingPoint;
  energy: number | null;
  line: number;
}

export interface ScalingCsv {
  rows: ScalingRow[];
  /** Distinct energies, ascending; empty when the table has no E column. */
  energies: number[];
}

/** A plain decimal number as people type it (`16.5`, `-1`, `1e5`); not hex, not empty, not `NaN` or `Infinity`. */
const NUMBER = /^[+-]?(\d+\.?\d*|\.\d+)([eE][+-]?\d+)?$/;

export function columnsOf(observable: ScalingObservable): { required: string[]; value: string; error: string } {
  const value = observable;
  const error = `${observable}_err`;
  return { required: ['L', 'W', value, error], value, error };
}

const unquote = (cell: string) => cell.trim().replace(/^"(.*)"$/, '$1').trim();

/**
 * A scaling table as CSV: a header naming L, W, the observable and its error (E optional, any
 * order, extra columns ignored), then one point per line. Blank lines and `#` lines are skipped.
 * Every malformed line is listed with its line number (exit 2); nothing is guessed or dropped.
 */
export function parseScalingCsv(text: string, name: string, observable: ScalingObservable): ScalingCsv {
  const { required, value, error } = columnsOf(observable);
  const lines = text.split(/\r?\n/);
  const isContent = (line: string) => line.trim() !== '' && !line.trimStart().startsWith('#');
  const headerIndex = lines.findIndex(isContent);
  if (headerIndex < 0) {
    throw new CliError(`${name} is empty; a scaling table needs a header line (${required.join(',')}) and one line per point.`, { exitCode: EXIT.usage });
  }
  const header = lines[headerIndex].split(',').map(unquote);
  const find = (column: string) => header.findIndex((h) => h.toLowerCase() === column.toLowerCase());
  const missing = required.filter((c) => find(c) < 0);
  if (missing.length) {
    const other = observable === 'lambda' ? 'g' : 'lambda';
    const hint =
      find(other) >= 0 && find(`${other}_err`) >= 0
        ? `The table has ${other} and ${other}_err: add --observable ${other}.`
        : `The first line must name the columns, e.g. L,W,E,${value},${error}; extra columns are allowed.`;
    throw new CliError(`line ${headerIndex + 1} of ${name} has no column ${missing.join(', ')} (read "${lines[headerIndex].trim()}").`, {
      exitCode: EXIT.usage,
      hint,
    });
  }
  const index = { L: find('L'), W: find('W'), E: find('E'), value: find(value), error: find(error) };
  const labels = { L: 'L', W: 'W', E: 'E', value, error };

  const rows: ScalingRow[] = [];
  const problems: ErrorDetail[] = [];
  for (let i = headerIndex + 1; i < lines.length; i++) {
    if (!isContent(lines[i])) continue;
    const line = i + 1;
    const cells = lines[i].split(',').map(unquote);
    const bad: string[] = [];
    const read = (key: keyof typeof index): number => {
      const at = index[key];
      const cell = cells[at];
      if (cell === undefined || cell === '') {
        bad.push(`${labels[key]} is missing`);
        return Number.NaN;
      }
      if (!NUMBER.test(cell)) {
        bad.push(`${labels[key]} is not a number (read "${cell}")`);
        return Number.NaN;
      }
      const n = Number(cell);
      if (!Number.isFinite(n)) bad.push(`${labels[key]} is not a finite number (read "${cell}")`);
      return n;
    };
    const point = { L: read('L'), x: read('W'), value: read('value'), error: read('error') };
    const energy = index.E >= 0 ? read('E') : null;
    if (bad.length) problems.push({ path: [`line ${line}`], message: bad.join('; ') });
    else rows.push({ point, energy, line });
  }
  if (problems.length) {
    const count = problems.length === 1 ? 'a malformed line' : `${problems.length} malformed lines`;
    throw new CliError(`${name} has ${count}; nothing was analyzed:`, {
      exitCode: EXIT.usage,
      details: problems,
      hint: `Every line needs numbers in ${index.E >= 0 ? 'L, W, E' : 'L, W'}, ${value} and ${error}.`,
    });
  }
  if (rows.length === 0) {
    throw new CliError(`${name} has a header but no points.`, { exitCode: EXIT.usage });
  }
  const energies = index.E >= 0 ? distinctSorted(rows.map((r) => r.energy as number)) : [];
  return { rows, energies };
}

/**
 * The points of one energy: the only one, or the one `--energy` picks. A table of several
 * energies without `--energy` is refused rather than mixed into one fit.
 */
export function pointsAtEnergy(csv: ScalingCsv, name: string, energy: number | undefined): { points: ScalingPoint[]; energy: number | null } {
  const list = csv.energies.join(', ');
  if (energy === undefined) {
    if (csv.energies.length > 1) {
      throw new CliError(`${name} holds ${csv.energies.length} energies (E = ${list}); a scaling fit takes one.`, {
        exitCode: EXIT.usage,
        hint: `Pick one with --energy, e.g. --energy ${csv.energies[0]}.`,
      });
    }
    return { points: csv.rows.map((r) => r.point), energy: csv.energies[0] ?? null };
  }
  if (csv.energies.length === 0) {
    throw new CliError(`--energy ${energy} was given, but ${name} has no E column.`, {
      exitCode: EXIT.usage,
      hint: 'Add an E column, or leave out --energy.',
    });
  }
  const rows = csv.rows.filter((r) => sameX(r.energy as number, energy));
  if (rows.length === 0) {
    throw new CliError(`${name} has no points at E = ${energy}; its energies are E = ${list}.`, { exitCode: EXIT.usage });
  }
  return { points: rows.map((r) => r.point), energy };
}
