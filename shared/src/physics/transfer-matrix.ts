import { transferMatrixOperationsPerSlice } from '../campaigns/cost-model';
import { SeededRandom } from './random';

/**
 * The transfer-matrix method for the Anderson model on a quasi-1D bar (Kramer & MacKinnon,
 * Rep. Prog. Phys. 56, 1469 (1993)): hopping t = 1, on-site energies uniform in [-W/2, W/2],
 * cross-section L^(d-1) with periodic transverse boundaries. The Schrödinger equation slice by
 * slice, psi_{n+1} = (E - H_n) psi_n - psi_{n-1}, is iterated on N_ch = L^(d-1) vectors of length
 * 2 N_ch; every q slices they are re-orthonormalized (modified Gram–Schmidt, i.e. a thin QR) and
 * the logarithms of R's diagonal accumulate the Lyapunov exponents. The smallest positive one,
 * gamma_min, gives xi = 1 / gamma_min and Lambda = xi / L.
 */
export interface TransferMatrixInput {
  dimension: 1 | 2 | 3;
  /** Linear size L of the cross-section. */
  width: number;
  /** Box-disorder width W. */
  disorder: number;
  energy?: number;
  /** Stop once the relative standard error of gamma_min is at most this. */
  precision?: number;
  /** Stop after this many slices (with `precision`: whichever comes first). */
  slices?: number;
  seed?: number;
  /** Slices between two re-orthonormalizations. */
  reorthogonalizeEvery?: number;
  /** Told every `progressEvery` re-orthonormalizations how far the run is. */
  onProgress?: (progress: TransferMatrixProgress) => void;
  progressEvery?: number;
  /** Asked at every re-orthonormalization; true stops the run, which then throws `TransferMatrixCancelled`. */
  isCancelled?: () => boolean;
  /** Runs expected to take longer than LONG_RUN_SECONDS are refused unless this is set. */
  allowLong?: boolean;
}

export interface TransferMatrixProgress {
  slices: number;
  gammaMin: number;
  relativeError: number;
  /** 0..1 against whichever limit (precision or slices) ends the run first, as far as can be told. */
  fraction: number;
}

export interface TransferMatrixResult {
  dim: 1 | 2 | 3;
  width: number;
  disorder: number;
  energy: number;
  slices: number;
  gammaMin: number;
  gammaErr: number;
  xi: number;
  xiErr: number;
  lambda: number;
  lambdaErr: number;
  seconds: number;
}

/**
 * Well below what one core sustains on this kernel (`npm run bench:physics`), so a run refused as
 * too long would really have been long.
 */
export const CONSERVATIVE_OPERATIONS_PER_SECOND = 5e8;
/** Longer than this needs `allowLong`: beyond a login node's patience and its usage rules. */
export const LONG_RUN_SECONDS = 3600;

/** How long a run is expected to take: slices (Lambda L / eps^2 with Lambda = 1, or the count given) × operations. */
export function expectedTransferMatrixRun(input: Pick<TransferMatrixInput, 'dimension' | 'width' | 'precision' | 'slices' | 'reorthogonalizeEvery'>) {
  const fromPrecision = input.precision === undefined ? Number.POSITIVE_INFINITY : Math.ceil(input.width / input.precision ** 2);
  const slices = Math.min(input.slices ?? Number.POSITIVE_INFINITY, fromPrecision);
  const operationsPerSlice = transferMatrixOperationsPerSlice(input.dimension, input.width, input.reorthogonalizeEvery ?? DEFAULT_REORTHOGONALIZE_EVERY);
  return { slices, operationsPerSlice, seconds: (slices * operationsPerSlice) / CONSERVATIVE_OPERATIONS_PER_SECOND };
}

export class TransferMatrixTooLong extends RangeError {
  constructor(readonly expectedSeconds: number) {
    super(`this run would take about ${Math.round(expectedSeconds / 3600)} h on one core; pass allowLong to run it anyway`);
  }
}

export class TransferMatrixCancelled extends Error {
  constructor(readonly slices: number) {
    super(`the transfer-matrix run was cancelled after ${slices} slices`);
  }
}

/**
 * Errors come from batch means: the log growths of consecutive re-orthonormalizations are
 * correlated (in 1D the phase of psi rotates and its log norm oscillates, cancelling over many
 * slices), so their naive variance overstates the error several times. Means over blocks of
 * BLOCK samples are close to independent; MIN_BLOCKS of them are needed before a precision is met.
 */
const BLOCK = 100;
const MIN_BLOCKS = 20;
export const DEFAULT_REORTHOGONALIZE_EVERY = 5;

/** Transverse neighbours of every site of the cross-section (periodic), as a flat list of 2(d-1) per site. */
function neighbourTable(dimension: 1 | 2 | 3, width: number): Int32Array {
  const n = width ** (dimension - 1);
  const per = 2 * (dimension - 1);
  const table = new Int32Array(n * per);
  for (let i = 0; i < n; i++) {
    if (dimension === 2) {
      table[i * per] = (i + 1) % width;
      table[i * per + 1] = (i - 1 + width) % width;
    } else if (dimension === 3) {
      const x = i % width;
      const y = Math.floor(i / width);
      table[i * per] = ((x + 1) % width) + y * width;
      table[i * per + 1] = ((x - 1 + width) % width) + y * width;
      table[i * per + 2] = x + ((y + 1) % width) * width;
      table[i * per + 3] = x + ((y - 1 + width) % width) * width;
    }
  }
  return table;
}

export function runTransferMatrix(input: TransferMatrixInput): TransferMatrixResult {
  const { dimension: d, width: L, disorder: W } = input;
  const E = input.energy ?? 0;
  if (!Number.isInteger(L) || L < 1) throw new RangeError('width must be a positive integer');
  if (!(W >= 0)) throw new RangeError('disorder must be 0 or more');
  if (input.precision === undefined && input.slices === undefined) throw new RangeError('give a precision, a slice count, or both');
  const q = input.reorthogonalizeEvery ?? DEFAULT_REORTHOGONALIZE_EVERY;
  const expected = expectedTransferMatrixRun(input);
  if (expected.seconds > LONG_RUN_SECONDS && !input.allowLong) throw new TransferMatrixTooLong(expected.seconds);
  const maxSlices = input.slices ?? Number.POSITIVE_INFINITY;
  const started = performance.now();

  const n = L ** (d - 1);
  const per = 2 * (d - 1);
  const nb = neighbourTable(d, L);
  const rng = new SeededRandom(input.seed ?? 1);
  // Column-major: vector j occupies [j*2n, (j+1)*2n), its psi_n in the first half, psi_{n-1} in the second.
  const vectors = new Float64Array(n * 2 * n);
  for (let j = 0; j < n; j++) vectors[j * 2 * n + j] = 1;
  const onsite = new Float64Array(n);
  const next = new Float64Array(n);

  // Per re-orthonormalization: the log of the last diagonal element of R (gamma_min's share).
  let sum = 0;
  let samples = 0;
  let blockSum = 0;
  let blockFill = 0;
  let blocks = 0;
  let blockMeanSum = 0;
  let blockMeanSq = 0;
  let slices = 0;
  const progressEvery = input.progressEvery ?? 200;

  const estimate = () => {
    const gamma = sum / samples / q;
    const mean = blockMeanSum / blocks;
    const variance = blocks > 1 ? Math.max(0, (blockMeanSq - blocks * mean * mean) / (blocks - 1)) : Number.POSITIVE_INFINITY;
    const gammaErr = Math.sqrt(variance / blocks) / q;
    return { gamma, gammaErr, relative: gamma > 0 ? gammaErr / gamma : Number.POSITIVE_INFINITY };
  };

  for (;;) {
    // q slices of the transfer matrix.
    for (let s = 0; s < q; s++) {
      for (let i = 0; i < n; i++) onsite[i] = E - W * (rng.next() - 0.5);
      for (let j = 0; j < n; j++) {
        const base = j * 2 * n;
        for (let i = 0; i < n; i++) {
          let h = onsite[i] * vectors[base + i] - vectors[base + n + i];
          for (let k = 0; k < per; k++) h -= vectors[base + nb[i * per + k]];
          next[i] = h;
        }
        for (let i = 0; i < n; i++) {
          vectors[base + n + i] = vectors[base + i];
          vectors[base + i] = next[i];
        }
      }
    }
    slices += q;

    // Modified Gram–Schmidt: the growth of each vector beyond the ones before it.
    let lastLog = 0;
    const m = 2 * n;
    for (let j = 0; j < n; j++) {
      const bj = j * m;
      for (let k = 0; k < j; k++) {
        const bk = k * m;
        let dot = 0;
        for (let i = 0; i < m; i++) dot += vectors[bk + i] * vectors[bj + i];
        for (let i = 0; i < m; i++) vectors[bj + i] -= dot * vectors[bk + i];
      }
      let norm = 0;
      for (let i = 0; i < m; i++) norm += vectors[bj + i] * vectors[bj + i];
      norm = Math.sqrt(norm);
      if (!(norm > 0) || !Number.isFinite(norm)) throw new Error('the transfer-matrix vectors degenerated; re-orthonormalize more often');
      const inv = 1 / norm;
      for (let i = 0; i < m; i++) vectors[bj + i] *= inv;
      if (j === n - 1) lastLog = Math.log(norm);
    }
    sum += lastLog;
    samples++;
    blockSum += lastLog;
    if (++blockFill === BLOCK) {
      const m = blockSum / BLOCK;
      blockMeanSum += m;
      blockMeanSq += m * m;
      blocks++;
      blockSum = 0;
      blockFill = 0;
    }

    const { relative, gamma } = blocks >= 2 ? estimate() : { relative: Number.POSITIVE_INFINITY, gamma: sum / samples / q };
    const reachedPrecision = input.precision !== undefined && blocks >= MIN_BLOCKS && relative <= input.precision;
    if (reachedPrecision || slices >= maxSlices) break;
    if (input.isCancelled?.()) throw new TransferMatrixCancelled(slices);
    if (input.onProgress && samples % progressEvery === 0) {
      const bySlices = Number.isFinite(maxSlices) ? slices / maxSlices : 0;
      // The error falls as 1/sqrt(slices): the slices still needed follow from where it stands.
      const byPrecision = input.precision !== undefined && Number.isFinite(relative) ? Math.min(1, (input.precision / relative) ** 2) : 0;
      input.onProgress({ slices, gammaMin: gamma, relativeError: relative, fraction: Math.max(bySlices, byPrecision) });
    }
  }

  const { gamma, gammaErr } = estimate();
  const xi = 1 / gamma;
  const xiErr = gammaErr / (gamma * gamma);
  return {
    dim: d,
    width: L,
    disorder: W,
    energy: E,
    slices,
    gammaMin: gamma,
    gammaErr,
    xi,
    xiErr,
    lambda: xi / L,
    lambdaErr: xiErr / L,
    seconds: (performance.now() - started) / 1000,
  };
}
