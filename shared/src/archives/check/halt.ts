import type { ArchiveInspector } from './archive-inspector';
import { StopReading } from './archive-inspector';
import type { FileHasher } from './file-hasher';

/** What a container reader needs besides the source. */
export interface WalkContext {
  inspector: ArchiveInspector;
  /** The whole-file SHA-256, fed by the sequential pass. */
  hasher: FileHasher;
  onProgress?: (bytesRead: number, totalBytes: number) => void;
  signal?: AbortSignal;
}

export interface WalkResult {
  /** Every entry was read (no limit hit, nothing unreadable, not cancelled). */
  completed: boolean;
  /** Bytes of the stored file read by the sequential pass. */
  bytesRead: number;
}

/** An error of the store (a failed read), not of the archive: the caller may retry. */
export class SourceError extends Error {
  constructor(readonly original: unknown) {
    super(original instanceof Error ? original.message : String(original));
  }
}

type Failure = { kind: 'stop' } | { kind: 'unreadable'; message: string } | { kind: 'source'; error: unknown } | { kind: 'abort'; reason: unknown };

/**
 * The first reason a read ends early, whoever sees it first (a limit, a corrupt stream, the store,
 * a cancel). Its signal tells every stream of the read to stop.
 */
export class Halt {
  private readonly controller = new AbortController();
  failure: Failure | null = null;
  private readonly onExternalAbort: () => void;

  constructor(private readonly external?: AbortSignal) {
    this.onExternalAbort = () => this.set({ kind: 'abort', reason: external?.reason });
    if (external?.aborted) this.onExternalAbort();
    else external?.addEventListener('abort', this.onExternalAbort, { once: true });
  }

  /** Stop listening to the caller's signal (a worker may pass one signal to many checks). */
  release(): void {
    this.external?.removeEventListener('abort', this.onExternalAbort);
  }

  get signal(): AbortSignal {
    return this.controller.signal;
  }

  get halted(): boolean {
    return this.failure !== null;
  }

  /** An error raised while reading: a limit, the store, or else a corrupt archive (`what` says which part could not be read). */
  fail(error: unknown, what: string): void {
    if (error instanceof StopReading) this.set({ kind: 'stop' });
    else if (error instanceof SourceError) this.set({ kind: 'source', error: error.original });
    else this.set({ kind: 'unreadable', message: `${what}: ${error instanceof Error ? error.message : String(error)}` });
  }

  set(failure: Failure): void {
    if (this.failure) return;
    this.failure = failure;
    this.controller.abort();
  }

  /** Resolves once halted. */
  whenHalted(): Promise<void> {
    return new Promise((resolve) => {
      if (this.halted) resolve();
      else this.signal.addEventListener('abort', () => resolve(), { once: true });
    });
  }

  /** After the read: false when it ended early for the archive's sake; throws for the store or a cancel. */
  settle(inspector: ArchiveInspector): boolean {
    this.release();
    const failure = this.failure;
    if (!failure) return true;
    if (failure.kind === 'source') throw failure.error;
    if (failure.kind === 'abort') throw failure.reason ?? new Error('the archive check was cancelled');
    if (failure.kind === 'unreadable') inspector.problems.add('unreadable', failure.message);
    return false;
  }
}

/** onProgress at most four times a second, and once at the end. */
export function progressReporter(total: number, onProgress?: (bytesRead: number, totalBytes: number) => void) {
  let last = 0;
  return {
    report(bytesRead: number) {
      if (!onProgress) return;
      const now = Date.now();
      if (now - last < 250) return;
      last = now;
      onProgress(bytesRead, total);
    },
    done(bytesRead: number) {
      onProgress?.(bytesRead, total);
    },
  };
}
