import { DEFAULT_BOOTSTRAP_SAMPLES, DEFAULT_BOOTSTRAP_SEED, type ErrorDetail, type ScalingObservable } from '@localis/shared';
import { CliError, EXIT } from './cli-error';

/** The options of `localis analyze` as commander hands them over: text, checked here. */
export interface AnalyzeRawOptions {
  observable?: string;
  orders?: string;
  bootstrap?: string;
  energy?: string;
  seed?: string;
  json: boolean;
}

export interface AnalyzePlan {
  observable: ScalingObservable;
  /** nr and ni as given; mr and mi keep the analysis's defaults. Absent: the scan chooses. */
  orders?: { nr: number; ni: number };
  bootstrap: number;
  energy?: number;
  seed: number;
  json: boolean;
}

export const DEFAULT_SEED = DEFAULT_BOOTSTRAP_SEED;
export const DEFAULT_BOOTSTRAP = DEFAULT_BOOTSTRAP_SAMPLES;
/** Far beyond what a 95 % interval needs; more is a typo, and would run for hours. */
export const MAX_BOOTSTRAP = 100_000;
const MAX_SEED = 0xffff_ffff;

const NUMBER = /^[+-]?(\d+\.?\d*|\.\d+)([eE][+-]?\d+)?$/;
const INTEGER = /^\d+$/;

/**
 * Checks every option and reports all problems at once, each with its option (exit 2). The ranges
 * of the orders themselves are the analysis's to judge; its message names them.
 */
export function planAnalyze(raw: AnalyzeRawOptions): AnalyzePlan {
  const problems: ErrorDetail[] = [];
  const problem = (option: string, message: string) => problems.push({ path: [option], message });

  const observable = (raw.observable ?? 'lambda').trim();
  if (observable !== 'lambda' && observable !== 'g') problem('--observable', `the observable must be lambda or g (read "${raw.observable}")`);

  let orders: AnalyzePlan['orders'];
  if (raw.orders !== undefined) {
    const match = /^\s*(\d+)\s*,\s*(\d+)\s*$/.exec(raw.orders);
    if (match) orders = { nr: Number(match[1]), ni: Number(match[2]) };
    else problem('--orders', `give the orders as nr,ni: two whole numbers, e.g. 3,1 (read "${raw.orders}")`);
  }

  const bootstrapText = (raw.bootstrap ?? String(DEFAULT_BOOTSTRAP)).trim();
  const bootstrap = INTEGER.test(bootstrapText) ? Number(bootstrapText) : Number.NaN;
  if (!(bootstrap === 0 || (bootstrap >= 2 && bootstrap <= MAX_BOOTSTRAP))) {
    problem('--bootstrap', `the bootstrap samples must be 0 (linearized intervals) or a whole number from 2 to ${MAX_BOOTSTRAP.toLocaleString('en')} (read "${raw.bootstrap}")`);
  }

  let energy: number | undefined;
  if (raw.energy !== undefined) {
    energy = NUMBER.test(raw.energy.trim()) ? Number(raw.energy.trim()) : Number.NaN;
    if (!Number.isFinite(energy)) problem('--energy', `the energy E must be a number (read "${raw.energy}")`);
  }

  const seedText = (raw.seed ?? String(DEFAULT_SEED)).trim();
  const seed = INTEGER.test(seedText) ? Number(seedText) : Number.NaN;
  if (!(seed >= 0 && seed <= MAX_SEED)) problem('--seed', `the seed must be a whole number from 0 to ${MAX_SEED} (read "${raw.seed}")`);

  if (problems.length) {
    throw new CliError('the options of `localis analyze` are not valid:', { exitCode: EXIT.usage, details: problems });
  }
  return { observable: observable as ScalingObservable, orders, bootstrap, energy, seed, json: raw.json };
}
