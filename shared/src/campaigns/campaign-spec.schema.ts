import { z } from 'zod';
import type { ErrorDetail } from '../errors/app-error';
import { estimateCampaign } from './cost-model';

/**
 * The scientific specification of a campaign: what is simulated, on which grid, by which
 * method, on what kind of node. The form, the api, the CLI and the cost model all read it.
 */

/** zod's own words for a missing or wrongly typed field are technical; these say what to give. */
const expected = (what: string) => ({
  error: (issue: { code?: string; input?: unknown }) =>
    issue.code !== 'invalid_type' ? undefined : issue.input === undefined ? `${what} is required` : `${what} has the wrong type`,
});

/** Model families. Extend the list (and the cost model's bytes per entry) for new ones. */
export const MODELS = ['anderson-box', 'anderson-gaussian', 'anderson-binary'] as const;
export const Model = z.enum(MODELS, { message: `model must be one of: ${MODELS.join(', ')}` });
export type Model = z.infer<typeof Model>;
export const MODEL_LABELS: Record<Model, string> = {
  'anderson-box': 'Anderson, box disorder',
  'anderson-gaussian': 'Anderson, Gaussian disorder',
  'anderson-binary': 'Anderson, binary disorder',
};

/** The ten Altland–Zirnbauer classes (Altland & Zirnbauer, PRB 55, 1142 (1997)). */
export const SYMMETRY_CLASSES = ['A', 'AI', 'AII', 'AIII', 'BDI', 'CII', 'D', 'C', 'DIII', 'CI'] as const;
export const SymmetryClass = z.enum(SYMMETRY_CLASSES, { message: `symmetry class must be one of the ten Altland–Zirnbauer classes: ${SYMMETRY_CLASSES.join(', ')}` });
export type SymmetryClass = z.infer<typeof SymmetryClass>;
/** (T^2, C^2, S) of each class, as in REFERENCES: 0 means the symmetry is absent. */
export const SYMMETRY_CLASS_SIGNATURE: Record<SymmetryClass, { t: -1 | 0 | 1; c: -1 | 0 | 1; s: 0 | 1; name: string }> = {
  A: { t: 0, c: 0, s: 0, name: 'unitary' },
  AI: { t: 1, c: 0, s: 0, name: 'orthogonal' },
  AII: { t: -1, c: 0, s: 0, name: 'symplectic' },
  AIII: { t: 0, c: 0, s: 1, name: 'chiral unitary' },
  BDI: { t: 1, c: 1, s: 1, name: 'chiral orthogonal' },
  CII: { t: -1, c: -1, s: 1, name: 'chiral symplectic' },
  D: { t: 0, c: 1, s: 0, name: 'class D (superconducting)' },
  C: { t: 0, c: -1, s: 0, name: 'class C (superconducting)' },
  DIII: { t: -1, c: 1, s: 1, name: 'class DIII (superconducting)' },
  CI: { t: 1, c: -1, s: 1, name: 'class CI (superconducting)' },
};

export const METHODS = ['transfer-matrix', 'exact-diagonalization', 'shift-invert', 'kernel-polynomial', 'recursive-green'] as const;
export const Method = z.enum(METHODS, { message: `method must be one of: ${METHODS.join(', ')}` });
export type Method = z.infer<typeof Method>;
export const METHOD_LABELS: Record<Method, string> = {
  'transfer-matrix': 'Transfer matrix',
  'exact-diagonalization': 'Exact diagonalization',
  'shift-invert': 'Shift-invert sparse eigensolver',
  'kernel-polynomial': 'Kernel polynomial method',
  'recursive-green': "Recursive Green's function",
};

/** What the campaign sets out to show; the notices judge the plan against it. */
export const GOALS = ['critical-point', 'localization-length', 'spectral-statistics', 'transport'] as const;
export const Goal = z.enum(GOALS, { message: `goal must be one of: ${GOALS.join(', ')}` });
export type Goal = z.infer<typeof Goal>;
export const GOAL_LABELS: Record<Goal, string> = {
  'critical-point': 'Locate a critical point (finite-size scaling)',
  'localization-length': 'Localization lengths',
  'spectral-statistics': 'Level statistics',
  transport: 'Conductance and transport',
};

/** A disorder or energy grid may not have more points than this. */
export const MAX_GRID_POINTS = 100_000;
export const MAX_SIZES = 64;

/** Points of `from, from+step, …, to` (the end included when it lies on the grid, to rounding). */
export function rangeCount(from: number, to: number, step: number): number {
  return Math.floor((to - from) / step + 1e-9) + 1;
}

/**
 * The disorder strengths W: either a range or explicit values. One flat object rather than a
 * union so each wrong field gets its own message and path (a union reports only "invalid input").
 */
export const DisorderGrid = z
  .object({
    from: z.number({ message: 'from must be a number' }).finite().min(0, 'from must be 0 or more').optional(),
    to: z.number({ message: 'to must be a number' }).finite().min(0, 'to must be 0 or more').optional(),
    step: z.number({ message: 'step must be a number' }).finite().optional(),
    values: z.array(z.number({ message: 'each disorder value must be a number' }).finite().min(0, 'disorder values must be 0 or more')).optional(),
  }, expected('disorder (from, to and step, or values)'))
  .strict()
  .superRefine((g, ctx) => {
    if (g.values !== undefined) {
      if (g.from !== undefined || g.to !== undefined || g.step !== undefined) {
        ctx.addIssue({ code: 'custom', path: ['values'], message: 'give either values or from, to and step, not both' });
      }
      if (g.values.length === 0) ctx.addIssue({ code: 'custom', path: ['values'], message: 'list at least one disorder value' });
      if (g.values.length > MAX_GRID_POINTS) ctx.addIssue({ code: 'custom', path: ['values'], message: `at most ${MAX_GRID_POINTS.toLocaleString('en')} disorder values` });
      return;
    }
    for (const key of ['from', 'to', 'step'] as const) {
      if (g[key] === undefined) ctx.addIssue({ code: 'custom', path: [key], message: `${key} is required (or give a list of values)` });
    }
    if (g.from === undefined || g.to === undefined || g.step === undefined) return;
    if (!(g.step > 0)) {
      ctx.addIssue({ code: 'custom', path: ['step'], message: 'step must be greater than 0' });
      return;
    }
    if (g.to < g.from) {
      ctx.addIssue({ code: 'custom', path: ['to'], message: `to (${g.to}) must not be below from (${g.from}); the grid runs upwards` });
      return;
    }
    const count = rangeCount(g.from, g.to, g.step);
    if (count > MAX_GRID_POINTS) {
      ctx.addIssue({ code: 'custom', path: ['step'], message: `this grid has ${count.toLocaleString('en')} points; at most ${MAX_GRID_POINTS.toLocaleString('en')} are allowed, so take a larger step` });
    }
  })
  .meta({ id: 'DisorderGrid' });
export type DisorderGrid = z.infer<typeof DisorderGrid>;

/** The disorder values a valid grid stands for, in order. */
export function disorderValues(grid: DisorderGrid): number[] {
  if (grid.values) return [...grid.values];
  const { from = 0, to = 0, step = 1 } = grid;
  const n = Math.max(0, Math.min(rangeCount(from, to, step), MAX_GRID_POINTS));
  // Rounded to 12 significant digits so 15 + 3 × 0.1 prints as 15.3, not 15.299999999999999.
  return Array.from({ length: n }, (_, i) => Number((from + i * step).toPrecision(12)));
}

/** Smallest and largest W of a valid grid, without listing the grid (it may hold 100 000 points). */
export function disorderSpan(grid: DisorderGrid): { min: number; max: number } {
  if (grid.values) {
    let min = Infinity;
    let max = -Infinity;
    for (const w of grid.values) {
      if (w < min) min = w;
      if (w > max) max = w;
    }
    return { min, max };
  }
  const { from = 0, to = 0, step = 1 } = grid;
  return { min: from, max: Number((from + (Math.min(rangeCount(from, to, step), MAX_GRID_POINTS) - 1) * step).toPrecision(12)) };
}

export function disorderCount(grid: DisorderGrid): number {
  return grid.values ? grid.values.length : rangeCount(grid.from ?? 0, grid.to ?? 0, grid.step ?? 1);
}

export const MethodOptions = z
  .object({
    moments: z.number().int('moments must be a whole number').min(16, 'use at least 16 moments').max(1_000_000).optional(),
    randomVectors: z.number().int('random vectors must be a whole number').min(1, 'use at least 1 random vector').max(100_000).optional(),
    eigenpairs: z.number().int('eigenpairs must be a whole number').min(1, 'ask for at least 1 eigenpair').max(100_000).optional(),
    expectedLambda: z.number().finite().positive('the expected Lambda must be greater than 0').max(1000).optional(),
    reorthogonalizeEvery: z.number().int().min(1, 're-orthonormalize at least every slice').max(100).optional(),
  })
  .strict()
  .meta({ id: 'MethodOptions' });
export type MethodOptions = z.infer<typeof MethodOptions>;

export const NodeShape = z
  .object({
    coresPerNode: z.number().int('cores per node must be a whole number').min(1, 'a node has at least 1 core').max(4096),
    memoryGiBPerNode: z.number().finite().positive('memory per node must be greater than 0').max(65_536),
  }, expected('node (cores and memory per node)'))
  .strict()
  .meta({ id: 'NodeShape' });
export type NodeShape = z.infer<typeof NodeShape>;

/** One measured pilot job: size L, wall-clock seconds, cores it used. */
export const PilotTiming = z
  .object({
    size: z.number(expected('size (the linear size L of the pilot)')).int('size must be a whole number').min(1, 'size must be at least 1'),
    seconds: z.number(expected('seconds (wall-clock time of the pilot)')).finite().positive('seconds must be greater than 0'),
    cores: z.number(expected('cores (how many the pilot used)')).int('cores must be a whole number').min(1, 'cores must be at least 1'),
  })
  .strict()
  .meta({ id: 'PilotTiming' });
export type PilotTiming = z.infer<typeof PilotTiming>;

/** What a set of pilot timings needs before a power law can be fitted through it. */
export function pilotSetProblems(timings: readonly PilotTiming[]): ErrorDetail[] {
  if (timings.length === 0) return [{ path: ['pilotTimings'], message: 'the pilot CSV has no timings below its header' }];
  if (new Set(timings.map((t) => t.size)).size < 2) {
    return [{ path: ['pilotTimings'], message: 'pilot timings need at least two different sizes to fit a power law' }];
  }
  return [];
}

/**
 * The settings the pilot jobs ran with. When the plan's own settings differ (a finer precision, more
 * moments), the cost model scales each pilot-calibrated job by the ratio of operations.
 */
export const PilotSettings = z
  .object({
    method: Method,
    symmetryClass: SymmetryClass,
    targetPrecision: z.number().gt(0).lt(1).optional(),
    methodOptions: MethodOptions.optional(),
  })
  .strict()
  .meta({ id: 'PilotSettings' });
export type PilotSettings = z.infer<typeof PilotSettings>;

/** The finest relative precision a transfer-matrix plan may ask for (bars of ~10^10 L slices). */
export const MIN_TARGET_PRECISION = 1e-5;
/** No plan may need more core-hours than a round can hold (the largest pool Localis accepts). */
export const MAX_CAMPAIGN_CORE_HOURS = 1e12;

export const CampaignSpec = z
  .object({
    model: Model,
    dimension: z.union([z.literal(1), z.literal(2), z.literal(3)], { message: 'dimension must be 1, 2 or 3' }),
    symmetryClass: SymmetryClass,
    goal: Goal.default('critical-point'),
    sizes: z
      .array(z.number({ message: 'each size must be a number' }).int('sizes must be whole numbers').min(1, 'sizes must be positive integers').max(100_000, 'sizes above 100 000 are not supported'), expected('sizes (a list of linear sizes L)'))
      .min(1, 'give at least one system size L')
      .max(MAX_SIZES, `at most ${MAX_SIZES} sizes`)
      .refine((s) => new Set(s).size === s.length, 'each size may appear only once'),
    disorder: DisorderGrid,
    energies: z
      .array(z.number({ message: 'each energy must be a number' }).finite(), expected('energies (a list of numbers)'))
      .min(1, 'give at least one energy')
      .max(1000, 'at most 1000 energies'),
    realizations: z.number(expected('realizations (a whole number)')).int('realizations must be a whole number').min(1, 'at least 1 realization per point').max(10_000_000),
    method: Method,
    targetPrecision: z
      .number()
      .superRefine((eps, ctx) => {
        if (!(eps > 0 && eps < 1)) ctx.addIssue({ code: 'custom', message: 'target precision must be between 0 and 1 (exclusive)' });
        else if (eps < MIN_TARGET_PRECISION) {
          ctx.addIssue({ code: 'custom', message: `target precision must be at least ${MIN_TARGET_PRECISION} (0.001 %); finer targets need bars no machine can run` });
        }
      })
      .optional(),
    methodOptions: MethodOptions.default({}),
    node: NodeShape,
    pilotTimings: z.array(PilotTiming).max(200, 'at most 200 pilot timings').optional(),
    pilotSettings: PilotSettings.optional(),
  })
  .strict()
  .superRefine((spec, ctx) => {
    if (spec.method === 'transfer-matrix' && spec.targetPrecision === undefined) {
      ctx.addIssue({ code: 'custom', path: ['targetPrecision'], message: 'the transfer-matrix method needs a target precision, e.g. 0.01 for 1 %' });
    }
    let problems = 0;
    const problem = (path: PropertyKey[], message: string) => {
      problems++;
      ctx.addIssue({ code: 'custom', path, message });
    };
    if (spec.pilotTimings && spec.pilotTimings.length > 0) {
      for (const p of pilotSetProblems(spec.pilotTimings)) problem(p.path, p.message);
      const ps = spec.pilotSettings;
      if (ps && ps.method !== spec.method) {
        problem(['pilotSettings', 'method'], `the pilot timings were measured with the ${ps.method} method, not ${spec.method}; remove them or time pilots of this method`);
      }
      if (ps && (SYMMETRY_CLASS_SIGNATURE[ps.symmetryClass].t === 1) !== (SYMMETRY_CLASS_SIGNATURE[spec.symmetryClass].t === 1)) {
        problem(['pilotSettings', 'symmetryClass'], `the pilot timings were measured in class ${ps.symmetryClass}, whose arithmetic differs from class ${spec.symmetryClass}'s; time new pilots`);
      }
    }
    const total = disorderCount(spec.disorder) * spec.energies.length;
    if (total > MAX_GRID_POINTS && disorderCount(spec.disorder) <= MAX_GRID_POINTS) {
      problem(['energies'], `disorder values × energies make ${total.toLocaleString('en')} grid points; at most ${MAX_GRID_POINTS.toLocaleString('en')} are allowed`);
    }
    // zod runs this even when fields failed (their issues are in ctx.issues): only a sound plan is costed.
    if (problems > 0 || ctx.issues.length > 0 || (spec.method === 'transfer-matrix' && spec.targetPrecision === undefined)) return;
    // A plan must stay countable: a total past the largest pool (or past floating point) is refused.
    const coreHours = estimateCampaign(spec).totalCoreHours;
    if (!Number.isFinite(coreHours) || coreHours > MAX_CAMPAIGN_CORE_HOURS) {
      const amount = Number.isFinite(coreHours) ? `${coreHours.toExponential(2)} core-hours` : 'more core-hours than can be counted';
      problem(['sizes'], `this plan needs ${amount}, more than the 10^12 any round can hold; reduce the largest sizes, the realizations or the precision`);
    }
  })
  .meta({ id: 'CampaignSpec' });
export type CampaignSpec = z.infer<typeof CampaignSpec>;
export type CampaignSpecInput = z.input<typeof CampaignSpec>;
