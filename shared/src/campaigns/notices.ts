import { z } from 'zod';
import { ANDERSON_3D_ORTHOGONAL } from '../physics/reference-values';
import { disorderSpan, type CampaignSpec } from './campaign-spec.schema';
import { GIB, type CampaignEstimate } from './cost-model';

/**
 * Scaling-theory notices: what scaling theory and the trade's practice say about a plan before
 * core-hours are spent on it. Shown beside the form and stored with the proposal; they never
 * block submission. Codes are stable (scripts and the committee filter on them).
 */
export const NOTICE_CODES = [
  'no-transition-1d',
  'no-transition-2d',
  'grid-misses-critical-disorder',
  'too-few-sizes',
  'narrow-size-range',
  'job-exceeds-node',
  'precision-cost',
  'pilot-extrapolation',
] as const;
export const NoticeCode = z.enum(NOTICE_CODES);
export type NoticeCode = z.infer<typeof NoticeCode>;

export const Notice = z
  .object({
    code: NoticeCode,
    severity: z.enum(['info', 'warning']),
    message: z.string(),
    /** The spec field the notice is about, for the form to point at. */
    field: z.string().optional(),
  })
  .meta({ id: 'Notice' });
export type Notice = z.infer<typeof Notice>;

/** Below this relative precision the cost of a transfer-matrix campaign runs away (common practice: 0.1 %–1 %). */
export const PRECISION_COST_THRESHOLD = 0.001;
/** A transfer-matrix plan this large is worth a second look at its precision, whatever eps is. */
export const PRECISION_COST_CORE_HOURS = 1_000_000;
/** Sizes beyond this multiple of the largest pilot size are an extrapolation worth naming. */
export const PILOT_EXTRAPOLATION_FACTOR = 2;

/** Three significant digits, with thousands separators, never rounding a small amount to 0. */
const fmt = (x: number, digits = 3) => {
  const rounded = Number(x.toPrecision(digits));
  return Math.abs(rounded) >= 1000 ? rounded.toLocaleString('en', { maximumFractionDigits: 0 }) : String(rounded);
};

export function campaignNotices(spec: CampaignSpec, estimate: CampaignEstimate): Notice[] {
  const notices: Notice[] = [];
  const seekingTransition = spec.goal === 'critical-point';
  const severity = seekingTransition ? 'warning' : 'info';

  // Abrahams et al., PRL 42, 673 (1979): in d = 1, and in d = 2 without spin–orbit coupling, every
  // state localizes at any disorder, so there is no critical point to locate.
  if (spec.dimension === 1) {
    notices.push({
      code: 'no-transition-1d',
      severity,
      field: 'dimension',
      message: seekingTransition
        ? 'In one dimension every state is localized for any disorder, so there is no metal–insulator transition and a search for a critical point cannot succeed. Study localization lengths instead, or move to d = 3 (or d = 2 in class AII).'
        : 'In one dimension every state is localized for any disorder: expect localization lengths, not a transition.',
    });
  }
  if (spec.dimension === 2 && (spec.symmetryClass === 'AI' || spec.symmetryClass === 'A')) {
    const qh = spec.symmetryClass === 'A'
      ? ' The exception is the integer quantum Hall transition in class A, at special energies in the centre of the Landau bands (nu = 2.593, Slevin & Ohtsuki 2009); that needs a magnetic field and a network or Landau-level model.'
      : '';
    notices.push({
      code: 'no-transition-2d',
      severity,
      field: 'symmetryClass',
      message: (seekingTransition
        ? `In two dimensions in class ${spec.symmetryClass} all states localize for any disorder (weak localization), so a search for a metal–insulator transition cannot succeed. For a 2D transition use the symplectic class AII, or go to d = 3.`
        : `In two dimensions in class ${spec.symmetryClass} all states localize for any disorder; localization lengths can be exponentially large at weak disorder.`) + qh,
    });
  }

  const { min: wMin, max: wMax } = disorderSpan(spec.disorder);
  const wc = ANDERSON_3D_ORTHOGONAL.criticalDisorder;
  if (
    seekingTransition && spec.dimension === 3 && spec.model === 'anderson-box' && spec.symmetryClass === 'AI' &&
    spec.energies.some((e) => e === 0) && !(wMin < wc && wMax > wc)
  ) {
    notices.push({
      code: 'grid-misses-critical-disorder',
      severity: 'warning',
      field: 'disorder',
      message: `The disorder grid (W from ${fmt(wMin)} to ${fmt(wMax)}) does not bracket the known critical disorder of the 3D Anderson model with box disorder at E = 0, W_c = ${wc} ± ${ANDERSON_3D_ORTHOGONAL.criticalDisorderError} (${ANDERSON_3D_ORTHOGONAL.source}). Curves for different L cross only at W_c: take a grid on both sides, e.g. W from 15 to 18.`,
    });
  }

  if (seekingTransition && spec.sizes.length < 3) {
    notices.push({
      code: 'too-few-sizes',
      severity: 'warning',
      field: 'sizes',
      message: `Finite-size scaling needs at least three system sizes to separate the scaling from corrections (common practice); this plan has ${spec.sizes.length}. Add sizes.`,
    });
  }
  const lMin = Math.min(...spec.sizes);
  const lMax = Math.max(...spec.sizes);
  if (seekingTransition && spec.sizes.length >= 2 && lMax < 2 * lMin) {
    notices.push({
      code: 'narrow-size-range',
      severity: 'warning',
      field: 'sizes',
      message: `The sizes span only a factor ${fmt(lMax / lMin, 2)} (L from ${lMin} to ${lMax}); finite-size scaling wants at least a factor of two (common practice), or the exponent is poorly constrained. Add a size of ${2 * lMin} or more.`,
    });
  }

  const tooBig = estimate.rows.filter((r) => !r.fitsNode);
  if (tooBig.length) {
    const worst = tooBig[tooBig.length - 1];
    notices.push({
      code: 'job-exceeds-node',
      severity: 'warning',
      field: 'sizes',
      message: `A job at L = ${tooBig.map((r) => r.size).join(', ')} needs up to ${fmt(worst.peakMemoryBytes / GIB)} GiB, more than one node's ${fmt(spec.node.memoryGiBPerNode)} GiB. Drop those sizes, choose a method with less memory, or plan a distributed code and say so in the justification.`,
    });
  }

  if (
    spec.method === 'transfer-matrix' && spec.targetPrecision !== undefined &&
    (spec.targetPrecision < PRECISION_COST_THRESHOLD || estimate.totalCoreHours >= PRECISION_COST_CORE_HOURS)
  ) {
    notices.push({
      code: 'precision-cost',
      severity: 'warning',
      field: 'targetPrecision',
      message: `A target precision of ${fmt(spec.targetPrecision * 100, 3)} % costs ${fmt(estimate.totalCoreHours)} core-hours: the bar length grows as 1/eps², so halving eps quadruples the cost. At ${fmt(spec.targetPrecision * 200, 3)} % it would be about ${fmt(estimate.totalCoreHours / 4)} core-hours. Studies usually aim at 0.1 %–1 % (common practice).`,
    });
  }

  if (estimate.rate.source === 'pilot') {
    const largestPilot = estimate.rate.fit.sizeRange.max;
    if (lMax > PILOT_EXTRAPOLATION_FACTOR * largestPilot) {
      notices.push({
        code: 'pilot-extrapolation',
        severity: 'info',
        field: 'pilotTimings',
        message: `The largest size (L = ${lMax}) is more than ${PILOT_EXTRAPOLATION_FACTOR}× the largest pilot (L = ${largestPilot}): the estimate extrapolates the fitted exponent ${estimate.rate.fit.exponent.toFixed(2)} (the method's asymptotic exponent is ${estimate.sizeExponent}). A pilot at a larger size would make it firmer.`,
      });
    }
  }
  return notices;
}
