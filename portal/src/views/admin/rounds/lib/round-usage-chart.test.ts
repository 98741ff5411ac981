import { describe, expect, it } from 'vitest';
import { POOL_USAGE as pool } from '../test/pool-usage-fixture';
import { poolShares, usageAxisMax, usageBars } from './round-usage-chart';

describe('round-usage-chart', () => {
  describe('usageBars', () => {
    it('should give a bar per group by name with what it used and what it holds still', () => {
      const bars = usageBars(pool);
      expect(bars.labels).toEqual(['Topological phases', 'Wave transport']);
      expect(bars.datasets.map((d) => [d.stack, d.data])).toEqual([
        ['used', [200, 2_900]],
        ['remaining', [2_800, 1_100]],
      ]);
    });

    it('should show a group in overdraft with its use only, never a negative part', () => {
      const bars = usageBars({ groups: [{ ...pool.groups[0], used: 4_300, remaining: -300 }] });
      expect(bars.datasets.map((d) => d.data)).toEqual([[4_300], [0]]);
    });

    it('should give no bar when nobody holds a grant yet', () => {
      const bars = usageBars({ groups: [] });
      expect(bars.labels).toEqual([]);
      expect(bars.datasets.map((d) => d.data)).toEqual([[], []]);
    });
  });

  describe('usageAxisMax', () => {
    it('should end the axis at the largest group rather than the pool when grants are small against it', () => {
      const tiny = usageBars({ groups: [{ ...pool.groups[0], granted: 40, used: 10, remaining: 30 }, { ...pool.groups[1], granted: 25, used: 25, remaining: 0 }] });
      expect(usageAxisMax(tiny)).toBe(40);
    });

    it('should count an overdrawn group by its use when that is larger than its grant', () => {
      expect(usageAxisMax(usageBars({ groups: [{ ...pool.groups[0], used: 4_300, remaining: -300 }] }))).toBe(4_300);
    });

    it('should never end the axis at zero when there is nothing to draw', () => {
      expect(usageAxisMax(usageBars({ groups: [] }))).toBe(1);
    });
  });

  describe('poolShares', () => {
    it('should give the granted and used shares of the pool, and zeros for an empty pool', () => {
      expect(poolShares(pool)).toEqual({ granted: 0.7, used: 0.31 });
      expect(poolShares({ pool: 0, granted: 0, used: 0 })).toEqual({ granted: 0, used: 0 });
    });
  });
});
