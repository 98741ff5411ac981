import 'dotenv/config';
import { Redis } from 'ioredis';
import { pino } from 'pino';
import { loadSettings } from '@localis/shared';
import { openDatabase } from './db';
import { createApp } from './app';

const settings = loadSettings(process.env);
const logger = pino({ level: settings.LOG_LEVEL, base: { service: 'api' } });
const db = openDatabase(settings);
const redis = new Redis({ host: settings.REDIS_HOST, port: settings.REDIS_PORT, lazyConnect: false, maxRetriesPerRequest: 2 });
const { app, close } = createApp({ settings, db, redis, logger });

const server = app.listen(settings.APP_PORT, settings.APP_HOST, () => {
  logger.info(`api listening on http://${settings.APP_HOST}:${settings.APP_PORT}`);
});

let stopping = false;
async function shutdown(signal: string) {
  if (stopping) return;
  stopping = true;
  logger.info({ signal }, 'api stopping');
  server.close();
  server.closeAllConnections();
  await Promise.allSettled([close(), db.close(), redis.quit()]);
  process.exit(0);
}
process.on('SIGTERM', () => void shutdown('SIGTERM'));
process.on('SIGINT', () => void shutdown('SIGINT'));
