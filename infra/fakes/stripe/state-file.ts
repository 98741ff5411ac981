import { mkdir, open, readFile, rename } from 'node:fs/promises';
import { dirname } from 'node:path';
import { parseSavedState, type SavedState } from './state-file-format';

/**
 * The fake's data file: the app keeps Stripe ids (customers, invoices, hosted page URLs) in its
 * database across restarts, so the fake must know them after a restart too, as Stripe would.
 */

/** The saved state, or undefined when there is no file yet; a file it cannot read stops the start. */
export async function loadStateFile(path: string): Promise<SavedState | undefined> {
  await mkdir(dirname(path), { recursive: true });
  let text: string;
  try {
    text = await readFile(path, 'utf8');
  } catch (e) {
    if ((e as NodeJS.ErrnoException).code === 'ENOENT') return undefined;
    throw new Error(`the Stripe fake cannot read its data file ${path}: ${(e as Error).message}`);
  }
  try {
    return parseSavedState(text);
  } catch (e) {
    // Starting empty would make every id the app holds answer 404; better to say so at once.
    throw new Error(`the Stripe fake's data file ${path} is unreadable: ${(e as Error).message}. Move it away to start with an empty Stripe.`);
  }
}

/** Whole file to `<path>.tmp`, flushed to disk, then renamed over: a crash leaves the old or the new file, never half of one. */
async function writeAtomically(path: string, text: string): Promise<void> {
  const tmp = `${path}.tmp`;
  const handle = await open(tmp, 'w');
  try {
    await handle.writeFile(text, 'utf8');
    // The data on disk before the rename (fdatasync): the rename then never points at a half-written file.
    await handle.datasync();
  } finally {
    await handle.close();
  }
  await rename(tmp, path);
}

/**
 * Saves the state after changes, one write at a time and at most one per `delayMs` (plus the
 * write): a burst of requests costs a write or two, not one each. Serializing blocks the event
 * loop (about 40 ms for 6 MB, some 300 invoices with their events), hence the pause between writes.
 * Each write serializes the state at its start, synchronously, so it is consistent.
 */
export class StateFileWriter {
  private pending = false;
  private running: Promise<void> | undefined;
  private lastError: unknown;
  /** Set by flush: skip the pauses until everything is written. */
  private urgent = false;
  private wake: (() => void) | undefined;

  constructor(
    private readonly path: string,
    private readonly snapshot: () => SavedState,
    private readonly delayMs = 50,
  ) {}

  /** Marks the state changed; a write follows soon. */
  schedule(): void {
    this.pending = true;
    this.running ??= this.drain();
  }

  /** Resolves once every change so far is on disk; rejects if the last write failed. */
  async flush(): Promise<void> {
    if (this.running) {
      this.urgent = true;
      this.wake?.();
    }
    while (this.running) await this.running;
    if (this.lastError !== undefined) throw this.lastError;
  }

  private async drain(): Promise<void> {
    while (this.pending) {
      await this.pause();
      this.pending = false;
      try {
        await writeAtomically(this.path, JSON.stringify(this.snapshot()));
        this.lastError = undefined;
      } catch (e) {
        this.lastError = new Error(`the Stripe fake could not save its data file ${this.path}: ${(e as Error).message}`);
        console.error(String(this.lastError));
      }
    }
    this.running = undefined;
    this.urgent = false;
  }

  private pause(): Promise<void> {
    if (this.urgent) return Promise.resolve();
    return new Promise((resolve) => {
      const done = () => {
        clearTimeout(timer);
        this.wake = undefined;
        resolve();
      };
      const timer = setTimeout(done, this.delayMs);
      this.wake = done;
    });
  }
}
