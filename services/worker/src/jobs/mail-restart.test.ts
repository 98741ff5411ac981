import { createHash, randomUUID } from 'node:crypto';
import { mkdtempSync, rmSync } from 'node:fs';
import { createServer, type AddressInfo } from 'node:net';
import { tmpdir } from 'node:os';
import { join } from 'node:path';
import { Queue, Worker } from 'bullmq';
import { Redis } from 'ioredis';
import { MailDev } from 'maildev';
import { pino } from 'pino';
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { loadSettings, QUEUES, type MailMessage } from '@localis/shared';
import { openDatabase, type Database } from '@localis/api/db';
import { mailJob } from './mail.job';

/**
 * A mail server of its own (maildev, like the stack's fake) on free ports, so this test can stop
 * and restart it without disturbing the other suites; Redis is the test stack's. The mail
 * directory keeps what arrived across the restart, as a real server would.
 */
const settings = loadSettings(process.env);
const logger = pino({ level: 'silent' });
const run = randomUUID().slice(0, 8);
let smtpPort: number;
let inboxPort: number;
let mailDir: string;
let maildev: MailDev;
let redis: Redis;
let db: Database;

async function freePort(): Promise<number> {
  const server = createServer();
  await new Promise<void>((resolve) => server.listen(0, '127.0.0.1', resolve));
  const { port } = server.address() as AddressInfo;
  await new Promise((resolve) => server.close(resolve));
  return port;
}

const startMailServer = async () => {
  maildev = new MailDev({ smtp: smtpPort, web: inboxPort, ip: '127.0.0.1', webIp: '127.0.0.1', silent: true, mailDirectory: mailDir });
  await maildev.start();
};

interface InboxMessage {
  subject: string;
  to: { address: string }[];
  html?: string;
}
async function inbox(): Promise<InboxMessage[]> {
  return (await (await fetch(`http://127.0.0.1:${inboxPort}/api/email`)).json()) as InboxMessage[];
}
const countOf = (all: InboxMessage[], subject: string) => all.filter((m) => m.subject === subject).length;

async function waitFor(what: string, done: () => boolean | Promise<boolean>, timeoutMs = 20_000): Promise<void> {
  const deadline = Date.now() + timeoutMs;
  while (!(await done())) {
    if (Date.now() > deadline) throw new Error(`timed out waiting for ${what}`);
    await new Promise((r) => setTimeout(r, 50));
  }
}

const message = (name: string): MailMessage => ({
  to: [`${name}-${run}@test.example`],
  subject: `Restart ${run} ${name}`,
  text: `Message ${name}.`,
  html: `<p>Message <b>${name}</b>.</p>`,
  dedupeKey: `mail-restart:${run}:${name}`,
});

beforeAll(async () => {
  [smtpPort, inboxPort] = [await freePort(), await freePort()];
  mailDir = mkdtempSync(join(tmpdir(), 'localis-mail-restart-'));
  await startMailServer();
  redis = new Redis({ host: settings.REDIS_HOST, port: settings.REDIS_PORT, maxRetriesPerRequest: null });
  db = openDatabase(settings, { poolMax: 1 });
});
afterAll(async () => {
  await maildev?.stop();
  rmSync(mailDir, { recursive: true, force: true });
  await db.close();
  await redis.quit();
});

describe('mail job', () => {
  describe('mail server restart', () => {
    it('should deliver every message exactly once when the mail server goes away and comes back', async () => {
      const queueName = `${QUEUES.mail}-restart-${run}`;
      const queue = new Queue(queueName, { connection: redis });
      const failedAttempts = new Map<string, number>();
      const completed = new Map<string, unknown>();
      const jobSettings = { ...settings, SMTP_HOST: '127.0.0.1' as const, SMTP_PORT: smtpPort };
      const worker = new Worker(queueName, async (job) => mailJob.process(mailJob.schema.parse(job.data), { settings: jobSettings, db, redis, logger }, job), {
        connection: redis,
        concurrency: 4,
      });
      worker.on('failed', (job) => job && failedAttempts.set(job.id!, (failedAttempts.get(job.id!) ?? 0) + 1));
      worker.on('completed', (job, result) => completed.set(job.id!, result));
      // Small fixed backoff and many attempts: the outage below lasts well under a second.
      const add = (m: MailMessage, jobId: string) => queue.add('mail', m, { jobId, attempts: 100, backoff: { type: 'fixed', delay: 100 } });
      const names = ['one', 'two', 'three', 'four'];
      try {
        // Delivered before the outage: it must not come again.
        const before = message('before');
        await add(before, `before-${run}`);
        await waitFor('the first message', () => completed.has(`before-${run}`));
        expect(countOf(await inbox(), before.subject)).toBe(1);

        await maildev.stop();
        for (const name of names) await add(message(name), `${name}-${run}`);
        // The same messages queued a second time (a message in the outbox twice): still one each.
        await add(message('one'), `one-again-${run}`);
        await add(before, `before-again-${run}`);
        await waitFor('a failed attempt of every message', () => names.every((n) => (failedAttempts.get(`${n}-${run}`) ?? 0) >= 1));
        expect(completed.has(`one-${run}`)).toBe(false);

        await startMailServer();
        const jobIds = [...names.map((n) => `${n}-${run}`), `one-again-${run}`, `before-again-${run}`];
        await waitFor('every job to finish', () => jobIds.every((id) => completed.has(id)));
        // Give a late duplicate the time to show up before counting.
        await new Promise((r) => setTimeout(r, 500));

        const all = await inbox();
        for (const name of [...names, 'before']) expect(countOf(all, message(name).subject), name).toBe(1);
        const two = all.find((m) => m.subject === message('two').subject)!;
        expect(two.to[0].address).toBe(`two-${run}@test.example`);
        expect(two.html).toContain('<b>two</b>');
        expect(completed.get(`before-again-${run}`)).toEqual({ skipped: 'already sent' });
      } finally {
        await worker.close();
        await queue.obliterate({ force: true });
        await queue.close();
        const hashes = [...names, 'before'].map((n) => createHash('sha256').update(message(n).dedupeKey).digest('hex'));
        await redis.del(...hashes.map((h) => `localis:mail:sent:${h}`));
      }
    });

    it('should send once when two jobs of the same message run at the same time', async () => {
      const twice = message('concurrent');
      const deps = { settings: { ...settings, SMTP_HOST: '127.0.0.1' as const, SMTP_PORT: smtpPort }, db, redis, logger };
      const outcomes = await Promise.allSettled([mailJob.process(twice, deps, undefined as never), mailJob.process(twice, deps, undefined as never)]);
      // One sends; the other finds it sending (and fails, to be retried) or already sent.
      expect(outcomes.filter((o) => o.status === 'fulfilled' && 'messageId' in (o.value as object))).toHaveLength(1);
      const retried = await mailJob.process(twice, deps, undefined as never);
      expect(retried).toEqual({ skipped: 'already sent' });
      await waitFor('the message', async () => countOf(await inbox(), twice.subject) > 0);
      await new Promise((r) => setTimeout(r, 300));
      expect(countOf(await inbox(), twice.subject)).toBe(1);
      await redis.del(`localis:mail:sent:${createHash('sha256').update(twice.dedupeKey).digest('hex')}`);
    });
  });
});
