import { describe, expect, it } from 'vitest';
import { dataCollapse } from './data-collapse';
import { fitScaling } from './scaling-fit';
import { syntheticScalingTable } from './synthetic-scaling-table';

const WS = Array.from({ length: 13 }, (_, i) => 15 + 0.25 * i);
const TRUTH = { criticalX: 16.5, nu: 1.57, criticalValue: 0.576 };

describe('data collapse', () => {
  describe('points on the fitted curve', () => {
    it('should put every size on exp(F(psi, 0)) when the data are nearly exact', () => {
      const table = syntheticScalingTable({ ...TRUTH, sizes: [6, 8, 12, 16], xs: WS, relativeError: 1e-7, seed: 1 });
      const fit = fitScaling(table, { orders: { nr: 2, ni: 0, mr: 1, mi: 0 } });
      const { points } = dataCollapse(table, fit);
      for (const p of points) {
        // psi = w L^(1/nu) with the fitted (here: true) W_c and nu; the curve ln(0.576) + 0.9 psi + 0.1 psi^2.
        const psi = ((fit.criticalX - p.x) / fit.criticalX) * p.L ** (1 / fit.nu);
        expect(p.scalingVariable).toBeCloseTo(psi, 12);
        expect(Math.log(p.value)).toBeCloseTo(Math.log(0.576) + 0.9 * psi + 0.1 * psi * psi, 5);
      }
    });

    it('should remove the fitted irrelevant correction so that the sizes fall on one curve', () => {
      const table = syntheticScalingTable({ ...TRUTH, sizes: [4, 6, 8, 12, 16], xs: WS, relativeError: 1e-6, seed: 1, irrelevant: { y: 2.5, amplitude: -2 } });
      const fit = fitScaling(table, { orders: { nr: 2, ni: 1, mr: 1, mi: 0 } });
      const { points, curve } = dataCollapse(table, fit, 11);
      const a = fit.parameters.filter((p) => p.name.startsWith('a0')).map((p) => p.value);
      for (const p of points) {
        const F0 = a[0] + a[1] * p.scalingVariable + a[2] * p.scalingVariable ** 2;
        expect(Math.abs(Math.log(p.value) - F0)).toBeLessThan(1e-4);
        // Relative errors are kept.
        const original = table.find((q) => q.L === p.L && q.x === p.x);
        expect(p.error / p.value).toBeCloseTo((original?.error ?? 0) / (original?.value ?? 1), 12);
      }
      expect(curve).toHaveLength(11);
      expect(curve[0].scalingVariable).toBeCloseTo(Math.min(...points.map((p) => p.scalingVariable)), 12);
    });
  });
});
