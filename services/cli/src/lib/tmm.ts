import { Worker } from 'node:worker_threads';
import type { TransferMatrixProgress, TransferMatrixResult } from '@localis/shared';
import { CliError, EXIT } from './cli-error';
import { formatProgress, formatTmm } from './format-tmm';
import { terminalOutput, type Output } from './output';
import { planTmm, type TmmPlan, type TmmRawOptions } from './tmm-options';
import type { TmmWorkerData, TmmWorkerMessage } from './tmm-worker';

/** About 2 ms of kernel work between two looks at the clock for the progress line: too little to slow it. */
const OPERATIONS_BETWEEN_PROGRESS_CHECKS = 2e6;
/** How long Ctrl-C waits for the kernel's next re-orthonormalization before stopping the thread outright. */
const STOP_GRACE_MS = 1000;

/**
 * `localis tmm`: the transfer-matrix kernel of `@localis/shared` on this machine, the same code the
 * worker uses to spot-check results, so a researcher can try a point (d, L, W, E) before proposing
 * a campaign, or check a number the portal shows.
 */
export async function tmm(raw: TmmRawOptions, io: Output = terminalOutput, stderr: NodeJS.WriteStream = process.stderr): Promise<void> {
  const plan = planTmm(raw);
  // Progress only for a person watching: a pipe or a log file would fill with redraws.
  const line = !raw.json && stderr.isTTY ? progressLine(stderr, plan) : undefined;
  let result: TransferMatrixResult;
  try {
    result = await runInWorker(plan, line?.draw);
  } finally {
    line?.clear();
  }
  if (raw.json) io.out(JSON.stringify(result, null, 2));
  else io.out(formatTmm(plan, result));
}

/** One line on a terminal, redrawn in place and wiped before anything else is written. */
function progressLine(stderr: NodeJS.WriteStream, plan: TmmPlan) {
  let drawn = false;
  return {
    draw(progress: TransferMatrixProgress) {
      const text = formatProgress(plan, progress);
      const room = Math.max(20, (stderr.columns || 80) - 1);
      stderr.write(`\r${text.length > room ? text.slice(0, room) : text}\x1b[K`);
      drawn = true;
    },
    clear() {
      if (drawn) stderr.write('\r\x1b[K');
    },
  };
}

/**
 * The kernel is one synchronous loop. A SIGINT handler is a JavaScript callback, and while that
 * loop holds the main thread Node only queues the signal: the handler would run after the run
 * ends, and an `isCancelled` flag it sets would never be seen. Running the kernel in chunks would
 * need a kernel that can pause and resume, which it is not. So it runs in a worker thread: the main
 * thread stays idle, receives Ctrl-C, and sets a flag in shared memory that the kernel's
 * `isCancelled` reads at every re-orthonormalization; the kernel then stops and says after how
 * many slices. A wide bar can spend seconds between two such checks, so a thread that has not
 * stopped within STOP_GRACE_MS (or at a second Ctrl-C) is terminated: it holds nothing to save.
 */
function runInWorker(plan: TmmPlan, onProgress?: (progress: TransferMatrixProgress) => void): Promise<TransferMatrixResult> {
  const cancel = new Int32Array(new SharedArrayBuffer(Int32Array.BYTES_PER_ELEMENT));
  const workOfOneCheck = plan.operationsPerSlice * plan.input.reorthogonalizeEvery;
  const data: TmmWorkerData = {
    input: plan.input,
    cancel,
    progressEvery: onProgress ? Math.max(1, Math.round(OPERATIONS_BETWEEN_PROGRESS_CHECKS / workOfOneCheck)) : 0,
  };
  const worker = new Worker(new URL('./tmm-worker.mjs', import.meta.url), { workerData: data });

  return new Promise((resolve, reject) => {
    let slicesDone = 0;
    let stopTimer: NodeJS.Timeout | undefined;
    const cancelled = (slices: number) =>
      new CliError(slices > 0 ? `cancelled after ${slices.toLocaleString('en')} slices; no result.` : 'cancelled; no result.', { exitCode: EXIT.interrupted });

    const onSigint = () => {
      if (Atomics.load(cancel, 0) === 1) {
        void worker.terminate();
        return;
      }
      Atomics.store(cancel, 0, 1);
      stopTimer = setTimeout(() => void worker.terminate(), STOP_GRACE_MS);
    };
    process.on('SIGINT', onSigint);

    worker.on('message', (message: TmmWorkerMessage) => {
      switch (message.type) {
        case 'progress':
          slicesDone = message.progress.slices;
          onProgress?.(message.progress);
          break;
        case 'result':
          resolve(message.result);
          break;
        case 'cancelled':
          reject(cancelled(message.slices));
          break;
        case 'failed':
          reject(failure(message.message, plan));
          break;
      }
    });
    worker.on('error', reject);
    // A promise settles once: these only count when no message has settled it first.
    worker.on('exit', () => {
      process.off('SIGINT', onSigint);
      clearTimeout(stopTimer);
      if (Atomics.load(cancel, 0) === 1) reject(cancelled(slicesDone));
      else reject(new Error('the transfer-matrix thread stopped without a result'));
    });
  });
}

function failure(message: string, plan: TmmPlan): CliError {
  const { dimension, width, reorthogonalizeEvery } = plan.input;
  if (/allocation failed|invalid typed array length/i.test(message)) {
    const gib = (2 * width ** (2 * (dimension - 1)) * 8) / 1024 ** 3;
    return new CliError(`the transfer-matrix run failed: ${message}.`, { hint: `A bar of width ${width} in d = ${dimension} needs about ${gib.toPrecision(3)} GiB for its vectors; use a smaller --width or a machine with more memory.` });
  }
  if (/degenerated/.test(message)) {
    return new CliError(`the transfer-matrix run failed: ${message}.`, { hint: `Give a smaller --reorthogonalize-every than ${reorthogonalizeEvery}.` });
  }
  return new CliError(`the transfer-matrix run failed: ${message}.`);
}
