import { describe, expect, it } from 'vitest';
import { compareSpotCheck } from './spot-check';
import { runTransferMatrix } from './transfer-matrix';

describe('spot-check', () => {
  describe('comparison', () => {
    it('should give the difference in combined standard errors and flag beyond 3 when worked by hand', () => {
      // (0.62 - 0.60) / hypot(0.003, 0.004) = 0.02 / 0.005 = 4 -> flagged; (0.601 - 0.60) / 0.005 = 0.2 -> fine.
      const { rows, flagged } = compareSpotCheck([
        { L: 4, x: 16, reported: 0.6, reportedErr: 0.003, recomputed: 0.62, recomputedErr: 0.004 },
        { L: 4, x: 17, reported: 0.6, reportedErr: 0.003, recomputed: 0.601, recomputedErr: 0.004 },
      ]);
      expect(rows.map((r) => Number(r.z.toFixed(6)))).toEqual([4, 0.2]);
      expect(rows.map((r) => r.flagged)).toEqual([true, false]);
      expect(flagged).toBe(1);
    });

    it('should pass a point the kernel recomputes with another seed when the archive is honest', () => {
      const reported = runTransferMatrix({ dimension: 3, width: 4, disorder: 16.5, precision: 0.01, seed: 100 });
      const again = runTransferMatrix({ dimension: 3, width: 4, disorder: 16.5, precision: 0.01, seed: 200 });
      const { flagged } = compareSpotCheck([{ L: 4, x: 16.5, reported: reported.lambda, reportedErr: reported.lambdaErr, recomputed: again.lambda, recomputedErr: again.lambdaErr }]);
      expect(flagged).toBe(0);
    });
  });
});
