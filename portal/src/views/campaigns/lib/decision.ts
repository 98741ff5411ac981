import type { DECISION_OUTCOMES, PoolUsage } from '@localis/shared';
import { formatCoreHoursExact } from '../../../lib/units';

export type DecisionOutcome = (typeof DECISION_OUTCOMES)[number];

/** What the decision form's inputs hold: nothing chosen yet is null. */
export interface DecisionFormValues {
  outcome: DecisionOutcome | null;
  coreHours: number | null;
  message: string;
}

export const OUTCOME_OPTIONS: { label: string; value: DecisionOutcome }[] = [
  { label: 'Grant all', value: 'grant-all' },
  { label: 'Grant part', value: 'grant-part' },
  { label: 'Decline', value: 'decline' },
];

export const blankDecision = (): DecisionFormValues => ({ outcome: null, coreHours: null, message: '' });

/**
 * What DecisionInput parses, from what the inputs hold. Core-hours typed for a partial grant stay
 * in the box when the outcome changes, but only a partial grant sends them.
 */
export function decisionInputOf(values: DecisionFormValues): unknown {
  return {
    outcome: values.outcome ?? undefined,
    coreHours: values.outcome === 'grant-part' ? (values.coreHours ?? undefined) : undefined,
    message: values.message,
  };
}

/** Core-hours the decision grants: the request, the part typed, or none. Null while that is not known. */
export function grantOf(values: { outcome: DecisionOutcome | null; coreHours?: number | null }, requested: number): number | null {
  switch (values.outcome) {
    case 'grant-all':
      return requested;
    case 'grant-part':
      return values.coreHours ?? null;
    case 'decline':
      return 0;
    default:
      return null;
  }
}

/** The round's pool on the machine before and after a grant. */
export interface PoolImpact {
  pool: number;
  grantedBefore: number;
  unallocatedBefore: number;
  grant: number;
  grantedAfter: number;
  unallocatedAfter: number;
  /** The grant fits in what is unallocated (the api refuses one that does not). */
  fits: boolean;
}

export function poolImpact(pool: Pick<PoolUsage, 'pool' | 'granted' | 'unallocated'>, grant: number | null): PoolImpact {
  const g = grant ?? 0;
  return {
    pool: pool.pool,
    grantedBefore: pool.granted,
    unallocatedBefore: pool.unallocated,
    grant: g,
    grantedAfter: pool.granted + g,
    unallocatedAfter: pool.unallocated - g,
    fits: g <= pool.unallocated,
  };
}

/**
 * This grant's share of the pool in words, "0.03 % of the pool", with two significant digits so
 * that a grant far too small to see in the bar still reads as more than nothing.
 */
export function grantShareText(grant: number, pool: number): string {
  if (pool <= 0) return 'no pool to share';
  if (grant <= 0) return '0 % of the pool';
  const pct = (grant / pool) * 100;
  const text = pct >= 10 ? Math.round(pct).toLocaleString('en') : Number(pct.toPrecision(2)).toLocaleString('en', { maximumFractionDigits: 20 });
  return `${text} % of the pool`;
}

/**
 * Rules the form checks beyond DecisionInput, keyed by the field they stand beside: a grant must
 * fit in what the pool has left (the api answers 409 otherwise), and a partial grant is less than
 * the request. `unallocated` is null when the pool could not be read; the api still checks.
 */
export function grantProblems(
  values: Pick<DecisionFormValues, 'outcome' | 'coreHours'>,
  context: { requested: number; unallocated: number | null; machine: string },
): Record<string, string> {
  const { requested, unallocated, machine } = context;
  const left = unallocated === null ? '' : `${formatCoreHoursExact(Math.max(0, unallocated))} left unallocated in the ${machine} pool`;
  if (values.outcome === 'grant-all' && unallocated !== null && requested > unallocated) {
    return { outcome: `the request of ${formatCoreHoursExact(requested)} is more than the ${left}: grant part of it or decline` };
  }
  if (values.outcome === 'grant-part' && values.coreHours !== null) {
    if (values.coreHours >= requested) return { coreHours: `a partial grant is less than the ${formatCoreHoursExact(requested)} requested; choose Grant all for the whole request` };
    if (unallocated !== null && values.coreHours > unallocated) return { coreHours: `that is more than the ${left}` };
  }
  return {};
}

/** The decision as a sentence, for the confirmation: what is granted of the request, or that it is declined. */
export function decisionSentence(outcome: DecisionOutcome, grant: number, requested: number, title: string): string {
  if (outcome === 'decline') return `Decline “${title}”.`;
  if (outcome === 'grant-all') return `Grant “${title}” the ${formatCoreHoursExact(requested)} it requests.`;
  return `Grant “${title}” ${Math.round(grant).toLocaleString('en')} of the ${formatCoreHoursExact(requested)} it requests.`;
}
