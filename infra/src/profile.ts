import { existsSync, readFileSync } from 'node:fs';
import { join, resolve } from 'node:path';
import { parse } from 'dotenv';
import { loadSettings, TEST_PROFILE, type Settings } from '@localis/shared';

export const ROOT = resolve(import.meta.dirname, '..', '..');

/**
 * The environment of one profile. The demo and dev profiles read `.env` when present; the test
 * profile takes its own ports and folders so `npm test` runs beside a running demo.
 */
export function profileEnv(mode: 'start' | 'dev' | 'test' | 'bench' | 'stop', forTest = mode === 'test' || mode === 'bench'): Record<string, string> {
  const base: Record<string, string> = {};
  for (const [k, v] of Object.entries(process.env)) if (v !== undefined) base[k] = v;
  if (forTest) {
    Object.assign(base, TEST_PROFILE);
    // The benchmark keeps its own database so it never touches the test data.
    if (mode === 'bench') Object.assign(base, { PG_DATABASE: 'localis_bench', LOG_LEVEL: 'silent' });
  } else {
    const envFile = join(ROOT, '.env');
    if (existsSync(envFile)) Object.assign(base, parse(readFileSync(envFile)), pickDefined(process.env));
    base.LOCALIS_PROFILE = mode === 'dev' ? 'dev' : 'demo';
  }
  // The stacks we start run the mail fake: admins get a link to its inbox (not the benchmark's).
  if (mode !== 'bench') base.MAIL_INBOX_URL ||= `http://127.0.0.1:${base.MAIL_INBOX_PORT ?? '1080'}/index.html`;
  base.AWS_SDK_JS_NODE_VERSION_SUPPORT_WARNING_DISABLED = 'true';
  // Resolve the data folder once so every child agrees whatever its working directory.
  base.DATA_DIR = resolve(ROOT, base.DATA_DIR ?? '.data');
  return base;
}

function pickDefined(env: NodeJS.ProcessEnv): Record<string, string> {
  return Object.fromEntries(Object.entries(env).filter(([, v]) => v !== undefined)) as Record<string, string>;
}

export function settingsOf(env: Record<string, string>): Settings {
  return loadSettings(env);
}
