import type { Response } from 'express';
import { MAX_PAGE_SIZE, toCsv, type Page } from '@localis/shared';

/** Rows a CSV export may hold; more would be a job for the api, not a download. */
const CSV_ROW_CAP = 50_000;

/**
 * Answer a list in JSON (one page) or, with `format=csv`, every matching row as CSV, reading
 * the same query page by page so an export equals what the table shows, filters and order kept.
 */
export async function sendList<T extends Record<string, unknown>, Q extends { limit: number; offset: number; format: 'json' | 'csv' }>(
  res: Response,
  query: Q,
  fetchPage: (q: Q) => Promise<Page<T>>,
  csv: { filename: string; columns: (keyof T & string)[] },
) {
  if (query.format !== 'csv') {
    res.json(await fetchPage(query));
    return;
  }
  const rows: T[] = [];
  for (let offset = 0; offset < CSV_ROW_CAP; offset += MAX_PAGE_SIZE) {
    const page = await fetchPage({ ...query, limit: MAX_PAGE_SIZE, offset });
    rows.push(...page.items);
    if (offset + MAX_PAGE_SIZE >= page.total) break;
  }
  res
    .type('text/csv; charset=utf-8')
    .attachment(`${csv.filename}-${new Date().toISOString().slice(0, 10)}.csv`)
    .send(toCsv(rows, csv.columns));
}
