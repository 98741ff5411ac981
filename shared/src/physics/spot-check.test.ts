import { describe, expect, it } from 'vitest';
import { compareSpotCheck, COARSEST_SPOT_CHECK_PRECISION, planSpotCheck, SPOT_CHECK_SECONDS_PER_POINT } from './spot-check';
import { expectedTransferMatrixRun, runTransferMatrix } from './transfer-matrix';

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

describe('spot-check plan', () => {
  const box3d = { model: 'anderson-box', dimension: 3, symmetryClass: 'AI' };
  const point = (L: number, W: number, E = 0, value = 0.6, err = 0.006) => ({ L, W, E, value, err });

  it('should pick the ends and the middle of the smallest size at its most common energy', () => {
    const points = [...[14, 15, 16, 17, 18].map((W) => point(6, W)), point(6, 16, 0.5), ...[14, 16, 18].map((W) => point(8, W))];
    const plan = planSpotCheck(box3d, points);
    expect('targets' in plan && plan.targets.map((t) => [t.L, t.W, t.E])).toEqual([
      [6, 14, 0],
      [6, 16, 0],
      [6, 18, 0],
    ]);
  });

  it('should ask the kernel for the archive’s own precision when the time allows, and no finer than the budget otherwise', () => {
    const cheap = planSpotCheck(box3d, [point(4, 16, 0, 0.6, 0.006)]);
    expect('targets' in cheap && cheap.targets[0]!.precision).toBe(0.01);
    // Rounded up to two figures, so the command a person copies stays short: 0.0146 -> 0.015.
    const odd = planSpotCheck(box3d, [point(4, 16, 0, 0.6, 0.00877)]);
    expect('targets' in odd && odd.targets[0]!.precision).toBe(0.015);
    // L = 10 in 3D: 1 % would take minutes a point, so the finest precision the budget allows is used.
    const dear = planSpotCheck(box3d, [point(10, 16, 0, 0.6, 0.006)]);
    const precision = 'targets' in dear ? dear.targets[0]!.precision : NaN;
    expect(precision).toBeGreaterThan(0.01);
    expect(precision).toBeLessThanOrEqual(COARSEST_SPOT_CHECK_PRECISION);
    const { seconds } = expectedTransferMatrixRun({ dimension: 3, width: 10, precision });
    expect(seconds).toBeLessThanOrEqual(SPOT_CHECK_SECONDS_PER_POINT * 1.01);
    expect(String(precision)).toMatch(/^0\.0\d{1,2}$/);
  });

  it('should give a reason instead of points for what the kernel does not compute', () => {
    expect(planSpotCheck({ ...box3d, model: 'anderson-gaussian' }, [point(4, 16)])).toEqual({ notApplicable: expect.stringMatching(/box disorder.*anderson-gaussian/) });
    expect(planSpotCheck({ ...box3d, symmetryClass: 'AII' }, [point(4, 16)])).toEqual({ notApplicable: expect.stringMatching(/class AI\b.*class AII/) });
    expect(planSpotCheck(box3d, [])).toEqual({ notApplicable: expect.stringMatching(/no Lambda points/) });
    expect(planSpotCheck(box3d, [point(4, 16, 0, 0.6, 0)])).toEqual({ notApplicable: expect.stringMatching(/positive errors/) });
    expect(planSpotCheck(box3d, [point(24, 16)])).toEqual({ notApplicable: expect.stringMatching(/L = 24 in d = 3/) });
  });
});
