import 'dotenv/config';
import { Queue, Worker } from 'bullmq';
import { Redis } from 'ioredis';
import { pino } from 'pino';
import { loadSettings, QUEUES } from '@localis/shared';
import { openDatabase } from '@localis/api/db';
import { JOBS } from './jobs';
import { DAILY_SWEEP_EVERY_MS, DAILY_SWEEP_SCHEDULER_ID } from './jobs/daily-sweep.job';
import { SEQUENCE_PROVENANCE_EVERY_MS, SEQUENCE_PROVENANCE_SCHEDULER_ID } from './jobs/sequence-provenance.job';
import { createOutboxDispatcher } from './outbox/outbox-dispatcher';

const settings = loadSettings(process.env);
const logger = pino({ level: settings.LOG_LEVEL, base: { service: 'worker' } });
const db = openDatabase(settings, { poolMax: 5 });
// BullMQ workers block on Redis; they need maxRetriesPerRequest: null.
const connection = new Redis({ host: settings.REDIS_HOST, port: settings.REDIS_PORT, maxRetriesPerRequest: null });
const deps = { settings, db, redis: connection, logger };

const workers = JOBS.map((job) => {
  const w = new Worker(
    job.name,
    async (j) => job.process(job.schema.parse(j.data), { ...deps, logger: logger.child({ job: job.name, id: j.id }) }, j),
    { connection, concurrency: job.concurrency ?? 4 },
  );
  w.on('failed', (j, err) => logger.warn({ job: job.name, id: j?.id, attempt: j?.attemptsMade, err: err.message }, 'job failed'));
  return w;
});
const dispatcher = createOutboxDispatcher(db, connection, logger);
dispatcher.start();

const sweepQueue = new Queue(QUEUES.dailySweep, { connection });
sweepQueue
  .upsertJobScheduler(
    DAILY_SWEEP_SCHEDULER_ID,
    { every: DAILY_SWEEP_EVERY_MS },
    { name: 'daily-sweep', data: {}, opts: { attempts: 3, backoff: { type: 'exponential', delay: 60_000 }, removeOnComplete: { count: 200 }, removeOnFail: { count: 200 } } },
  )
  .catch((err) => logger.error({ err }, 'could not schedule the daily sweep'));
const sequencerQueue = new Queue(QUEUES.sequenceProvenance, { connection });
sequencerQueue
  .upsertJobScheduler(
    SEQUENCE_PROVENANCE_SCHEDULER_ID,
    { every: SEQUENCE_PROVENANCE_EVERY_MS },
    { name: 'sequence-provenance', data: {}, opts: { attempts: 1, removeOnComplete: { count: 50 }, removeOnFail: { count: 200 } } },
  )
  .catch((err) => logger.error({ err }, 'could not schedule the provenance sequencer'));
logger.info(`worker running: ${JOBS.map((j) => j.name).join(', ')}`);

let stopping = false;
async function shutdown(signal: string) {
  if (stopping) return;
  stopping = true;
  logger.info({ signal }, 'worker stopping');
  await dispatcher.close();
  await Promise.all(workers.map((w) => w.close()));
  await Promise.all([sweepQueue.close(), sequencerQueue.close()]);
  await Promise.allSettled([db.close(), connection.quit()]);
  process.exit(0);
}
process.on('SIGTERM', () => void shutdown('SIGTERM'));
process.on('SIGINT', () => void shutdown('SIGINT'));
