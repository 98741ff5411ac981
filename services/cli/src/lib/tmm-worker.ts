import { parentPort, workerData } from 'node:worker_threads';
import { runTransferMatrix, TransferMatrixCancelled, type TransferMatrixProgress, type TransferMatrixResult } from '@localis/shared';
import type { TmmPlan } from './tmm-options';

/** What `localis tmm` hands its worker thread. */
export interface TmmWorkerData {
  input: TmmPlan['input'];
  /** One Int32 the main thread sets to 1 on Ctrl-C; shared memory, so it is seen mid-run. */
  cancel: Int32Array;
  /** Re-orthonormalizations between two looks at the clock; 0 for no progress at all. */
  progressEvery: number;
}

export type TmmWorkerMessage =
  | { type: 'progress'; progress: TransferMatrixProgress }
  | { type: 'result'; result: TransferMatrixResult }
  | { type: 'cancelled'; slices: number }
  | { type: 'failed'; message: string };

/** A terminal redraws smoothly at this pace; faster only costs the kernel time. */
const PROGRESS_INTERVAL_MS = 100;

const data = workerData as TmmWorkerData;
const post = (message: TmmWorkerMessage) => parentPort!.postMessage(message);
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
            if (now - lastPost < PROGRESS_INTERVAL_MS) return;
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
