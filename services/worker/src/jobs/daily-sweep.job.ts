import { z } from 'zod';
import { QUEUES } from '@localis/shared';
import { sendRoundClosingNotices } from '@localis/api/notifications/round-closing-notices';
import { expireEndedAllocations } from '@localis/api/ledger/ledger-expiry';
import { abandonStaleUploads } from '@localis/api/archives/abandoned-uploads';
import { createObjectStore } from '@localis/api/archives/object-store';
import { queueLastMonthsRun, remindOverdueInvoices } from '@localis/api/invoices/billing-chores';
import type { JobDefinition } from './job';

/** One scheduler under a fixed id: a restarted worker replaces it instead of adding a second. */
export const DAILY_SWEEP_SCHEDULER_ID = 'localis-daily-sweep';

/**
 * The chores are due once a day, but the sweep runs every hour: a worker that was down at the
 * wrong moment never skips a day, and each chore marks what it did, so running again is harmless.
 */
export const DAILY_SWEEP_EVERY_MS = 3_600_000;

export const DailySweepData = z.object({});

/** Round-closing notices (14 days ahead), the expiry of grants whose allocation period ended, uploads abandoned for a week, last month's invoice run and reminders of overdue invoices. */
export const dailySweepJob: JobDefinition<typeof DailySweepData> = {
  name: QUEUES.dailySweep,
  schema: DailySweepData,
  async process(_data, { settings, db, logger }) {
    const now = new Date();
    // Independent chores: a failure in one must not hold back the other. The job fails (and is
    // retried) when either did, after both have had their turn.
    const [notices, expiry, abandoned, monthlyRun, reminders] = await Promise.allSettled([
      sendRoundClosingNotices(db, now, settings.PUBLIC_URL),
      expireEndedAllocations(db, now),
      abandonStaleUploads(db, createObjectStore(settings), now),
      queueLastMonthsRun(db, now),
      remindOverdueInvoices(db, now, settings.PUBLIC_URL),
    ]);
    const noticed = notices.status === 'fulfilled' ? notices.value : [];
    const expired = expiry.status === 'fulfilled' ? expiry.value : 0;
    const abandonedUploads = abandoned.status === 'fulfilled' ? abandoned.value : 0;
    const invoiceRunQueued = monthlyRun.status === 'fulfilled' ? monthlyRun.value : null;
    const overdueReminders = reminders.status === 'fulfilled' ? reminders.value : 0;
    logger.info({ roundClosingNotices: noticed.length, expiredAllocations: expired, abandonedUploads, invoiceRunQueued, overdueReminders }, 'daily sweep done');
    const failed = [notices, expiry, abandoned, monthlyRun, reminders].filter((r): r is PromiseRejectedResult => r.status === 'rejected');
    if (failed.length) throw new AggregateError(failed.map((r) => r.reason), `daily sweep: ${failed.length} chore(s) failed`);
    return { roundClosingNotices: noticed, expiredAllocations: expired, abandonedUploads, invoiceRunQueued, overdueReminders };
  },
};
