import { parentPort, workerData } from 'node:worker_threads';
import { runTransferMatrix, TransferMatrixCancelled, type TransferMatrixInput, type TransferMatrixProgress, type TransferMatrixResult } from './transfer-matrix';

/** What the kernel's thread is handed. */
export interface KernelThreadData {
  input: Omit<TransferMatrixInput, 'onProgress' | 'isCancelled' | 'progressEvery'>;
  /** One Int32 the caller sets to 1 to cancel; shared memory, so it is seen mid-run. */
  cancel: Int32Array;
  /** Re-orthonormalizations between two looks at the clock; 0 for no progress at all. */
  progressEvery: number;
  /** Least time between two progress messages. */
  progressIntervalMs: number;
}

export type KernelThreadMessage =
  | { type: 'progress'; progress: TransferMatrixProgress }
  | { type: 'result'; result: TransferMatrixResult }
  | { type: 'cancelled'; slices: number }
  | { type: 'failed'; message: string };

const data = workerData as KernelThreadData;
const post = (message: KernelThreadMessage) => parentPort!.postMessage(message);
let lastPost = 0;

try {
  const result = runTransferMatrix({
    ...data.input,
    isCancelled: () => Atomics.load(data.cancel, 0) === 1,
    progressEvery: data.progressEvery || undefined,
    onProgress:
      data.progressEvery > 0
        ? (progress) => {
            const now = performance.now();
            if (now - lastPost < data.progressIntervalMs) return;
            lastPost = now;
            post({ type: 'progress', progress });
          }
        : undefined,
  });
  post({ type: 'result', result });
} catch (e) {
  if (e instanceof TransferMatrixCancelled) post({ type: 'cancelled', slices: e.slices });
  else post({ type: 'failed', message: e instanceof Error ? e.message : String(e) });
}
