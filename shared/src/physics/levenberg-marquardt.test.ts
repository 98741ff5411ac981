import { describe, expect, it } from 'vitest';
import { choleskyFactor, choleskySolve, inverseSymmetric } from './dense-matrix';
import { levenbergMarquardt, type LeastSquaresProblem } from './levenberg-marquardt';
import { SeededRandom } from './random';

/** y = A exp(-k t) + c at t = 0..19. */
function decayProblem(data: number[], sigma: number[], analytic: boolean): LeastSquaresProblem {
  const t = data.map((_, i) => i);
  return {
    data,
    sigma,
    model: (p, out) => {
      for (let i = 0; i < t.length; i++) out[i] = p[0] * Math.exp(-p[1] * t[i]) + p[2];
    },
    jacobian: analytic
      ? (p, out) => {
          for (let i = 0; i < t.length; i++) {
            const e = Math.exp(-p[1] * t[i]);
            out[i * 3] = e;
            out[i * 3 + 1] = -p[0] * t[i] * e;
            out[i * 3 + 2] = 1;
          }
        }
      : undefined,
  };
}

const exactDecay = Array.from({ length: 20 }, (_, i) => 5 * Math.exp(-0.3 * i) + 1);

describe('levenberg-marquardt', () => {
  describe('recovery', () => {
    it('should recover the parameters to 1e-8 when the data are exact', () => {
      const r = levenbergMarquardt(decayProblem(exactDecay, exactDecay.map(() => 0.1), true), [1, 1, 0]);
      expect(r.converged).toBe(true);
      expect(r.parameters[0]).toBeCloseTo(5, 8);
      expect(r.parameters[1]).toBeCloseTo(0.3, 8);
      expect(r.parameters[2]).toBeCloseTo(1, 8);
      expect(r.chi2).toBeLessThan(1e-12);
    });

    it('should reach the same minimum with central-difference derivatives when no Jacobian is given', () => {
      const rng = new SeededRandom(4);
      const noisy = exactDecay.map((y) => y + 0.05 * rng.normal());
      const sigma = noisy.map(() => 0.05);
      const analytic = levenbergMarquardt(decayProblem(noisy, sigma, true), [1, 1, 0]);
      const numeric = levenbergMarquardt(decayProblem(noisy, sigma, false), [1, 1, 0]);
      expect(analytic.converged && numeric.converged).toBe(true);
      for (let j = 0; j < 3; j++) expect(numeric.parameters[j]).toBeCloseTo(analytic.parameters[j], 6);
      expect(numeric.chi2).toBeCloseTo(analytic.chi2, 8);
      // 20 points, 3 parameters: chi-square of the order of 17 for correct errors.
      expect(analytic.chi2).toBeGreaterThan(5);
      expect(analytic.chi2).toBeLessThan(40);
    });

    it('should find (1, 1) when minimising the Rosenbrock function from (-1.2, 1)', () => {
      // Rosenbrock as least squares: r1 = 10 (y - x^2), r2 = 1 - x; the classic curved valley.
      const problem: LeastSquaresProblem = {
        data: [0, 0],
        sigma: [1, 1],
        model: (p, out) => {
          out[0] = -10 * (p[1] - p[0] * p[0]);
          out[1] = -(1 - p[0]);
        },
      };
      const r = levenbergMarquardt(problem, [-1.2, 1]);
      expect(r.converged).toBe(true);
      expect(r.parameters[0]).toBeCloseTo(1, 6);
      expect(r.parameters[1]).toBeCloseTo(1, 6);
    });
  });

  describe('covariance', () => {
    it('should equal the textbook weighted straight-line covariance when the model is a + b x', () => {
      // For y = a + b x with weights w = 1/sigma^2: S = sum w, Sx = sum w x, Sxx = sum w x^2,
      // Delta = S Sxx - Sx^2, var a = Sxx/Delta, var b = S/Delta, cov ab = -Sx/Delta.
      const x = [0, 1, 2, 3, 4, 5];
      const sigma = [0.1, 0.2, 0.1, 0.3, 0.2, 0.1];
      const y = [1.1, 2.9, 5.2, 6.8, 9.1, 11.0];
      const r = levenbergMarquardt(
        {
          data: y,
          sigma,
          model: (p, out) => x.forEach((xi, i) => (out[i] = p[0] + p[1] * xi)),
        },
        [0, 0],
      );
      let S = 0;
      let Sx = 0;
      let Sxx = 0;
      x.forEach((xi, i) => {
        const w = 1 / sigma[i] ** 2;
        S += w;
        Sx += w * xi;
        Sxx += w * xi * xi;
      });
      const delta = S * Sxx - Sx * Sx;
      expect(r.covariance).not.toBeNull();
      const cov = r.covariance as Float64Array;
      expect(cov[0]).toBeCloseTo(Sxx / delta, 10);
      expect(cov[3]).toBeCloseTo(S / delta, 10);
      expect(cov[1]).toBeCloseTo(-Sx / delta, 10);
      expect(r.standardErrors[1]).toBeCloseTo(Math.sqrt(S / delta), 10);
    });

    it('should give no covariance when two parameters enter only as their sum', () => {
      const x = [0, 1, 2, 3];
      const r = levenbergMarquardt(
        { data: [1, 2, 3, 4], sigma: [1, 1, 1, 1], model: (p, out) => x.forEach((xi, i) => (out[i] = p[0] + p[1] + p[2] * xi)) },
        [0, 0, 0],
      );
      expect(r.covariance).toBeNull();
      expect(Number.isNaN(r.standardErrors[0])).toBe(true);
    });
  });

  describe('failure', () => {
    it('should report max-iterations and not converged when the cap is too low', () => {
      const r = levenbergMarquardt(decayProblem(exactDecay, exactDecay.map(() => 0.1), true), [1, 1, 0], { maxIterations: 2 });
      expect(r.converged).toBe(false);
      expect(r.stop).toBe('max-iterations');
    });

    it('should report not-finite-start when the model is not finite at the start', () => {
      const r = levenbergMarquardt(
        { data: [1, 2], sigma: [1, 1], model: (p, out) => out.fill(Math.log(p[0])) },
        [-1],
      );
      expect(r.converged).toBe(false);
      expect(r.stop).toBe('not-finite-start');
    });

    it('should refuse steps into a NaN region and still converge when the minimum lies inside the domain', () => {
      // y = sqrt(p) at every point with data 4: the minimum p = 16 sits in p > 0.
      const r = levenbergMarquardt({ data: [4, 4, 4], sigma: [1, 1, 1], model: (p, out) => out.fill(Math.sqrt(p[0])) }, [0.01]);
      expect(r.converged).toBe(true);
      expect(r.parameters[0]).toBeCloseTo(16, 6);
    });
  });
});

describe('dense matrix', () => {
  describe('cholesky', () => {
    it('should solve a symmetric positive-definite system when given one', () => {
      // A = [[4, 2, 0], [2, 5, 1], [0, 1, 3]], x = (1, -1, 2) => b = A x = (2, -1, 5).
      const a = Float64Array.from([4, 2, 0, 2, 5, 1, 0, 1, 3]);
      expect(choleskyFactor(a, 3)).toBe(true);
      const x = choleskySolve(a, 3, Float64Array.from([2, -1, 5]));
      expect([...x].map((v) => Number(v.toFixed(12)))).toEqual([1, -1, 2]);
    });

    it('should give the inverse, and null when the matrix is singular', () => {
      const a = Float64Array.from([4, 2, 0, 2, 5, 1, 0, 1, 3]);
      const inv = inverseSymmetric(a, 3) as Float64Array;
      for (let i = 0; i < 3; i++) {
        for (let j = 0; j < 3; j++) {
          let s = 0;
          for (let k = 0; k < 3; k++) s += a[i * 3 + k] * inv[k * 3 + j];
          expect(s).toBeCloseTo(i === j ? 1 : 0, 12);
        }
      }
      expect(inverseSymmetric(Float64Array.from([1, 2, 2, 4]), 2)).toBeNull();
    });
  });
});
