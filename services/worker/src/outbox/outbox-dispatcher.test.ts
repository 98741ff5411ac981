import { randomUUID } from 'node:crypto';
import { Worker } from 'bullmq';
import { Redis } from 'ioredis';
import { pino } from 'pino';
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { loadSettings, QUEUES } from '@localis/shared';
import { openDatabase, OutboxMessage, type Database } from '@localis/api/db';
import { outboxRepository } from '@localis/api/outbox';
import { mailJob } from '../jobs/mail.job';
import { createOutboxDispatcher } from './outbox-dispatcher';

/**
 * Runs against the real PostgreSQL, Redis and mail fake of `npm test`. The worker process of
 * the test stack is running too, so these tests look only at their own messages (by a
 * unique subject) and accept that either worker may deliver them: exactly once in total.
 */
const settings = loadSettings(process.env);
const inbox = `http://${settings.SMTP_HOST}:${settings.MAIL_INBOX_PORT}/api/email`;
let db: Database;
let redis: Redis;
const logger = pino({ level: 'silent' });

async function messagesWithSubject(subject: string): Promise<{ subject: string; to: { address: string }[]; text: string }[]> {
  const all = (await (await fetch(inbox)).json()) as { subject: string; to: { address: string }[]; text: string }[];
  return all.filter((m) => m.subject === subject);
}

async function waitFor<T>(what: string, probe: () => Promise<T | undefined>, timeoutMs = 15_000): Promise<T> {
  const deadline = Date.now() + timeoutMs;
  while (Date.now() < deadline) {
    const v = await probe();
    if (v !== undefined) return v;
    await new Promise((r) => setTimeout(r, 100));
  }
  throw new Error(`timed out waiting for ${what}`);
}

beforeAll(() => {
  db = openDatabase(settings, { poolMax: 3 });
  redis = new Redis({ host: settings.REDIS_HOST, port: settings.REDIS_PORT, maxRetriesPerRequest: null });
});
afterAll(async () => {
  await db.close();
  await redis.quit();
});

describe('outbox dispatcher', () => {
  describe('delivery', () => {
    it('should deliver a queued e-mail exactly once when dispatched more than once', async () => {
      const subject = `Outbox test ${randomUUID()}`;
      const id = await outboxRepository.enqueue('mail', { to: ['someone@test.example'], subject, text: 'Hello from the outbox.', dedupeKey: subject });
      // A worker of our own, beside the stack's: whichever takes the job, it runs once.
      const worker = new Worker(QUEUES.mail, async (job) => mailJob.process(mailJob.schema.parse(job.data), { settings, db, redis, logger }, job), { connection: redis });
      const dispatcher = createOutboxDispatcher(db, redis, logger);
      await dispatcher.dispatchOnce();
      // Simulate a crash after the job was queued but before the row was marked.
      await OutboxMessage.update({ dispatchedAt: null }, { where: { id } });
      await dispatcher.dispatchOnce();
      await dispatcher.close();
      const mails = await waitFor('the e-mail', async () => ((await messagesWithSubject(subject)).length ? messagesWithSubject(subject) : undefined));
      await new Promise((r) => setTimeout(r, 1000));
      await worker.close();
      expect(await messagesWithSubject(subject)).toHaveLength(1);
      expect(mails[0].to[0].address).toBe('someone@test.example');
      expect((await OutboxMessage.findByPk(id))!.dispatchedAt).not.toBeNull();
    });

    it('should leave nothing in the outbox when the change that caused it is rolled back', async () => {
      const subject = `Rolled back ${randomUUID()}`;
      await expect(
        db.transaction(async (tx) => {
          await outboxRepository.enqueue('mail', { to: ['someone@test.example'], subject, text: 'never', dedupeKey: subject }, tx);
          throw new Error('the change failed');
        }),
      ).rejects.toThrow();
      const rows = await OutboxMessage.findAll({ where: { kind: 'mail' } });
      expect(rows.some((r) => (r.payload as { subject: string }).subject === subject)).toBe(false);
    });
  });
});

describe('mail job', () => {
  describe('idempotency', () => {
    it('should not send again when a job with the same dedupeKey is retried', async () => {
      const subject = `Retry test ${randomUUID()}`;
      const message = { to: ['retry@test.example'], subject, text: 'Once only.', dedupeKey: subject };
      const deps = { settings, db, redis, logger };
      const first = await mailJob.process(message, deps, undefined as never);
      const second = await mailJob.process(message, deps, undefined as never);
      expect(first).toHaveProperty('messageId');
      expect(second).toEqual({ skipped: 'already sent' });
      await waitFor('the e-mail', async () => ((await messagesWithSubject(subject)).length ? true : undefined));
      expect(await messagesWithSubject(subject)).toHaveLength(1);
    });

    it('should retry with backoff when the mail server refuses, then succeed', async () => {
      const subject = `Backoff test ${randomUUID()}`;
      const queueName = `${QUEUES.mail}-test-${randomUUID().slice(0, 8)}`;
      let attempts = 0;
      const worker = new Worker(
        queueName,
        async (job) => {
          attempts++;
          const s = attempts === 1 ? { ...settings, SMTP_PORT: 9 } : settings;
          return mailJob.process(mailJob.schema.parse(job.data), { settings: s, db, redis, logger }, job);
        },
        { connection: redis },
      );
      const { Queue } = await import('bullmq');
      const queue = new Queue(queueName, { connection: redis });
      await queue.add('mail', { to: ['backoff@test.example'], subject, text: 'Second time lucky.', dedupeKey: subject }, { attempts: 3, backoff: { type: 'fixed', delay: 200 } });
      await waitFor('the e-mail after a retry', async () => ((await messagesWithSubject(subject)).length ? true : undefined));
      expect(attempts).toBe(2);
      await worker.close();
      await queue.obliterate({ force: true });
      await queue.close();
    });
  });
});
