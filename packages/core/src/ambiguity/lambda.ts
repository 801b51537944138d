/**
 * Integer least-squares estimation of float ambiguities: the LAMBDA method.
 *
 * Teunissen P.J.G. (1995) The least-squares ambiguity decorrelation adjustment: a method for fast GPS
 * integer ambiguity estimation. J. Geodesy 70:65-82. de Jonge P., Tiberius C. (1996) The LAMBDA method
 * for integer ambiguity estimation: implementation aspects. LGR series 12, Delft University of Technology:
 *  - Q = L' D L (L unit lower triangular, D diagonal), section 3.3;
 *  - decorrelation: integer Gauss transformations and permutations of adjacent ambiguities until the
 *    conditional variances are ordered (section 3.4), giving z = Z' a and Qz = Z' Q Z = L' D L;
 *  - search: depth-first enumeration of the conditional intervals from the last ambiguity to the first,
 *    in zig-zag order about each conditional estimate, with the ellipsoid shrunk to the worst of the
 *    candidates kept (section 4), which finds the best and second-best integer vectors exactly.
 *
 * Matrices are dense, row-major Float64Array of n*n.
 */
import { normalCdf } from '../solve/index.js';

export interface IntegerSolution {
  /** Best integer vector (original ambiguity space). */
  readonly best: Float64Array;
  /** Second-best integer vector. */
  readonly second: Float64Array;
  /** Squared norms (a - a_int)' Q^-1 (a - a_int) of the best and second-best vectors. */
  readonly bestNorm: number;
  readonly secondNorm: number;
  /** secondNorm / bestNorm (the ratio test statistic; Infinity when the best norm is 0). */
  readonly ratio: number;
  /**
   * Success rate of integer bootstrapping on the decorrelated ambiguities, prod(2 Phi(1 / (2 sqrt(d_i))) - 1)
   * (Teunissen 1998, J. Geodesy 72:606-612): a lower bound of the integer least-squares success rate,
   * from the formal covariance.
   */
  readonly successRate: number;
}

/** Q = L' D L. Returns null when Q is not positive definite. de Jonge & Tiberius 1996, section 3.3. */
export function ltdl(q: Float64Array, n: number): { l: Float64Array; d: Float64Array } | null {
  const a = Float64Array.from(q);
  const l = new Float64Array(n * n);
  const d = new Float64Array(n);
  for (let i = n - 1; i >= 0; i--) {
    d[i] = a[i * n + i];
    if (!(d[i] > 0)) return null;
    const s = Math.sqrt(d[i]);
    for (let j = 0; j <= i; j++) l[i * n + j] = a[i * n + j] / s;
    for (let j = 0; j < i; j++) for (let k = 0; k <= j; k++) a[j * n + k] -= l[i * n + k] * l[i * n + j];
    const lii = l[i * n + i];
    for (let j = 0; j <= i; j++) l[i * n + j] /= lii;
  }
  return { l, d };
}

/** Integer Gauss transformation on column j by row i (de Jonge & Tiberius 1996, eq. 3.22). */
function gauss(l: Float64Array, z: Float64Array, n: number, i: number, j: number): void {
  const mu = Math.round(l[i * n + j]);
  if (mu === 0) return;
  for (let k = i; k < n; k++) l[k * n + j] -= mu * l[k * n + i];
  for (let k = 0; k < n; k++) z[k * n + j] -= mu * z[k * n + i];
}

/** Permutation of ambiguities j and j+1 with the new conditional variance del (section 3.4). */
function permute(l: Float64Array, d: Float64Array, z: Float64Array, n: number, j: number, del: number): void {
  const eta = d[j] / del;
  const lam = (d[j + 1] * l[(j + 1) * n + j]) / del;
  d[j] = eta * d[j + 1];
  d[j + 1] = del;
  for (let k = 0; k < j; k++) {
    const a0 = l[j * n + k], a1 = l[(j + 1) * n + k];
    l[j * n + k] = -l[(j + 1) * n + j] * a0 + a1;
    l[(j + 1) * n + k] = eta * a0 + lam * a1;
  }
  l[(j + 1) * n + j] = lam;
  for (let k = j + 2; k < n; k++) {
    const t = l[k * n + j]; l[k * n + j] = l[k * n + j + 1]; l[k * n + j + 1] = t;
  }
  for (let k = 0; k < n; k++) {
    const t = z[k * n + j]; z[k * n + j] = z[k * n + j + 1]; z[k * n + j + 1] = t;
  }
}

/** Decorrelation: L and D of Qz and the unimodular Z with z = Z' a (section 3.4). Modifies l, d. */
export function decorrelate(l: Float64Array, d: Float64Array, n: number): Float64Array {
  const z = new Float64Array(n * n);
  for (let i = 0; i < n; i++) z[i * n + i] = 1;
  let j = n - 2, k = n - 2;
  while (j >= 0) {
    if (j <= k) for (let i = j + 1; i < n; i++) gauss(l, z, n, i, j);
    const lj = l[(j + 1) * n + j];
    const del = d[j] + lj * lj * d[j + 1];
    // The small tolerance stops endless swapping of equal conditional variances.
    if (del + 1e-6 < d[j + 1]) {
      permute(l, d, z, n, j, del);
      k = j;
      j = n - 2;
    } else {
      j--;
    }
  }
  return z;
}

const sgn = (x: number): number => (x <= 0 ? -1 : 1);

/**
 * The m best integer vectors of z (conditional estimates zs, Qz = L' D L) by the shrinking-ellipsoid
 * search (section 4). Returns the candidates (m vectors of n, best first) and their squared norms.
 */
export function searchIntegers(zs: Float64Array, l: Float64Array, d: Float64Array, n: number, m: number, maxLoops = 100_000): { candidates: Float64Array[]; norms: number[] } | null {
  const s = new Float64Array(n * n);
  const dist = new Float64Array(n);
  const zb = new Float64Array(n);
  const z = new Float64Array(n);
  const step = new Float64Array(n);
  const found: Float64Array[] = [];
  const norms: number[] = [];
  let maxDist = Infinity;
  let imax = 0;
  let k = n - 1;
  dist[k] = 0;
  zb[k] = zs[k];
  z[k] = Math.round(zb[k]);
  let y = zb[k] - z[k];
  step[k] = sgn(y);
  let loops = 0;
  for (;;) {
    if (++loops > maxLoops) return null;
    const newDist = dist[k] + (y * y) / d[k];
    if (newDist < maxDist) {
      if (k !== 0) {
        k--;
        dist[k] = newDist;
        for (let i = 0; i <= k; i++) s[k * n + i] = s[(k + 1) * n + i] + (z[k + 1] - zb[k + 1]) * l[(k + 1) * n + i];
        zb[k] = zs[k] + s[k * n + k];
        z[k] = Math.round(zb[k]);
        y = zb[k] - z[k];
        step[k] = sgn(y);
      } else {
        if (found.length < m) {
          found.push(Float64Array.from(z));
          norms.push(newDist);
          if (found.length === m) {
            imax = 0;
            for (let i = 1; i < m; i++) if (norms[i] > norms[imax]) imax = i;
            maxDist = norms[imax];
          }
        } else {
          found[imax] = Float64Array.from(z);
          norms[imax] = newDist;
          imax = 0;
          for (let i = 1; i < m; i++) if (norms[i] > norms[imax]) imax = i;
          maxDist = norms[imax];
        }
        z[0] += step[0];
        y = zb[0] - z[0];
        step[0] = -step[0] - sgn(step[0]);
      }
    } else {
      if (k === n - 1) break;
      k++;
      z[k] += step[k];
      y = zb[k] - z[k];
      step[k] = -step[k] - sgn(step[k]);
    }
  }
  const order = norms.map((_, i) => i).sort((a, b) => norms[a] - norms[b]);
  return { candidates: order.map((i) => found[i]), norms: order.map((i) => norms[i]) };
}

/** Solves Z' a = z for a (Z unimodular: the solution is integer; rounded). Gaussian elimination with pivoting. */
function backTransform(zm: Float64Array, zv: Float64Array, n: number): Float64Array {
  // Build A = Z' (row-major), augmented with zv.
  const a = new Float64Array(n * (n + 1));
  for (let i = 0; i < n; i++) {
    for (let j = 0; j < n; j++) a[i * (n + 1) + j] = zm[j * n + i];
    a[i * (n + 1) + n] = zv[i];
  }
  const w = n + 1;
  for (let c = 0; c < n; c++) {
    let p = c;
    for (let r = c + 1; r < n; r++) if (Math.abs(a[r * w + c]) > Math.abs(a[p * w + c])) p = r;
    if (p !== c) for (let j = 0; j < w; j++) { const t = a[c * w + j]; a[c * w + j] = a[p * w + j]; a[p * w + j] = t; }
    const piv = a[c * w + c];
    for (let r = 0; r < n; r++) {
      if (r === c) continue;
      const f = a[r * w + c] / piv;
      if (f === 0) continue;
      for (let j = c; j < w; j++) a[r * w + j] -= f * a[c * w + j];
    }
  }
  const out = new Float64Array(n);
  for (let i = 0; i < n; i++) out[i] = Math.round(a[i * w + n] / a[i * w + i]) + 0;
  return out;
}

/**
 * Best and second-best integer vectors for float ambiguities a (n) with covariance q (n*n, row-major).
 * Null when q is not positive definite or the search does not end (a degenerate covariance).
 */
export function lambdaSearch(a: Float64Array, q: Float64Array, n: number): IntegerSolution | null {
  if (n < 1) return null;
  const f = ltdl(q, n);
  if (!f) return null;
  const zm = decorrelate(f.l, f.d, n);
  // Remove the integer part first so the search works on small numbers (z = Z' a; integer shifts commute).
  const shift = new Float64Array(n);
  const af = new Float64Array(n);
  for (let i = 0; i < n; i++) { shift[i] = Math.round(a[i]); af[i] = a[i] - shift[i]; }
  const zs = new Float64Array(n);
  for (let j = 0; j < n; j++) {
    let v = 0;
    for (let i = 0; i < n; i++) v += zm[i * n + j] * af[i];
    zs[j] = v;
  }
  const r = searchIntegers(zs, f.l, f.d, n, 2);
  if (!r || r.candidates.length < 2) return null;
  const best = backTransform(zm, r.candidates[0], n);
  const second = backTransform(zm, r.candidates[1], n);
  for (let i = 0; i < n; i++) { best[i] = best[i] + shift[i] + 0; second[i] = second[i] + shift[i] + 0; }
  const [b, s2] = r.norms;
  let successRate = 1;
  for (let i = 0; i < n; i++) successRate *= 2 * normalCdf(1 / (2 * Math.sqrt(f.d[i]))) - 1;
  return { best, second, bestNorm: b, secondNorm: s2, ratio: b > 0 ? s2 / b : Infinity, successRate };
}
