#!/usr/bin/env node
// The first step of `npm start`, `npm test`, `npm run dev`, `npm run stop` and the benchmarks.
// Plain JavaScript with no dependencies on purpose: it runs before node_modules exists, installs
// what is missing (Debian packages, then `npm ci`), and hands over to the TypeScript orchestrator.
import { spawnSync, spawn } from 'node:child_process';
import { createHash } from 'node:crypto';
import { existsSync, readFileSync, writeFileSync } from 'node:fs';
import { dirname, join } from 'node:path';
import { fileURLToPath } from 'node:url';

const root = join(dirname(fileURLToPath(import.meta.url)), '..');
const mode = process.argv[2] ?? 'start';
const MODES = ['start', 'test', 'dev', 'stop', 'bench', 'bench-archives'];
if (!MODES.includes(mode)) {
  console.error(`localis: unknown mode "${mode}"; use one of ${MODES.join(', ')}`);
  process.exit(2);
}

/** A Debian package and the file that proves it is installed. */
const PACKAGES = [
  { pkg: 'postgresql-15', probe: '/usr/lib/postgresql/15/bin/initdb', modes: ['start', 'test', 'dev', 'bench', 'bench-archives'] },
  { pkg: 'redis-server', probe: '/usr/bin/redis-server', modes: ['start', 'test', 'dev', 'bench', 'bench-archives'] },
  { pkg: 'chromium', probe: '/usr/bin/chromium', modes: ['test'] },
  // The archive benchmark times `openssl dgst -sha256` beside the worker's verification.
  { pkg: 'openssl', probe: '/usr/bin/openssl', modes: ['bench-archives'] },
];

function log(message) {
  console.log(`localis: ${message}`);
}

function run(cmd, args, options = {}) {
  const result = spawnSync(cmd, args, { stdio: 'inherit', cwd: root, ...options });
  return result.status === 0;
}

function ensureDebianPackages() {
  const missing = PACKAGES.filter((p) => p.modes.includes(mode) && !existsSync(p.probe)).map((p) => p.pkg);
  if (missing.length === 0) return;
  log(`installing Debian packages: ${missing.join(' ')}`);
  const isRoot = process.getuid?.() === 0;
  const sudoWithoutPassword = !isRoot && spawnSync('sudo', ['-n', 'true'], { stdio: 'ignore' }).status === 0;
  // With a terminal, sudo may ask for the password; without one it must not hang.
  const sudoAsking = !isRoot && !sudoWithoutPassword && process.stdin.isTTY && spawnSync('sudo', ['-V'], { stdio: 'ignore' }).status === 0;
  if (!isRoot && !sudoWithoutPassword && !sudoAsking) {
    console.error(
      `localis: these Debian packages are missing: ${missing.join(', ')}.\n` +
        `Neither root nor password-less sudo is available to install them. Run:\n` +
        `  sudo apt-get update && sudo apt-get install -y ${missing.join(' ')}\n` +
        `and start again.`,
    );
    process.exit(1);
  }
  const prefix = isRoot ? [] : sudoWithoutPassword ? ['sudo', '-n'] : ['sudo'];
  const asAdmin = (cmd, args, options) => (prefix.length ? run(prefix[0], [...prefix.slice(1), cmd, ...args], options) : run(cmd, args, options));
  const env = { ...process.env, DEBIAN_FRONTEND: 'noninteractive' };
  if (!asAdmin('apt-get', ['update'], { env }) || !asAdmin('apt-get', ['install', '-y', '--no-install-recommends', ...missing], { env })) {
    console.error(`localis: apt-get could not install ${missing.join(', ')}; see the messages above.`);
    process.exit(1);
  }
  // Debian's packages start a system-wide PostgreSQL and Redis on the default ports and enable
  // them at boot. Localis runs its own on loopback under .data/, so turn the system ones off.
  const services = [missing.includes('redis-server') && 'redis-server', missing.includes('postgresql-15') && 'postgresql'].filter(Boolean);
  for (const service of services) {
    asAdmin('sh', ['-c', `(command -v systemctl >/dev/null && systemctl disable --now ${service}) >/dev/null 2>&1 || service ${service} stop >/dev/null 2>&1 || true`], { stdio: 'ignore' });
  }
}

function ensureNodeModules() {
  const lockFile = join(root, 'package-lock.json');
  const stamp = join(root, 'node_modules', '.localis-lock.sha256');
  const want = createHash('sha256').update(readFileSync(lockFile)).digest('hex');
  const have = existsSync(stamp) ? readFileSync(stamp, 'utf8').trim() : '';
  if (have === want && existsSync(join(root, 'node_modules', '.bin', 'tsx'))) return;
  log(existsSync(join(root, 'node_modules')) ? 'package-lock.json changed; running npm ci' : 'installing dependencies (npm ci)');
  if (!run('npm', ['ci', '--no-audit', '--no-fund'])) {
    console.error('localis: npm ci failed; see the messages above.');
    process.exit(1);
  }
  writeFileSync(stamp, want + '\n');
}

if (mode !== 'stop') {
  ensureDebianPackages();
  ensureNodeModules();
}

// Hand over to the orchestrator. Ctrl-C reaches the whole foreground process group; the
// orchestrator handles it and stops what it started, so this process only waits for it.
const tsx = join(root, 'node_modules', '.bin', 'tsx');
if (!existsSync(tsx)) {
  console.error('localis: dependencies are not installed; run `npm start` or `npm test` first.');
  process.exit(1);
}
const child = spawn(tsx, [join(root, 'infra', 'src', 'main.ts'), mode, ...process.argv.slice(3)], {
  stdio: 'inherit',
  cwd: root,
});
for (const signal of ['SIGINT', 'SIGTERM', 'SIGHUP']) process.on(signal, () => child.kill(signal));
child.on('exit', (code, signal) => process.exit(code ?? (signal ? 1 : 0)));
