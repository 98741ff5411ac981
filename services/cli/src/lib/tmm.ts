import { TransferMatrixCancelled, type TransferMatrixProgress, type TransferMatrixResult } from '@localis/shared';
import { KernelThreadFailure, startTransferMatrixThread } from '@localis/shared/node';
import { CliError, EXIT } from './cli-error';
import { formatProgress, formatTmm } from './format-tmm';
import { terminalOutput, type Output } from './output';
import { planTmm, type TmmPlan, type TmmRawOptions } from './tmm-options';

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
 * The kernel runs on a thread of its own (`startTransferMatrixThread`), so this thread stays free
 * to receive Ctrl-C: the first asks the kernel to stop at its next re-orthonormalization (and ends
 * the thread after STOP_GRACE_MS), a second ends it at once.
 */
async function runInWorker(plan: TmmPlan, onProgress?: (progress: TransferMatrixProgress) => void): Promise<TransferMatrixResult> {
  const run = startTransferMatrixThread(plan.input, { onProgress, graceMs: STOP_GRACE_MS });
  let interrupted = false;
  const onSigint = () => {
    if (interrupted) run.terminate();
    else run.cancel();
    interrupted = true;
  };
  process.on('SIGINT', onSigint);
  try {
    return await run.result;
  } catch (e) {
    if (e instanceof TransferMatrixCancelled) {
      throw new CliError(e.slices > 0 ? `cancelled after ${e.slices.toLocaleString('en')} slices; no result.` : 'cancelled; no result.', { exitCode: EXIT.interrupted });
    }
    if (e instanceof KernelThreadFailure) throw failure(e.message, plan);
    throw e;
  } finally {
    process.off('SIGINT', onSigint);
  }
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
