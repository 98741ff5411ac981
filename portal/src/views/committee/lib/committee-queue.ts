import { CommitteeQueueQuery, type AssignmentState, type CommitteeQueueItem } from '@localis/shared';
import type { TableQuerySpec, TableQueryState } from '../../../composables/use-table-query';
import { fieldErrors } from '../../../composables/use-zod-form';
import { formatCount } from '../../../lib/formatters';

export type QueueFilter = 'scope' | 'roundId';
export type QueueFilters = Partial<Record<QueueFilter, string>>;
export type QueueScope = 'mine' | 'all';

/** Fields the queue sorts by. The api answers the whole queue at once; the portal sorts and pages it. */
export const QUEUE_SORTABLE = ['title', 'groupName', 'roundName', 'requestedCoreHours', 'submittedAt', 'meanScore', 'reviewed'] as const;
type QueueSortField = (typeof QUEUE_SORTABLE)[number];

export const QUEUE_TABLE: TableQuerySpec<QueueFilter> = {
  filters: ['scope', 'roundId'],
  sortable: QUEUE_SORTABLE,
  // The longest waiting first: the order the committee works through proposals.
  defaultSort: 'submittedAt',
};

/**
 * Which queue a person sees. Only committee members can be assigned, so "mine" is their default;
 * for the office alone it would always be empty, and it sees everything.
 */
export function scopeOf(filters: QueueFilters, reviews: boolean): QueueScope {
  if (!reviews) return 'all';
  return filters.scope === 'all' ? 'all' : 'mine';
}

/** What the address holds for a chosen scope: nothing for the default "mine". */
export function scopeValue(scope: QueueScope): string | null {
  return scope === 'mine' ? null : scope;
}

/** A round id in the address the api would refuse, in the schema's words, by field. */
export function queueQueryProblems(query: { scope: QueueScope; roundId?: string }): Record<string, string> {
  const result = CommitteeQueueQuery.safeParse(query);
  return result.success ? {} : fieldErrors(result.error.issues);
}

function sortValue(item: CommitteeQueueItem, field: QueueSortField): string | number | null {
  switch (field) {
    case 'reviewed':
      return item.assigned > 0 ? item.reviewed / item.assigned : null;
    case 'submittedAt':
      return item.submittedAt;
    default:
      return item[field];
  }
}

/** The queue in the order asked for (`-field` for descending); items without a value go last either way. */
export function sortQueue(items: readonly CommitteeQueueItem[], sort: string): CommitteeQueueItem[] {
  const descending = sort.startsWith('-');
  const name = descending ? sort.slice(1) : sort;
  const field: QueueSortField = (QUEUE_SORTABLE as readonly string[]).includes(name) ? (name as QueueSortField) : 'submittedAt';
  const direction = descending ? -1 : 1;
  return [...items].sort((a, b) => {
    const x = sortValue(a, field);
    const y = sortValue(b, field);
    if (x === y) return a.title.localeCompare(b.title);
    if (x === null) return 1;
    if (y === null) return -1;
    const order = typeof x === 'number' && typeof y === 'number' ? x - y : String(x).localeCompare(String(y));
    return order * direction;
  });
}

/** The rows of one page of the sorted queue. */
export function queuePage(items: readonly CommitteeQueueItem[], state: Pick<TableQueryState<QueueFilter>, 'page' | 'limit' | 'sort'>): CommitteeQueueItem[] {
  const start = (state.page - 1) * state.limit;
  return sortQueue(items, state.sort).slice(start, start + state.limit);
}

/** How far the reviews of one proposal are: the share done and the same in words. */
export function reviewProgress(item: Pick<CommitteeQueueItem, 'assigned' | 'reviewed' | 'conflicts'>): { share: number; text: string } {
  const conflicts = item.conflicts > 0 ? ` · ${formatCount(item.conflicts, 'conflict')}` : '';
  if (item.assigned === 0) return { share: 0, text: `No reviewer yet${conflicts}` };
  return { share: Math.min(1, item.reviewed / item.assigned), text: `${item.reviewed} of ${item.assigned} reviewed${conflicts}` };
}

type Severity = 'info' | 'success' | 'warn' | 'secondary';

/** The caller's own part in a proposal, as a tag: what is left to do reads first. */
export const MY_STATE_LOOK: Record<AssignmentState, { label: string; severity: Severity; icon: string }> = {
  assigned: { label: 'To review', severity: 'warn', icon: 'pi pi-pencil' },
  reviewed: { label: 'Reviewed', severity: 'success', icon: 'pi pi-check' },
  conflict: { label: 'Conflict declared', severity: 'secondary', icon: 'pi pi-ban' },
};
