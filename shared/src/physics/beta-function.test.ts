import { describe, expect, it } from 'vitest';
import { numericalBeta } from './beta-function';
import type { ScalingPoint } from './scaling-table';

describe('numerical beta function', () => {
  describe('hand-made tables', () => {
    it('should give beta = ln(g2/g1)/ln(L2/L1) with propagated errors, at ln g of the geometric mean size', () => {
      // W = 1: g(4) = 1 ± 0.1, g(8) = 2 ± 0.2. beta = ln 2 / ln 2 = 1; ln g at sqrt(32) = (0 + ln 2)/2.
      // sigma(ln g) = 0.1 for both, combined sqrt(0.02) = 0.141421: sigma(beta) = 0.141421 / ln 2 = 0.204028,
      // sigma(ln g at the mean) = 0.141421 / 2 = 0.0707107.
      // W = 2: g(4) = 1 ± 0.1, g(8) = 0.5 ± 0.05: beta = -1, same errors.
      const table: ScalingPoint[] = [
        { L: 4, x: 1, value: 1, error: 0.1 },
        { L: 8, x: 1, value: 2, error: 0.2 },
        { L: 4, x: 2, value: 1, error: 0.1 },
        { L: 8, x: 2, value: 0.5, error: 0.05 },
      ];
      const [a, b] = numericalBeta(table, { observable: 'g' });
      expect(a.x).toBe(1);
      expect(a.sizes).toEqual([4, 8]);
      expect(a.size).toBeCloseTo(Math.sqrt(32), 12);
      expect(a.beta).toBeCloseTo(1, 14);
      expect(a.lnValue).toBeCloseTo(Math.LN2 / 2, 14);
      expect(a.betaError).toBeCloseTo(Math.SQRT2 * 0.1 / Math.LN2, 12);
      expect(a.lnValueError).toBeCloseTo(Math.SQRT2 * 0.05, 12);
      expect(b.beta).toBeCloseTo(-1, 14);
      expect(b.betaError).toBeCloseTo(a.betaError, 12);
    });

    it('should give beta = d - 2 = 1 when a 3D metal follows Ohm’s law g = sigma L', () => {
      // Scaling theory (Abrahams et al., PRL 42, 673 (1979)): metallic limit beta -> d - 2.
      const table = [6, 8, 12].map((L) => ({ L, x: 5, value: 3 * L, error: 0.03 * L }));
      for (const p of numericalBeta(table)) expect(p.beta).toBeCloseTo(1, 12);
    });

    it('should give a negative beta that falls with ln g when g decays as exp(-L/xi)', () => {
      // Localized limit (same source): g = exp(-L/xi) with xi = 2. L = 4, 8: beta = -(8 - 4)/2 / ln 2
      // = -2/ln 2 = -2.88539, ln g at the mean = (-2 - 4)/2 = -3. L = 8, 16: beta = -4/ln 2, ln g = -6.
      const table = [4, 8, 16].map((L) => ({ L, x: 30, value: Math.exp(-L / 2), error: 0.01 * Math.exp(-L / 2) }));
      const [first, second] = numericalBeta(table);
      expect(first.beta).toBeCloseTo(-2 / Math.LN2, 12);
      expect(first.lnValue).toBeCloseTo(-3, 12);
      expect(second.beta).toBeCloseTo(-4 / Math.LN2, 12);
      expect(second.lnValue).toBeCloseTo(-6, 12);
      // The slope d beta / d ln g is positive: beta ~ ln g + const in this limit.
      expect((second.beta - first.beta) / (second.lnValue - first.lnValue)).toBeGreaterThan(0);
    });

    it('should skip W values that only one of the two sizes has', () => {
      const table: ScalingPoint[] = [
        { L: 4, x: 1, value: 1, error: 0.1 },
        { L: 4, x: 2, value: 1, error: 0.1 },
        { L: 8, x: 2, value: 1, error: 0.1 },
        { L: 8, x: 3, value: 1, error: 0.1 },
      ];
      expect(numericalBeta(table).map((p) => p.x)).toEqual([2]);
    });

    it('should refuse when there is only one size', () => {
      expect(() => numericalBeta([{ L: 4, x: 1, value: 1, error: 0.1 }])).toThrow(/at least two sizes/);
    });
  });
});
