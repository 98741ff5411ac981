import type { z } from 'zod';
import { computed } from 'vue';
import { useRoute, useRouter, type LocationQuery, type LocationQueryRaw } from 'vue-router';

/** What one table keeps in the URL: its filters, sortable fields and defaults. */
export interface TableQuerySpec<F extends string> {
  filters: readonly F[];
  sortable: readonly string[];
  defaultSort: string;
  pageSizes?: readonly number[];
  defaultLimit?: number;
}

export interface TableQueryState<F extends string> {
  /** 1-based, as people say it and as it reads in a shared link. */
  page: number;
  limit: number;
  sort: string;
  filters: Partial<Record<F, string>>;
}

export const PAGE_SIZES = [10, 25, 50, 100] as const;
const DEFAULT_LIMIT = 25;

function first(value: LocationQuery[string] | undefined): string | undefined {
  const v = Array.isArray(value) ? value[0] : value;
  return typeof v === 'string' ? v : undefined;
}

function sizesOf<F extends string>(spec: TableQuerySpec<F>): readonly number[] {
  return spec.pageSizes ?? PAGE_SIZES;
}

function limitOf<F extends string>(spec: TableQuerySpec<F>): number {
  return spec.defaultLimit ?? DEFAULT_LIMIT;
}

function isSortValue<F extends string>(value: string, spec: TableQuerySpec<F>): boolean {
  const field = value.startsWith('-') ? value.slice(1) : value;
  return spec.sortable.includes(field);
}

/** URL -> table state. Whatever is missing or makes no sense falls back to the default. */
export function parseTableQuery<F extends string>(query: LocationQuery, spec: TableQuerySpec<F>): TableQueryState<F> {
  const pageNumber = Number(first(query.page));
  const limitNumber = Number(first(query.limit));
  const sort = first(query.sort);
  const filters: Partial<Record<F, string>> = {};
  for (const name of spec.filters) {
    const value = first(query[name])?.trim();
    if (value) filters[name] = value;
  }
  return {
    page: Number.isInteger(pageNumber) && pageNumber >= 1 ? pageNumber : 1,
    limit: sizesOf(spec).includes(limitNumber) ? limitNumber : limitOf(spec),
    sort: sort && isSortValue(sort, spec) ? sort : spec.defaultSort,
    filters,
  };
}

/** Table state -> URL. Defaults are left out so a plain table has a plain address. */
export function toLocationQuery<F extends string>(state: TableQueryState<F>, spec: TableQuerySpec<F>): LocationQueryRaw {
  const query: LocationQueryRaw = {};
  for (const name of spec.filters) {
    const value = state.filters[name]?.trim();
    if (value) query[name] = value;
  }
  if (state.sort !== spec.defaultSort) query.sort = state.sort;
  if (state.page > 1) query.page = String(state.page);
  if (state.limit !== limitOf(spec)) query.limit = String(state.limit);
  return query;
}

/** Table state -> the list query of the API (`limit`, `offset`, `sort` and the filters). */
export function toApiQuery<F extends string>(state: TableQueryState<F>): { limit: number; offset: number; sort: string } & Partial<Record<F, string>> {
  return { ...state.filters, limit: state.limit, offset: (state.page - 1) * state.limit, sort: state.sort };
}

/** `-createdAt` -> the DataTable's sortField and sortOrder. */
export function sortToTable(sort: string): { sortField: string; sortOrder: 1 | -1 } {
  return sort.startsWith('-') ? { sortField: sort.slice(1), sortOrder: -1 } : { sortField: sort, sortOrder: 1 };
}

/** The DataTable's sort event -> our sort value; an unsorted or unknown column means the default. */
export function sortFromTable<F extends string>(field: unknown, order: unknown, spec: TableQuerySpec<F>): string {
  if (typeof field !== 'string' || !spec.sortable.includes(field) || (order !== 1 && order !== -1)) return spec.defaultSort;
  return order === -1 ? `-${field}` : field;
}

/**
 * Why the api would refuse this list query, in its schema's words, or null. A hand-edited address
 * then gets words instead of a failed request.
 */
export function listQueryProblem(schema: z.ZodType, apiQuery: unknown): string | null {
  const result = schema.safeParse(apiQuery);
  return result.success ? null : result.error.issues.map((i) => `${String(i.path[0])}: ${i.message}`).join('; ');
}

/**
 * Binds a lazy DataTable to the URL: paging, sorting and filters live in the query string so a
 * view can be shared and reloaded. The view watches `apiQuery` and loads.
 */
export function useTableQuery<F extends string>(spec: TableQuerySpec<F>) {
  const route = useRoute();
  const router = useRouter();

  const state = computed(() => parseTableQuery(route.query, spec));
  const apiQuery = computed(() => toApiQuery(state.value));
  const firstRow = computed(() => (state.value.page - 1) * state.value.limit);
  const tableSort = computed(() => sortToTable(state.value.sort));
  const hasFilters = computed(() => Object.keys(state.value.filters).length > 0);

  function commit(next: TableQueryState<F>): Promise<unknown> {
    const managed = new Set<string>([...spec.filters, 'page', 'limit', 'sort']);
    const kept = Object.fromEntries(Object.entries(route.query).filter(([key]) => !managed.has(key)));
    return router.replace({ query: { ...kept, ...toLocationQuery(next, spec) } });
  }

  function onPage(event: { first: number; rows: number }): Promise<unknown> {
    const limit = event.rows || state.value.limit;
    return commit({ ...state.value, limit, page: Math.floor(event.first / limit) + 1 });
  }

  function onSort(event: { sortField?: unknown; sortOrder?: unknown }): Promise<unknown> {
    return commit({ ...state.value, page: 1, sort: sortFromTable(event.sortField, event.sortOrder, spec) });
  }

  /** A changed filter starts again at page 1: the old page may no longer exist. */
  function setFilter(name: F, value: string | null | undefined): Promise<unknown> {
    const filters = { ...state.value.filters, [name]: value ?? undefined };
    return commit({ ...state.value, page: 1, filters });
  }

  function clearFilters(): Promise<unknown> {
    return commit({ ...state.value, page: 1, filters: {} });
  }

  return { state, apiQuery, firstRow, tableSort, hasFilters, onPage, onSort, setFilter, clearFilters };
}

/** What a server-side table needs of `useTableQuery`: where it stands and how it moves. */
export type TableBinding = Pick<ReturnType<typeof useTableQuery>, 'state' | 'firstRow' | 'tableSort' | 'onPage' | 'onSort'>;
