import { mkdirSync, readFileSync, rmSync, writeFileSync } from 'node:fs';
import { join } from 'node:path';
import { PEOPLE, DEMO_PASSWORD } from '@localis/seeds/scenario';
import { databasePassword } from './postgres';
import { ProcessGroup } from './processes';
import { profileEnv, ROOT, settingsOf } from './profile';
import { buildPortalIfStale, runOnce, startApplication, startInfrastructure, stopFromOutside, stopInfrastructure } from './stack';
import { summarise } from './test-summary';

type Mode = 'start' | 'dev' | 'test' | 'stop' | 'bench' | 'bench-archives';
const mode = (process.argv[2] ?? 'start') as Mode;
const extraArgs = process.argv.slice(3);
const TSX = join(ROOT, 'node_modules', '.bin', 'tsx');

/** Thrown between start-up steps once a signal asked us to stop. */
class Interrupted extends Error {}

async function main(): Promise<number> {
  if (mode === 'stop') {
    for (const profile of ['start', 'test'] as const) await stopFromOutside(settingsOf(profileEnv(profile)));
    console.log('localis: stopped');
    return 0;
  }

  const env = mode === 'bench-archives' ? benchArchivesEnv() : profileEnv(mode);
  env.PG_PASSWORD = databasePassword(settingsOf(env));
  const s = settingsOf(env);
  const runDir = join(s.DATA_DIR, 'run');
  mkdirSync(runDir, { recursive: true });
  const running = runningStack(join(runDir, 'stack.pid'));
  if (running) {
    console.error(`localis: a ${mode === 'test' ? 'test run' : 'Localis stack'} is already running here (pid ${running}); stop it with \`npm run stop\` or Ctrl-C in its shell.`);
    return 1;
  }
  writeFileSync(join(runDir, 'stack.pid'), String(process.pid));
  const group = new ProcessGroup(runDir);

  // A signal never stops things itself: it interrupts the main flow, whose `finally` stops
  // everything once, in order, whatever step we were at (even halfway through start-up).
  const interrupt = new AbortController();
  const interrupted = new Promise<never>((_, reject) => interrupt.signal.addEventListener('abort', () => reject(new Interrupted())));
  interrupted.catch(() => undefined);
  for (const signal of ['SIGINT', 'SIGTERM', 'SIGHUP'] as const) {
    process.on(signal, () => {
      if (!interrupt.signal.aborted) console.log(`\nlocalis: ${signal} received, stopping`);
      interrupt.abort();
    });
  }
  const step = async <T>(work: () => T | Promise<T>): Promise<T> => {
    if (interrupt.signal.aborted) throw new Interrupted();
    return Promise.race([Promise.resolve().then(work), interrupted]);
  };

  try {
    await step(() => startInfrastructure(s, env, group, { freshDatabase: mode === 'test' || mode === 'bench' || mode === 'bench-archives', fakes: mode !== 'bench' }));
    if (mode === 'bench') {
      const bench = group.start('bench', TSX, [join(ROOT, 'infra', 'src', 'bench.ts'), ...extraArgs], env, { inheritOutput: true });
      return await step(() => bench.exited);
    }
    await step(() => runOnce('the demo scenario', 'seeds/src/load.cli.ts', [], env));
    if (mode === 'bench-archives') {
      // The api serves without the built portal, and the benchmark only talks to the api.
      await step(() => startApplication(s, env, group, { watch: false }));
      const bench = group.start('bench', TSX, [join(ROOT, 'infra', 'src', 'bench-archives.ts'), ...extraArgs], env, { inheritOutput: true });
      return await step(() => bench.exited);
    }
    if (mode === 'dev') {
      const apiPort = s.APP_PORT + 1;
      await step(() => startApplication(s, env, group, { watch: true, apiPort }));
      group.start('portal', 'npm', ['run', 'dev', '-w', '@localis/portal'], { ...env, API_PORT: String(apiPort) });
      announce(s.PUBLIC_URL, s.DATA_DIR, s.MAIL_INBOX_PORT);
      const crashed = await step(() => group.anyExit());
      console.error(`localis: ${crashed.name} stopped; stopping the rest`);
      return 1;
    }
    await step(() => buildPortalIfStale(env));
    await step(() => startApplication(s, env, group, { watch: false }));
    if (mode === 'test') {
      const report = join(s.DATA_DIR, 'vitest.json');
      rmSync(report, { force: true });
      const vitest = group.start('vitest', join(ROOT, 'node_modules', '.bin', 'vitest'), ['run', '--reporter=default', '--reporter=json', `--outputFile.json=${report}`, ...extraArgs], env, { inheritOutput: true });
      const code = await step(() => vitest.exited);
      const summary = summarise(report);
      console.log(`tests: ${summary.passed} passed, ${summary.failed} failed`);
      return code !== 0 || summary.failed > 0 || summary.passed === 0 ? 1 : 0;
    }
    announce(s.PUBLIC_URL, s.DATA_DIR, s.MAIL_INBOX_PORT);
    const crashed = await step(() => group.anyExit());
    console.error(`localis: ${crashed.name} stopped unexpectedly; stopping the rest`);
    return 1;
  } catch (e) {
    if (e instanceof Interrupted) return 130;
    throw e;
  } finally {
    console.log('localis: stopping');
    await group.stopAll();
    await stopInfrastructure(s);
    rmSync(join(runDir, 'stack.pid'), { force: true });
  }
}

/**
 * `npm run bench:archives`: the test profile's ports and data folder (so it never runs beside
 * `npm test`, which shares the pid file), in the `localis_bench` database like `npm run bench`.
 */
function benchArchivesEnv(): Record<string, string> {
  return { ...profileEnv('test'), PG_DATABASE: 'localis_bench' };
}

/** The pid of a live orchestrator of this profile, if one is running. */
function runningStack(pidFile: string): number | null {
  try {
    const pid = Number(readFileSync(pidFile, 'utf8'));
    process.kill(pid, 0);
    return pid;
  } catch {
    return null;
  }
}

function announce(url: string, dataDir: string, inboxPort: number) {
  const tokens = (() => {
    try {
      return JSON.parse(readFileSync(join(dataDir, 'demo-tokens.json'), 'utf8')) as Record<string, string>;
    } catch {
      return {};
    }
  })();
  const lines = PEOPLE.map((p) => `  ${p.email.padEnd(44)} ${p.roles.join(', ').padEnd(22)} ${p.story}`);
  console.log(`
Localis is running at ${url}

Demo sign-ins (password for every account: ${DEMO_PASSWORD}):
${lines.join('\n')}

API tokens for the CLI and scripts: ${join(dataDir, 'demo-tokens.json')} (${Object.keys(tokens).length} tokens)
Mail inbox of the local mail server: http://127.0.0.1:${inboxPort}/index.html
Stop with Ctrl-C, or \`npm run stop\` from another shell.
`);
}

main().then(
  (code) => process.exit(code),
  (e) => {
    console.error(`localis: ${(e as Error).message}`);
    process.exit(1);
  },
);
