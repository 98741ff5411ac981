import { createHash } from 'node:crypto';
import { existsSync, mkdirSync, readFileSync, renameSync, writeFileSync } from 'node:fs';
import { availableParallelism } from 'node:os';
import { dirname, join } from 'node:path';
import { fileURLToPath } from 'node:url';
import { expectedTransferMatrixRun, type TransferMatrixResult } from '@localis/shared';
import { startTransferMatrixThread } from '@localis/shared/node';
import { pointsOf, type DemoArchivePlan } from './results-scenario';

export type KernelInput = ReturnType<typeof pointsOf>[number];
export interface ComputedPoint extends KernelInput {
  result: TransferMatrixResult;
}

/** The kernel's source: a changed kernel computes the demo afresh, an unchanged one reuses the cache. */
const KERNEL_SOURCE = join(dirname(fileURLToPath(import.meta.url)), '..', '..', 'shared', 'src', 'physics', 'transfer-matrix.ts');
export const kernelSourceHash = () => createHash('sha256').update(readFileSync(KERNEL_SOURCE)).digest('hex');

const cacheFile = (cacheDir: string, plan: DemoArchivePlan) => {
  const key = createHash('sha256').update(JSON.stringify({ points: pointsOf(plan), kernel: kernelSourceHash() })).digest('hex').slice(0, 16);
  return join(cacheDir, `${plan.fileName}.${key}.json`);
};

/**
 * The points of each demo archive, computed by the transfer-matrix kernel on as many threads as
 * there are cores (at most two: `npm start` on a laptop should stay usable), or read from
 * `cacheDir` when this kernel computed them before. Costliest points first, so the threads
 * finish together. A minute or two on this machine the first time; nothing after.
 */
export async function computeDemoTables(plans: DemoArchivePlan[], cacheDir: string, log: (line: string) => void = console.log): Promise<Map<string, ComputedPoint[]>> {
  const tables = new Map<string, ComputedPoint[]>();
  const missing: { plan: DemoArchivePlan; points: KernelInput[] }[] = [];
  for (const plan of plans) {
    const file = cacheFile(cacheDir, plan);
    if (existsSync(file)) tables.set(plan.fileName, JSON.parse(readFileSync(file, 'utf8')) as ComputedPoint[]);
    else missing.push({ plan, points: pointsOf(plan) });
  }
  if (!missing.length) return tables;

  const jobs = missing.flatMap(({ plan, points }) => points.map((input, index) => ({ plan, index, input, cost: expectedTransferMatrixRun(input).seconds })));
  jobs.sort((a, b) => b.cost - a.cost);
  const results = new Map<DemoArchivePlan, ComputedPoint[]>(missing.map(({ plan }) => [plan, []]));
  const threads = Math.max(1, Math.min(2, availableParallelism()));
  log(`demo results: computing ${jobs.length} points with the transfer-matrix kernel on ${threads} thread${threads > 1 ? 's' : ''} (kept in ${cacheDir})`);
  const started = Date.now();
  let done = 0;
  let lastLog = started;
  let next = 0;
  await Promise.all(
    Array.from({ length: threads }, async () => {
      while (next < jobs.length) {
        const job = jobs[next++]!;
        const result = await startTransferMatrixThread(job.input).result;
        results.get(job.plan)![job.index] = { ...job.input, result };
        done++;
        if (Date.now() - lastLog > 5000 || done === jobs.length) {
          lastLog = Date.now();
          log(`demo results: ${done} of ${jobs.length} points (${Math.round((Date.now() - started) / 1000)} s)`);
        }
      }
    }),
  );
  mkdirSync(cacheDir, { recursive: true });
  for (const [plan, points] of results) {
    const file = cacheFile(cacheDir, plan);
    // Written whole, then renamed: an interrupted start leaves no half-written cache.
    writeFileSync(`${file}.tmp`, JSON.stringify(points));
    renameSync(`${file}.tmp`, file);
    tables.set(plan.fileName, points);
  }
  return tables;
}

/** The archive's result table, in the columns of the archive format. */
export function lambdaCsv(points: ComputedPoint[]): string {
  const rows = points.map((p) => `${p.width},${p.disorder},${p.energy},${p.result.lambda.toPrecision(10)},${p.result.lambdaErr.toPrecision(6)}`);
  return ['L,W,E,lambda,lambda_err', ...rows].join('\n') + '\n';
}
