/**
 * Small dense symmetric positive-definite kernels on row-major Float64Array (n x n), in place.
 * Cholesky–Banachiewicz factorisation N = L L^T (Golub & Van Loan, "Matrix Computations", 4th ed.,
 * algorithm 4.2.1), triangular solves and the inverse (L^-T L^-1). Used by the per-epoch solver and DOP,
 * where n <= ~10 and allocation-free loops beat a general matrix library.
 */

/**
 * Relative pivot tolerance: a column whose Cholesky pivot L_jj^2 falls below this fraction of its own
 * diagonal N_jj is (numerically) a combination of the previous columns. 1e-12 leaves ~4 significant
 * digits in double precision (common practice for a rank test on normal equations).
 */
export const CHOLESKY_RELATIVE_PIVOT_TOLERANCE = 1e-12;

/**
 * Factor the symmetric matrix `a` (row-major n x n, only the lower triangle is read) into L (lower
 * triangle of `a`, upper triangle zeroed). Returns false when a pivot is not positive or is below the
 * relative tolerance (rank deficient / not positive definite); `a` is then garbage.
 */
export function choleskyInPlace(a: Float64Array, n: number, relTol = CHOLESKY_RELATIVE_PIVOT_TOLERANCE): boolean {
  for (let j = 0; j < n; j++) {
    const jj = j * n + j;
    let d = a[jj];
    const diag = d;
    for (let k = 0; k < j; k++) d -= a[j * n + k] * a[j * n + k];
    // Golub & Van Loan alg. 4.2.1: L_jj = sqrt(N_jj - sum_k L_jk^2)
    if (!(d > relTol * diag) || !(diag > 0)) return false;
    const ljj = Math.sqrt(d);
    a[jj] = ljj;
    for (let i = j + 1; i < n; i++) {
      let s = a[i * n + j];
      for (let k = 0; k < j; k++) s -= a[i * n + k] * a[j * n + k];
      a[i * n + j] = s / ljj;
      a[j * n + i] = 0;
    }
  }
  return true;
}

/** Solve L L^T x = b in place in `b`, with L from choleskyInPlace. */
export function choleskySolveInPlace(l: Float64Array, n: number, b: Float64Array): void {
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
}

/** Inverse (L L^T)^-1 = L^-T L^-1 written into `out` (row-major n x n, symmetric, full). */
export function choleskyInverse(l: Float64Array, n: number, out: Float64Array = new Float64Array(n * n)): Float64Array {
  // W = L^-1 (lower triangular), by forward substitution column by column.
  const w = new Float64Array(n * n);
  for (let j = 0; j < n; j++) {
    w[j * n + j] = 1 / l[j * n + j];
    for (let i = j + 1; i < n; i++) {
      let s = 0;
      for (let k = j; k < i; k++) s -= l[i * n + k] * w[k * n + j];
      w[i * n + j] = s / l[i * n + i];
    }
  }
  // (L L^T)^-1 = W^T W
  for (let i = 0; i < n; i++) {
    for (let j = 0; j <= i; j++) {
      let s = 0;
      for (let k = i; k < n; k++) s += w[k * n + i] * w[k * n + j];
      out[i * n + j] = s;
      out[j * n + i] = s;
    }
  }
  return out;
}
