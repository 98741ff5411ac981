import type { PoolUsage } from '@localis/shared';

export const UNALLOCATED_LABEL = 'Unallocated';

/** The three stacks of a pool's bars: what groups used, what they hold still, what nobody holds. */
export type UsageStack = 'used' | 'remaining' | 'unallocated';

export const USAGE_STACK_LABELS: Record<UsageStack, string> = {
  used: 'Used',
  remaining: 'Granted, not used yet',
  unallocated: 'Unallocated',
};

export interface UsageBars {
  /** One bar per group by name, and a last bar for what is not granted. */
  labels: string[];
  datasets: { stack: UsageStack; label: string; data: number[] }[];
}

/**
 * A pool's usage as a stacked horizontal bar chart: a bar per group of used plus granted-but-unused
 * core-hours, and a bar of what the office can still grant. A group in overdraft (remaining below
 * zero) shows its use only: a bar cannot stack a negative part.
 */
export function usageBars(pool: Pick<PoolUsage, 'groups' | 'unallocated'>): UsageBars {
  const groups = [...pool.groups].sort((a, b) => a.groupName.localeCompare(b.groupName));
  const labels = [...groups.map((g) => g.groupName), UNALLOCATED_LABEL];
  const perGroup = (value: (g: (typeof groups)[number]) => number) => [...groups.map((g) => Math.max(0, value(g))), 0];
  return {
    labels,
    datasets: [
      { stack: 'used', label: USAGE_STACK_LABELS.used, data: perGroup((g) => g.used) },
      { stack: 'remaining', label: USAGE_STACK_LABELS.remaining, data: perGroup((g) => g.remaining) },
      { stack: 'unallocated', label: USAGE_STACK_LABELS.unallocated, data: [...groups.map(() => 0), Math.max(0, pool.unallocated)] },
    ],
  };
}

/** Shares of the pool for the figures above the chart, 0..1 (granted may exceed 1 after the pool shrank). */
export function poolShares(pool: Pick<PoolUsage, 'pool' | 'granted' | 'used'>): { granted: number; used: number } {
  if (pool.pool <= 0) return { granted: 0, used: 0 };
  return { granted: pool.granted / pool.pool, used: Math.max(0, pool.used) / pool.pool };
}
