/**
 * Invoice arithmetic: from a partner's monthly usage and its rate card to priced lines and totals.
 * The api, the worker, the portal and the property tests share it, so every figure is computed once.
 *
 * The rules, followed exactly:
 * 1. Integers only. Quantities are milli-core-hours (as in the ledger), money is minor units of
 *    the card's currency, rates are basis points (1 bp = 0.01 %). Products are taken in BigInt, as
 *    milli-core-hours x price can pass 2^53; nothing goes through a float.
 * 2. One rounding rule everywhere: each line's figure is rounded once, half away from zero, to the
 *    minor unit (`halfAwayFromZero`). Totals are sums of rounded line figures, never rounded again,
 *    so the lines always add up to the totals printed under them.
 * 3. Tiers are graduated by the partner's total positive volume in each calendar month. The month's
 *    campaigns with positive net usage are taken in a fixed order (campaign title, then id, compared
 *    by code unit so that no locale changes the order), and each fills the volume from where the
 *    one before stopped: a campaign whose usage straddles a tier boundary becomes one line per tier
 *    it touches. The card's own price applies below the first tier (tier null).
 * 4. A campaign's net negative usage in a month (a refund this month of an earlier month's charge)
 *    is credited at the card's own price, on its own line with tier null. It does not reduce the
 *    month's volume for the tiers: the volume is what was used this month.
 * 5. Per line: amount = round(coreHoursMilli x unitPriceMinor / 1000);
 *    discount = round(amount x discountBasisPoints / 10000);
 *    tax = reverseCharge ? 0 : round((amount - discount) x taxRateBasisPoints / 10000).
 * 6. subtotal = sum of amounts, discount = sum of discounts, tax = sum of taxes,
 *    total = subtotal - discount + tax. A campaign with zero net usage in a month gives no line.
 */
import { errors } from '../errors';
import type { InvoiceLine } from './invoice.schema';
import type { RateCard } from './rate-card.schema';

/** The parts of a rate card that price an invoice. */
export type InvoicePricing = Pick<RateCard, 'currency' | 'unitPriceMinor' | 'discountBasisPoints' | 'taxRateBasisPoints' | 'reverseCharge'> & {
  tiers?: readonly RateCard['tiers'][number][];
};

/** Net usage of one campaign in one calendar month: ledger debits minus refunds, in milli-core-hours. */
export interface CampaignMonthUsage {
  month: string;
  campaignId: string;
  campaignTitle: string;
  netMilli: number;
}

export interface ComputedInvoice {
  currency: string;
  lines: InvoiceLine[];
  subtotalMinor: number;
  discountMinor: number;
  taxMinor: number;
  totalMinor: number;
  reverseCharge: boolean;
  taxRateBasisPoints: number;
  discountBasisPoints: number;
  notes: string[];
}

const MILLI_PER_CORE_HOUR = 1000n;
const BASIS_POINTS = 10_000n;
const MONTH = /^\d{4}-(0[1-9]|1[0-2])$/;

export const REVERSE_CHARGE_NOTE = 'Reverse charge: no VAT is charged on this invoice; the customer accounts for VAT.';
export const CREDIT_NOTE =
  'Lines with negative core-hours credit core-hours returned after an earlier month was invoiced; they are credited at the base price of the rate card.';

/** numerator / denominator rounded to the nearest integer, an exact half away from zero (common practice for invoice amounts). */
export function halfAwayFromZero(numerator: bigint, denominator: bigint): bigint {
  if (denominator === 0n) throw new RangeError('halfAwayFromZero: division by zero');
  const n = numerator < 0n ? -numerator : numerator;
  const d = denominator < 0n ? -denominator : denominator;
  let quotient = n / d;
  if (2n * (n % d) >= d) quotient += 1n;
  return numerator < 0n !== denominator < 0n ? -quotient : quotient;
}

function safeNumber(value: bigint, what: string): number {
  const n = Number(value);
  if (!Number.isSafeInteger(n)) throw errors.invalid(`the ${what} of this invoice is beyond what Localis can represent exactly (2^53 minor units)`);
  return n;
}

function wholeNumber(value: number, what: string): bigint {
  if (!Number.isSafeInteger(value)) throw errors.invalid(`${what} must be a whole number, not ${value}`);
  return BigInt(value);
}

/** Code-unit order: the same on every machine and in every locale. */
const byCodeUnits = (a: string, b: string) => (a < b ? -1 : a > b ? 1 : 0);
const campaignOrder = (a: CampaignMonthUsage, b: CampaignMonthUsage) => byCodeUnits(a.campaignTitle, b.campaignTitle) || byCodeUnits(a.campaignId, b.campaignId);

/** One entry per campaign and month (several rows for the same pair are added up), months in order. */
function usageByMonth(usage: readonly CampaignMonthUsage[]): Map<string, CampaignMonthUsage[]> {
  const merged = new Map<string, CampaignMonthUsage>();
  for (const u of usage) {
    if (!MONTH.test(u.month)) throw errors.invalid(`the usage month ${u.month} is not written YYYY-MM`);
    wholeNumber(u.netMilli, `the usage of ${u.campaignTitle} in ${u.month}`);
    const key = `${u.month} ${u.campaignId}`;
    const seen = merged.get(key);
    merged.set(key, seen ? { ...seen, netMilli: seen.netMilli + u.netMilli } : { ...u });
  }
  const months = new Map<string, CampaignMonthUsage[]>();
  for (const u of [...merged.values()].sort((a, b) => byCodeUnits(a.month, b.month) || campaignOrder(a, b))) {
    months.set(u.month, [...(months.get(u.month) ?? []), u]);
  }
  return months;
}

interface PriceBand {
  tier: number | null;
  fromMilli: bigint;
  /** Exclusive; null for the last band. */
  toMilli: bigint | null;
  unitPriceMinor: bigint;
  fromCoreHours: number;
}

function priceBands(pricing: InvoicePricing): PriceBand[] {
  const tiers = pricing.tiers ?? [];
  const starts = [{ fromCoreHours: 0, unitPriceMinor: pricing.unitPriceMinor }, ...tiers];
  for (let i = 1; i < starts.length; i++) {
    if (!(starts[i].fromCoreHours > starts[i - 1].fromCoreHours)) throw errors.invalid('the tiers of a rate card must start at strictly ascending core-hours');
  }
  return starts.map((s, i) => ({
    tier: i === 0 ? null : i - 1,
    fromMilli: wholeNumber(s.fromCoreHours, 'a tier start') * MILLI_PER_CORE_HOUR,
    toMilli: i + 1 < starts.length ? wholeNumber(starts[i + 1].fromCoreHours, 'a tier start') * MILLI_PER_CORE_HOUR : null,
    unitPriceMinor: wholeNumber(s.unitPriceMinor, 'a price per core-hour'),
    fromCoreHours: s.fromCoreHours,
  }));
}

function lineDescription(u: CampaignMonthUsage, band: PriceBand, credit: boolean): string {
  if (credit) return `${u.campaignTitle}, ${u.month}: credit for core-hours returned, at the base price`;
  if (band.tier === null) return `${u.campaignTitle}, ${u.month}: core-hours at the base price`;
  return `${u.campaignTitle}, ${u.month}: core-hours beyond ${band.fromCoreHours} in the month (tier ${band.tier + 1})`;
}

interface LineFigures {
  coreHoursMilli: bigint;
  unitPriceMinor: bigint;
  amountMinor: bigint;
  discountMinor: bigint;
  taxMinor: bigint;
}

function priceLine(milli: bigint, unitPriceMinor: bigint, pricing: InvoicePricing): LineFigures {
  const amountMinor = halfAwayFromZero(milli * unitPriceMinor, MILLI_PER_CORE_HOUR);
  const discountMinor = halfAwayFromZero(amountMinor * BigInt(pricing.discountBasisPoints), BASIS_POINTS);
  const taxMinor = pricing.reverseCharge ? 0n : halfAwayFromZero((amountMinor - discountMinor) * BigInt(pricing.taxRateBasisPoints), BASIS_POINTS);
  return { coreHoursMilli: milli, unitPriceMinor, amountMinor, discountMinor, taxMinor };
}

/** Priced lines and totals of one partner's usage under one rate card (rules at the top of this file). */
export function computeInvoice(pricing: InvoicePricing, usage: readonly CampaignMonthUsage[]): ComputedInvoice {
  wholeNumber(pricing.discountBasisPoints, 'the discount');
  wholeNumber(pricing.taxRateBasisPoints, 'the tax rate');
  const bands = priceBands(pricing);
  const base = bands[0];
  const lines: InvoiceLine[] = [];
  const totals = { subtotal: 0n, discount: 0n, tax: 0n };

  const addLine = (u: CampaignMonthUsage, band: PriceBand, milli: bigint, credit: boolean) => {
    const f = priceLine(milli, band.unitPriceMinor, pricing);
    totals.subtotal += f.amountMinor;
    totals.discount += f.discountMinor;
    totals.tax += f.taxMinor;
    lines.push({
      campaignId: u.campaignId,
      campaignTitle: u.campaignTitle,
      month: u.month,
      tier: band.tier,
      description: lineDescription(u, band, credit),
      coreHoursMilli: safeNumber(f.coreHoursMilli, 'core-hours'),
      unitPriceMinor: safeNumber(f.unitPriceMinor, 'unit price'),
      amountMinor: safeNumber(f.amountMinor, 'line amount'),
      discountMinor: safeNumber(f.discountMinor, 'line discount'),
      taxMinor: safeNumber(f.taxMinor, 'line tax'),
    });
  };

  for (const campaigns of usageByMonth(usage).values()) {
    let volume = 0n; // the month's positive volume priced so far
    for (const u of campaigns) {
      const net = BigInt(u.netMilli);
      if (net < 0n) addLine(u, base, net, true);
      if (net <= 0n) continue;
      const start = volume;
      const end = volume + net;
      for (const band of bands) {
        const from = start > band.fromMilli ? start : band.fromMilli;
        const to = band.toMilli === null || end < band.toMilli ? end : band.toMilli;
        if (to > from) addLine(u, band, to - from, false);
      }
      volume = end;
    }
  }

  const total = totals.subtotal - totals.discount + totals.tax;
  return {
    currency: pricing.currency,
    lines,
    subtotalMinor: safeNumber(totals.subtotal, 'subtotal'),
    discountMinor: safeNumber(totals.discount, 'discount'),
    taxMinor: safeNumber(totals.tax, 'tax'),
    totalMinor: safeNumber(total, 'total'),
    reverseCharge: pricing.reverseCharge,
    taxRateBasisPoints: pricing.taxRateBasisPoints,
    discountBasisPoints: pricing.discountBasisPoints,
    notes: invoiceNotes({ reverseCharge: pricing.reverseCharge, lines }),
  };
}

/** What an invoice must say besides its lines: that VAT is reverse-charged, and how credits are priced. */
export function invoiceNotes(invoice: { reverseCharge: boolean; lines: readonly Pick<InvoiceLine, 'coreHoursMilli'>[] }): string[] {
  const notes: string[] = [];
  if (invoice.reverseCharge) notes.push(REVERSE_CHARGE_NOTE);
  if (invoice.lines.some((l) => l.coreHoursMilli < 0)) notes.push(CREDIT_NOTE);
  return notes;
}

/** A campaign and month whose invoiced core-hours differ from its usage. */
export interface ReconcileDifference {
  campaignId: string;
  month: string;
  invoicedMilli: number;
  usageMilli: number;
}

/**
 * Whether the lines bill exactly the usage: the sum of coreHoursMilli per campaign and month
 * against the usage's netMilli. An empty list when they agree.
 */
export function reconcile(
  lines: readonly Pick<InvoiceLine, 'campaignId' | 'month' | 'coreHoursMilli'>[],
  usage: readonly Pick<CampaignMonthUsage, 'campaignId' | 'month' | 'netMilli'>[],
): ReconcileDifference[] {
  const sums = new Map<string, { campaignId: string; month: string; invoiced: bigint; usage: bigint }>();
  const at = (campaignId: string, month: string) => {
    const key = `${month} ${campaignId}`;
    let entry = sums.get(key);
    if (!entry) sums.set(key, (entry = { campaignId, month, invoiced: 0n, usage: 0n }));
    return entry;
  };
  for (const l of lines) at(l.campaignId, l.month).invoiced += wholeNumber(l.coreHoursMilli, 'the core-hours of a line');
  for (const u of usage) at(u.campaignId, u.month).usage += wholeNumber(u.netMilli, 'the usage of a campaign');
  return [...sums.values()]
    .filter((s) => s.invoiced !== s.usage)
    .sort((a, b) => byCodeUnits(a.month, b.month) || byCodeUnits(a.campaignId, b.campaignId))
    .map((s) => ({ campaignId: s.campaignId, month: s.month, invoicedMilli: Number(s.invoiced), usageMilli: Number(s.usage) }));
}

/** The day payment is due: the issue day plus the payment terms, in calendar days (dates YYYY-MM-DD). */
export function dueOn(issuedOn: string, paymentTermsDays: number): string {
  const day = Date.parse(`${issuedOn}T00:00:00Z`);
  if (!/^\d{4}-\d{2}-\d{2}$/.test(issuedOn) || Number.isNaN(day) || new Date(day).toISOString().slice(0, 10) !== issuedOn) {
    throw errors.invalid(`the issue date ${issuedOn} is not a date written YYYY-MM-DD`);
  }
  if (!Number.isInteger(paymentTermsDays) || paymentTermsDays < 0) throw errors.invalid(`payment terms must be a whole number of days, not ${paymentTermsDays}`);
  // UTC midnight plus whole days: no time zone or daylight-saving change can shift the date.
  return new Date(day + paymentTermsDays * 86_400_000).toISOString().slice(0, 10);
}
