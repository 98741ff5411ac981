import { IMPORT_FIELD_LABELS, IMPORT_FIELDS, type ImportField, type ImportMapping, type ImportRow, type RunImportResult } from '@localis/shared';

/** What a column may be mapped to: a run field or nothing. */
export type ColumnChoice = ImportField | 'ignore';

export const IGNORE_LABEL = 'Ignore this column';

export const MAPPING_OPTIONS: readonly { label: string; value: ColumnChoice }[] = [
  ...IMPORT_FIELDS.map((f) => ({ label: IMPORT_FIELD_LABELS[f], value: f })),
  { label: IGNORE_LABEL, value: 'ignore' },
];

/**
 * What each column is mapped to now: the person's choice first, then what the server guessed
 * from the header; null while an unknown column waits for a choice.
 */
export function columnChoices(result: Pick<RunImportResult, 'columns' | 'mapping'>, chosen: ImportMapping): Record<string, ColumnChoice | null> {
  const choices: Record<string, ColumnChoice | null> = {};
  for (const column of result.columns) choices[column] = Object.hasOwn(chosen, column) ? chosen[column] : (result.mapping[column] ?? null);
  return choices;
}

/** Fields that more than one column is mapped to: each field may come from one column only. */
export function fieldsMappedTwice(choices: Record<string, ColumnChoice | null>): ImportField[] {
  const counts = new Map<ImportField, number>();
  for (const choice of Object.values(choices)) if (choice && choice !== 'ignore') counts.set(choice, (counts.get(choice) ?? 0) + 1);
  return IMPORT_FIELDS.filter((f) => (counts.get(f) ?? 0) > 1);
}

/** The fields a run needs and no column gives, in words: "Job id", "End or Elapsed (…)". */
export function missingFieldLabel(missing: string): string {
  return missing
    .split(' or ')
    .map((part) => (IMPORT_FIELDS as readonly string[]).includes(part) ? IMPORT_FIELD_LABELS[part as ImportField] : part)
    .join(' or ');
}

export type RowStatus = 'ok' | 'error' | 'duplicate';

/** Errors first: a row with errors and a duplicate job id needs fixing either way. */
export function rowStatus(row: ImportRow): RowStatus {
  if (row.errors.length > 0) return 'error';
  return row.duplicate ? 'duplicate' : 'ok';
}

export const DUPLICATE_LABELS: Record<NonNullable<ImportRow['duplicate']>, string> = {
  'in-file': 'This job id appears more than once in the file',
  recorded: 'A run with this job id is already recorded on this machine',
};

/**
 * Why the runs cannot be recorded yet, in words; none means the commit may go ahead. `stale` is
 * set while the mapping or defaults changed after the last preview.
 */
export function commitBlockers(result: RunImportResult | null, choices: Record<string, ColumnChoice | null>, stale: boolean): string[] {
  if (!result) return ['Preview the file first.'];
  const blockers: string[] = [];
  if (stale) blockers.push('The mapping changed since the preview; wait for the new preview.');
  const unchosen = Object.entries(choices).filter(([, choice]) => choice === null).map(([column]) => column);
  if (unchosen.length) blockers.push(`Choose a field or "ignore" for ${unchosen.length === 1 ? 'the column' : 'the columns'} ${unchosen.map((c) => `“${c}”`).join(', ')}.`);
  const twice = fieldsMappedTwice(choices);
  if (twice.length) blockers.push(`Map ${twice.map((f) => IMPORT_FIELD_LABELS[f]).join(', ')} from one column only.`);
  if (result.missingFields.length) blockers.push(`No column gives ${result.missingFields.map(missingFieldLabel).join(', ')}.`);
  if (result.summary.rows === 0) blockers.push('The file has no rows to record.');
  if (result.summary.withErrors) blockers.push(`${countText(result.summary.withErrors, 'row has', 'rows have')} errors; correct the file and upload it again.`);
  if (result.summary.duplicates) blockers.push(`${countText(result.summary.duplicates, 'row repeats', 'rows repeat')} a job id; remove ${result.summary.duplicates === 1 ? 'it' : 'them'} from the file.`);
  if (!result.ledger.allowed) blockers.push('The grant does not cover these runs, even with the round’s overdraft.');
  return blockers;
}

function countText(n: number, one: string, many: string): string {
  return `${n.toLocaleString('en')} ${n === 1 ? one : many}`;
}

/** The wizard's steps and which of them may be opened now. */
export type ImportStep = 'source' | 'preview' | 'commit';

export function enabledSteps(state: { hasSource: boolean; result: RunImportResult | null; blockers: string[]; committed: boolean }): Record<ImportStep, boolean> {
  return {
    // Once recorded, going back would only invite importing the same runs twice.
    source: !state.committed,
    preview: !state.committed && state.hasSource && state.result !== null,
    commit: state.committed || (state.result !== null && state.blockers.length === 0),
  };
}

/** The person's choices to send: only columns they chose, the rest the server guesses again. */
export function mappingToSend(chosen: ImportMapping, columns: readonly string[]): ImportMapping {
  return Object.fromEntries(Object.entries(chosen).filter(([column]) => columns.includes(column)));
}
