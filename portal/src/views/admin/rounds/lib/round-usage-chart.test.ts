import { describe, expect, it } from 'vitest';
import { POOL_USAGE as pool } from '../test/pool-usage-fixture';
import { poolShares, UNALLOCATED_LABEL, usageBars } from './round-usage-chart';

describe('round-usage-chart', () => {
  describe('usageBars', () => {
    it('should give a bar per group by name and a last bar for the unallocated core-hours', () => {
      const bars = usageBars(pool);
      expect(bars.labels).toEqual(['Topological phases', 'Wave transport', UNALLOCATED_LABEL]);
      expect(bars.datasets.map((d) => [d.stack, d.data])).toEqual([
        ['used', [200, 2_900, 0]],
        ['remaining', [2_800, 1_100, 0]],
        ['unallocated', [0, 0, 3_000]],
      ]);
    });

    it('should show a group in overdraft with its use only, never a negative part', () => {
      const bars = usageBars({ unallocated: -50, groups: [{ ...pool.groups[0], used: 4_300, remaining: -300 }] });
      expect(bars.datasets.map((d) => d.data)).toEqual([[4_300, 0], [0, 0], [0, 0]]);
    });

    it('should give the unallocated bar alone when nobody holds a grant yet', () => {
      const bars = usageBars({ unallocated: 10_000, groups: [] });
      expect(bars.labels).toEqual([UNALLOCATED_LABEL]);
      expect(bars.datasets[2].data).toEqual([10_000]);
    });
  });

  describe('poolShares', () => {
    it('should give the granted and used shares of the pool, and zeros for an empty pool', () => {
      expect(poolShares(pool)).toEqual({ granted: 0.7, used: 0.31 });
      expect(poolShares({ pool: 0, granted: 0, used: 0 })).toEqual({ granted: 0, used: 0 });
    });
  });
});
