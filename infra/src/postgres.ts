import { execFileSync } from 'node:child_process';
import { randomBytes } from 'node:crypto';
import { existsSync, mkdirSync, readFileSync, realpathSync, rmSync, writeFileSync } from 'node:fs';
import { join } from 'node:path';
import pg from 'pg';
import type { Settings } from '@localis/shared';
import { asUser, isRoot, serviceDir } from './service-dir';

const BIN = '/usr/lib/postgresql/15/bin';
const asPostgres = (cmd: string, args: string[]) => asUser('postgres', join(BIN, cmd), args);

/** DATA_DIR/pg, resolved through the link when the cluster lives outside (see service-dir). */
function existingClusterDir(s: Settings): string | null {
  const dir = join(s.DATA_DIR, 'pg');
  return existsSync(join(dir, 'PG_VERSION')) ? realpathSync(dir) : null;
}

/**
 * The database password: PG_PASSWORD when set, else one made at the cluster's creation and kept
 * in DATA_DIR/pg-password (0600), so other users of the machine cannot connect on loopback.
 */
export function databasePassword(s: Settings): string {
  if (s.PG_PASSWORD) return s.PG_PASSWORD;
  const file = join(s.DATA_DIR, 'pg-password');
  if (!existsSync(file)) {
    mkdirSync(s.DATA_DIR, { recursive: true });
    writeFileSync(file, randomBytes(24).toString('base64url') + '\n', { mode: 0o600 });
  }
  return readFileSync(file, 'utf8').trim();
}

/** Create the project-local cluster under DATA_DIR/pg on first use, then start it on loopback. */
export function startPostgres(s: Settings): void {
  const dir = serviceDir(s.DATA_DIR, 'pg', 'postgres');
  if (!existsSync(join(dir, 'PG_VERSION'))) {
    // initdb reads the superuser's password from a file the postgres user can read, for a moment.
    const pwfile = join(dir, '..', `.pg-init-${process.pid}`);
    writeFileSync(pwfile, databasePassword(s) + '\n', { mode: 0o600 });
    if (isRoot) execFileSync('chown', ['postgres', pwfile]);
    try {
      const init = asPostgres('initdb', ['-D', dir, '-U', s.PG_USER, '--pwfile', pwfile, '--auth-host=scram-sha-256', '--auth-local=peer', '-E', 'UTF8', '--locale=C.UTF-8']);
      if (init.status !== 0) throw new Error(`initdb failed:\n${init.output}`);
    } finally {
      rmSync(pwfile, { force: true });
    }
  }
  if (asPostgres('pg_ctl', ['-D', dir, 'status']).status === 0) return;
  const started = asPostgres('pg_ctl', [
    '-D', dir, '-l', join(dir, 'server.log'), '-w', '-t', '60',
    // TCP on loopback only, no Unix socket: a socket path inside a long or spaced checkout path
    // would break start-up. fsync is off only for the throwaway test database, for speed.
    '-o', `-c listen_addresses=${s.PG_HOST} -p ${s.PG_PORT} -c unix_socket_directories='' -c fsync=${s.LOCALIS_PROFILE === 'test' ? 'off' : 'on'}`,
    'start',
  ]);
  if (started.status !== 0) throw new Error(`PostgreSQL did not start:\n${started.output}\n(see ${join(dir, 'server.log')})`);
}

export function stopPostgres(s: Settings): void {
  const dir = existingClusterDir(s);
  if (!dir || asPostgres('pg_ctl', ['-D', dir, 'status']).status !== 0) return;
  asPostgres('pg_ctl', ['-D', dir, '-m', 'fast', '-w', 'stop']);
}

/** Create the application database if missing; with `fresh`, drop it first (the test profile). */
export async function ensureDatabase(s: Settings, fresh: boolean): Promise<void> {
  const client = new pg.Client({ host: s.PG_HOST, port: s.PG_PORT, user: s.PG_USER, password: databasePassword(s), database: 'postgres' });
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
