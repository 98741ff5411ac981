import { describe, expect, it } from 'vitest';
import { crossingDrift, findCrossings } from './crossings';
import { ScalingFitError } from './scaling-fit-error';
import type { ScalingPoint } from './scaling-table';

const rows = (L: number, xs: number[], values: number[], error = 0.01): ScalingPoint[] => xs.map((x, i) => ({ L, x, value: values[i], error }));

/**
 * Hand-made: W = 1, 2, 3, every error 0.01.
 *   L = 4:  1.0, 0.8, 0.6
 *   L = 8:  1.1, 0.7, 0.4
 *   L = 16: 1.3, 0.7, 0.3
 */
const TABLE = [...rows(4, [1, 2, 3], [1.0, 0.8, 0.6]), ...rows(8, [1, 2, 3], [1.1, 0.7, 0.4]), ...rows(16, [1, 2, 3], [1.3, 0.7, 0.3])];

describe('crossings', () => {
  describe('position and errors', () => {
    const crossings = findCrossings(TABLE);

    it('should find one crossing per pair when each pair changes sign once', () => {
      expect(crossings.map((c) => c.sizes)).toEqual([
        [4, 8],
        [8, 16],
      ]);
    });

    it('should interpolate linearly and propagate the four errors when the difference changes sign between grid points', () => {
      // L = 4 vs 8: d = L8 - L4 = (0.1, -0.1, -0.2); sign change on [1, 2]; t = d0/(d0 - d1) = 0.1/0.2 = 0.5,
      // so W* = 1.5, value = 1.0 + 0.5 (0.8 - 1.0) = 0.9 (the L = 8 segment gives 1.1 - 0.2 = 0.9 too).
      // D = 0.2, dt/dd0 = -d1/D^2 = 2.5, dt/dd1 = d0/D^2 = 2.5; dW*/d(a0, a1, b0, b1) = (-2.5, -2.5, 2.5, 2.5),
      // so sigma(W*) = 0.01 sqrt(4 × 6.25) = 0.05. dv*/d(...) = (1 - t - s dt/dd0, t - s dt/dd1, s dt/dd0, s dt/dd1)
      // with slope s = -0.2: (1, 1, -0.5, -0.5), so sigma(v*) = 0.01 sqrt(2.5) = 0.0158114.
      const c = crossings[0];
      expect(c.x).toBeCloseTo(1.5, 12);
      expect(c.value).toBeCloseTo(0.9, 12);
      expect(c.xError).toBeCloseTo(0.05, 12);
      expect(c.valueError).toBeCloseTo(0.01 * Math.sqrt(2.5), 12);
      expect(c.size).toBeCloseTo(Math.sqrt(32), 12);
    });

    it('should put the crossing on the grid point, counted once, when the difference is exactly zero there', () => {
      // L = 8 vs 16: d = (0.2, 0, -0.1); zero at W = 2, taken from the interval [2, 3] with t = 0.
      // D = 0 - (-0.1) = 0.1, dt/dd0 = -d1/D^2 = 10, dt/dd1 = 0: sigma(W*) = 0.01 sqrt(10^2 + 10^2) = 0.141421.
      // slope s = 0.4 - 0.7 = -0.3: dv*/d(...) = (1 + 3, 0, -3, 0), sigma(v*) = 0.01 × 5 = 0.05.
      const c = crossings[1];
      expect(c.x).toBeCloseTo(2, 12);
      expect(c.value).toBeCloseTo(0.7, 12);
      expect(c.xError).toBeCloseTo(0.1 * Math.SQRT2, 12);
      expect(c.valueError).toBeCloseTo(0.05, 12);
    });

    it('should find every crossing of a pair when noise makes the curves cross more than once', () => {
      // d = (0.1, -0.1, 0.1): crossings at 1.5 and 2.5.
      const table = [...rows(4, [1, 2, 3], [1, 1, 1]), ...rows(8, [1, 2, 3], [1.1, 0.9, 1.1])];
      expect(findCrossings(table).map((c) => c.x)).toEqual([expect.closeTo(1.5, 12), expect.closeTo(2.5, 12)]);
    });

    it('should find none when the curves do not cross, and use only grid points both sizes share', () => {
      const parallel = [...rows(4, [1, 2, 3], [1, 0.8, 0.6]), ...rows(8, [1, 2, 3], [1.1, 0.9, 0.7])];
      expect(findCrossings(parallel)).toEqual([]);
      // L = 8 lacks W = 2: the shared points are W = 1 and 3, d = (0.1, -0.2), crossing at 1 + 2 × 1/3.
      const offGrid = [...rows(4, [1, 2, 3], [1, 0.8, 0.6]), ...rows(8, [1, 3, 4], [1.1, 0.4, 0.3])];
      expect(findCrossings(offGrid)[0].x).toBeCloseTo(1 + 2 / 3, 12);
    });

    it('should refuse when there is only one size, and refuse bad points like the fit does', () => {
      expect(() => findCrossings(rows(4, [1, 2], [1, 0.8]))).toThrow(/at least two sizes/);
      expect(() => findCrossings([...rows(4, [1, 2], [1, 0.8]), ...rows(8, [1, 2], [1.1, 0.7], 0)])).toThrow(ScalingFitError);
    });
  });

  describe('drift', () => {
    it('should give shifts and the slope against 1/L with errors when the crossings move with size', () => {
      // Path: 1.5 ± 0.05 at L = sqrt(32) = 5.65685, 2 ± 0.141421 at sqrt(128) = 11.3137.
      // Shift 0.5 ± hypot(0.05, 0.141421) = 0.15. Two points: slope = 0.5 / (1/11.3137 - 1/5.65685)
      // = 0.5 / (-0.0883883) = -5.65685, error = 0.15 / 0.0883883 = 1.69706: beyond two errors, and
      // negative in 1/L, so W* grows with L.
      const drift = crossingDrift(findCrossings(TABLE));
      expect(drift.path.map((c) => c.x)).toEqual([expect.closeTo(1.5, 12), expect.closeTo(2, 12)]);
      expect(drift.shifts[0].shift).toBeCloseTo(0.5, 12);
      expect(drift.shifts[0].shiftError).toBeCloseTo(0.15, 12);
      expect(drift.slopeVsInverseSize?.value).toBeCloseTo(-Math.sqrt(32), 9);
      expect(drift.slopeVsInverseSize?.error).toBeCloseTo(0.15 * Math.sqrt(128), 9);
      expect(drift.direction).toBe('towards larger x');
    });

    it('should follow the crossing nearest the previous one when a pair has several', () => {
      const table = [
        ...rows(4, [1, 2, 3, 4], [1.0, 0.8, 0.6, 0.4]),
        ...rows(8, [1, 2, 3, 4], [1.1, 0.7, 0.5, 0.3]),
        // L = 16 crosses L = 8 at 1.5 and again at 3.5; 1.5 is nearer the previous 1.5.
        ...rows(16, [1, 2, 3, 4], [1.2, 0.6, 0.4, 0.4]),
      ];
      const drift = crossingDrift(findCrossings(table));
      expect(drift.path.map((c) => c.x)).toEqual([expect.closeTo(1.5, 12), expect.closeTo(1.5, 12)]);
      expect(drift.direction).toBe('none');
    });

    it('should report no slope when there is one pair', () => {
      const drift = crossingDrift(findCrossings(TABLE.filter((p) => p.L !== 16)));
      expect(drift.slopeVsInverseSize).toBeNull();
      expect(drift.shifts).toEqual([]);
    });
  });
});
