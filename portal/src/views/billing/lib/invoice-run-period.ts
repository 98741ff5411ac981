import { InvoiceRunInput } from '@localis/shared';
import { firstDayOf, isMonth, lastDayOf } from './month-range';

/** One calendar month (the usual run), or a custom range of whole months. */
export type RunMode = 'month' | 'range';

/** What the run form edits: months as `<input type="month">` gives them ('' until chosen). */
export interface RunPeriodValues {
  mode: RunMode;
  month: string;
  fromMonth: string;
  toMonth: string;
}

export type RunPeriodField = 'month' | 'fromMonth' | 'toMonth';
export type RunPeriodErrors = Partial<Record<RunPeriodField, string>>;

/** Where an issue about `from` or `to` (the schema's or the server's) stands in the form. */
export function runPeriodField(path: readonly PropertyKey[], mode: RunMode): RunPeriodField | null {
  if (mode === 'month') return path[0] === 'from' || path[0] === 'to' ? 'month' : null;
  return path[0] === 'from' ? 'fromMonth' : path[0] === 'to' ? 'toMonth' : null;
}

/** Issues sorted onto the month boxes; an issue about no box goes under `month` or `fromMonth`. */
export function runPeriodErrors(issues: readonly { path: readonly PropertyKey[]; message: string }[], mode: RunMode): RunPeriodErrors {
  const errors: RunPeriodErrors = {};
  for (const issue of issues) errors[runPeriodField(issue.path, mode) ?? (mode === 'month' ? 'month' : 'fromMonth')] ??= issue.message;
  return errors;
}

/**
 * The run's `{ from, to }`: the first day of the first month to the last day of the last, checked
 * by the schema the api uses (at most 366 days, the end not before the start). Otherwise the
 * errors, beside the month boxes.
 */
export function runPeriodInput(values: RunPeriodValues): { input: InvoiceRunInput; errors: null } | { input: null; errors: RunPeriodErrors } {
  const errors: RunPeriodErrors = {};
  if (values.mode === 'month') {
    if (!isMonth(values.month)) errors.month = 'choose the month to invoice';
  } else {
    if (!isMonth(values.fromMonth)) errors.fromMonth = 'choose the first month';
    if (!isMonth(values.toMonth)) errors.toMonth = 'choose the last month';
  }
  if (Object.keys(errors).length > 0) return { input: null, errors };
  const [first, last] = values.mode === 'month' ? [values.month, values.month] : [values.fromMonth, values.toMonth];
  const parsed = InvoiceRunInput.safeParse({ from: firstDayOf(first), to: lastDayOf(last) });
  return parsed.success ? { input: parsed.data, errors: null } : { input: null, errors: runPeriodErrors(parsed.error.issues, values.mode) };
}
