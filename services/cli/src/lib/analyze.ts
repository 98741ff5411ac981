import { analyzeTableAsync, ScalingFitCancelled, ScalingFitError, type ScalingAnalysis } from '@localis/shared';
import { planAnalyze, type AnalyzeRawOptions } from './analyze-options';
import { CliError, EXIT } from './cli-error';
import { formatAnalysis, formatAnalyzeProgress } from './format-analyze';
import { terminalOutput, type Output } from './output';
import { readInput } from './read-input';
import { parseScalingCsv, pointsAtEnergy } from './scaling-csv';

/** A progress line redrawn at most this often: a bootstrap step is a few milliseconds. */
const REDRAW_MS = 100;

/**
 * `localis analyze`: the finite-size scaling analysis of `@localis/shared` (the one the worker
 * runs) on a table of Lambda or g against W, on this machine, as a first look at a campaign's
 * results before anything is uploaded.
 */
export async function analyze(tablePath: string, raw: AnalyzeRawOptions, io: Output = terminalOutput, stderr: NodeJS.WriteStream = process.stderr): Promise<void> {
  const plan = planAnalyze(raw);
  const input = await readInput(tablePath, 'scaling table');
  const csv = parseScalingCsv(input.text, input.name, plan.observable);
  const { points, energy } = pointsAtEnergy(csv, input.name, plan.energy);

  // Progress only for a person watching: a pipe or a log file would fill with redraws.
  const line = !plan.json && stderr.isTTY ? progressLine(stderr) : undefined;
  let cancelled = false;
  const onSigint = () => {
    cancelled = true;
  };
  process.on('SIGINT', onSigint);
  let result: ScalingAnalysis;
  try {
    result = await analyzeTableAsync(points, {
      variable: 'W',
      observable: plan.observable,
      ...(plan.orders ? { orders: plan.orders } : {}),
      bootstrap: plan.bootstrap,
      seed: plan.seed,
      onProgress: line?.draw,
      isCancelled: () => cancelled,
    });
  } catch (e) {
    if (e instanceof ScalingFitCancelled) {
      throw new CliError(`cancelled after ${e.done} of ${e.total} fits; no result.`, { exitCode: EXIT.interrupted });
    }
    if (e instanceof ScalingFitError) {
      throw new CliError(`the scaling analysis of ${input.name} cannot be done: ${e.message}`, { exitCode: EXIT.usage, details: e.details ?? [] });
    }
    throw e;
  } finally {
    process.off('SIGINT', onSigint);
    line?.clear();
  }
  // The analysis as the worker stores it, for jq and plotting scripts.
  if (plan.json) io.out(JSON.stringify(result, null, 2));
  else io.out(formatAnalysis(result, { name: input.name, energy, bootstrap: plan.bootstrap }));
}

/** One line on a terminal, redrawn in place and wiped before anything else is written. */
function progressLine(stderr: NodeJS.WriteStream) {
  let drawn = false;
  let last = 0;
  return {
    draw(done: number, total: number) {
      const now = Date.now();
      if (done < total && now - last < REDRAW_MS) return;
      last = now;
      const text = formatAnalyzeProgress(done, total);
      const room = Math.max(20, (stderr.columns || 80) - 1);
      stderr.write(`\r${text.length > room ? text.slice(0, room) : text}\x1b[K`);
      drawn = true;
    },
    clear() {
      if (drawn) stderr.write('\r\x1b[K');
    },
  };
}
