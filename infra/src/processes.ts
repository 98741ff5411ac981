import { spawn, type ChildProcess } from 'node:child_process';
import { mkdirSync, rmSync, writeFileSync } from 'node:fs';
import { join } from 'node:path';
import { ROOT } from './profile';

const COLOURS = [36, 33, 35, 32, 34, 91, 96];

export interface Managed {
  name: string;
  child: ChildProcess;
  exited: Promise<number>;
}

/** Starts and stops the long-running children of one stack, with labelled output. */
export class ProcessGroup {
  private readonly children: Managed[] = [];
  constructor(private readonly runDir: string, private readonly quiet = false) {
    mkdirSync(runDir, { recursive: true });
  }

  start(name: string, command: string, args: string[], env: Record<string, string>): Managed {
    const child = spawn(command, args, { cwd: ROOT, env, stdio: ['ignore', 'pipe', 'pipe'] });
    const colour = COLOURS[this.children.length % COLOURS.length];
    const label = `\x1b[${colour}m${name.padEnd(7)}\x1b[0m| `;
    const relay = (stream: NodeJS.WritableStream) => (chunk: Buffer) => {
      if (this.quiet) return;
      const text = chunk.toString();
      stream.write(text.split('\n').filter((l, i, a) => l !== '' || i < a.length - 1).map((l) => label + l).join('\n') + '\n');
    };
    child.stdout!.on('data', relay(process.stdout));
    child.stderr!.on('data', relay(process.stderr));
    if (child.pid) writeFileSync(join(this.runDir, `${name}.pid`), String(child.pid));
    const exited = new Promise<number>((resolve) => child.on('exit', (code) => resolve(code ?? 1)));
    const managed = { name, child, exited };
    this.children.push(managed);
    return managed;
  }

  /** The first child that exits, for the orchestrator to notice a crash. */
  anyExit(): Promise<Managed> {
    return Promise.race(this.children.map((m) => m.exited.then(() => m)));
  }

  async stopAll(timeoutMs = 8000): Promise<void> {
    const alive = this.children.filter((m) => m.child.exitCode === null && m.child.signalCode === null).reverse();
    for (const m of alive) m.child.kill('SIGTERM');
    await Promise.all(
      alive.map((m) =>
        Promise.race([
          m.exited,
          new Promise((r) => setTimeout(r, timeoutMs)).then(() => m.child.kill('SIGKILL')),
        ]),
      ),
    );
    for (const m of this.children) rmSync(join(this.runDir, `${m.name}.pid`), { force: true });
  }
}
