import type { CrossingDrift, Interval, ScalingObservable, ScalingVariable } from '@localis/shared';
import { scientificText } from './scientific';

/**
 * How the analysis page writes its numbers: estimates to the precision their interval supports
 * (two significant digits of the half-width), probabilities and chi² to what a reader compares,
 * and the physics in its usual notation (Λ, ν, W_c).
 */

/** A true minus sign, as everywhere in Localis. */
function minus(text: string): string {
  return /^-0(\.0*)?$/.test(text) ? text.slice(1) : text.replace(/^-/, '−');
}

/** Decimals that keep two significant digits of `spread` (at least 0, at most 8). */
export function decimalsFor(spread: number): number {
  if (!Number.isFinite(spread) || spread <= 0) return 4;
  return Math.min(8, Math.max(0, 1 - Math.floor(Math.log10(spread))));
}

/** A number with this many decimals, or four significant digits when no spread says otherwise. */
export function formatFixed(value: number | null | undefined, decimals: number): string {
  if (value === null || value === undefined || !Number.isFinite(value)) return '—';
  return minus(value.toFixed(decimals));
}

/** A number at four significant digits, without trailing noise ("16.54", "0.0012", "1.2 × 10⁻⁵"). */
export function formatSignificant(value: number | null | undefined, digits = 4): string {
  if (value === null || value === undefined || !Number.isFinite(value)) return '—';
  return scientificText(value, digits);
}

export interface IntervalText {
  value: string;
  lo: string;
  hi: string;
  /** "16.54 (16.48 to 16.60)": for a sentence or a screen reader. */
  text: string;
}

/** An estimate and its 95 % interval, all at the precision the interval's half-width supports. */
export function formatInterval(interval: Interval): IntervalText {
  const decimals = decimalsFor((interval.hi - interval.lo) / 2);
  const value = formatFixed(interval.value, decimals);
  const lo = formatFixed(interval.lo, decimals);
  const hi = formatFixed(interval.hi, decimals);
  return { value, lo, hi, text: `${value} (${lo} to ${hi})` };
}

/** A goodness-of-fit probability: three decimals, small ones in powers of ten. */
export function formatProbability(p: number | null | undefined): string {
  if (p === null || p === undefined || !Number.isFinite(p)) return '—';
  if (p === 0) return '0';
  return p < 0.001 ? scientificText(p, 2) : p.toFixed(3);
}

/** chi² with one decimal (two below 10): it is read against the degrees of freedom. */
export function formatChi2(chi2: number | null | undefined): string {
  if (chi2 === null || chi2 === undefined || !Number.isFinite(chi2)) return '—';
  return minus(chi2.toFixed(chi2 < 10 ? 2 : 1));
}

/** The observable's symbol: Λ (xi / L from the transfer matrix) or g (the conductance). */
export function observableSymbol(observable: ScalingObservable): string {
  return observable === 'lambda' ? 'Λ' : 'g';
}

/** The observable in words, for a sentence. */
export function observableWords(observable: ScalingObservable): string {
  return observable === 'lambda' ? 'Λ = ξ/L, the reduced localization length' : 'g, the dimensionless conductance';
}

/** The control parameter in words. */
export function variableWords(variable: ScalingVariable): string {
  return variable === 'W' ? 'disorder W' : 'energy E';
}

/** "8, 12, 16 and 24" */
export function sizesText(sizes: readonly number[]): string {
  if (sizes.length <= 1) return sizes.join('');
  return `${sizes.slice(0, -1).join(', ')} and ${sizes[sizes.length - 1]}`;
}

/** The drift of the crossings with size, in a sentence. */
export function driftWords(drift: CrossingDrift, variable: ScalingVariable): string {
  if (drift.path.length < 2 || !drift.slopeVsInverseSize) {
    return drift.path.length === 0
      ? `No pair of successive sizes crosses in this ${variable} range, so there is no drift to measure.`
      : `Only one pair of sizes crosses, so the drift of the crossing cannot be measured.`;
  }
  const { value, error } = drift.slopeVsInverseSize;
  const slope = `d${variable}×/d(1/L) = ${formatSignificant(value, 3)} ± ${formatSignificant(error, 2)}`;
  if (drift.direction === 'none') return `The crossing does not move measurably as L grows (${slope}, within two standard errors of zero).`;
  const where = drift.direction === 'towards larger x' ? `larger ${variable}` : `smaller ${variable}`;
  return `The crossing moves towards ${where} as L grows (${slope}): corrections to scaling show at these sizes; compare the models with an irrelevant term (ni ≥ 1) in the scan.`;
}
