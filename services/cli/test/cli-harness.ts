import { spawn, type ChildProcess } from 'node:child_process';
import { mkdtempSync, readFileSync, rmSync } from 'node:fs';
import { tmpdir } from 'node:os';
import { join, resolve } from 'node:path';

const BIN = resolve(import.meta.dirname, '..', 'bin', 'localis.mjs');

export interface CliResult {
  code: number | null;
  stdout: string;
  stderr: string;
}

/** A fresh config folder per test, so no test sees another's (or the developer's) credentials. */
export function tempConfigDir(): { dir: string; remove: () => void } {
  const dir = mkdtempSync(join(tmpdir(), 'localis-cli-test-'));
  return { dir, remove: () => rmSync(dir, { recursive: true, force: true }) };
}

/**
 * Run the real `localis` as a user would, in a child process. Stdin is a pipe that is closed
 * after `input`, which is how a batch script (never a terminal) looks to the CLI. `onSpawn` is
 * handed the child, e.g. to press Ctrl-C (send SIGINT) while it runs.
 */
export function runCli(
  args: string[],
  opts: { configDir: string; input?: string; env?: Record<string, string>; onSpawn?: (child: ChildProcess) => void },
): Promise<CliResult> {
  const env: NodeJS.ProcessEnv = { ...process.env, LOCALIS_CONFIG_DIR: opts.configDir, ...opts.env };
  // The developer's own shell settings must not leak into what is being tested.
  for (const name of ['LOCALIS_URL', 'LOCALIS_TOKEN', 'LOCALIS_DEBUG']) if (!opts.env?.[name]) delete env[name];
  return new Promise((resolvePromise, reject) => {
    const child = spawn(process.execPath, [BIN, ...args], { env, stdio: ['pipe', 'pipe', 'pipe'] });
    let stdout = '';
    let stderr = '';
    child.stdout.setEncoding('utf8').on('data', (d: string) => (stdout += d));
    child.stderr.setEncoding('utf8').on('data', (d: string) => (stderr += d));
    child.on('error', reject);
    child.on('close', (code) => resolvePromise({ code, stdout, stderr }));
    child.stdin.end(opts.input ?? '');
    opts.onSpawn?.(child);
  });
}

/** The tokens the demo scenario made for its people, by e-mail (written by seeds/ at `npm test`). */
export function demoToken(email: string): string {
  const file = join(process.env.DATA_DIR ?? '.data/test', 'demo-tokens.json');
  const token = (JSON.parse(readFileSync(file, 'utf8')) as Record<string, string>)[email];
  if (!token) throw new Error(`${file} has no token for ${email}`);
  return token;
}

export const RESEARCHER = 'ines.albrecht@brennmoor.example';
export const ADMIN = 'dana.whitfield@coldwater-network.example';
