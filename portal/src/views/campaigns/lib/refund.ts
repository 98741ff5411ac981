import type { Run } from '@localis/shared';

/** What a run's debit still holds after earlier refunds, in core-hours (to the milli-core-hour). */
export function refundableCoreHours(run: Pick<Run, 'coreHours' | 'refundedCoreHours'>): number {
  return Math.max(0, Math.round((run.coreHours - run.refundedCoreHours) * 1000) / 1000);
}
