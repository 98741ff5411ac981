import { describe, expect, it } from 'vitest';
import { ANDERSON_3D_ORTHOGONAL } from './reference-values';
import { expectedTransferMatrixRun, runTransferMatrix, TransferMatrixCancelled, TransferMatrixTooLong } from './transfer-matrix';

/** Within k combined standard errors. */
const within = (value: number, expected: number, err: number, k = 3) => Math.abs(value - expected) <= k * err;

// Physics runs take seconds, more on a busy machine.
describe('transfer-matrix kernel', { timeout: 60_000 }, () => {
  describe('one dimension', () => {
    it('should give xi = 24(4 - E^2)/W^2 when the disorder is weak and E lies away from the band centre and edges', () => {
      // Thouless, J. Phys. C 5, 77 (1972): amplitude localization length at weak disorder.
      for (const [W, E] of [[0.5, 1], [1, 1.5]] as const) {
        const r = runTransferMatrix({ dimension: 1, width: 1, disorder: W, energy: E, precision: 0.01, seed: 3 });
        const expected = (24 * (4 - E * E)) / (W * W);
        expect(within(r.xi, expected, r.xiErr) || Math.abs(r.xi / expected - 1) < 0.02, `W=${W} E=${E}: ${r.xi} ± ${r.xiErr} vs ${expected}`).toBe(true);
      }
    });

    it('should give the band-centre anomaly 105.045/W^2 rather than 96/W^2 when E = 0', () => {
      // Kappus & Wegner, Z. Phys. B 45, 15 (1981); Derrida & Gardner, J. Physique 45, 1283 (1984) (memory).
      const W = 0.5;
      const r = runTransferMatrix({ dimension: 1, width: 1, disorder: W, energy: 0, precision: 0.004, seed: 5 });
      expect(within(r.xi, 105.045 / W ** 2, r.xiErr), `${r.xi} ± ${r.xiErr}`).toBe(true);
      expect(Math.abs(r.xi - 96 / W ** 2)).toBeGreaterThan(5 * r.xiErr);
    });

    it('should have a relative error close to sqrt(xi / slices) when it stops at a precision', () => {
      // Self-averaging of the Lyapunov exponent; prefactor about 1 (REFERENCES: own check).
      const r = runTransferMatrix({ dimension: 1, width: 1, disorder: 1, energy: 1, precision: 0.02, seed: 9 });
      const ratio = r.gammaErr / r.gammaMin / Math.sqrt(r.xi / r.slices);
      expect(ratio).toBeGreaterThan(0.5);
      expect(ratio).toBeLessThan(2);
    });
  });

  describe('two dimensions, class AI', () => {
    it('should give Lambda decreasing with L at every W when all states localize', () => {
      // Abrahams et al., PRL 42, 673 (1979): no metallic phase in d = 2 without spin-orbit coupling.
      for (const W of [4, 8]) {
        const runs = [4, 8, 16].map((L) => runTransferMatrix({ dimension: 2, width: L, disorder: W, precision: 0.01, seed: 21 }));
        for (let i = 1; i < runs.length; i++) {
          const drop = runs[i - 1].lambda - runs[i].lambda;
          expect(drop, `W=${W} L=${runs[i].width}`).toBeGreaterThan(3 * Math.hypot(runs[i - 1].lambdaErr, runs[i].lambdaErr));
        }
      }
    });
  });

  describe('three dimensions, class AI', () => {
    it('should give Lambda near the published critical value when W is near W_c', () => {
      // Slevin & Ohtsuki, PRL 82, 382 (1999): Lambda_c = 0.576 +- 0.002 at W_c = 16.54 (E = 0, periodic).
      // Small bars carry irrelevant-scaling corrections of a few percent, hence the tolerance.
      const r = runTransferMatrix({ dimension: 3, width: 6, disorder: 16.5, precision: 0.01, seed: 7 });
      expect(Math.abs(r.lambda - ANDERSON_3D_ORTHOGONAL.criticalLambda)).toBeLessThan(0.03);
    });

    it('should give curves for two sizes that cross between W = 14 and 19, near the published W_c', () => {
      // Slevin & Ohtsuki, PRL 82, 382 (1999): W_c = 16.54; metallic side Lambda grows with L, insulating side shrinks.
      const at = (L: number, W: number) => runTransferMatrix({ dimension: 3, width: L, disorder: W, precision: 0.01, seed: 11 });
      const [m4, m6, i4, i6] = [at(4, 14), at(6, 14), at(4, 19), at(6, 19)];
      expect(m6.lambda - m4.lambda).toBeGreaterThan(3 * Math.hypot(m4.lambdaErr, m6.lambdaErr));
      expect(i4.lambda - i6.lambda).toBeGreaterThan(3 * Math.hypot(i4.lambdaErr, i6.lambdaErr));
      // Where the straight lines between the two W cross.
      const dMetal = m6.lambda - m4.lambda;
      const dInsulator = i6.lambda - i4.lambda;
      const crossing = 14 + (5 * dMetal) / (dMetal - dInsulator);
      expect(Math.abs(crossing - ANDERSON_3D_ORTHOGONAL.criticalDisorder)).toBeLessThan(1);
    });
  });

  describe('runs', () => {
    it('should repeat a run exactly when the seed is the same, and differ when it is not', () => {
      const a = runTransferMatrix({ dimension: 3, width: 4, disorder: 16, slices: 5000, seed: 42 });
      const b = runTransferMatrix({ dimension: 3, width: 4, disorder: 16, slices: 5000, seed: 42 });
      const c = runTransferMatrix({ dimension: 3, width: 4, disorder: 16, slices: 5000, seed: 43 });
      expect(b.gammaMin).toBe(a.gammaMin);
      expect(b.gammaErr).toBe(a.gammaErr);
      expect(c.gammaMin).not.toBe(a.gammaMin);
    });

    it('should stop at the slice count when no precision is asked for', () => {
      expect(runTransferMatrix({ dimension: 2, width: 8, disorder: 5, slices: 10_000, seed: 1 }).slices).toBe(10_000);
    });

    it('should report progress and stop when cancelled', () => {
      const seen: number[] = [];
      let calls = 0;
      expect(() =>
        runTransferMatrix({
          dimension: 2, width: 8, disorder: 5, slices: 1_000_000, seed: 1, progressEvery: 100,
          onProgress: (p) => seen.push(p.fraction),
          isCancelled: () => ++calls > 1000,
        }),
      ).toThrow(TransferMatrixCancelled);
      expect(seen.length).toBeGreaterThan(3);
      expect(seen.every((f, i) => f >= 0 && f <= 1 && (i === 0 || f >= seen[i - 1]))).toBe(true);
    });

    it('should refuse a run expected to take hours unless it is allowed', () => {
      // 3D, L = 40 at 0.1 %: 4e7 slices x ~2.8e9 operations, years at 5e8 operations/s.
      const big = { dimension: 3 as const, width: 40, disorder: 16.5, precision: 0.001 };
      expect(expectedTransferMatrixRun(big).seconds).toBeGreaterThan(3600);
      expect(() => runTransferMatrix(big)).toThrow(TransferMatrixTooLong);
      expect(expectedTransferMatrixRun({ dimension: 3, width: 4, precision: 0.01 }).seconds).toBeLessThan(60);
    });

    it.each([
      ['a width that is not a positive integer', { width: 0 }],
      ['negative disorder', { disorder: -1 }],
      ['neither a precision nor a slice count', { precision: undefined, slices: undefined }],
    ])('should refuse %s', (_name, change) => {
      expect(() => runTransferMatrix({ dimension: 2, width: 4, disorder: 5, slices: 100, ...change })).toThrow(RangeError);
    });
  });
});
