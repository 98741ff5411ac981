import type { Ledger, LedgerEntry } from '@localis/shared';

/** One point of a burn-down line: a time (ms since 1970) and core-hours. */
export interface BurnDownPoint {
  x: number;
  y: number;
}

export interface BurnDownSeries {
  /** The remaining balance after each entry, held until the next one (a step line). */
  remaining: BurnDownPoint[];
  /** What the campaign held in grants (grants, adjustments, transfers) at each entry: the reference line. */
  granted: BurnDownPoint[];
  /** How far below zero debits may go under the round's overdraft, when there is one. */
  floor: BurnDownPoint[];
}

/** Entries that change what was granted rather than what was used. */
const GRANTING = new Set<LedgerEntry['kind']>(['grant', 'adjustment', 'transfer']);

const round3 = (v: number) => Math.round(v * 1000) / 1000;

/**
 * The burn-down of a ledger over time, from its entries alone (oldest first, each with its
 * balance after). The lines run on to `now`, so the last balance reads as the present one.
 */
export function burnDownSeries(ledger: Pick<Ledger, 'entries' | 'overdraftAllowance'>, now: Date = new Date()): BurnDownSeries {
  const entries = [...ledger.entries].sort((a, b) => a.createdAt.localeCompare(b.createdAt));
  if (entries.length === 0) return { remaining: [], granted: [], floor: [] };
  const remaining: BurnDownPoint[] = [];
  const granted: BurnDownPoint[] = [];
  let grantedSoFar = 0;
  for (const entry of entries) {
    const x = new Date(entry.createdAt).getTime();
    if (GRANTING.has(entry.kind)) grantedSoFar = round3(grantedSoFar + entry.coreHours);
    remaining.push({ x, y: entry.balanceAfter });
    granted.push({ x, y: grantedSoFar });
  }
  const first = remaining[0].x;
  const end = Math.max(now.getTime(), remaining[remaining.length - 1].x);
  remaining.push({ x: end, y: remaining[remaining.length - 1].y });
  granted.push({ x: end, y: grantedSoFar });
  const floor = ledger.overdraftAllowance > 0 ? [{ x: first, y: -ledger.overdraftAllowance }, { x: end, y: -ledger.overdraftAllowance }] : [];
  return { remaining, granted, floor };
}

/** Below this span the x axis reads in hours: days alone would label every tick the same. */
const TIME_AXIS_SPAN_MS = 2 * 24 * 60 * 60 * 1000;

/** Whether the axis ticks are dates or times of day: times when every point falls within two days. */
export function burnDownTickUnit(series: Pick<BurnDownSeries, 'remaining'>): 'date' | 'time' {
  const xs = series.remaining.map((p) => p.x);
  if (xs.length === 0) return 'date';
  return Math.max(...xs) - Math.min(...xs) <= TIME_AXIS_SPAN_MS ? 'time' : 'date';
}

/** The share of the grant used, 0..1 (more than 1 in an overdraft); 0 without a grant. */
export function usedShare(ledger: Pick<Ledger, 'granted' | 'used'>): number {
  return ledger.granted > 0 ? Math.max(0, ledger.used) / ledger.granted : 0;
}

/** How a grant's use should look: amber from 75 % (the first usage mail), red from 100 %. */
export type UsageLevel = 'ok' | 'warn' | 'over';

export function usageLevel(share: number): UsageLevel {
  if (share >= 1) return 'over';
  return share >= 0.75 ? 'warn' : 'ok';
}
