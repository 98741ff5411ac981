/**
 * Small dense symmetric positive-definite systems (the normal equations of a fit with a dozen
 * parameters), row-major in Float64Array. Cholesky because the matrices are symmetric positive
 * definite whenever the fit is well posed, and a failed factorization is exactly the signal that it
 * is not.
 */

/**
 * Factor the n×n matrix `a` as L Lᵀ in place (lower triangle holds L; the upper is left alone).
 * Returns false when a pivot is not positive or below `relativePivot` times its diagonal entry,
 * i.e. the matrix is singular or indefinite to working precision.
 */
export function choleskyFactor(a: Float64Array, n: number, relativePivot = 1e-14): boolean {
  for (let j = 0; j < n; j++) {
    let d = a[j * n + j];
    const original = d;
    for (let k = 0; k < j; k++) d -= a[j * n + k] * a[j * n + k];
    if (!(d > relativePivot * Math.abs(original)) || !(d > 0) || !Number.isFinite(d)) return false;
    const ljj = Math.sqrt(d);
    a[j * n + j] = ljj;
    for (let i = j + 1; i < n; i++) {
      let s = a[i * n + j];
      for (let k = 0; k < j; k++) s -= a[i * n + k] * a[j * n + k];
      a[i * n + j] = s / ljj;
    }
  }
  return true;
}

/** Solve L Lᵀ x = b with a factor from `choleskyFactor`; `b` is overwritten by x. */
export function choleskySolve(l: Float64Array, n: number, b: Float64Array): Float64Array {
  for (let i = 0; i < n; i++) {
    let s = b[i];
    for (let k = 0; k < i; k++) s -= l[i * n + k] * b[k];
    b[i] = s / l[i * n + i];
  }
  for (let i = n - 1; i >= 0; i--) {
    let s = b[i];
    for (let k = i + 1; k < n; k++) s -= l[k * n + i] * b[k];
    b[i] = s / l[i * n + i];
  }
  return b;
}

/**
 * Inverse of a symmetric positive-definite matrix, or null when it is singular to working
 * precision. The matrix is first scaled to unit diagonal so that parameters of very different
 * sizes (a critical disorder near 16 and a coefficient near 0.01) do not trip the pivot test.
 */
export function inverseSymmetric(a: Float64Array, n: number): Float64Array | null {
  const scale = new Float64Array(n);
  for (let i = 0; i < n; i++) {
    const d = a[i * n + i];
    if (!(d > 0) || !Number.isFinite(d)) return null;
    scale[i] = 1 / Math.sqrt(d);
  }
  const c = new Float64Array(n * n);
  for (let i = 0; i < n; i++) for (let j = 0; j < n; j++) c[i * n + j] = a[i * n + j] * scale[i] * scale[j];
  if (!choleskyFactor(c, n, 1e-13)) return null;
  const inverse = new Float64Array(n * n);
  const column = new Float64Array(n);
  for (let j = 0; j < n; j++) {
    column.fill(0);
    column[j] = 1;
    choleskySolve(c, n, column);
    for (let i = 0; i < n; i++) inverse[i * n + j] = column[i] * scale[i] * scale[j];
  }
  return inverse;
}
