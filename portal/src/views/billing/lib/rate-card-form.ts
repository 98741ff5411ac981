import { isIsoCurrency, minorUnitDigits, RateCardInput, type RateCard } from '@localis/shared';
import { z } from 'zod';
import { majorToMinor, minorToMajor } from './money-input';
import { firstOfNextMonth } from './month-range';

/** One row of the tiers editor: core-hours as a number, the price as typed text in major units. */
export interface TierRow {
  fromCoreHours: number | null;
  unitPrice: string;
}

/**
 * What the rate-card form edits: prices in major units as typed ("2.50"), rates in percent
 * (21 for 21 %). `rateCardInputOf` turns them into the RateCardInput the api takes.
 */
export interface RateCardFormValues {
  currency: string;
  unitPrice: string;
  tiers: TierRow[];
  discountPercent: number | null;
  taxPercent: number | null;
  reverseCharge: boolean;
  paymentTermsDays: number | null;
  effectiveFrom: string;
}

/** Currencies partners commonly pay in, offered first; any other ISO code comes from an earlier card. */
export const COMMON_CURRENCIES = ['EUR', 'GBP', 'USD', 'CHF', 'SEK', 'NOK', 'DKK', 'PLN', 'CZK', 'HUF', 'JPY', 'CAD', 'AUD', 'BHD'] as const;

const currencyNames = new Intl.DisplayNames(['en'], { type: 'currency' });

/** "EUR · Euro (2 decimals)": the code, its name, and how many decimals a price in it has. */
export function currencyLabel(code: string): string {
  const digits = minorUnitDigits(code);
  return `${code} · ${currencyNames.of(code) ?? code} (${digits === 0 ? 'no decimals' : `${digits} decimals`})`;
}

export function currencyOptions(extra: readonly string[] = []): { label: string; value: string }[] {
  const codes = [...new Set([...COMMON_CURRENCIES, ...extra.filter(isIsoCurrency)])];
  return codes.map((code) => ({ label: currencyLabel(code), value: code }));
}

export const emptyTier = (): TierRow => ({ fromCoreHours: null, unitPrice: '' });

/**
 * A new card starts from the latest one, so the office changes only what changes; it takes
 * effect at the start of next month unless told otherwise.
 */
export function rateCardFormOf(latest: RateCard | null, now: Date = new Date()): RateCardFormValues {
  const currency = latest?.currency ?? 'EUR';
  return {
    currency,
    unitPrice: latest ? minorToMajor(latest.unitPriceMinor, currency) : '',
    tiers: latest ? latest.tiers.map((t) => ({ fromCoreHours: t.fromCoreHours, unitPrice: minorToMajor(t.unitPriceMinor, currency) })) : [],
    discountPercent: latest ? latest.discountBasisPoints / 100 : 0,
    taxPercent: latest ? latest.taxRateBasisPoints / 100 : null,
    reverseCharge: latest?.reverseCharge ?? false,
    paymentTermsDays: latest?.paymentTermsDays ?? 30,
    effectiveFrom: firstOfNextMonth(now),
  };
}

type Issue = { path: (string | number)[]; message: string };

/** Percent as typed (two decimals at most) to basis points: 5.5 -> 550. */
const basisPoints = (percent: number) => Math.round(percent * 100);

/**
 * The values as RateCardInput, with what cannot be converted (a price with too many decimals, a
 * tier without its start) as issues at the input's own paths, where the server's 422 details
 * also point, so both stand beside the same field. Unreadable values become 0 in the candidate,
 * under an issue of their own.
 */
export function rateCardInputOf(values: RateCardFormValues): { candidate: Record<string, unknown>; issues: Issue[] } {
  const issues: Issue[] = [];
  const currencyKnown = isIsoCurrency(values.currency);
  const price = (text: string, path: (string | number)[]): number => {
    const read = majorToMinor(text, values.currency);
    // Without a currency the currency's own error says what to do; the prices wait for it.
    if (!read.ok && currencyKnown) issues.push({ path, message: read.message });
    return read.ok ? read.minor : 0;
  };

  const tiers = values.tiers.map((tier, i) => {
    if (tier.fromCoreHours === null) issues.push({ path: ['tiers', i, 'fromCoreHours'], message: 'enter the core-hours where this tier starts' });
    return { fromCoreHours: tier.fromCoreHours ?? 0, unitPriceMinor: price(tier.unitPrice, ['tiers', i, 'unitPriceMinor']) };
  });
  if (values.taxPercent === null && !values.reverseCharge) issues.push({ path: ['taxRateBasisPoints'], message: 'enter the tax rate (0 when no tax is charged)' });
  if (values.paymentTermsDays === null) issues.push({ path: ['paymentTermsDays'], message: 'enter the payment terms in days' });

  const candidate = {
    currency: values.currency,
    unitPriceMinor: price(values.unitPrice, ['unitPriceMinor']),
    tiers,
    discountBasisPoints: basisPoints(values.discountPercent ?? 0),
    // Under reverse charge no tax is charged: the customer accounts for it.
    taxRateBasisPoints: values.reverseCharge ? 0 : basisPoints(values.taxPercent ?? 0),
    reverseCharge: values.reverseCharge,
    paymentTermsDays: values.paymentTermsDays ?? 0,
    effectiveFrom: values.effectiveFrom,
  };
  return { candidate, issues };
}

/** The form's schema: the conversion above, then RateCardInput itself, the schema the api uses. */
export const RateCardFormSchema = z
  .custom<RateCardFormValues>((v) => typeof v === 'object' && v !== null)
  .transform((values, ctx) => {
    const { candidate, issues } = rateCardInputOf(values);
    // Tiers that could not be read are not checked for their order: a stand-in start would be named in the message.
    const tiersUnread = issues.some((i) => i.path[0] === 'tiers');
    const parsed = RateCardInput.safeParse(tiersUnread ? { ...candidate, tiers: [] } : candidate);
    const all = [...issues, ...(parsed.success ? [] : parsed.error.issues.map((i) => ({ path: i.path as Issue['path'], message: i.message })))];
    if (all.length > 0 || !parsed.success) {
      for (const issue of all) ctx.addIssue({ code: 'custom', path: issue.path, message: issue.message });
      return z.NEVER;
    }
    return parsed.data;
  });

export interface TierErrors {
  /** About the tiers as a whole (more than 20). */
  list?: string;
  rows: Record<number, { fromCoreHours?: string; unitPriceMinor?: string }>;
}

/** Sorts issues about `tiers` (the form's or the server's) onto the editor's rows and fields. */
export function tierErrors(issues: readonly { path: readonly PropertyKey[]; message: string }[]): TierErrors {
  const out: TierErrors = { rows: {} };
  for (const issue of issues) {
    if (issue.path[0] !== 'tiers') continue;
    const [, index, field] = issue.path;
    if (typeof index === 'number' && (field === 'fromCoreHours' || field === 'unitPriceMinor')) (out.rows[index] ??= {})[field] ??= issue.message;
    else out.list ??= issue.message;
  }
  return out;
}
