/**
 * Weighted least squares (Gauss–Markov model y = A x + e, E{e e^T} = Qyy = diag(variances), P = Qyy^-1):
 *   x = (A^T P A)^-1 A^T P y,  Qxx = (A^T P A)^-1,  v = y - A x,  Qvv = Qyy - A Qxx A^T,
 *   sigma0^2 = v^T P v / (m - n).
 * Source: Teunissen, "Adjustment theory" (Delft, 2000), ch. 2-3; Koch, "Parameter estimation and
 * hypothesis testing in linear models" (1999), 3.2. Two implementations with one result type:
 * `solveWeightedLeastSquares` (ml-matrix: Cholesky of the normal matrix, SVD rank test as fall-back) and
 * `solveWeightedLeastSquaresSmall` (hand-written normal equations + in-place Cholesky, for the per-epoch
 * hot path with n <= ~10).
 */
import { CholeskyDecomposition, Matrix, SingularValueDecomposition } from 'ml-matrix';
import { CHOLESKY_RELATIVE_PIVOT_TOLERANCE, choleskyInPlace, choleskyInverse, choleskySolveInPlace } from './dense-cholesky.js';

export interface WlsSolution {
  readonly ok: true;
  /** Observations and unknowns. */
  readonly m: number;
  readonly n: number;
  /** Estimated unknowns (length n). */
  readonly x: Float64Array;
  /** Cofactor matrix of the unknowns (A^T P A)^-1, row-major n x n (a covariance when variances are absolute). */
  readonly qxx: Float64Array;
  /** Residuals v = y - A x (length m). */
  readonly residuals: Float64Array;
  /** v^T P v. */
  readonly vtpv: number;
  /** Redundancy m - n. */
  readonly dof: number;
  /** A-posteriori variance factor v^T P v / (m - n); NaN when m == n. */
  readonly sigma0Sq: number;
  /** Diagonal of the residual cofactor matrix Qvv = Qyy - A Qxx A^T (length m). */
  readonly qvvDiag: Float64Array;
}

export interface WlsFailure {
  readonly ok: false;
  /** Geometry cannot determine all unknowns (rank deficient, or fewer observations than unknowns). */
  readonly reason: 'singular';
  readonly detail: string;
}

export type WlsResult = WlsSolution | WlsFailure;

/** The problem as both solvers take it: design row-major m x n, misclosures y (observed - computed), variances. */
export interface WlsProblem {
  readonly design: Float64Array;
  readonly m: number;
  readonly n: number;
  readonly misclosure: Float64Array;
  readonly variances: Float64Array;
}

export type WlsSolver = (design: Float64Array, m: number, n: number, misclosure: Float64Array, variances: Float64Array) => WlsResult;

function checkInput(design: Float64Array, m: number, n: number, misclosure: Float64Array, variances: Float64Array): void {
  if (!Number.isInteger(m) || !Number.isInteger(n) || n < 1 || m < 0) throw new RangeError(`WLS: bad dimensions m=${m}, n=${n}`);
  if (design.length < m * n) throw new RangeError(`WLS: design has ${design.length} values, expected m*n = ${m * n}`);
  if (misclosure.length < m || variances.length < m) throw new RangeError(`WLS: misclosure/variances shorter than m = ${m}`);
  for (let i = 0; i < m; i++) {
    if (!(variances[i] > 0) || !Number.isFinite(variances[i])) throw new RangeError(`WLS: variance ${i} is ${variances[i]}, expected a positive finite number`);
  }
}

/** Residuals, v'Pv and diag(Qvv) shared by both solvers (Teunissen 2000, eq. for Qvv = Qyy - A Qxx A^T). */
function finish(design: Float64Array, m: number, n: number, y: Float64Array, variances: Float64Array, x: Float64Array, qxx: Float64Array, cholesky?: Float64Array): WlsSolution {
  const residuals = new Float64Array(m);
  const qvvDiag = new Float64Array(m);
  const z = cholesky ? new Float64Array(n) : null;
  let vtpv = 0;
  for (let i = 0; i < m; i++) {
    const row = i * n;
    let ax = 0;
    let aqa = 0;
    if (z && cholesky) {
      // a^T Qxx a = |L^-1 a|^2 with Qxx = (L L^T)^-1: one forward substitution per row (n^2 / 2).
      for (let j = 0; j < n; j++) {
        const aij = design[row + j];
        ax += aij * x[j];
        let t = aij;
        for (let k = 0; k < j; k++) t -= cholesky[j * n + k] * z[k];
        t /= cholesky[j * n + j];
        z[j] = t;
        aqa += t * t;
      }
    } else {
      for (let j = 0; j < n; j++) {
        const aij = design[row + j];
        ax += aij * x[j];
        let qa = 0;
        for (let k = 0; k < n; k++) qa += qxx[j * n + k] * design[row + k];
        aqa += aij * qa;
      }
    }
    const v = y[i] - ax;
    residuals[i] = v;
    vtpv += (v * v) / variances[i];
    qvvDiag[i] = variances[i] - aqa;
  }
  const dof = m - n;
  return { ok: true, m, n, x, qxx, residuals, vtpv, dof, sigma0Sq: dof > 0 ? vtpv / dof : NaN, qvvDiag };
}

function singular(detail: string): WlsFailure {
  return { ok: false, reason: 'singular', detail };
}

/**
 * WLS with ml-matrix: Cholesky of N = A^T P A; when it is not positive definite (or a pivot is below
 * the relative tolerance) an SVD of P^1/2 A decides: rank < n -> { ok: false, reason: 'singular' },
 * otherwise the SVD solves it.
 */
export function solveWeightedLeastSquares(design: Float64Array, m: number, n: number, misclosure: Float64Array, variances: Float64Array): WlsResult {
  checkInput(design, m, n, misclosure, variances);
  if (m < n) return singular(`${m} observations for ${n} unknowns`);
  // Whitened system: rows scaled by 1/sigma_i, so N = Aw^T Aw and u = Aw^T yw.
  const aw = new Matrix(m, n);
  const yw = new Matrix(m, 1);
  for (let i = 0; i < m; i++) {
    const s = 1 / Math.sqrt(variances[i]);
    for (let j = 0; j < n; j++) aw.set(i, j, design[i * n + j] * s);
    yw.set(i, 0, misclosure[i] * s);
  }
  const awT = aw.transpose();
  const normal = awT.mmul(aw);
  const u = awT.mmul(yw);
  const chol = new CholeskyDecomposition(normal);
  let pivotsOk = chol.isPositiveDefinite();
  if (pivotsOk) {
    const l = chol.lowerTriangularMatrix;
    for (let j = 0; j < n; j++) {
      if (!(l.get(j, j) ** 2 > CHOLESKY_RELATIVE_PIVOT_TOLERANCE * normal.get(j, j))) pivotsOk = false;
    }
  }
  let xM: Matrix;
  let qM: Matrix;
  if (pivotsOk) {
    xM = chol.solve(u);
    qM = chol.solve(Matrix.eye(n));
  } else {
    const svd = new SingularValueDecomposition(aw, { autoTranspose: true });
    const sv = svd.diagonal;
    const sMax = Math.max(...sv);
    const rankTol = Math.sqrt(CHOLESKY_RELATIVE_PIVOT_TOLERANCE) * sMax;
    const rank = sv.filter((s) => s > rankTol).length;
    if (rank < n) return singular(`design matrix rank ${rank} < ${n} unknowns`);
    xM = svd.solve(yw);
    // Qxx = V S^-2 V^T (pseudo-inverse of the normal matrix)
    const v = svd.rightSingularVectors;
    qM = new Matrix(n, n);
    for (let i = 0; i < n; i++) {
      for (let j = 0; j < n; j++) {
        let s = 0;
        for (let k = 0; k < n; k++) s += (v.get(i, k) * v.get(j, k)) / (sv[k] * sv[k]);
        qM.set(i, j, s);
      }
    }
  }
  const x = Float64Array.from(xM.getColumn(0));
  const qxx = new Float64Array(n * n);
  for (let i = 0; i < n; i++) for (let j = 0; j < n; j++) qxx[i * n + j] = qM.get(i, j);
  return finish(design, m, n, misclosure, variances, x, qxx);
}

/**
 * Same model and result as solveWeightedLeastSquares, hand-written for the per-epoch hot path:
 * normal equations accumulated in a Float64Array, in-place Cholesky, inverse by triangular solves.
 * Meant for n <= ~10 unknowns (any n works, cost O(m n^2 + n^3)).
 */
export function solveWeightedLeastSquaresSmall(design: Float64Array, m: number, n: number, misclosure: Float64Array, variances: Float64Array): WlsResult {
  checkInput(design, m, n, misclosure, variances);
  if (m < n) return singular(`${m} observations for ${n} unknowns`);
  const normal = new Float64Array(n * n);
  const u = new Float64Array(n);
  for (let i = 0; i < m; i++) {
    const p = 1 / variances[i];
    const row = i * n;
    const py = p * misclosure[i];
    for (let j = 0; j < n; j++) {
      const paj = p * design[row + j];
      u[j] += design[row + j] * py;
      for (let k = 0; k <= j; k++) normal[j * n + k] += paj * design[row + k];
    }
  }
  if (!choleskyInPlace(normal, n)) return singular('normal matrix not positive definite (rank deficient geometry)');
  const qxx = choleskyInverse(normal, n);
  const x = u;
  choleskySolveInPlace(normal, n, x);
  return finish(design, m, n, misclosure, variances, x, qxx, normal);
}
