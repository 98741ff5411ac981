import { z } from 'zod';

export const MAX_PAGE_SIZE = 200;

/**
 * The paging and sorting part of every list query: `limit`, `offset` and `sort`
 * (a field name, `-field` for descending). Filters are added by each list.
 */
export function listQuery<const F extends readonly [string, ...string[]], S extends z.ZodRawShape>(
  sortable: F,
  filters: S,
  defaultSort: F[number] | `-${F[number]}`,
) {
  const sortValues = sortable.flatMap((f) => [f, `-${f}`]) as [string, ...string[]];
  return z.object({
    limit: z.coerce.number().int().min(1).max(MAX_PAGE_SIZE).default(25),
    offset: z.coerce.number().int().min(0).default(0),
    sort: z
      .enum(sortValues, { message: `sort must be one of: ${sortValues.join(', ')}` })
      .default(defaultSort as string),
    format: z.enum(['json', 'csv']).default('json'),
    ...filters,
  });
}

/** Split `-name` into the field and its direction. */
export function parseSort(sort: string): { field: string; direction: 'ASC' | 'DESC' } {
  return sort.startsWith('-') ? { field: sort.slice(1), direction: 'DESC' } : { field: sort, direction: 'ASC' };
}

/** The answer of every list: one page of items and the total across pages. */
export function page<T extends z.ZodType>(item: T) {
  return z.object({
    items: z.array(item),
    total: z.number().int().min(0),
    limit: z.number().int(),
    offset: z.number().int(),
  });
}
export type Page<T> = { items: T[]; total: number; limit: number; offset: number };

/** A query-string boolean: `true`/`false`/`1`/`0`, not JavaScript truthiness. */
export const QueryBoolean = z.enum(['true', 'false', '1', '0']).transform((v) => v === 'true' || v === '1');

/** Quote a value for a CSV cell (RFC 4180), and neutralise spreadsheet formulas. */
export function csvCell(value: unknown): string {
  if (value === null || value === undefined) return '';
  let text =
    Array.isArray(value) ? value.join(' ')
    : value instanceof Date ? value.toISOString()
    : typeof value === 'object' ? JSON.stringify(value)
    : String(value);
  // Numbers are data, not formulas: a debit of -1536 stays a number in a spreadsheet.
  if (typeof value !== 'number' && /^[=+\-@\t\r]/.test(text)) text = `'${text}`;
  return /[",\n\r]/.test(text) ? `"${text.replace(/"/g, '""')}"` : text;
}

export function toCsv<T extends Record<string, unknown>>(rows: T[], columns: (keyof T & string)[]): string {
  const lines = [columns.join(',')];
  for (const row of rows) lines.push(columns.map((c) => csvCell(row[c])).join(','));
  return lines.join('\r\n') + '\r\n';
}
