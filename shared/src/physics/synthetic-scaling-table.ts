import { SeededRandom } from './random';
import type { ScalingPoint } from './scaling-table';

/**
 * A table drawn from a known scaling function, for the tests and the benchmark of the fit:
 * ln value = ln(criticalValue) + sum_j coefficients[j-1] psi^j + amplitude L^(-y),
 * psi = w L^(1/nu), w = (criticalX - x) / criticalX; each value carries Gaussian noise of
 * `relativeError` times the exact value, and that is also its stated error.
 */
export interface SyntheticScalingOptions {
  criticalX: number;
  nu: number;
  criticalValue: number;
  sizes: readonly number[];
  xs: readonly number[];
  relativeError: number;
  /** Coefficients of psi, psi², …; default [0.9, 0.1] (Lambda from about 0.35 to 0.95 over W = 15–18 at L = 6–16). */
  coefficients?: readonly number[];
  /** An irrelevant correction amplitude × L^(-y) added to ln value (at every x; chi_i = 1). */
  irrelevant?: { y: number; amplitude: number };
  seed?: number;
}

export function syntheticScalingTable(options: SyntheticScalingOptions): ScalingPoint[] {
  const coefficients = options.coefficients ?? [0.9, 0.1];
  const rng = new SeededRandom(options.seed ?? 1);
  const out: ScalingPoint[] = [];
  for (const L of options.sizes) {
    for (const x of options.xs) {
      const psi = ((options.criticalX - x) / options.criticalX) * L ** (1 / options.nu);
      let ln = Math.log(options.criticalValue);
      let power = 1;
      for (const a of coefficients) {
        power *= psi;
        ln += a * power;
      }
      if (options.irrelevant) ln += options.irrelevant.amplitude * L ** -options.irrelevant.y;
      const exact = Math.exp(ln);
      const error = options.relativeError * exact;
      out.push({ L, x, value: exact + error * rng.normal(), error });
    }
  }
  return out;
}
