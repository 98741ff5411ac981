/**
 * The chi-square goodness-of-fit probability p = Q(dof/2, chi²/2): the chance that a correct model
 * with Gaussian errors gives a chi-square at least this large. Q is the regularized upper incomplete
 * gamma function, evaluated by the power series of P = 1 - Q where it converges fast (x < a + 1) and
 * by a continued fraction (modified Lentz) elsewhere, the usual pairing that keeps both parts
 * accurate; ln Gamma comes from a Lanczos approximation (g = 7, nine terms, about 1e-15 relative).
 */

const LANCZOS_G = 7;
const LANCZOS = [
  0.99999999999980993, 676.5203681218851, -1259.1392167224028, 771.32342877765313, -176.61502916214059,
  12.507343278686905, -0.13857109526572012, 9.9843695780195716e-6, 1.5056327351493116e-7,
];

/** ln Gamma(x) for x > 0. */
export function lnGamma(x: number): number {
  if (!(x > 0)) throw new RangeError(`lnGamma needs x > 0, got ${x}`);
  if (x < 0.5) {
    // Reflection keeps the approximation in the range where it is accurate.
    return Math.log(Math.PI / Math.sin(Math.PI * x)) - lnGamma(1 - x);
  }
  const z = x - 1;
  let sum = LANCZOS[0];
  for (let i = 1; i < LANCZOS.length; i++) sum += LANCZOS[i] / (z + i);
  const t = z + LANCZOS_G + 0.5;
  return 0.5 * Math.log(2 * Math.PI) + (z + 0.5) * Math.log(t) - t + Math.log(sum);
}

const EPS = 1e-15;
const TINY = 1e-300;

/** Iterations grow like sqrt(a) for large a; this cap is far above what any chi-square needs. */
function iterationCap(a: number): number {
  return 1000 + Math.ceil(50 * Math.sqrt(a));
}

/** P(a, x) by its series; call for x < a + 1. */
function lowerSeries(a: number, x: number): number {
  let ap = a;
  let term = 1 / a;
  let sum = term;
  const cap = iterationCap(a);
  for (let n = 0; n < cap; n++) {
    ap += 1;
    term *= x / ap;
    sum += term;
    if (Math.abs(term) < Math.abs(sum) * EPS) {
      return sum * Math.exp(-x + a * Math.log(x) - lnGamma(a));
    }
  }
  throw new Error(`the incomplete gamma series did not converge for a = ${a}, x = ${x}`);
}

/** Q(a, x) by its continued fraction; call for x >= a + 1. */
function upperContinuedFraction(a: number, x: number): number {
  let b = x + 1 - a;
  let c = 1 / TINY;
  let d = 1 / b;
  let h = d;
  const cap = iterationCap(a);
  for (let i = 1; i <= cap; i++) {
    const an = -i * (i - a);
    b += 2;
    d = an * d + b;
    if (Math.abs(d) < TINY) d = TINY;
    c = b + an / c;
    if (Math.abs(c) < TINY) c = TINY;
    d = 1 / d;
    const delta = d * c;
    h *= delta;
    if (Math.abs(delta - 1) < EPS) {
      return Math.exp(-x + a * Math.log(x) - lnGamma(a)) * h;
    }
  }
  throw new Error(`the incomplete gamma continued fraction did not converge for a = ${a}, x = ${x}`);
}

/** Regularized lower incomplete gamma P(a, x) = gamma(a, x) / Gamma(a), a > 0, x >= 0. */
export function regularizedGammaP(a: number, x: number): number {
  if (!(a > 0) || !(x >= 0)) throw new RangeError(`regularizedGammaP needs a > 0 and x >= 0, got a = ${a}, x = ${x}`);
  if (x === 0) return 0;
  if (x === Infinity) return 1;
  return x < a + 1 ? lowerSeries(a, x) : 1 - upperContinuedFraction(a, x);
}

/** Regularized upper incomplete gamma Q(a, x) = 1 - P(a, x), a > 0, x >= 0. */
export function regularizedGammaQ(a: number, x: number): number {
  if (!(a > 0) || !(x >= 0)) throw new RangeError(`regularizedGammaQ needs a > 0 and x >= 0, got a = ${a}, x = ${x}`);
  if (x === 0) return 1;
  if (x === Infinity) return 0;
  return x < a + 1 ? 1 - lowerSeries(a, x) : upperContinuedFraction(a, x);
}

/**
 * Goodness-of-fit probability of a chi-square `chi2` with `dof` degrees of freedom: Q(dof/2, chi2/2).
 * Near 1 for fits better than the errors allow (errors overestimated), near 0 for poor models.
 */
export function chiSquareProbability(chi2: number, dof: number): number {
  if (!(dof > 0) || !Number.isFinite(dof)) throw new RangeError(`degrees of freedom must be a positive number, got ${dof}`);
  if (!(chi2 >= 0)) throw new RangeError(`chi-square must be 0 or more, got ${chi2}`);
  return regularizedGammaQ(dof / 2, chi2 / 2);
}
