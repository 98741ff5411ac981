import { CONSERVATIVE_OPERATIONS_PER_SECOND, DEFAULT_REORTHOGONALIZE_EVERY, expectedTransferMatrixRun, LONG_RUN_SECONDS, type ErrorDetail, type TransferMatrixInput } from '@localis/shared';
import { CliError, EXIT } from './cli-error';

/** The options of `localis tmm` as commander hands them over: text, checked here. */
export interface TmmRawOptions {
  dim?: string;
  width?: string;
  disorder?: string;
  energy?: string;
  precision?: string;
  slices?: string;
  seed?: string;
  reorthogonalizeEvery?: string;
  allowLong: boolean;
  json: boolean;
}

/** What the run will do and roughly what it costs, before any of it is computed. */
export interface TmmPlan {
  input: Omit<TransferMatrixInput, 'onProgress' | 'isCancelled' | 'progressEvery'> & {
    energy: number;
    seed: number;
    reorthogonalizeEvery: number;
  };
  /** Slices the run is expected to need: the given count, or Lambda L / eps^2 with Lambda = 1, whichever is fewer. */
  expectedSlices: number;
  operationsPerSlice: number;
  expectedSeconds: number;
}

export const DEFAULT_PRECISION = 0.01;
export const DEFAULT_SEED = 1;
const MAX_SEED = 0xffff_ffff;

/** A plain decimal number as people type it (`16.5`, `-1`, `1e5`); not hex, not empty, not `Infinity`. */
const NUMBER = /^[+-]?(\d+\.?\d*|\.\d+)([eE][+-]?\d+)?$/;

function readNumber(text: string | undefined): number | undefined {
  if (text === undefined) return undefined;
  const trimmed = text.trim();
  return NUMBER.test(trimmed) ? Number(trimmed) : Number.NaN;
}

/**
 * Checks every option and reports all problems at once, each with the option it is about, so one
 * correction fixes the command line. Throws a usage error (exit 2) on any problem, and on a run
 * expected to take hours unless `--allow-long` is given.
 */
export function planTmm(raw: TmmRawOptions): TmmPlan {
  const problems: ErrorDetail[] = [];
  const problem = (option: string, message: string) => problems.push({ path: [option], message });
  const read = (text: string | undefined) => (text === undefined ? '' : ` (read "${text}")`);

  const dimValue = readNumber(raw.dim);
  const dimension = dimValue === 1 || dimValue === 2 || dimValue === 3 ? dimValue : undefined;
  if (raw.dim === undefined) problem('--dim', 'give the dimension d: 1, 2 or 3');
  else if (dimension === undefined) problem('--dim', `the dimension d must be 1, 2 or 3${read(raw.dim)}`);

  let width = readNumber(raw.width);
  if (raw.width === undefined) {
    if (dimension === 1) width = 1;
    else problem('--width', 'give the width L of the bar (its cross-section is L^(d-1) sites), a positive integer');
  } else if (!(Number.isSafeInteger(width) && width! >= 1)) {
    problem('--width', `the width L must be a positive integer${read(raw.width)}`);
  } else if (dimension === 1 && width !== 1) {
    problem('--width', `a 1D chain has width 1: its cross-section is a single site${read(raw.width)}; leave --width out or give 1`);
  }

  const disorder = readNumber(raw.disorder);
  if (raw.disorder === undefined) problem('--disorder', 'give the disorder W, the width of the box distribution of on-site energies, 0 or more');
  else if (!(Number.isFinite(disorder) && disorder! >= 0)) problem('--disorder', `the disorder W must be a number, 0 or more${read(raw.disorder)}`);

  const energy = readNumber(raw.energy) ?? 0;
  if (!Number.isFinite(energy)) problem('--energy', `the energy E must be a number${read(raw.energy)}`);

  const slices = readNumber(raw.slices);
  if (raw.slices !== undefined && !(Number.isSafeInteger(slices) && slices! >= 1)) {
    problem('--slices', `the slice count must be a positive integer${read(raw.slices)}`);
  }

  // Without either, the run stops at a 1 % relative error of gamma_min: enough to see a trend in Lambda.
  const precision = readNumber(raw.precision) ?? (raw.slices === undefined ? DEFAULT_PRECISION : undefined);
  if (raw.precision !== undefined && !(Number.isFinite(precision) && precision! > 0 && precision! < 1)) {
    problem('--precision', `the precision must be between 0 and 1, both excluded${read(raw.precision)}; it is the relative error of gamma_min at which the run stops, e.g. 0.01`);
  }

  // Clean bars have extended states inside the band: gamma_min is 0, its relative error never
  // falls, and a run stopped only by a precision would never end.
  if (disorder === 0 && raw.slices === undefined) {
    problem('--disorder', 'with W = 0 nothing localizes the states inside the band, so no precision is ever reached; give --slices as well');
  }

  const seed = readNumber(raw.seed) ?? DEFAULT_SEED;
  if (!(Number.isInteger(seed) && seed >= 0 && seed <= MAX_SEED)) problem('--seed', `the seed must be an integer from 0 to ${MAX_SEED}${read(raw.seed)}`);

  const q = readNumber(raw.reorthogonalizeEvery) ?? DEFAULT_REORTHOGONALIZE_EVERY;
  if (!(Number.isSafeInteger(q) && q >= 1)) {
    problem('--reorthogonalize-every', `the slices between two re-orthonormalizations must be a positive integer${read(raw.reorthogonalizeEvery)}`);
  }

  if (problems.length) {
    throw new CliError('the options of `localis tmm` are not valid:', { exitCode: EXIT.usage, details: problems, hint: 'See `localis tmm --help` for what each option means.' });
  }

  const d = dimension!;
  const L = width!;
  // The kernel's own estimate: the CLI refuses with a readable message before starting a worker.
  const expected = expectedTransferMatrixRun({ dimension: d, width: L, precision, slices, reorthogonalizeEvery: q });
  const fromPrecision = precision === undefined ? Number.POSITIVE_INFINITY : Math.ceil(L / precision ** 2);
  const expectedSlices = expected.slices;
  const perSlice = expected.operationsPerSlice;
  const expectedSeconds = expected.seconds;
  const plan: TmmPlan = {
    input: { dimension: d, width: L, disorder: disorder!, energy, precision, slices, seed, reorthogonalizeEvery: q, allowLong: raw.allowLong },
    expectedSlices,
    operationsPerSlice: perSlice,
    expectedSeconds,
  };

  if (expectedSeconds > LONG_RUN_SECONDS && !raw.allowLong) {
    throw new CliError(
      `this run would take about ${duration(expectedSeconds)} on one core: ${scientific(expectedSlices)} slices` +
        (slices === undefined || fromPrecision < slices ? ` (L / precision², taking Lambda = 1)` : '') +
        ` × ${scientific(perSlice)} operations at ${scientific(CONSERVATIVE_OPERATIONS_PER_SECOND)} operations/s.`,
      {
        exitCode: EXIT.usage,
        hint: `Check the width and the ${expectedSlices === slices ? 'slice count' : 'precision'}, or add --allow-long to run it anyway (on a compute node, not the login node).`,
      },
    );
  }
  return plan;
}

/** 4.0e7: the trade's way to write large counts, without JavaScript's `e+`. */
export function scientific(x: number): string {
  if (x < 1e4) return x.toLocaleString('en', { maximumSignificantDigits: 3 });
  return x.toExponential(1).replace('e+', 'e');
}

/** A duration in the unit a person would use for it. */
export function duration(seconds: number): string {
  const units: [number, string][] = [
    [365.25 * 86_400, 'years'],
    [86_400, 'days'],
    [3600, 'hours'],
    [60, 'minutes'],
  ];
  for (const [size, name] of units) if (seconds >= size) return `${(seconds / size).toLocaleString('en', { maximumFractionDigits: 1 })} ${name}`;
  return `${seconds.toLocaleString('en', { maximumFractionDigits: 1 })} s`;
}
