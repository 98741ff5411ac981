import { describe, expect, it } from 'vitest';
import { ANDERSON_3D_ORTHOGONAL } from './reference-values';
import { bootstrapScaling, fitScaling, percentile, startingCriticalX } from './scaling-fit';
import { ScalingFitCancelled, ScalingFitError } from './scaling-fit-error';
import { validateScalingTable, type ScalingPoint } from './scaling-table';
import { syntheticScalingTable } from './synthetic-scaling-table';

/**
 * Truth near the 3D orthogonal transition (Slevin & Ohtsuki, PRL 82, 382 (1999), via
 * REFERENCES.md): W_c = 16.5, nu = 1.57, Lambda_c = 0.576; L = 6–16, W = 15–18 by 0.25, 2 % errors.
 */
const TRUTH = { criticalX: 16.5, nu: ANDERSON_3D_ORTHOGONAL.exponentNu, criticalValue: ANDERSON_3D_ORTHOGONAL.criticalLambda };
const WS = Array.from({ length: 13 }, (_, i) => 15 + 0.25 * i);
const SIZES = [6, 8, 10, 12, 14, 16];
const TABLE = syntheticScalingTable({ ...TRUTH, sizes: SIZES, xs: WS, relativeError: 0.02, seed: 2 });
const ORDERS = { nr: 2, ni: 0, mr: 1, mi: 0 };

function refusal(run: () => unknown): ScalingFitError {
  try {
    run();
  } catch (error) {
    expect(error).toBeInstanceOf(ScalingFitError);
    return error as ScalingFitError;
  }
  throw new Error('the fit was accepted');
}

describe('scaling fit', () => {
  describe('recovery of a known scaling function', () => {
    const fit = fitScaling(TABLE, { orders: ORDERS });
    const boot = bootstrapScaling(TABLE, fit, { samples: 50, seed: 1 });

    it('should come close to W_c, nu and Lambda_c when the data are drawn from them with 2 % noise', () => {
      expect(Math.abs(fit.criticalX - TRUTH.criticalX)).toBeLessThan(0.1);
      expect(Math.abs(fit.nu - TRUTH.nu)).toBeLessThan(0.2);
      expect(Math.abs(fit.criticalValue - TRUTH.criticalValue)).toBeLessThan(0.015);
      expect(fit.y).toBeNull();
    });

    it('should have chi-square near the degrees of freedom and an acceptable p when the model is the true one', () => {
      expect(fit.points).toBe(78);
      expect(fit.dof).toBe(78 - 5);
      expect(fit.chi2 / fit.dof).toBeGreaterThan(0.6);
      expect(fit.chi2 / fit.dof).toBeLessThan(1.5);
      expect(fit.p).toBeGreaterThan(0.01);
    });

    it('should hold the true values inside the 95 % bootstrap intervals, which contain the estimates', () => {
      for (const [interval, truth] of [
        [boot.criticalX, TRUTH.criticalX],
        [boot.nu, TRUTH.nu],
        [boot.criticalValue, TRUTH.criticalValue],
      ] as const) {
        expect(interval.lo).toBeLessThan(truth);
        expect(interval.hi).toBeGreaterThan(truth);
        expect(interval.lo).toBeLessThan(interval.value);
        expect(interval.hi).toBeGreaterThan(interval.value);
      }
      expect(boot.failed).toBe(0);
      expect(boot.y).toBeNull();
    });

    it('should give intervals as wide as about four linearized standard errors when the model is nearly linear', () => {
      // A 95 % interval spans 2 × 1.96 sigma; with 50 samples its ends are rough, so within a factor 1.6.
      const sigmaWc = fit.parameters[0].standardError;
      const width = boot.criticalX.hi - boot.criticalX.lo;
      expect(width / (3.92 * sigmaWc)).toBeGreaterThan(1 / 1.6);
      expect(width / (3.92 * sigmaWc)).toBeLessThan(1.6);
    });

    it('should recover W_c, nu and y when the data carry an irrelevant correction that ni = 0 cannot fit', () => {
      // ln Lambda gets -2 L^(-2.5) on top; L = 4–16 and 0.5 % errors resolve it.
      const table = syntheticScalingTable({ ...TRUTH, sizes: [4, 6, 8, 10, 12, 16], xs: WS, relativeError: 0.005, seed: 3, irrelevant: { y: 2.5, amplitude: -2 } });
      const without = fitScaling(table, { orders: ORDERS });
      const withCorrection = fitScaling(table, { orders: { nr: 2, ni: 1, mr: 1, mi: 0 } });
      expect(without.p).toBeLessThan(1e-6);
      expect(withCorrection.p).toBeGreaterThan(0.01);
      expect(Math.abs(withCorrection.criticalX - TRUTH.criticalX)).toBeLessThan(0.1);
      expect(Math.abs(withCorrection.nu - TRUTH.nu)).toBeLessThan(0.1);
      expect(Math.abs((withCorrection.y as number) - 2.5)).toBeLessThan(1);
      expect(withCorrection.parameters.map((p) => p.name)).toEqual(['Wc', 'nu', 'y', 'a00', 'a01', 'a02', 'a10', 'a11', 'a12']);
    });
  });

  describe('starting values', () => {
    it('should start W_c at the crossing of the two largest sizes when they cross', () => {
      // L = 10 vs 12 cross where 0.1 - 0.3 t = 0 => t = 1/3 on [16, 17]: 16.3333 (L = 8 and 10 do not cross).
      const table: ScalingPoint[] = [
        { L: 8, x: 16, value: 0.5, error: 0.01 },
        { L: 8, x: 17, value: 0.4, error: 0.01 },
        { L: 10, x: 16, value: 0.6, error: 0.01 },
        { L: 10, x: 17, value: 0.5, error: 0.01 },
        { L: 12, x: 16, value: 0.7, error: 0.01 },
        { L: 12, x: 17, value: 0.3, error: 0.01 },
      ];
      expect(startingCriticalX(validateScalingTable(table))).toBeCloseTo(16 + 1 / 3, 12);
    });

    it('should fall back to where the largest sizes come closest when no pair crosses', () => {
      const table: ScalingPoint[] = [16, 17, 18].flatMap((x, i) =>
        [8, 10, 12].map((L) => ({ L, x, value: 0.5 + L * [0.03, 0.001, 0.02][i], error: 0.01 })),
      );
      expect(startingCriticalX(validateScalingTable(table))).toBe(17);
    });
  });

  describe('bootstrap', () => {
    const fit = fitScaling(TABLE, { orders: ORDERS });

    it('should give the same intervals for the same seed and different ones for another', () => {
      const a = bootstrapScaling(TABLE, fit, { samples: 20, seed: 5 });
      const b = bootstrapScaling(TABLE, fit, { samples: 20, seed: 5 });
      const c = bootstrapScaling(TABLE, fit, { samples: 20, seed: 6 });
      expect(b).toEqual(a);
      expect(c.nu.lo).not.toBe(a.nu.lo);
    });

    it('should report progress after every refit when given a progress callback', () => {
      const calls: [number, number][] = [];
      bootstrapScaling(TABLE, fit, { samples: 10, onProgress: (done, total) => calls.push([done, total]) });
      expect(calls).toEqual(Array.from({ length: 10 }, (_, i) => [i + 1, 10]));
    });

    it('should stop with ScalingFitCancelled when the cancel callback says so', () => {
      let done = 0;
      const run = () =>
        bootstrapScaling(TABLE, fit, {
          samples: 50,
          onProgress: (d) => (done = d),
          isCancelled: () => done >= 7,
        });
      expect(run).toThrow(ScalingFitCancelled);
      done = 0;
      expect(run).toThrow(/cancelled after 7 of 50/);
    });

    it('should refuse fewer than two samples', () => {
      expect(refusal(() => bootstrapScaling(TABLE, fit, { samples: 1 })).reason).toBe('bootstrap-failed');
    });

    it('should interpolate percentiles between order statistics', () => {
      // (n - 1) q = 4 × 0.025 = 0.1: 1 + 0.1 × (2 - 1); 4 × 0.975 = 3.9: 4 + 0.9 × (10 - 4).
      expect(percentile([1, 2, 3, 4, 10], 0.025)).toBeCloseTo(1.1, 14);
      expect(percentile([1, 2, 3, 4, 10], 0.975)).toBeCloseTo(9.4, 14);
    });
  });

  describe('refused fits', () => {
    const small = SIZES.slice(0, 3).flatMap((L) => [16, 17].map((x) => TABLE.find((p) => p.L === L && p.x === x) as ScalingPoint));

    it('should refuse orders that leave no degrees of freedom, with the counts', () => {
      // 3 sizes × 2 W = 6 points; nr = 2, mr = 2: W_c, nu, a00, a01, a02, b2 = 6 parameters, 0 left.
      const zero = refusal(() => fitScaling(small, { orders: { nr: 2, ni: 0, mr: 2, mi: 0 } }));
      expect(zero.reason).toBe('no-degrees-of-freedom');
      expect(zero.message).toMatch(/has 6 parameters but the table has only 6 points, which leaves 0 degrees of freedom. Lower the orders or add points/);
      const negative = refusal(() => fitScaling(small, { orders: { nr: 3, ni: 1, mr: 1, mi: 0 } }));
      expect(negative.message).toMatch(/leaves -5 degrees of freedom/);
    });

    it('should report non-convergence as an error when the iterations run out', () => {
      const error = refusal(() => fitScaling(TABLE, { orders: { nr: 3, ni: 0, mr: 3, mi: 0 }, maxIterations: 2 }));
      expect(error.reason).toBe('not-converged');
      expect(error.message).toMatch(/did not converge in 2 iterations .* Try lower orders/);
    });

    it('should refuse invalid orders and a bad table before fitting', () => {
      expect(refusal(() => fitScaling(TABLE, { orders: { nr: 0 } })).reason).toBe('bad-orders');
      expect(refusal(() => fitScaling(TABLE.filter((p) => p.L < 10), { orders: ORDERS })).reason).toBe('too-few-sizes');
    });
  });

  describe('labels', () => {
    it('should name the critical point Ec when the table runs over energy', () => {
      const fit = fitScaling(TABLE, { orders: ORDERS, variable: 'E', observable: 'lambda' });
      expect(fit.parameters[0].name).toBe('Ec');
      expect(fit.variable).toBe('E');
    });
  });
});
