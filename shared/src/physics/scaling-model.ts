import { ScalingFitError } from './scaling-fit-error';
import type { ScalingVariable } from './scaling-table';

/**
 * The finite-size scaling function of Slevin & Ohtsuki, PRL 82, 382 (1999):
 *
 *   ln value = F(psi, phi) = sum_{i=0..ni} sum_{j=0..nr} a_ij psi^j phi^i,
 *   psi = chi_r(w) L^(1/nu),  chi_r(w) = w + sum_{m=2..mr} b_m w^m          (b_1 = 1)
 *   phi = chi_i(w) L^(-y),    chi_i(w) = 1 + sum_{m=1..mi} c_m w^m          (c_0 = 1)
 *   w = (x_c - x) / x_c,
 *
 * x being W (or E) and x_c the critical point. ni = 0 drops the irrelevant correction (no phi, no
 * y, no c). Fixing b_1 = c_0 = 1 removes the redundancy between the scale of the scaling variables
 * and the coefficients a_ij. At x = x_c and L -> infinity, F -> a_00, so the critical value is
 * exp(a_00).
 *
 * Parameter vector: [x_c, nu, (y), a_00 … a_0nr, a_10 … a_ni nr, b_2 … b_mr, (c_1 … c_mi)].
 */
export interface ScalingOrders {
  /** Order of the expansion in the relevant scaling variable psi (at least 1). */
  nr: number;
  /** Order in the irrelevant scaling variable phi; 0 means no irrelevant correction. */
  ni: number;
  /** Order of chi_r in w (at least 1; 1 means chi_r = w). */
  mr: number;
  /** Order of chi_i in w (0 means chi_i = 1); ignored when ni = 0. */
  mi: number;
}

export interface ScalingLayout {
  orders: ScalingOrders;
  count: number;
  names: string[];
  /** Index of y, or -1 without an irrelevant correction. */
  y: number;
  a: number;
  b: number;
  c: number;
}

const LIMITS: ScalingOrders = { nr: 6, ni: 3, mr: 6, mi: 4 };

export function ordersLabel(o: ScalingOrders): string {
  return `nr = ${o.nr}, ni = ${o.ni}, mr = ${o.mr}, mi = ${o.mi}`;
}

/** Check the orders and drop mi when there is no irrelevant correction for it to act on. */
export function normalizeOrders(orders: Partial<ScalingOrders>): ScalingOrders {
  const o = { nr: orders.nr, ni: orders.ni ?? 0, mr: orders.mr ?? 1, mi: orders.mi ?? 0 };
  const problems: string[] = [];
  const check = (key: keyof ScalingOrders, min: number) => {
    const v = o[key];
    if (!Number.isInteger(v) || (v as number) < min || (v as number) > LIMITS[key]) {
      problems.push(`${key} must be a whole number from ${min} to ${LIMITS[key]}, got ${v}`);
    }
  };
  check('nr', 1);
  check('ni', 0);
  check('mr', 1);
  check('mi', 0);
  if (problems.length) {
    throw new ScalingFitError(
      'bad-orders',
      `The expansion orders are not valid: ${problems.join('; ')}.`,
      problems.map((message) => ({ path: ['orders'], message })),
    );
  }
  const normalized = o as ScalingOrders;
  return normalized.ni === 0 ? { ...normalized, mi: 0 } : normalized;
}

export function scalingLayout(orders: ScalingOrders, variable: ScalingVariable = 'W'): ScalingLayout {
  const { nr, ni, mr, mi } = orders;
  const names = [`${variable}c`, 'nu'];
  if (ni > 0) names.push('y');
  const a = names.length;
  for (let i = 0; i <= ni; i++) for (let j = 0; j <= nr; j++) names.push(`a${i}${j}`);
  const b = names.length;
  for (let m = 2; m <= mr; m++) names.push(`b${m}`);
  const c = names.length;
  if (ni > 0) for (let m = 1; m <= mi; m++) names.push(`c${m}`);
  return { orders, count: names.length, names, y: ni > 0 ? 2 : -1, a, b, c };
}

/** Everything per point that both the value and the derivatives need. */
interface PointTerms {
  w: number;
  lnL: number;
  Lr: number;
  Li: number;
  psi: number;
  phi: number;
  chirPrime: number;
  chiiPrime: number;
}

function terms(layout: ScalingLayout, p: ArrayLike<number>, L: number, x: number, out: PointTerms): boolean {
  const { mr, mi, ni } = layout.orders;
  const xc = p[0];
  const nu = p[1];
  if (!(xc > 0) || !(nu > 0) || (ni > 0 && !(p[layout.y] > 0))) return false;
  const w = (xc - x) / xc;
  const lnL = Math.log(L);
  const Lr = Math.exp(lnL / nu);
  let chir = w;
  let chirPrime = 1;
  let wPow = w; // w^(m-1)
  for (let m = 2; m <= mr; m++) {
    const bm = p[layout.b + m - 2];
    chirPrime += m * bm * wPow;
    wPow *= w;
    chir += bm * wPow;
  }
  let chii = 1;
  let chiiPrime = 0;
  let Li = 0;
  if (ni > 0) {
    Li = Math.exp(-p[layout.y] * lnL);
    wPow = 1;
    for (let m = 1; m <= mi; m++) {
      const cm = p[layout.c + m - 1];
      chiiPrime += m * cm * wPow;
      wPow *= w;
      chii += cm * wPow;
    }
  }
  out.w = w;
  out.lnL = lnL;
  out.Lr = Lr;
  out.Li = Li;
  out.psi = chir * Lr;
  out.phi = chii * Li;
  out.chirPrime = chirPrime;
  out.chiiPrime = chiiPrime;
  return true;
}

function newTerms(): PointTerms {
  return { w: 0, lnL: 0, Lr: 0, Li: 0, psi: 0, phi: 0, chirPrime: 0, chiiPrime: 0 };
}

/** ln value predicted at each (L, x); NaN everywhere when the parameters leave the model's domain (x_c, nu, y > 0). */
export function evaluateScaling(layout: ScalingLayout, p: ArrayLike<number>, L: ArrayLike<number>, x: ArrayLike<number>, out: Float64Array): void {
  const { nr, ni } = layout.orders;
  const t = newTerms();
  for (let k = 0; k < L.length; k++) {
    if (!terms(layout, p, L[k], x[k], t)) {
      out.fill(Number.NaN);
      return;
    }
    let F = 0;
    let phiPow = 1;
    for (let i = 0; i <= ni; i++) {
      let psiPow = 1;
      let inner = 0;
      for (let j = 0; j <= nr; j++) {
        inner += p[layout.a + i * (nr + 1) + j] * psiPow;
        psiPow *= t.psi;
      }
      F += inner * phiPow;
      phiPow *= t.phi;
    }
    out[k] = F;
  }
}

/** d(ln value)/d parameter at each point, row-major (points × parameters). */
export function scalingJacobian(layout: ScalingLayout, p: ArrayLike<number>, L: ArrayLike<number>, x: ArrayLike<number>, out: Float64Array): void {
  const { nr, ni, mr, mi } = layout.orders;
  const m = layout.count;
  const t = newTerms();
  const psiPow = new Float64Array(nr + 1);
  const phiPow = new Float64Array(ni + 1);
  for (let k = 0; k < L.length; k++) {
    const row = k * m;
    if (!terms(layout, p, L[k], x[k], t)) {
      out.fill(Number.NaN);
      return;
    }
    psiPow[0] = 1;
    for (let j = 1; j <= nr; j++) psiPow[j] = psiPow[j - 1] * t.psi;
    phiPow[0] = 1;
    for (let i = 1; i <= ni; i++) phiPow[i] = phiPow[i - 1] * t.phi;

    let dPsi = 0;
    let dPhi = 0;
    for (let i = 0; i <= ni; i++) {
      for (let j = 0; j <= nr; j++) {
        const aij = p[layout.a + i * (nr + 1) + j];
        out[row + layout.a + i * (nr + 1) + j] = psiPow[j] * phiPow[i];
        if (j > 0) dPsi += j * aij * psiPow[j - 1] * phiPow[i];
        if (i > 0) dPhi += i * aij * psiPow[j] * phiPow[i - 1];
      }
    }
    const xc = p[0];
    const nu = p[1];
    const dwdxc = x[k] / (xc * xc);
    out[row] = dPsi * t.chirPrime * dwdxc * t.Lr + (ni > 0 ? dPhi * t.chiiPrime * dwdxc * t.Li : 0);
    out[row + 1] = (-dPsi * t.psi * t.lnL) / (nu * nu);
    if (ni > 0) out[row + layout.y] = -dPhi * t.phi * t.lnL;
    let wPow = t.w;
    for (let q = 2; q <= mr; q++) {
      wPow *= t.w;
      out[row + layout.b + q - 2] = dPsi * wPow * t.Lr;
    }
    if (ni > 0) {
      wPow = 1;
      for (let q = 1; q <= mi; q++) {
        wPow *= t.w;
        out[row + layout.c + q - 1] = dPhi * wPow * t.Li;
      }
    }
  }
}
