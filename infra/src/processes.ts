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

/**
 * Starts and stops the long-running children of one stack. Each child leads its own process
 * group, so a stop reaches the whole tree (tsx starts node; vitest starts workers and Chromium),
 * and the terminal's Ctrl-C reaches only the orchestrator, which then stops them in order.
 */
export class ProcessGroup {
  private readonly children: Managed[] = [];
  constructor(private readonly runDir: string, private readonly quiet = false) {
    mkdirSync(runDir, { recursive: true });
  }

  start(name: string, command: string, args: string[], env: Record<string, string>, opts: { inheritOutput?: boolean } = {}): Managed {
    const child = spawn(command, args, { cwd: ROOT, env, detached: true, stdio: opts.inheritOutput ? ['ignore', 'inherit', 'inherit'] : ['ignore', 'pipe', 'pipe'] });
    if (!opts.inheritOutput) {
      const colour = COLOURS[this.children.length % COLOURS.length];
      const label = `\x1b[${colour}m${name.padEnd(7)}\x1b[0m| `;
      const relay = (stream: NodeJS.WritableStream) => (chunk: Buffer) => {
        if (this.quiet) return;
        const lines = chunk.toString().split('\n');
        if (lines.at(-1) === '') lines.pop();
        stream.write(lines.map((l) => label + l).join('\n') + '\n');
      };
      child.stdout!.on('data', relay(process.stdout));
      child.stderr!.on('data', relay(process.stderr));
    }
    if (child.pid) writeFileSync(join(this.runDir, `${name}.pid`), String(child.pid));
    const exited = new Promise<number>((resolve) => child.on('exit', (code, signal) => resolve(code ?? (signal ? 128 : 1))));
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
    for (const m of alive) killTree(m.child, 'SIGTERM');
    await Promise.all(
      alive.map((m) =>
        Promise.race([m.exited, new Promise((r) => setTimeout(r, timeoutMs)).then(() => killTree(m.child, 'SIGKILL'))]),
      ),
    );
    for (const m of this.children) rmSync(join(this.runDir, `${m.name}.pid`), { force: true });
  }
}

/** Signal a child's whole process group (it was spawned detached, as the group leader). */
export function killTree(child: ChildProcess, signal: NodeJS.Signals): void {
  if (!child.pid) return;
  try {
    process.kill(-child.pid, signal);
  } catch {
    try {
      child.kill(signal);
    } catch {
      // already gone
    }
  }
}
