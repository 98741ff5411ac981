import { cpus } from 'node:os';
import { analyzeTable, DEFAULT_FLOPS_PER_CORE, DEFAULT_REORTHOGONALIZE_EVERY, runTransferMatrix, syntheticScalingTable, transferMatrixOperationsPerSlice } from '@localis/shared';

/**
 * `npm run bench:physics`: how fast the transfer-matrix kernel runs on one core of this machine,
 * in the cost model's own terms. Operations per slice come from the cost model's formula
 * (2(2d-1) N_ch² + (10/3) N_ch³ / q), so the ratio to its default rate per core says directly
 * whether the core-hours it estimates for transfer-matrix campaigns are high or low here. Needs
 * no database: it only runs the pure kernel.
 */
const TARGET_SECONDS = 1;
/** A short first run warms the JIT and measures the speed the timed run is sized from. */
const PROBE_SECONDS = 0.1;
const Q = DEFAULT_REORTHOGONALIZE_EVERY;
const CASES = [
  ...[8, 16, 32, 64].map((width) => ({ dimension: 2 as const, width, disorder: 6 })),
  // Near the critical disorder of the 3D orthogonal class, where campaigns spend their time.
  ...[4, 6, 8, 10, 12].map((width) => ({ dimension: 3 as const, width, disorder: 16.5 })),
];

function operationsPerSlice(dimension: 1 | 2 | 3, width: number): number {
  return transferMatrixOperationsPerSlice(dimension, width, Q);
}

/** A whole number of re-orthonormalization periods, rounded to two significant digits so the counts read well. */
function sliceCount(slices: number): number {
  const magnitude = 10 ** Math.max(0, Math.floor(Math.log10(slices)) - 1);
  return Math.max(20 * Q, Math.ceil(Math.round(slices / magnitude) * magnitude / Q) * Q);
}

const GFLOPS = (DEFAULT_FLOPS_PER_CORE / 1e9).toFixed(1);

function microseconds(x: number): string {
  return x < 100 ? x.toPrecision(3) : Math.round(x).toLocaleString('en');
}

interface Row {
  dimension: 2 | 3;
  width: number;
  channels: number;
  slices: number;
  seconds: number;
  operationsPerSlice: number;
}

const rows: Row[] = [];
for (const { dimension, width, disorder } of CASES) {
  const perSlice = operationsPerSlice(dimension, width);
  const probe = runTransferMatrix({ dimension, width, disorder, slices: sliceCount((PROBE_SECONDS * DEFAULT_FLOPS_PER_CORE) / perSlice), seed: 1 });
  const slices = sliceCount(TARGET_SECONDS / (probe.seconds / probe.slices));
  const run = runTransferMatrix({ dimension, width, disorder, slices, seed: 2 });
  rows.push({ dimension, width, channels: width ** (dimension - 1), slices: run.slices, seconds: run.seconds, operationsPerSlice: perSlice });
}

const cpu = cpus()[0]?.model.trim() ?? 'unknown CPU';
console.log(`Localis transfer-matrix kernel benchmark: one core (${cpu}), Node ${process.version}, QR every ${Q} slices, about ${TARGET_SECONDS} s per run`);
const header = ['d', 'L', 'N_ch', 'slices', 'seconds', 'µs/slice', 'operations/slice', 'Gop/s', `vs ${GFLOPS} GFLOP/s`];
const table = rows.map((r) => {
  const perSecond = (r.operationsPerSlice * r.slices) / r.seconds;
  return [
    String(r.dimension),
    String(r.width),
    String(r.channels),
    r.slices.toLocaleString('en'),
    r.seconds.toFixed(2),
    microseconds((r.seconds / r.slices) * 1e6),
    r.operationsPerSlice.toExponential(2).replace('e+', 'e'),
    (perSecond / 1e9).toFixed(2),
    (perSecond / DEFAULT_FLOPS_PER_CORE).toFixed(2),
  ];
});
const widths = header.map((h, i) => Math.max(h.length, ...table.map((cells) => cells[i].length)));
for (const cells of [header, ...table]) console.log(cells.map((c, i) => c.padStart(widths[i])).join('  '));

const ratios = rows.map((r) => (r.operationsPerSlice * r.slices) / r.seconds / DEFAULT_FLOPS_PER_CORE);
const [low, high] = [Math.min(...ratios), Math.max(...ratios)];
const verdict = high < 1 ? 'too high' : low > 1 ? 'too low' : 'too high or too low, depending on the size';
console.log(
  `\nThe cost model assumes ${GFLOPS} GFLOP/s sustained per core without pilot timings; this kernel reaches ` +
    `${low.toFixed(2)} to ${high.toFixed(2)} times that on this machine, so that default rate is ${verdict} for it here.`,
);

// The finite-size-scaling analysis as the worker runs it: 5 sizes x 40 disorder values, the model
// scan, then a 200-sample parametric bootstrap of the chosen model (median of three runs).
const fitTable = syntheticScalingTable({
  criticalX: 16.5, nu: 1.57, criticalValue: 0.576, relativeError: 0.01, seed: 3,
  sizes: [6, 8, 10, 12, 16], xs: Array.from({ length: 40 }, (_, i) => 15 + (3 * i) / 39),
});
const fitTimes: number[] = [];
let fitted: ReturnType<typeof analyzeTable> | null = null;
for (let run = 0; run < 3; run++) {
  const t0 = performance.now();
  fitted = analyzeTable(fitTable, { bootstrap: 200, seed: run + 1 });
  fitTimes.push((performance.now() - t0) / 1000);
}
const fitSeconds = fitTimes.sort((a, b) => a - b)[1];
const m = fitted!.model as unknown as { nr?: number; ni?: number };
console.log(
  `\nScaling analysis of 5 sizes x 40 W (${fitTable.length} points), model scan + 200-sample bootstrap: ${fitSeconds.toFixed(3)} s (median of 3); ` +
    `chosen orders nr=${m.nr ?? '?'}, ni=${m.ni ?? '?'}; W_c = ${fitted!.Wc.value.toFixed(3)} [${fitted!.Wc.lo.toFixed(3)}, ${fitted!.Wc.hi.toFixed(3)}] for a true 16.5, ` +
    `nu = ${fitted!.nu.value.toFixed(3)} [${fitted!.nu.lo.toFixed(3)}, ${fitted!.nu.hi.toFixed(3)}] for a true 1.57`,
);
