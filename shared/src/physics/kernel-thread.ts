import { Worker } from 'node:worker_threads';
import type { KernelThreadData, KernelThreadMessage } from './kernel-thread-body';
import { transferMatrixOperationsPerSlice } from '../campaigns/cost-model';
import { DEFAULT_REORTHOGONALIZE_EVERY, TransferMatrixCancelled, type TransferMatrixProgress, type TransferMatrixResult } from './transfer-matrix';

/** About 2 ms of kernel work between two looks at the clock: too little to slow it. */
const OPERATIONS_BETWEEN_PROGRESS_CHECKS = 2e6;

export interface KernelThreadOptions {
  onProgress?: (progress: TransferMatrixProgress) => void;
  /** Least time between two progress calls (default 100 ms, a terminal's redraw pace). */
  progressIntervalMs?: number;
  /** After `cancel`, how long the kernel gets to reach its next check before the thread is stopped outright. */
  graceMs?: number;
}

/**
 * Plain JavaScript that registers tsx in the thread. Its name differs from this module's: Vite (so
 * vitest) resolves `./kernel-thread` to a `.mjs` of that name before the `.ts`.
 */
const KERNEL_THREAD_ENTRY = new URL('./kernel-thread-entry.mjs', import.meta.url);

/** The kernel failed (not cancelled); the message is the kernel's. */
export class KernelThreadFailure extends Error {}

export interface KernelThreadRun {
  /** Rejects with TransferMatrixCancelled after a cancel, KernelThreadFailure when the kernel fails. */
  result: Promise<TransferMatrixResult>;
  /** Asks the kernel to stop at its next re-orthonormalization; the thread is stopped after `graceMs` regardless. */
  cancel(): void;
  /** Stops the thread now. */
  terminate(): void;
  /** Slices done as of the last progress message. */
  readonly slicesDone: number;
}

/**
 * The transfer-matrix kernel on a thread of its own. The kernel is one synchronous loop: on the
 * main thread it would hold off signal handlers (Ctrl-C in the CLI) and everything else of the
 * event loop (a worker's queue locks and heartbeats) for as long as it runs. Running it in chunks
 * would need a kernel that can pause and resume, which it is not. So the caller's thread stays
 * free and cancels through a flag in shared memory that the kernel reads at every
 * re-orthonormalization. A wide bar can spend seconds between two checks, hence the grace period
 * after which the thread is ended: it holds nothing worth saving.
 */
export function startTransferMatrixThread(input: KernelThreadData['input'], options: KernelThreadOptions = {}): KernelThreadRun {
  const cancelFlag = new Int32Array(new SharedArrayBuffer(Int32Array.BYTES_PER_ELEMENT));
  const reorthogonalizeEvery = input.reorthogonalizeEvery ?? DEFAULT_REORTHOGONALIZE_EVERY;
  const workOfOneCheck = transferMatrixOperationsPerSlice(input.dimension, input.width, reorthogonalizeEvery) * reorthogonalizeEvery;
  const data: KernelThreadData = {
    input,
    cancel: cancelFlag,
    progressEvery: options.onProgress ? Math.max(1, Math.round(OPERATIONS_BETWEEN_PROGRESS_CHECKS / workOfOneCheck)) : 0,
    progressIntervalMs: options.progressIntervalMs ?? 100,
  };
  const worker = new Worker(KERNEL_THREAD_ENTRY, { workerData: data });
  let slicesDone = 0;
  let stopTimer: NodeJS.Timeout | undefined;
  const cancelled = () => Atomics.load(cancelFlag, 0) === 1;

  const result = new Promise<TransferMatrixResult>((resolve, reject) => {
    worker.on('message', (message: KernelThreadMessage) => {
      switch (message.type) {
        case 'progress':
          slicesDone = message.progress.slices;
          options.onProgress?.(message.progress);
          break;
        case 'result':
          resolve(message.result);
          break;
        case 'cancelled':
          reject(new TransferMatrixCancelled(message.slices));
          break;
        case 'failed':
          reject(new KernelThreadFailure(message.message));
          break;
      }
    });
    worker.on('error', reject);
    // A promise settles once: these only count when no message has settled it first.
    worker.on('exit', () => {
      clearTimeout(stopTimer);
      reject(cancelled() ? new TransferMatrixCancelled(slicesDone) : new KernelThreadFailure('the transfer-matrix thread stopped without a result'));
    });
  });

  return {
    result,
    cancel() {
      if (cancelled()) return;
      Atomics.store(cancelFlag, 0, 1);
      stopTimer = setTimeout(() => void worker.terminate(), options.graceMs ?? 1000);
    },
    terminate() {
      Atomics.store(cancelFlag, 0, 1);
      void worker.terminate();
    },
    get slicesDone() {
      return slicesDone;
    },
  };
}
