/**
 * Core-hour arithmetic of the ledger, pure so the api, the portal and the property tests share it.
 *
 * Amounts are kept as integer milli-core-hours (0.001 core-hour, 3.6 core-seconds): a run's
 * cores x wall-clock is rarely a whole number of core-hours, and sums of binary floating-point
 * decimals drift, so "the balance equals the sum of the entries" would not hold exactly.
 */
export const MILLI_PER_CORE_HOUR = 1000;

/** Core-hours (a number, maybe fractional) to integer milli-core-hours, half away from zero. */
export function toMilli(coreHours: number): number {
  const scaled = coreHours * MILLI_PER_CORE_HOUR;
  const milli = Math.sign(scaled) * Math.round(Math.abs(scaled) + 1e-9);
  // A tiny negative amount rounds to -0, which Intl prints as "-0".
  return milli === 0 ? 0 : milli;
}

export function fromMilli(milli: number): number {
  return milli / MILLI_PER_CORE_HOUR;
}

/** Core-hours of a run from its cores and wall-clock, in milli-core-hours. */
export function runMilliCoreHours(cores: number, startedAt: string | Date, endedAt: string | Date): number {
  const ms = new Date(endedAt).getTime() - new Date(startedAt).getTime();
  // cores x ms / 3600 is the amount in milli-core-hours. One division of whole numbers keeps an
  // exact half exact, which seconds / 3600 x 1000 does not for long runs (it rounded them down).
  const scaled = (cores * ms) / 3600;
  const milli = Math.sign(scaled) * Math.round(Math.abs(scaled));
  return milli === 0 ? 0 : milli;
}

export const LEDGER_KINDS = ['grant', 'debit', 'refund', 'adjustment', 'transfer', 'expiry'] as const;
type LedgerKind = (typeof LEDGER_KINDS)[number];

/**
 * The sign each kind may carry: grants and refunds add, debits and expiries take away,
 * adjustments and transfers go either way (a transfer is two entries, one per campaign).
 */
export const LEDGER_SIGNS: Record<LedgerKind, 'positive' | 'negative' | 'either'> = {
  grant: 'positive',
  debit: 'negative',
  refund: 'positive',
  adjustment: 'either',
  transfer: 'either',
  expiry: 'negative',
};

export interface LedgerAmount {
  kind: LedgerKind;
  /** Signed milli-core-hours: what the entry adds to the remaining balance. */
  milli: number;
}

export interface Balances {
  /** Grants, adjustments and transfers in and out. */
  granted: number;
  /** Debits less refunds. */
  used: number;
  /** Taken back when the round's allocation period ended. */
  expired: number;
  /** granted - used - expired, which is the sum of every entry. */
  remaining: number;
}

/** Balances derived from entries alone; nothing is stored apart from the entries. */
export function balancesOf(entries: readonly LedgerAmount[]): Balances {
  let granted = 0;
  let used = 0;
  let expired = 0;
  for (const e of entries) {
    if (e.kind === 'debit' || e.kind === 'refund') used -= e.milli;
    else if (e.kind === 'expiry') expired -= e.milli;
    else granted += e.milli;
  }
  return { granted, used, expired, remaining: granted - used - expired };
}

/** How far below zero a debit may take a campaign: a share of what it was granted. */
export function overdraftAllowance(grantedMilli: number, overdraftPercent: number): number {
  return Math.floor((Math.max(0, grantedMilli) * overdraftPercent) / 100);
}

export type DebitVerdict =
  | { allowed: true; overdraft: boolean; remainingAfter: number }
  | { allowed: false; shortBy: number; remainingAfter: number };

/**
 * May a debit of `debitMilli` be written? Under the default policy (0 %) only while it fits in
 * what remains; with an overdraft of p % down to -p % of the grant, flagged as an overdraft.
 */
export function judgeDebit(balances: Balances, debitMilli: number, overdraftPercent: number): DebitVerdict {
  const remainingAfter = balances.remaining - debitMilli;
  const floor = -overdraftAllowance(balances.granted, overdraftPercent);
  if (remainingAfter < floor) return { allowed: false, shortBy: floor - remainingAfter, remainingAfter };
  return { allowed: true, overdraft: remainingAfter < 0, remainingAfter };
}

/** Usage alerts: a share of the grant used, each mailed once per grant. */
export const USAGE_THRESHOLDS = [75, 90, 100] as const;
export type UsageThreshold = (typeof USAGE_THRESHOLDS)[number];

/** The thresholds that `used` has reached (of a positive grant). */
export function thresholdsReached(balances: Balances): UsageThreshold[] {
  if (balances.granted <= 0) return [];
  return USAGE_THRESHOLDS.filter((t) => balances.used * 100 >= balances.granted * t);
}

/** Format milli-core-hours for people: up to three decimals, no trailing zeros. */
export function formatCoreHours(milli: number): string {
  return fromMilli(milli).toLocaleString('en-GB', { maximumFractionDigits: 3 });
}
