import { describe, expect, it } from 'vitest';
import { SeededRandom } from './random';
import { ScalingFitError } from './scaling-fit-error';
import { evaluateScaling, normalizeOrders, scalingJacobian, scalingLayout, type ScalingOrders } from './scaling-model';

const L = Float64Array.from([6, 8, 12, 16, 6, 16]);
const X = Float64Array.from([15, 16, 16.5, 17, 18, 15.5]);

function randomParameters(orders: ScalingOrders, rng: SeededRandom): Float64Array {
  const layout = scalingLayout(orders);
  const p = new Float64Array(layout.count);
  for (let j = 0; j < p.length; j++) p[j] = 0.6 * (rng.next() - 0.5);
  p[0] = 16.5;
  p[1] = 1.57;
  if (layout.y >= 0) p[layout.y] = 2.7;
  return p;
}

describe('scaling model', () => {
  describe('layout', () => {
    it('should list Wc, nu, y, the a_ij, then b_2.. and c_1.. when all orders are in use', () => {
      const layout = scalingLayout({ nr: 2, ni: 1, mr: 3, mi: 2 });
      expect(layout.names).toEqual(['Wc', 'nu', 'y', 'a00', 'a01', 'a02', 'a10', 'a11', 'a12', 'b2', 'b3', 'c1', 'c2']);
      expect(layout.count).toBe(13);
    });

    it('should drop y and the c_m when there is no irrelevant correction', () => {
      const orders = normalizeOrders({ nr: 3, ni: 0, mr: 2, mi: 2 });
      expect(orders.mi).toBe(0);
      expect(scalingLayout(orders, 'E').names).toEqual(['Ec', 'nu', 'a00', 'a01', 'a02', 'a03', 'b2']);
    });

    it('should refuse orders that are not whole numbers in range, naming each', () => {
      const attempt = () => normalizeOrders({ nr: 0, ni: 1.5, mr: 1, mi: 0 });
      expect(attempt).toThrow(ScalingFitError);
      expect(attempt).toThrow(/nr must be a whole number from 1 to 6, got 0; ni must be a whole number from 0 to 3, got 1.5/);
    });
  });

  describe('values', () => {
    it('should give a_00 at the critical point and a_00 + a_01 psi + a_02 psi^2 elsewhere when ni = 0', () => {
      const layout = scalingLayout({ nr: 2, ni: 0, mr: 1, mi: 0 });
      const p = [16, 1.5, -0.5, 0.8, 0.1];
      const out = new Float64Array(2);
      evaluateScaling(layout, p, [10, 10], [16, 14], out);
      expect(out[0]).toBeCloseTo(-0.5, 14);
      // w = (16 - 14)/16 = 0.125, psi = 0.125 × 10^(1/1.5) = 0.125 × 4.641588834 = 0.580198604.
      const psi = 0.125 * 10 ** (1 / 1.5);
      expect(out[1]).toBeCloseTo(-0.5 + 0.8 * psi + 0.1 * psi * psi, 13);
    });

    it('should give NaN when nu, Wc or y leave the positive range', () => {
      const layout = scalingLayout({ nr: 1, ni: 1, mr: 1, mi: 0 });
      const out = new Float64Array(1);
      for (const p of [[16, -1, 2, 0, 1, 0, 0], [0, 1.5, 2, 0, 1, 0, 0], [16, 1.5, 0, 0, 1, 0, 0]]) {
        evaluateScaling(layout, p, [8], [16], out);
        expect(Number.isNaN(out[0])).toBe(true);
      }
    });
  });

  describe('derivatives', () => {
    const cases: ScalingOrders[] = [
      { nr: 1, ni: 0, mr: 1, mi: 0 },
      { nr: 3, ni: 0, mr: 3, mi: 0 },
      { nr: 2, ni: 1, mr: 1, mi: 0 },
      { nr: 3, ni: 2, mr: 2, mi: 2 },
    ];
    for (const orders of cases) {
      it(`should match central differences when the orders are ${JSON.stringify(orders)}`, () => {
        const rng = new SeededRandom(11);
        const layout = scalingLayout(orders);
        const p = randomParameters(orders, rng);
        const jac = new Float64Array(L.length * layout.count);
        scalingJacobian(layout, p, L, X, jac);
        const plus = new Float64Array(L.length);
        const minus = new Float64Array(L.length);
        for (let j = 0; j < layout.count; j++) {
          const h = 1e-6 * Math.max(1, Math.abs(p[j]));
          const q = Float64Array.from(p);
          q[j] = p[j] + h;
          evaluateScaling(layout, q, L, X, plus);
          q[j] = p[j] - h;
          evaluateScaling(layout, q, L, X, minus);
          for (let k = 0; k < L.length; k++) {
            const numeric = (plus[k] - minus[k]) / (2 * h);
            expect(Math.abs(jac[k * layout.count + j] - numeric), `${layout.names[j]} at point ${k}`).toBeLessThan(1e-7 * Math.max(1, Math.abs(numeric)));
          }
        }
      });
    }
  });
});
