import { Queue } from 'bullmq';
import type { Redis } from 'ioredis';
import type { Logger } from 'pino';
import { OUTBOX_KINDS, QUEUES } from '@localis/shared';
import type { Database } from '@localis/api/db';
import { outboxRepository } from '@localis/api/outbox';

/** Which queue each outbox kind goes to. */
const ROUTES: Record<string, string> = { [OUTBOX_KINDS.mail]: QUEUES.mail, [OUTBOX_KINDS.verifyArchive]: QUEUES.verifyArchive, [OUTBOX_KINDS.analyze]: QUEUES.analyze, [OUTBOX_KINDS.spotCheck]: QUEUES.spotCheck, [OUTBOX_KINDS.invoiceRun]: QUEUES.invoiceRun, [OUTBOX_KINDS.invoiceIssued]: QUEUES.invoiceIssued };

export const JOB_OPTIONS = {
  attempts: 8,
  backoff: { type: 'exponential' as const, delay: 2000 },
  removeOnComplete: { age: 7 * 86_400, count: 10_000 },
  removeOnFail: { age: 30 * 86_400 },
};

/**
 * Hands outbox rows to BullMQ. The job id is the outbox id, so a row handed over twice (a crash
 * after adding the job, before marking the row) still makes one job.
 */
export function createOutboxDispatcher(db: Database, redis: Redis, logger: Logger) {
  const queues = new Map<string, Queue>();
  const queueFor = (name: string) => {
    let q = queues.get(name);
    if (!q) queues.set(name, (q = new Queue(name, { connection: redis })));
    return q;
  };

  async function dispatchOnce(batch = 100): Promise<number> {
    return db.transaction(async (tx) => {
      const pending = await outboxRepository.claimPending(batch, tx);
      const done: string[] = [];
      for (const m of pending) {
        const queue = ROUTES[m.kind];
        if (!queue) {
          await outboxRepository.markFailed(m.id, `no queue for outbox kind "${m.kind}"`, tx, true);
          continue;
        }
        await queueFor(queue).add(m.kind, m.payload, { ...JOB_OPTIONS, jobId: `outbox-${m.id}` });
        done.push(m.id);
      }
      await outboxRepository.markDispatched(done, tx);
      return done.length;
    });
  }

  let timer: NodeJS.Timeout | undefined;
  let running = false;
  return {
    dispatchOnce,
    start(intervalMs = 500) {
      const tick = async () => {
        if (running) return;
        running = true;
        try {
          while ((await dispatchOnce()) > 0);
        } catch (e) {
          logger.error({ err: e }, 'outbox dispatch failed; will retry');
        } finally {
          running = false;
        }
      };
      timer = setInterval(tick, intervalMs);
      void tick();
    },
    async close() {
      if (timer) clearInterval(timer);
      while (running) await new Promise((r) => setTimeout(r, 20));
      await Promise.all([...queues.values()].map((q) => q.close()));
    },
  };
}
