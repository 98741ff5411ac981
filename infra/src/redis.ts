import { spawnSync } from 'node:child_process';
import { existsSync, mkdirSync, readFileSync } from 'node:fs';
import { join } from 'node:path';
import type { Settings } from '@localis/shared';
import { canConnect } from './wait-for';

function paths(s: Settings) {
  const dir = join(s.DATA_DIR, 'redis');
  return { dir, pid: join(dir, 'redis.pid'), log: join(dir, 'redis.log') };
}

/** Start a private Redis on loopback, without persistence: queues are rebuilt from the outbox. */
export async function startRedis(s: Settings): Promise<void> {
  const p = paths(s);
  mkdirSync(p.dir, { recursive: true });
  if (await canConnect(s.REDIS_HOST, s.REDIS_PORT)) return;
  const r = spawnSync('redis-server', [
    '--bind', s.REDIS_HOST, '--port', String(s.REDIS_PORT), '--save', '', '--appendonly', 'no',
    '--daemonize', 'yes', '--pidfile', p.pid, '--logfile', p.log, '--dir', p.dir,
  ], { encoding: 'utf8' });
  if (r.status !== 0) throw new Error(`redis-server did not start: ${r.stderr || r.stdout}`);
}

export async function stopRedis(s: Settings): Promise<void> {
  const p = paths(s);
  if (!existsSync(p.pid)) return;
  const pid = Number(readFileSync(p.pid, 'utf8').trim());
  try {
    process.kill(pid, 'SIGTERM');
  } catch {
    return; // already gone
  }
  for (let i = 0; i < 50 && (await canConnect(s.REDIS_HOST, s.REDIS_PORT)); i++) await new Promise((r) => setTimeout(r, 100));
}
