import { disorderCount, SYMMETRY_CLASS_SIGNATURE, type CampaignSpec, type Method, type SymmetryClass } from './campaign-spec.schema';
import { fitPilotTimings, type PilotFit } from './pilot-fit';

/**
 * The core-hour and memory model of a campaign, from the published algorithmic scalings
 * (../shared/REFERENCES.md, "Cost of the numerical methods"). Pure: the form runs it live, the
 * server again on save, the CLI offline. Every count is for one job: one realization at one
 * (W, E) point of one size L; a campaign runs points × energies × realizations jobs per size.
 *
 * Conventions: N = L^d sites, N_ch = L^(d-1) channels of a quasi-1D bar; "operations" are
 * floating-point operations in real arithmetic (a complex multiply-add costs four real ones).
 */

/** Sustained floating-point rate of one core when no pilot timings are given (common practice:
 * sparse and dense kernels sustain a few percent to a few tens of percent of a core's peak). */
export const DEFAULT_FLOPS_PER_CORE = 1e9;
export const GIB = 1024 ** 3;

/** Defaults for method options the proposer left out, stated in the estimate's assumptions. */
export const METHOD_OPTION_DEFAULTS = { moments: 1024, randomVectors: 8, eigenpairs: 50, expectedLambda: 1, reorthogonalizeEvery: 8 } as const;

export interface EstimateRow {
  size: number;
  /** Disorder values on the grid. */
  points: number;
  energies: number;
  realizations: number;
  /** points × energies × realizations. */
  jobs: number;
  sites: number;
  /** Transfer-matrix slices per job (the bar's length); null for other methods. */
  slices: number | null;
  /** Floating-point operations of one job. */
  operations: number;
  coreSecondsPerJob: number;
  /** Core-hours of all jobs of this size. */
  coreHours: number;
  /** This size's part of the campaign's total, 0..1. */
  share: number;
  peakMemoryBytes: number;
  fitsNode: boolean;
}

export interface CampaignEstimate {
  method: Method;
  totalCoreHours: number;
  rows: EstimateRow[];
  /** The largest job's memory, and the node's. */
  peakMemoryBytes: number;
  nodeMemoryBytes: number;
  fitsNode: boolean;
  /** Whether arithmetic is real or complex (by symmetry class) and its bytes per matrix entry. */
  arithmetic: { kind: 'real' | 'complex'; bytesPerEntry: 8 | 16 };
  /** The method's cost exponent: operations grow as L^exponent for large L. */
  sizeExponent: number;
  rate: { source: 'default'; flopsPerCore: number } | { source: 'pilot'; fit: PilotFit };
  /** Each assumption the numbers rest on, in words, for the proposer and the committee. */
  assumptions: string[];
}

/** Real arithmetic where time reversal squares to +1 (a real basis exists), complex otherwise. */
export function arithmeticOf(symmetryClass: SymmetryClass): CampaignEstimate['arithmetic'] {
  return SYMMETRY_CLASS_SIGNATURE[symmetryClass].t === 1 ? { kind: 'real', bytesPerEntry: 8 } : { kind: 'complex', bytesPerEntry: 16 };
}

interface JobCost {
  operations: number;
  memoryBytes: number;
  slices: number | null;
}

/**
 * Real operations of one transfer-matrix slice on an L^(d-1) cross-section: the sparse slice
 * (2d-1 entries per row) times the 2N_ch x N_ch block, 2 flops each, plus a Householder QR of that
 * block (2mn^2 - 2n^3/3 = 10/3 N_ch^3) every q slices. The kernel's own run-time guard uses it too.
 */
export function transferMatrixOperationsPerSlice(dimension: 1 | 2 | 3, size: number, reorthogonalizeEvery: number): number {
  const nch = size ** (dimension - 1);
  return 2 * (2 * dimension - 1) * nch ** 2 + ((10 / 3) * nch ** 3) / reorthogonalizeEvery;
}

/** Operations and memory of one job of size L: the heart of the model, one formula per method. */
export function jobCost(spec: Pick<CampaignSpec, 'method' | 'dimension' | 'symmetryClass' | 'targetPrecision' | 'methodOptions'>, size: number): JobCost {
  const d = spec.dimension;
  const { bytesPerEntry, kind } = arithmeticOf(spec.symmetryClass);
  const cf = kind === 'complex' ? 4 : 1;
  const o = { ...METHOD_OPTION_DEFAULTS, ...stripUndefined(spec.methodOptions ?? {}) };
  const n = size ** d;
  const nch = size ** (d - 1);
  switch (spec.method) {
    case 'transfer-matrix': {
      // Slices for relative precision eps of gamma_min: M = Lambda L / eps^2 (Kramer & MacKinnon 1993).
      const eps = spec.targetPrecision ?? 0.01;
      // The relative nudge keeps a whole count whole: 0.6 × 43 / 0.002² is 6450000.000000001 in floating point.
      const slices = Math.ceil(((o.expectedLambda * size) / eps ** 2) * (1 - 1e-12));
      const perSlice = transferMatrixOperationsPerSlice(d, size, o.reorthogonalizeEvery);
      // The block and a QR workspace of the same shape, plus one slice of on-site energies.
      const memoryBytes = (2 * 2 * nch * nch + nch) * bytesPerEntry;
      return { operations: slices * perSlice * cf, memoryBytes, slices };
    }
    case 'exact-diagonalization': {
      // All eigenvalues of a dense N x N matrix: Householder tridiagonalization, 4/3 N^3 flops, dominates.
      return { operations: (4 / 3) * n ** 3 * cf, memoryBytes: n * n * bytesPerEntry, slices: null };
    }
    case 'kernel-polynomial': {
      // One sparse mat-vec (2 flops per nonzero; 2d neighbours plus the diagonal) per moment and vector
      // (Weisse, Wellein, Alvermann & Fehske, RMP 78, 275 (2006)).
      const nnz = n * (2 * d + 1);
      const operations = o.moments * o.randomVectors * 2 * nnz * cf;
      // Three recursion vectors and the matrix in CSR (value plus a 4-byte column index per nonzero).
      const memoryBytes = 3 * n * bytesPerEntry + nnz * (bytesPerEntry + 4);
      return { operations, memoryBytes, slices: null };
    }
    case 'shift-invert': {
      // Sparse LU with nested dissection: 3D about N^2 flops and N^(4/3) fill (memory; Schenk,
      // Bollhoefer & Roemer, SIAM Rev. 50, 91 (2008)); 2D N^(3/2) flops and N log2 N fill; 1D banded.
      const factorFlops = d === 3 ? n ** 2 : d === 2 ? n ** 1.5 : n;
      const fill = d === 3 ? n ** (4 / 3) : d === 2 ? n * Math.max(1, Math.log2(n)) : n;
      // About 2k Lanczos steps for k eigenpairs, each a forward and a backward solve (4 flops per fill entry).
      const solveFlops = 2 * o.eigenpairs * 4 * fill;
      const memoryBytes = (fill + 2 * o.eigenpairs * n) * bytesPerEntry;
      return { operations: (factorFlops + solveFlops) * cf, memoryBytes, slices: null };
    }
    case 'recursive-green': {
      // L slices, each an N_ch x N_ch inversion (2 N_ch^3) and two products (2 N_ch^3 each).
      return { operations: size * 6 * nch ** 3 * cf, memoryBytes: 4 * nch * nch * bytesPerEntry, slices: null };
    }
  }
}

/** Operations grow as L^exponent for large L; the pilot fit is compared with this. */
export function sizeExponent(method: Method, dimension: 1 | 2 | 3): number {
  const d = dimension;
  switch (method) {
    case 'transfer-matrix':
    case 'recursive-green':
      return 1 + 3 * (d - 1);
    case 'exact-diagonalization':
      return 3 * d;
    case 'kernel-polynomial':
      return d;
    case 'shift-invert':
      return d === 3 ? 6 : d === 2 ? 3 : 1;
  }
}

/**
 * How much more one job of this plan costs than a pilot job of the same size: the ratio of
 * operations between the plan's settings and those the pilots ran with (1 when they are the same).
 */
export function pilotScale(spec: CampaignSpec, size: number): number {
  const ps = spec.pilotSettings;
  if (!ps) return 1;
  const pilot = jobCost({ ...spec, targetPrecision: ps.targetPrecision ?? spec.targetPrecision, methodOptions: ps.methodOptions ?? spec.methodOptions }, size).operations;
  return pilot > 0 ? jobCost(spec, size).operations / pilot : 1;
}

function stripUndefined<T extends object>(o: T): Partial<T> {
  return Object.fromEntries(Object.entries(o).filter(([, v]) => v !== undefined)) as Partial<T>;
}

/** The whole estimate of a valid spec: per size, the total, shares, memory against the node. */
export function estimateCampaign(spec: CampaignSpec): CampaignEstimate {
  const points = disorderCount(spec.disorder);
  const energies = spec.energies.length;
  const jobs = points * energies * spec.realizations;
  const nodeMemoryBytes = spec.node.memoryGiBPerNode * GIB;
  const fit = spec.pilotTimings && spec.pilotTimings.length > 0 ? fitPilotTimings(spec.pilotTimings) : null;
  const sizes = [...spec.sizes].sort((a, b) => a - b);

  const rows: EstimateRow[] = sizes.map((size) => {
    const cost = jobCost(spec, size);
    const coreSecondsPerJob = fit ? fit.prefactor * size ** fit.exponent * pilotScale(spec, size) : cost.operations / DEFAULT_FLOPS_PER_CORE;
    return {
      size,
      points,
      energies,
      realizations: spec.realizations,
      jobs,
      sites: size ** spec.dimension,
      slices: cost.slices,
      operations: cost.operations,
      coreSecondsPerJob,
      coreHours: (coreSecondsPerJob * jobs) / 3600,
      share: 0,
      peakMemoryBytes: cost.memoryBytes,
      fitsNode: cost.memoryBytes <= nodeMemoryBytes,
    };
  });
  const totalCoreHours = rows.reduce((sum, r) => sum + r.coreHours, 0);
  for (const r of rows) r.share = totalCoreHours > 0 ? r.coreHours / totalCoreHours : 0;
  const peakMemoryBytes = Math.max(...rows.map((r) => r.peakMemoryBytes));
  const arithmetic = arithmeticOf(spec.symmetryClass);

  return {
    method: spec.method,
    totalCoreHours,
    rows,
    peakMemoryBytes,
    nodeMemoryBytes,
    fitsNode: peakMemoryBytes <= nodeMemoryBytes,
    arithmetic,
    sizeExponent: sizeExponent(spec.method, spec.dimension),
    rate: fit ? { source: 'pilot', fit } : { source: 'default', flopsPerCore: DEFAULT_FLOPS_PER_CORE },
    assumptions: assumptionsOf(spec, arithmetic, fit),
  };
}

function assumptionsOf(spec: CampaignSpec, arithmetic: CampaignEstimate['arithmetic'], fit: PilotFit | null): string[] {
  const o = { ...METHOD_OPTION_DEFAULTS, ...stripUndefined(spec.methodOptions ?? {}) };
  const given = spec.methodOptions ?? {};
  const said = (key: keyof typeof METHOD_OPTION_DEFAULTS, text: string) => `${text}${given[key] === undefined ? ' (default)' : ''}`;
  const out: string[] = [];
  out.push(
    fit
      ? `Speed from ${fit.points} pilot timings: core-seconds per pilot job = ${fit.prefactor.toPrecision(3)} × L^${fit.exponent.toFixed(2)} (R² = ${fit.rSquared.toFixed(3)}).`
      : `No pilot timings: a default sustained rate of ${(DEFAULT_FLOPS_PER_CORE / 1e9).toFixed(1)} GFLOP/s per core is assumed. Upload pilot timings for this machine to replace it.`,
  );
  if (fit) {
    const scale = pilotScale(spec, Math.max(...spec.sizes));
    out.push(
      !spec.pilotSettings
        ? "Each pilot is taken to be one job with this campaign's own settings."
        : Math.abs(scale - 1) < 1e-9
          ? "The pilots ran with this campaign's settings."
          : `The pilots ran with other settings${spec.pilotSettings.targetPrecision !== undefined ? ` (eps = ${spec.pilotSettings.targetPrecision})` : ''}: each job is scaled by the ratio of operations, ${scale.toPrecision(3)}× at the largest size.`,
    );
  }
  out.push(`Symmetry class ${spec.symmetryClass}: ${arithmetic.kind} arithmetic, ${arithmetic.bytesPerEntry} bytes per matrix entry.`);
  switch (spec.method) {
    case 'transfer-matrix':
      out.push(said('expectedLambda', `Slices per job = Lambda × L / eps² with Lambda = ${o.expectedLambda}`) + `, eps = ${spec.targetPrecision}.`);
      out.push(said('reorthogonalizeEvery', `QR re-orthonormalization every ${o.reorthogonalizeEvery} slices`) + '.');
      break;
    case 'kernel-polynomial':
      out.push(said('moments', `${o.moments} Chebyshev moments`) + ', ' + said('randomVectors', `${o.randomVectors} random vectors`) + '.');
      break;
    case 'shift-invert':
      out.push(said('eigenpairs', `${o.eigenpairs} eigenpairs per job`) + '; nested-dissection ordering for the factorization.');
      break;
    case 'exact-diagonalization':
      out.push('All eigenvalues of the dense matrix; eigenvectors would cost several times more.');
      break;
    case 'recursive-green':
      out.push('Conductance of an L^(d-1) × L bar, one slice at a time.');
      break;
  }
  out.push('Memory counts the method\'s own arrays per job, not the program and its libraries.');
  return out;
}
