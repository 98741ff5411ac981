import { readFileSync, rmSync, writeFileSync, mkdirSync } from 'node:fs';
import { join } from 'node:path';
import { spawn } from 'node:child_process';
import { PEOPLE, DEMO_PASSWORD } from '@localis/seeds/scenario';
import { ProcessGroup } from './processes';
import { profileEnv, ROOT, settingsOf } from './profile';
import { buildPortalIfStale, runOnce, startApplication, startInfrastructure, stopFromOutside, stopInfrastructure } from './stack';
import { summarise } from './test-summary';

type Mode = 'start' | 'dev' | 'test' | 'stop' | 'bench';
const mode = (process.argv[2] ?? 'start') as Mode;
const extraArgs = process.argv.slice(3);

async function main(): Promise<number> {
  if (mode === 'stop') {
    for (const profile of ['start', 'test'] as const) await stopFromOutside(settingsOf(profileEnv(profile)));
    console.log('localis: stopped');
    return 0;
  }

  const env = profileEnv(mode);
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

  let stopping: Promise<void> | undefined;
  const stop = () =>
    (stopping ??= (async () => {
      console.log('\nlocalis: stopping');
      await group.stopAll();
      await stopInfrastructure(s);
      rmSync(join(runDir, 'stack.pid'), { force: true });
    })());
  const onSignal = () => void stop().then(() => process.exit(130));
  process.on('SIGINT', onSignal);
  process.on('SIGTERM', onSignal);

  try {
    await startInfrastructure(s, env, group, { freshDatabase: mode === 'test' || mode === 'bench', fakes: mode !== 'bench' });
    if (mode === 'bench') {
      return await runChild(join(ROOT, 'node_modules', '.bin', 'tsx'), [join(ROOT, 'infra', 'src', 'bench.ts'), ...extraArgs], env);
    }
    runOnce('the demo scenario', 'seeds/src/load.cli.ts', [], env);
    if (mode === 'dev') {
      const apiPort = s.APP_PORT + 1;
      await startApplication(s, env, group, { watch: true, apiPort });
      group.start('portal', 'npm', ['run', 'dev', '-w', '@localis/portal'], { ...env, API_PORT: String(apiPort) });
      announce(s.PUBLIC_URL, s.DATA_DIR, s.MAIL_INBOX_PORT);
      await group.anyExit();
      return 1;
    }
    buildPortalIfStale(env);
    await startApplication(s, env, group, { watch: false });
    if (mode === 'test') {
      const code = await runChild('npx', ['vitest', 'run', '--reporter=default', '--reporter=json', `--outputFile.json=${join(s.DATA_DIR, 'vitest.json')}`, ...extraArgs], env);
      const summary = summarise(join(s.DATA_DIR, 'vitest.json'));
      console.log(`tests: ${summary.passed} passed, ${summary.failed} failed`);
      return code !== 0 || summary.failed > 0 || summary.passed === 0 ? 1 : 0;
    }
    announce(s.PUBLIC_URL, s.DATA_DIR, s.MAIL_INBOX_PORT);
    const crashed = await group.anyExit();
    console.error(`localis: ${crashed.name} stopped unexpectedly; stopping the rest`);
    return 1;
  } finally {
    await stop();
  }
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

function runChild(cmd: string, args: string[], env: Record<string, string>): Promise<number> {
  return new Promise((resolve) => {
    const child = spawn(cmd, args, { cwd: ROOT, env, stdio: 'inherit' });
    child.on('exit', (code) => resolve(code ?? 1));
  });
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
  async (e) => {
    console.error(`localis: ${(e as Error).message}`);
    process.exit(1);
  },
);
