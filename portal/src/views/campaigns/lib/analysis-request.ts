import type { Analysis, AnalysisRequest, Campaign, ScalingOrders } from '@localis/shared';
import type { TypeMessages } from '../../../composables/use-zod-form';

/**
 * The "Run again" form: what its inputs hold, where they start from (the analysis on screen), and
 * how they become an AnalysisRequest for the same schema the api checks.
 */

export type OrdersMode = 'scan' | 'given';

export interface AnalysisFormValues {
  /** 'auto' leaves it to the tables. */
  observable: 'auto' | 'lambda' | 'g';
  /** 'auto' is the energy most points have; otherwise one of the campaign's energies, as text. */
  energy: string;
  ordersMode: OrdersMode;
  nr: number;
  ni: number;
  mr: number;
  mi: number;
  /** The sizes to keep; all of them sends no `sizes` at all. */
  sizes: number[];
  bootstrap: string;
}

/** The limits of AnalysisRequest's orders, for the form's choices. */
export const ORDER_CHOICES: Record<keyof ScalingOrders, number[]> = {
  nr: [1, 2, 3, 4],
  ni: [0, 1, 2],
  mr: [1, 2, 3],
  mi: [0, 1, 2],
};

export const DEFAULT_BOOTSTRAP = 200;

/** The choice that leaves observable and energy to the api (a select shows an empty value as nothing chosen). */
export const AUTO = 'auto';

export const ANALYSIS_FORM_MESSAGES: TypeMessages = {
  blank: 'fill this in',
  notANumber: 'must be a number',
  blankByField: { bootstrap: 'give the number of bootstrap refits (0 for linearized intervals)' },
};

/** The sizes a new analysis can keep: the campaign's and those of the analysis on screen, ascending. */
export function availableSizes(campaign: Pick<Campaign, 'spec'> | null, latest: Analysis | null): number[] {
  const all = new Set<number>([...(campaign?.spec?.sizes ?? []), ...(latest?.result?.model.sizes ?? [])]);
  return [...all].filter((n) => Number.isInteger(n) && n > 0).sort((a, b) => a - b);
}

/** The campaign's energies, for the energy choice. */
export function availableEnergies(campaign: Pick<Campaign, 'spec'> | null): number[] {
  return [...new Set(campaign?.spec?.energies ?? [])].sort((a, b) => a - b);
}

/** The form as the analysis on screen was asked for, its model's orders ready to adjust. */
export function analysisFormValues(latest: Analysis | null, sizes: readonly number[]): AnalysisFormValues {
  const request = latest?.request;
  const model = latest?.result?.model;
  const orders = request?.orders ?? model ?? { nr: 2, ni: 0, mr: 1, mi: 0 };
  return {
    observable: request?.observable ?? AUTO,
    energy: request?.energy === undefined ? AUTO : String(request.energy),
    ordersMode: request?.orders ? 'given' : 'scan',
    nr: orders.nr,
    ni: orders.ni ?? 0,
    mr: orders.mr ?? 1,
    mi: orders.mi ?? 0,
    sizes: [...(request?.sizes ?? sizes)],
    bootstrap: String(request?.bootstrap ?? DEFAULT_BOOTSTRAP),
  };
}

function numberOrText(text: string): number | string | undefined {
  const trimmed = text.trim().replace(/^−/, '-');
  if (trimmed === '') return undefined;
  const n = Number(trimmed);
  return Number.isNaN(n) ? Number.NaN : n;
}

/**
 * What AnalysisRequest parses: only what the person chose (the api's defaults fill the rest), the
 * orders only when given (mi only with an irrelevant term), sizes only when some are left out.
 */
export function analysisRequestInput(values: AnalysisFormValues, sizes: readonly number[]): Record<string, unknown> {
  const input: Record<string, unknown> = {};
  if (values.observable !== AUTO) input.observable = values.observable;
  const energy = values.energy === AUTO ? undefined : numberOrText(values.energy);
  if (energy !== undefined) input.energy = energy;
  if (values.ordersMode === 'given') input.orders = { nr: values.nr, ni: values.ni, mr: values.mr, mi: values.ni === 0 ? 0 : values.mi };
  const kept = [...new Set(values.sizes)].sort((a, b) => a - b);
  const all = sizes.length > 0 && sizes.every((s) => kept.includes(s)) && kept.length === sizes.length;
  if (!all) input.sizes = kept;
  input.bootstrap = values.bootstrap.trim() === '' ? undefined : numberOrText(values.bootstrap);
  return input;
}

/** The request in words, for the list of analyses and the progress panel. */
export function requestWords(request: AnalysisRequest): string {
  const parts = [
    request.orders ? `orders nr = ${request.orders.nr}, ni = ${request.orders.ni}, mr = ${request.orders.mr}, mi = ${request.orders.mi}` : 'orders chosen by the scan',
    request.sizes ? `sizes L = ${request.sizes.join(', ')}` : 'all sizes',
    request.bootstrap === 0 ? 'linearized intervals' : `${request.bootstrap} bootstrap refits`,
  ];
  if (request.observable) parts.unshift(request.observable === 'lambda' ? 'Λ' : 'g');
  if (request.energy !== undefined) parts.push(`E = ${request.energy}`);
  return parts.join(' · ');
}
