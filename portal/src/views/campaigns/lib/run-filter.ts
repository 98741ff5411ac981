import { RunListQuery, type Run, type RunParameters } from '@localis/shared';
import { fieldErrors } from '../../../composables/use-zod-form';
import type { TableQuerySpec } from '../../../composables/use-table-query';

/** The filters of a campaign's runs table, as they appear in the URL. */
export type RunFilter = 'q' | 'codeName' | 'from' | 'to';
export type RunFilters = Partial<Record<RunFilter, string>>;

export const RUN_TABLE: TableQuerySpec<RunFilter> = {
  filters: ['q', 'codeName', 'from', 'to'],
  sortable: ['startedAt', 'endedAt', 'coreHours', 'cores', 'externalJobId', 'createdAt'],
  defaultSort: '-startedAt',
};

/** Filters the address holds that the api would refuse, by field, in the schema's own words. */
export function runQueryProblems(apiQuery: Record<string, unknown>): Record<string, string> {
  const result = RunListQuery.safeParse(apiQuery);
  return result.success ? {} : fieldErrors(result.error.issues);
}

const SYMBOLS: Record<keyof RunParameters, string> = { sizes: 'L', disorder: 'W', energies: 'E', seeds: 'seeds' };

/** A run's parameters in one short line: "L 8–24 (4) · W 16–17 (7) · 3 seeds". */
export function parameterSummary(parameters: Run['parameters']): string {
  const parts: string[] = [];
  for (const key of ['sizes', 'disorder', 'energies'] as const) {
    const list = parameters[key];
    if (!list.length) continue;
    // Lists may hold 100 000 values: too many to spread into Math.min's arguments.
    const min = list.reduce((a, b) => Math.min(a, b));
    const max = list.reduce((a, b) => Math.max(a, b));
    parts.push(min === max ? `${SYMBOLS[key]} ${min}` : `${SYMBOLS[key]} ${min}–${max} (${list.length})`);
  }
  if (parameters.seeds.length) parts.push(`${parameters.seeds.length} ${parameters.seeds.length === 1 ? 'seed' : 'seeds'}`);
  return parts.join(' · ');
}
