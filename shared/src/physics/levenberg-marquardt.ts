import { choleskyFactor, choleskySolve, inverseSymmetric } from './dense-matrix';

/**
 * Weighted nonlinear least squares by Levenberg–Marquardt: minimise
 * chi² = sum_k ((data_k - model_k(p)) / sigma_k)².
 *
 * Our own rather than a package: the problems are small (a few hundred points, a dozen
 * parameters), the same code must run in the browser, the worker and the CLI without native
 * dependencies, and the scaling analysis needs what general curve-fitting packages do not give:
 * per-point uncertainties as weights, the covariance matrix at the minimum, an honest "did not
 * converge" instead of the last iterate, and starts from a previous solution so that hundreds of
 * bootstrap refits stay cheap.
 *
 * Method: dense normal equations (JᵀJ + lambda D) delta = Jᵀr with Marquardt's scaling
 * D = diag(JᵀJ) (kept as the running maximum so that it never shrinks towards singular), solved
 * by Cholesky; the damping lambda is updated from the gain ratio between the actual and the
 * predicted chi² decrease (Nielsen's rule, as in Madsen, Nielsen & Tingleff, "Methods for
 * non-linear least squares problems", 2004). A step is accepted only when chi² goes down and the
 * model stays finite, so a model that returns NaN outside its domain (a negative exponent, say)
 * simply has such steps refused.
 */
export interface LeastSquaresProblem {
  /** Fill `out` with the model's prediction for every point; non-finite values mark parameters outside the model's domain. */
  model(parameters: Float64Array, out: Float64Array): void;
  /**
   * Fill `out` (row-major, points × parameters) with d model_k / d parameter_j. Without it the
   * Jacobian is taken by central differences.
   */
  jacobian?(parameters: Float64Array, out: Float64Array): void;
  data: ArrayLike<number>;
  sigma: ArrayLike<number>;
}

export interface LevenbergMarquardtOptions {
  /** Accepted plus refused steps; beyond it the fit is reported as not converged. */
  maxIterations?: number;
  /** Converged when an accepted step lowers chi² by less than this fraction… */
  chi2Tolerance?: number;
  /** …and changes no parameter by more than this fraction of its size (absolute for parameters near 0). */
  stepTolerance?: number;
  /** Or when every Jacobian column is this close to orthogonal to the residuals (cosine). */
  gradientTolerance?: number;
  initialDamping?: number;
}

export type LevenbergMarquardtStop =
  /** Converged: chi² and the parameters stopped changing. */
  | 'small-change'
  /** Converged: the gradient vanished (or the residuals did). */
  | 'zero-gradient'
  /** Not converged: the iteration cap was reached. */
  | 'max-iterations'
  /** Not converged: no downhill step could be found although the gradient is not small. */
  | 'stalled'
  /** Not converged: the model is not finite at the starting parameters. */
  | 'not-finite-start';

export interface LevenbergMarquardtResult {
  parameters: Float64Array;
  chi2: number;
  iterations: number;
  converged: boolean;
  stop: LevenbergMarquardtStop;
  /** (JᵀJ)⁻¹ at the minimum (weighted), row-major; null when the parameters are not all determined by the data. */
  covariance: Float64Array | null;
  /** Square roots of the covariance diagonal; NaN when the covariance is null. */
  standardErrors: Float64Array;
}

const DEFAULTS: Required<LevenbergMarquardtOptions> = {
  maxIterations: 200,
  chi2Tolerance: 1e-10,
  stepTolerance: 1e-6,
  gradientTolerance: 1e-9,
  initialDamping: 1e-3,
};

/** Above this the damped step is a vanishing gradient step: no progress is possible at this point. */
const MAX_DAMPING = 1e16;
/** A stall counts as a minimum when the residuals are this close to orthogonal to every Jacobian column. */
const STALL_GRADIENT = 1e-5;

function chiSquare(data: ArrayLike<number>, sigma: ArrayLike<number>, prediction: Float64Array, residual: Float64Array): number {
  let sum = 0;
  for (let k = 0; k < prediction.length; k++) {
    const r = (data[k] - prediction[k]) / sigma[k];
    residual[k] = r;
    sum += r * r;
  }
  return Number.isFinite(sum) ? sum : Number.POSITIVE_INFINITY;
}

/** Central differences with a step scaled to each parameter (cube root of machine epsilon). */
function numericalJacobian(problem: LeastSquaresProblem, p: Float64Array, n: number, out: Float64Array): void {
  const m = p.length;
  const plus = new Float64Array(n);
  const minus = new Float64Array(n);
  const trial = Float64Array.from(p);
  for (let j = 0; j < m; j++) {
    const h = 6e-6 * Math.max(Math.abs(p[j]), 1e-3);
    trial[j] = p[j] + h;
    problem.model(trial, plus);
    trial[j] = p[j] - h;
    problem.model(trial, minus);
    trial[j] = p[j];
    let central = true;
    for (let k = 0; k < n; k++) if (!Number.isFinite(plus[k]) || !Number.isFinite(minus[k])) central = false;
    if (central) {
      for (let k = 0; k < n; k++) out[k * m + j] = (plus[k] - minus[k]) / (2 * h);
    } else {
      // At the edge of the model's domain: one-sided, towards whichever side is finite.
      const base = new Float64Array(n);
      problem.model(p, base);
      const side = plus.every(Number.isFinite) ? plus : minus;
      const sign = side === plus ? 1 : -1;
      for (let k = 0; k < n; k++) out[k * m + j] = (sign * (side[k] - base[k])) / h;
    }
  }
}

/** Weighted normal matrix A = JwᵀJw and right-hand side b = Jwᵀr with Jw = J / sigma. */
function normalEquations(
  jacobian: Float64Array,
  sigma: ArrayLike<number>,
  residual: Float64Array,
  n: number,
  m: number,
  a: Float64Array,
  b: Float64Array,
): void {
  a.fill(0);
  b.fill(0);
  for (let k = 0; k < n; k++) {
    const w = 1 / sigma[k];
    const row = k * m;
    const rk = residual[k];
    for (let i = 0; i < m; i++) {
      const ji = jacobian[row + i] * w;
      if (ji === 0) continue;
      b[i] += ji * rk;
      for (let j = 0; j <= i; j++) a[i * m + j] += ji * jacobian[row + j] * w;
    }
  }
  for (let i = 0; i < m; i++) for (let j = 0; j < i; j++) a[j * m + i] = a[i * m + j];
}

/** Largest cosine between the residual vector and a weighted Jacobian column (0 at a stationary point). */
function gradientCosine(a: Float64Array, b: Float64Array, m: number, chi2: number): number {
  if (chi2 === 0) return 0;
  let worst = 0;
  for (let j = 0; j < m; j++) {
    const norm = Math.sqrt(a[j * m + j]);
    if (norm > 0) worst = Math.max(worst, Math.abs(b[j]) / (norm * Math.sqrt(chi2)));
  }
  return worst;
}

export function levenbergMarquardt(
  problem: LeastSquaresProblem,
  initial: ArrayLike<number>,
  options: LevenbergMarquardtOptions = {},
): LevenbergMarquardtResult {
  const opts = { ...DEFAULTS, ...options };
  const n = problem.data.length;
  const m = initial.length;
  const p = Float64Array.from(initial);
  const prediction = new Float64Array(n);
  const residual = new Float64Array(n);
  const trialPrediction = new Float64Array(n);
  const trialResidual = new Float64Array(n);
  const jacobian = new Float64Array(n * m);
  const a = new Float64Array(m * m);
  const b = new Float64Array(m);
  const damped = new Float64Array(m * m);
  const step = new Float64Array(m);
  const scaling = new Float64Array(m);
  const trial = new Float64Array(m);

  const finish = (converged: boolean, stop: LevenbergMarquardtStop, chi2: number, iterations: number): LevenbergMarquardtResult => {
    const covariance = Number.isFinite(chi2) ? inverseSymmetric(a, m) : null;
    const standardErrors = new Float64Array(m).fill(Number.NaN);
    if (covariance) for (let j = 0; j < m; j++) standardErrors[j] = Math.sqrt(covariance[j * m + j]);
    return { parameters: p, chi2, iterations, converged, stop, covariance, standardErrors };
  };

  const linearize = () => {
    if (problem.jacobian) problem.jacobian(p, jacobian);
    else numericalJacobian(problem, p, n, jacobian);
    normalEquations(jacobian, problem.sigma, residual, n, m, a, b);
    for (let j = 0; j < m; j++) scaling[j] = Math.max(scaling[j], a[j * m + j]);
  };

  problem.model(p, prediction);
  let chi2 = chiSquare(problem.data, problem.sigma, prediction, residual);
  if (!Number.isFinite(chi2)) return finish(false, 'not-finite-start', chi2, 0);
  linearize();
  // A parameter the data do not touch at all would give a zero scale and a singular damped matrix.
  let largestScale = 0;
  for (let j = 0; j < m; j++) largestScale = Math.max(largestScale, scaling[j]);
  const scaleFloor = 1e-12 * (largestScale || 1);

  let lambda = opts.initialDamping;
  let growth = 2;
  for (let iteration = 1; iteration <= opts.maxIterations; iteration++) {
    if (chi2 === 0 || gradientCosine(a, b, m, chi2) < opts.gradientTolerance) return finish(true, 'zero-gradient', chi2, iteration - 1);

    damped.set(a);
    for (let j = 0; j < m; j++) damped[j * m + j] += lambda * Math.max(scaling[j], scaleFloor);
    step.set(b);
    const solved = choleskyFactor(damped, m, 0);
    let accepted = false;
    let trialChi2 = Number.POSITIVE_INFINITY;
    let rho = -1;
    if (solved) {
      choleskySolve(damped, m, step);
      for (let j = 0; j < m; j++) trial[j] = p[j] + step[j];
      problem.model(trial, trialPrediction);
      trialChi2 = chiSquare(problem.data, problem.sigma, trialPrediction, trialResidual);
      // Predicted decrease of the linear model: deltaᵀ(lambda D delta + b).
      let predicted = 0;
      for (let j = 0; j < m; j++) predicted += step[j] * (lambda * Math.max(scaling[j], scaleFloor) * step[j] + b[j]);
      rho = predicted > 0 ? (chi2 - trialChi2) / predicted : -1;
      accepted = Number.isFinite(trialChi2) && trialChi2 < chi2 && rho > 0;
    }

    if (accepted) {
      let relativeStep = 0;
      for (let j = 0; j < m; j++) relativeStep = Math.max(relativeStep, Math.abs(step[j]) / (Math.abs(p[j]) + opts.stepTolerance));
      const relativeChange = (chi2 - trialChi2) / Math.max(trialChi2, Number.MIN_VALUE);
      p.set(trial);
      prediction.set(trialPrediction);
      residual.set(trialResidual);
      chi2 = trialChi2;
      linearize();
      lambda *= Math.max(1 / 3, 1 - (2 * rho - 1) ** 3);
      growth = 2;
      if (relativeChange < opts.chi2Tolerance && relativeStep < opts.stepTolerance) return finish(true, 'small-change', chi2, iteration);
    } else {
      lambda *= growth;
      growth *= 2;
      if (lambda > MAX_DAMPING || !Number.isFinite(lambda)) {
        // Even a tiny gradient step does not lower chi²: either we sit at the minimum to working
        // precision, or the model is broken here. The gradient tells which.
        const atMinimum = gradientCosine(a, b, m, chi2) < STALL_GRADIENT;
        return finish(atMinimum, atMinimum ? 'zero-gradient' : 'stalled', chi2, iteration);
      }
    }
  }
  return finish(false, 'max-iterations', chi2, opts.maxIterations);
}
