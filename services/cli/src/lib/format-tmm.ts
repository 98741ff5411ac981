import type { TransferMatrixProgress, TransferMatrixResult } from '@localis/shared';
import type { TmmPlan } from './tmm-options';

/**
 * A transfer-matrix result as a reader at a terminal wants it: Lambda first (what finite-size
 * scaling reads), then xi and gamma_min, each with its standard error, then how far the run went.
 * One fact per line, so `localis tmm ... | grep Lambda` works.
 */
export function formatTmm(plan: TmmPlan, r: TransferMatrixResult): string {
  const { input } = plan;
  const stoppedBy =
    input.slices !== undefined && r.slices >= input.slices
      ? 'the slice count'
      : `the precision (relative error of gamma_min ${percent(r.gammaErr / r.gammaMin)}, asked ${percent(input.precision!)})`;
  return [
    `Transfer matrix, d = ${r.dim}, L = ${r.width}, W = ${r.disorder}, E = ${r.energy} (seed ${input.seed}, QR every ${input.reorthogonalizeEvery} slices)`,
    `Lambda = xi/L = ${withError(r.lambda, r.lambdaErr)} (${percent(r.lambdaErr / r.lambda)})`,
    `xi = ${withError(r.xi, r.xiErr)}`,
    `gamma_min = ${withError(r.gammaMin, r.gammaErr)}`,
    `Slices: ${r.slices.toLocaleString('en')}, stopped by ${stoppedBy}`,
    `Time: ${seconds(r.seconds)}`,
  ].join('\n');
}

/** The one line redrawn on a terminal's stderr while the kernel runs. */
export function formatProgress(plan: TmmPlan, p: TransferMatrixProgress): string {
  const { precision, slices } = plan.input;
  return [
    `localis tmm: ${Math.floor(p.fraction * 100)} %`,
    `slices ${p.slices.toLocaleString('en')}${slices !== undefined ? ` of ${slices.toLocaleString('en')}` : ''}`,
    `relative error ${Number.isFinite(p.relativeError) ? percent(p.relativeError) : '-'}${precision !== undefined ? ` (target ${percent(precision)})` : ''}`,
  ].join('  ');
}

/** The value to the digits its error allows: two significant digits of the error. */
export function withError(value: number, err: number): string {
  if (!Number.isFinite(value)) return String(value);
  if (!(err > 0) || !Number.isFinite(err)) return value.toPrecision(4);
  const decimals = Math.min(15, Math.max(0, 1 - Math.floor(Math.log10(err))));
  return `${value.toFixed(decimals)} ± ${err.toFixed(decimals)}`;
}

function percent(x: number): string {
  if (!Number.isFinite(x)) return '-';
  return `${(x * 100).toLocaleString('en', { maximumSignificantDigits: 2 })} %`;
}

function seconds(s: number): string {
  if (s < 60) return `${s.toFixed(s < 10 ? 2 : 1)} s`;
  const m = Math.floor(s / 60);
  if (m < 60) return `${m} min ${Math.floor(s - m * 60)} s`;
  return `${Math.floor(m / 60)} h ${m % 60} min`;
}
