import { createHash } from 'node:crypto';
import { execFileSync, spawnSync } from 'node:child_process';
import { existsSync, mkdirSync, realpathSync, rmSync, symlinkSync } from 'node:fs';
import { join } from 'node:path';

export const isRoot = process.getuid?.() === 0;

/**
 * The folder DATA_DIR/<name> for a service that runs as its own system user (postgres, redis)
 * when we are root. That user must be able to reach DATA_DIR; in a checkout under a private
 * home folder (/root is 0700) it cannot, so the folder then lives under /var/tmp and
 * DATA_DIR/<name> links to it. Returns the real path to hand to the service.
 */
export function serviceDir(dataDir: string, name: string, user: string): string {
  const dir = join(dataDir, name);
  mkdirSync(dataDir, { recursive: true });
  if (!isRoot) {
    mkdirSync(dir, { recursive: true, mode: 0o700 });
    return dir;
  }
  if (existsSync(dir)) {
    const real = realpathSync(dir);
    execFileSync('chown', ['-R', `${user}:${user}`, real]); // made by an earlier run as root
    return real;
  }
  rmSync(dir, { force: true }); // a link left dangling by a cleared /var/tmp
  if (spawnSync('runuser', ['-u', user, '--', 'test', '-x', dataDir], { stdio: 'ignore' }).status === 0) {
    execFileSync('install', ['-d', '-o', user, '-g', user, '-m', '700', dir]);
    return dir;
  }
  const outside = join('/var/tmp', `localis-${name}-${createHash('sha256').update(dir).digest('hex').slice(0, 12)}`);
  execFileSync('install', ['-d', '-o', user, '-g', user, '-m', '700', outside]);
  symlinkSync(outside, dir);
  console.log(`localis: the ${user} user cannot reach ${dataDir}; ${name} data lives in ${outside} (linked from ${dir})`);
  return outside;
}

/** Run a service's command as its user when we are root (initdb and pg_ctl refuse root). */
export function asUser(user: string, file: string, args: string[]): { status: number | null; output: string } {
  const [cmd, fullArgs] = isRoot ? ['runuser', ['-u', user, '--', file, ...args]] : [file, args];
  const r = spawnSync(cmd, fullArgs, { encoding: 'utf8' });
  return { status: r.status, output: `${r.stdout ?? ''}${r.stderr ?? ''}` };
}
