import { spawnSync } from 'node:child_process';
import { existsSync, readdirSync, readFileSync, statSync } from 'node:fs';
import { join } from 'node:path';
import type { Settings } from '@localis/shared';
import { ensureDatabase, startPostgres, stopPostgres } from './postgres';
import { ProcessGroup } from './processes';
import { ROOT } from './profile';
import { startRedis, stopRedis } from './redis';
import { waitForHttp, waitForPort } from './wait-for';

const TSX = join(ROOT, 'node_modules', '.bin', 'tsx');

function step(message: string) {
  console.log(`localis: ${message}`);
}

/** Run a TypeScript entry point to completion (migrations, the demo scenario). */
export function runOnce(what: string, entry: string, args: string[], env: Record<string, string>): void {
  const r = spawnSync(TSX, [join(ROOT, entry), ...args], { cwd: ROOT, env, stdio: 'inherit' });
  if (r.status !== 0) throw new Error(`${what} failed (exit ${r.status})`);
}

/** The newest modification time under a folder, to tell whether the portal build is stale. */
function newestMtime(dir: string): number {
  let newest = 0;
  for (const entry of readdirSync(dir, { withFileTypes: true })) {
    if (entry.name === 'node_modules' || entry.name === 'dist') continue;
    const path = join(dir, entry.name);
    newest = Math.max(newest, entry.isDirectory() ? newestMtime(path) : statSync(path).mtimeMs);
  }
  return newest;
}

export function buildPortalIfStale(env: Record<string, string>): void {
  const index = join(ROOT, 'portal', 'dist', 'index.html');
  const sources = Math.max(newestMtime(join(ROOT, 'portal')), newestMtime(join(ROOT, 'shared', 'src')));
  if (existsSync(index) && statSync(index).mtimeMs > sources) return;
  step('building the portal');
  const r = spawnSync('npm', ['run', 'build', '-w', '@localis/portal'], { cwd: ROOT, env, stdio: 'inherit' });
  if (r.status !== 0) throw new Error('the portal build failed');
}

/** The services every profile needs: PostgreSQL, Redis, the fakes; then migrations. */
export async function startInfrastructure(s: Settings, env: Record<string, string>, group: ProcessGroup, opts: { freshDatabase: boolean; fakes?: boolean }) {
  step(`PostgreSQL on ${s.PG_HOST}:${s.PG_PORT}`);
  startPostgres(s);
  await ensureDatabase(s, opts.freshDatabase);
  step(`Redis on ${s.REDIS_HOST}:${s.REDIS_PORT}`);
  await startRedis(s);
  if (opts.fakes !== false) {
    step('local fakes: identity provider, object store, mail, payments');
    group.start('fakes', TSX, [join(ROOT, 'infra', 'fakes', 'run-fakes.ts')], env);
    await Promise.all([
      waitForHttp(`${s.OIDC_ISSUER}/.well-known/openid-configuration`, 'the identity-provider fake'),
      waitForPort('127.0.0.1', s.S3_PORT, 'the object-store fake'),
      waitForPort(s.SMTP_HOST, s.SMTP_PORT, 'the mail fake'),
      waitForHttp(`http://127.0.0.1:${s.STRIPE_PORT}/_fake/health`, 'the Stripe fake'),
    ]);
  }
  step('migrations');
  runOnce('migrations', 'services/api/src/db/migrate.cli.ts', ['up'], env);
}

export async function startApplication(s: Settings, env: Record<string, string>, group: ProcessGroup, opts: { watch: boolean; apiPort?: number }) {
  const apiEnv = opts.apiPort ? { ...env, APP_PORT: String(opts.apiPort) } : env;
  const watch = opts.watch ? ['watch', '--clear-screen=false'] : [];
  group.start('api', TSX, [...watch, join(ROOT, 'services', 'api', 'src', 'main.ts')], apiEnv);
  group.start('worker', TSX, [...watch, join(ROOT, 'services', 'worker', 'src', 'main.ts')], env);
  await waitForHttp(`http://${s.APP_HOST}:${opts.apiPort ?? s.APP_PORT}/readyz`, 'the api');
}

export async function stopInfrastructure(s: Settings): Promise<void> {
  await stopRedis(s);
  stopPostgres(s);
}

/** `npm run stop`: end a stack started from another shell, through its pid files. */
export async function stopFromOutside(s: Settings): Promise<void> {
  const runDir = join(s.DATA_DIR, 'run');
  const orchestratorPid = join(runDir, 'stack.pid');
  if (existsSync(orchestratorPid)) {
    const pid = Number(readFileSync(orchestratorPid, 'utf8'));
    try {
      process.kill(pid, 'SIGTERM');
      for (let i = 0; i < 100; i++) {
        process.kill(pid, 0);
        await new Promise((r) => setTimeout(r, 100));
      }
    } catch {
      // it has ended
    }
  }
  if (existsSync(runDir)) {
    for (const f of readdirSync(runDir).filter((n) => n.endsWith('.pid') && n !== 'stack.pid')) {
      try {
        process.kill(-Number(readFileSync(join(runDir, f), 'utf8')), 'SIGTERM'); // its process group
      } catch {
        // already gone
      }
    }
  }
  await stopInfrastructure(s);
}
