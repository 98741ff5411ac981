import { describe, expect, it } from 'vitest';
import { chiSquareProbability, lnGamma, regularizedGammaP, regularizedGammaQ } from './chi-square';

describe('chi-square probability', () => {
  describe('ln Gamma', () => {
    it('should match factorials and Gamma(1/2) = sqrt(pi) when given integers and halves', () => {
      expect(lnGamma(1)).toBeCloseTo(0, 13);
      expect(lnGamma(5)).toBeCloseTo(Math.log(24), 13);
      expect(lnGamma(11)).toBeCloseTo(Math.log(3628800), 12);
      expect(lnGamma(0.5)).toBeCloseTo(0.5 * Math.log(Math.PI), 13);
      // Gamma(3/2) = sqrt(pi)/2; below 1/2 the reflection formula: Gamma(1/4)Gamma(3/4) = pi sqrt 2.
      expect(lnGamma(1.5)).toBeCloseTo(Math.log(Math.sqrt(Math.PI) / 2), 13);
      expect(lnGamma(0.25) + lnGamma(0.75)).toBeCloseTo(Math.log(Math.PI * Math.SQRT2), 12);
    });

    it('should refuse when x is not positive', () => {
      expect(() => lnGamma(0)).toThrow(RangeError);
    });
  });

  describe('table values', () => {
    // Critical values of the standard chi-square table (upper-tail probabilities 0.10, 0.05, 0.01),
    // printed to three decimals there, so compared to a few parts in 10^4.
    const table: [chi2: number, dof: number, p: number][] = [
      [2.706, 1, 0.1],
      [3.84, 1, 0.05],
      [6.635, 1, 0.01],
      [15.987, 10, 0.1],
      [18.31, 10, 0.05],
      [23.209, 10, 0.01],
      [124.342, 100, 0.05],
    ];
    for (const [chi2, dof, p] of table) {
      it(`should give p = ${p} when chi-square = ${chi2} with ${dof} degrees of freedom`, () => {
        expect(Math.abs(chiSquareProbability(chi2, dof) - p)).toBeLessThan(3e-4);
      });
    }

    it('should give p between 0.44 and 0.5, rising towards 0.5, when chi-square equals a large dof', () => {
      // The chi-square distribution's median lies a little below its mean dof, approaching it as dof grows.
      const ps = [10, 50, 100, 1000, 10000].map((dof) => chiSquareProbability(dof, dof));
      for (const p of ps) {
        expect(p).toBeGreaterThan(0.44);
        expect(p).toBeLessThan(0.5);
      }
      for (let i = 1; i < ps.length; i++) expect(ps[i]).toBeGreaterThan(ps[i - 1]);
    });
  });

  describe('closed forms', () => {
    it('should equal exp(-x/2) sum_{i<k} (x/2)^i / i! when dof = 2k, on both sides of the series/fraction switch', () => {
      // For even dof the upper incomplete gamma is a finite Poisson sum (exact).
      for (const dof of [2, 4, 10, 30]) {
        for (const chi2 of [0.3, 1, 5, 12, 29, 31, 60, 120]) {
          const h = chi2 / 2;
          let term = 1;
          let sum = 1;
          for (let i = 1; i < dof / 2; i++) {
            term *= h / i;
            sum += term;
          }
          const exact = Math.exp(-h) * sum;
          expect(Math.abs(chiSquareProbability(chi2, dof) - exact)).toBeLessThanOrEqual(1e-13 + 1e-11 * exact);
        }
      }
    });

    it('should give P + Q = 1 and the limits P(a, 0) = 0, Q(a, 0) = 1', () => {
      for (const [a, x] of [[0.5, 0.2], [3.5, 2], [3.5, 12], [40, 35], [40, 60]]) {
        expect(regularizedGammaP(a, x) + regularizedGammaQ(a, x)).toBeCloseTo(1, 14);
      }
      expect(regularizedGammaP(2, 0)).toBe(0);
      expect(regularizedGammaQ(2, 0)).toBe(1);
      expect(chiSquareProbability(0, 5)).toBe(1);
    });

    it('should refuse when dof is not positive or chi-square is negative', () => {
      expect(() => chiSquareProbability(3, 0)).toThrow(/degrees of freedom/);
      expect(() => chiSquareProbability(-1, 3)).toThrow(/0 or more/);
      expect(() => chiSquareProbability(Number.NaN, 3)).toThrow(RangeError);
    });
  });
});
