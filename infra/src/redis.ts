import { existsSync, readFileSync, realpathSync } from 'node:fs';
import { join } from 'node:path';
import type { Settings } from '@localis/shared';
import { asUser, serviceDir } from './service-dir';
import { canConnect } from './wait-for';

/** Start a private Redis on loopback, as the redis user when we are root, without persistence. */
export async function startRedis(s: Settings): Promise<void> {
  if (await canConnect(s.REDIS_HOST, s.REDIS_PORT)) return;
  const dir = serviceDir(s.DATA_DIR, 'redis', 'redis');
  const r = asUser('redis', '/usr/bin/redis-server', [
    '--bind', s.REDIS_HOST, '--port', String(s.REDIS_PORT), '--save', '', '--appendonly', 'no',
    '--daemonize', 'yes', '--pidfile', join(dir, 'redis.pid'), '--logfile', join(dir, 'redis.log'), '--dir', dir,
  ]);
  if (r.status !== 0) throw new Error(`redis-server did not start: ${r.output}`);
}

export async function stopRedis(s: Settings): Promise<void> {
  const link = join(s.DATA_DIR, 'redis');
  const pidFile = existsSync(link) ? join(realpathSync(link), 'redis.pid') : '';
  if (!pidFile || !existsSync(pidFile)) return;
  try {
    process.kill(Number(readFileSync(pidFile, 'utf8').trim()), 'SIGTERM');
  } catch {
    return; // already gone
  }
  for (let i = 0; i < 50 && (await canConnect(s.REDIS_HOST, s.REDIS_PORT)); i++) await new Promise((r) => setTimeout(r, 100));
}
