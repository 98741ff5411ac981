import { execFileSync, spawnSync } from 'node:child_process';
import { existsSync, mkdirSync } from 'node:fs';
import { join } from 'node:path';
import pg from 'pg';
import type { Settings } from '@localis/shared';

const BIN = '/usr/lib/postgresql/15/bin';
const isRoot = process.getuid?.() === 0;

/** initdb and pg_ctl refuse to run as root: run them as the postgres user when we are root. */
function asPostgres(cmd: string, args: string[]): { status: number | null; output: string } {
  const [file, fullArgs] = isRoot ? ['runuser', ['-u', 'postgres', '--', join(BIN, cmd), ...args]] : [join(BIN, cmd), args];
  const r = spawnSync(file, fullArgs, { encoding: 'utf8' });
  return { status: r.status, output: `${r.stdout ?? ''}${r.stderr ?? ''}` };
}

export function clusterDir(s: Settings): string {
  return join(s.DATA_DIR, 'pg');
}

/** Create the project-local cluster under DATA_DIR/pg on first use, then start it on loopback. */
export function startPostgres(s: Settings): void {
  const dir = clusterDir(s);
  mkdirSync(s.DATA_DIR, { recursive: true });
  if (!existsSync(join(dir, 'PG_VERSION'))) {
    if (isRoot) execFileSync('install', ['-d', '-o', 'postgres', '-g', 'postgres', '-m', '700', dir]);
    else mkdirSync(dir, { recursive: true, mode: 0o700 });
    const init = asPostgres('initdb', ['-D', dir, '-U', s.PG_USER, '-A', 'trust', '-E', 'UTF8', '--locale=C.UTF-8']);
    if (init.status !== 0) throw new Error(`initdb failed:\n${init.output}`);
  }
  if (asPostgres('pg_ctl', ['-D', dir, 'status']).status === 0) return;
  const started = asPostgres('pg_ctl', [
    '-D', dir, '-l', join(dir, 'server.log'), '-w', '-t', '60',
    '-o', `-c listen_addresses=${s.PG_HOST} -p ${s.PG_PORT} -c unix_socket_directories=${dir} -c fsync=${s.LOCALIS_PROFILE === 'test' ? 'off' : 'on'}`,
    'start',
  ]);
  if (started.status !== 0) throw new Error(`PostgreSQL did not start:\n${started.output}\n(see ${join(dir, 'server.log')})`);
}

export function stopPostgres(s: Settings): void {
  const dir = clusterDir(s);
  if (!existsSync(join(dir, 'PG_VERSION'))) return;
  if (asPostgres('pg_ctl', ['-D', dir, 'status']).status !== 0) return;
  asPostgres('pg_ctl', ['-D', dir, '-m', 'fast', '-w', 'stop']);
}

/** Create the application database if missing; with `fresh`, drop it first (the test profile). */
export async function ensureDatabase(s: Settings, fresh: boolean): Promise<void> {
  const client = new pg.Client({ host: s.PG_HOST, port: s.PG_PORT, user: s.PG_USER, password: s.PG_PASSWORD || undefined, database: 'postgres' });
  await client.connect();
  try {
    const name = client.escapeIdentifier(s.PG_DATABASE);
    if (fresh) await client.query(`DROP DATABASE IF EXISTS ${name} WITH (FORCE)`);
    const exists = await client.query('SELECT 1 FROM pg_database WHERE datname = $1', [s.PG_DATABASE]);
    if (exists.rowCount === 0) await client.query(`CREATE DATABASE ${name} TEMPLATE template0 ENCODING 'UTF8'`);
  } finally {
    await client.end();
  }
}
