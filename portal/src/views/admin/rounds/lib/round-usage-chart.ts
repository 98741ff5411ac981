import type { PoolUsage } from '@localis/shared';

/** The two stacks of a group's bar: what it used and what it holds still. */
export type UsageStack = 'used' | 'remaining';

export const USAGE_STACK_LABELS: Record<UsageStack, string> = {
  used: 'Used',
  remaining: 'Granted, not used yet',
};

export interface UsageBars {
  /** One bar per group, by name. */
  labels: string[];
  datasets: { stack: UsageStack; label: string; data: number[] }[];
}

/**
 * A pool's usage as stacked horizontal bars, a bar per group of used plus granted-but-unused
 * core-hours. What nobody holds is not a bar: next to a large pool the groups' grants would shrink
 * to slivers, so the axis runs to the largest grant and the unallocated core-hours are written out
 * beside the chart. A group in overdraft (remaining below zero) shows its use only: a bar cannot
 * stack a negative part.
 */
export function usageBars(pool: Pick<PoolUsage, 'groups'>): UsageBars {
  const groups = [...pool.groups].sort((a, b) => a.groupName.localeCompare(b.groupName));
  const perGroup = (value: (g: (typeof groups)[number]) => number) => groups.map((g) => Math.max(0, value(g)));
  return {
    labels: groups.map((g) => g.groupName),
    datasets: [
      { stack: 'used', label: USAGE_STACK_LABELS.used, data: perGroup((g) => g.used) },
      { stack: 'remaining', label: USAGE_STACK_LABELS.remaining, data: perGroup((g) => g.remaining) },
    ],
  };
}

/** Where the axis ends: the longest group bar (used plus what is left), never zero. */
export function usageAxisMax(bars: UsageBars): number {
  const totals = bars.labels.map((_, i) => bars.datasets.reduce((sum, d) => sum + (d.data[i] ?? 0), 0));
  return Math.max(1, ...totals);
}

/** Shares of the pool for the figures above the chart, 0..1 (granted may exceed 1 after the pool shrank). */
export function poolShares(pool: Pick<PoolUsage, 'pool' | 'granted' | 'used'>): { granted: number; used: number } {
  if (pool.pool <= 0) return { granted: 0, used: 0 };
  return { granted: pool.granted / pool.pool, used: Math.max(0, pool.used) / pool.pool };
}
