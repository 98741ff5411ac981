import 'dotenv/config';
import { Worker } from 'bullmq';
import { Redis } from 'ioredis';
import { pino } from 'pino';
import { loadSettings } from '@localis/shared';
import { openDatabase } from '@localis/api/db';
import { JOBS } from './jobs';
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
    { connection, concurrency: 4 },
  );
  w.on('failed', (j, err) => logger.warn({ job: job.name, id: j?.id, attempt: j?.attemptsMade, err: err.message }, 'job failed'));
  return w;
});
const dispatcher = createOutboxDispatcher(db, connection, logger);
dispatcher.start();
logger.info(`worker running: ${JOBS.map((j) => j.name).join(', ')}`);

let stopping = false;
async function shutdown(signal: string) {
  if (stopping) return;
  stopping = true;
  logger.info({ signal }, 'worker stopping');
  await dispatcher.close();
  await Promise.all(workers.map((w) => w.close()));
  await Promise.allSettled([db.close(), connection.quit()]);
  process.exit(0);
}
process.on('SIGTERM', () => void shutdown('SIGTERM'));
process.on('SIGINT', () => void shutdown('SIGINT'));
