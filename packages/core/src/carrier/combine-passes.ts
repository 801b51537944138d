/**
 * Forward and backward passes combined per epoch:
 *  - both fixed and within `agreementM` (3-D) of each other: fixed, at their covariance-weighted mean;
 *  - one fixed, the other float, and the fixed position consistent with the float one: the difference
 *    d = fixed - float passes d' (C_float + C_fixed)^-1 d <= chi-square(3 dof) at FIX_FLOAT_ALPHA: fixed, at
 *    the fixed position (the float pass has not converged yet, and does not object). A test of the whole
 *    3-D difference against the full covariance, not of each axis against its own sigma: the float
 *    solution's errors are correlated between the axes (a box per axis, 3 sigma plus the agreement
 *    distance, let GLONASS-only fixes 1 m off through while the other pass's float put them at chi-square
 *    20 to 90 on the real static run);
 *  - otherwise float: the two float solutions weighted by their covariances (the combination of a
 *    forward and a backward filter, Fraser & Potter 1969, shares only the epoch's own measurements),
 *    or, when they contradict each other or both passes fixed and disagree, the covariance of the two
 *    candidates (floats, or fixes) about that mean (candidatesCovariance); no ratio when a pass's fix
 *    was not taken;
 *  - one pass only: that pass's solution.
 * An epoch's residuals (EpochResult.residualM) and innovation test (chiSquare, dof) come from the pass whose
 * solution it carries: forward when
 * both fixed and agree; for a float combination, the float pass with the smaller formal variance (none
 * when both passes fixed and disagree: neither pass's residuals belong to the combined float position).
 */
import { chiSquareQuantile } from '../solve/index.js';
import type { EpochResult } from './float-filter.js';
import type { PassResults } from './pass-results.js';

/**
 * Significance level of the test of one pass's fixed position against the other pass's float: 0.1 %, the
 * failure rate the integer search itself is held to (options.ts minSuccessRate 0.999) and the default level
 * of the code epochs' global test (session/options.ts).
 */
const FIX_FLOAT_ALPHA = 0.001;
/** chi-square(3 dof) quantile at 1 - FIX_FLOAT_ALPHA (16.27). */
const FIX_FLOAT_CRITICAL = chiSquareQuantile(1 - FIX_FLOAT_ALPHA, 3);

function inv3(c: ArrayLike<number>, o: number): number[] | null {
  const a = c[o], b = c[o + 1], d = c[o + 2], e = c[o + 3], f = c[o + 4], g = c[o + 5];
  // Symmetric [[a b d][b e f][d f g]].
  const A = e * g - f * f, B = -(b * g - f * d), C = b * f - e * d;
  const det = a * A + b * B + d * C;
  if (!(Math.abs(det) > 0)) return null;
  const E = a * g - d * d, F = -(a * f - b * d), G = a * e - b * b;
  return [A / det, B / det, C / det, E / det, F / det, G / det];
}

function mulSym(m: number[], v: number[]): number[] {
  return [m[0] * v[0] + m[1] * v[1] + m[2] * v[2], m[1] * v[0] + m[3] * v[1] + m[4] * v[2], m[2] * v[0] + m[4] * v[1] + m[5] * v[2]];
}

/** A solution: position (3) and covariance (6) at offsets 3 i and 6 i of its arrays. */
interface Solution {
  readonly position: ArrayLike<number>;
  readonly covariance: ArrayLike<number>;
  readonly i: number;
}

/**
 * Combines the backward pass's result `b` at an epoch with the forward pass's, at index i of `r` (its
 * columns as the forward pass wrote them), writing the combination there in place: kind, position,
 * covariance, ratio, fixed ambiguities, satellites used, the backward kind, the epoch's innovation test and residuals (its
 * `entries` entries from `entry` in r.residualM: the forward pass's stay, or the backward pass's replace
 * them, or none, NaN). Every forward value is read before it is overwritten.
 */
export function combineEpoch(r: PassResults, i: number, entry: number, entries: number, b: EpochResult, agreementM: number): void {
  const from = combine(r, i, b, agreementM);
  r.backwardKind[i] = b.kind;
  r.backwardCause[i] = b.cause; r.backwardCauseA[i] = b.causeA; r.backwardCauseB[i] = b.causeB;
  if (from === 2) { r.residualM.set(b.residualM.subarray(0, entries), entry); r.chiSquare[i] = b.chiSquare; r.dof[i] = b.dof; }
  else if (from === 0) { r.residualM.fill(NaN, entry, entry + entries); r.chiSquare[i] = NaN; r.dof[i] = 0; }
}

/** Returns whose residuals the epoch carries: 0 none, 1 forward, 2 backward. */
function combine(r: PassResults, i: number, b: EpochResult, agreementM: number): 0 | 1 | 2 {
  const kf = r.kind[i], kb = b.kind;
  r.ratio[i] = Math.max(Number.isNaN(r.ratio[i]) ? 0 : r.ratio[i], Number.isNaN(b.ratio) ? 0 : b.ratio);
  r.satellitesUsed[i] = Math.max(r.satellitesUsed[i], b.satellitesUsed);
  if (kf === 0 && kb === 0) return 0;
  const set = (kind: number, position: ArrayLike<number>, covariance: ArrayLike<number>, o3: number, o6: number): void => {
    r.kind[i] = kind;
    for (let a = 0; a < 3; a++) r.position[3 * i + a] = position[o3 + a];
    for (let a = 0; a < 6; a++) r.covariance[6 * i + a] = covariance[o6 + a];
  };
  if (kf === 0) { set(kb, b.position, b.covariance, 0, 0); r.fixedAmbiguities[i] = b.fixedAmbiguities; return 2; }
  // The forward result stays as it is.
  if (kb === 0) return 1;
  const f: Solution = { position: r.position, covariance: r.covariance, i };
  const fFloat: Solution = { position: r.floatPosition, covariance: r.floatCovariance, i };
  const bFixed: Solution = { position: b.position, covariance: b.covariance, i: 0 };
  const bFloat: Solution = { position: b.floatPosition, covariance: b.floatCovariance, i: 0 };
  const trace = (s: Solution): number => s.covariance[6 * s.i] + s.covariance[6 * s.i + 3] + s.covariance[6 * s.i + 5];
  const from = kf === 2 && kb === 2 ? 0 : kf === 2 ? 2 : kb === 2 ? 1 : trace(f) <= trace(bFixed) ? 1 : 2;
  // Arrays written out, not made by map: one array shape at each use for the optimised code.
  const d = [r.position[3 * i] - b.position[0], r.position[3 * i + 1] - b.position[1], r.position[3 * i + 2] - b.position[2]];
  if (kf === 2 && kb === 2 && Math.hypot(d[0], d[1], d[2]) <= agreementM) {
    // Kind and covariance (when the mean has none) stay the forward pass's.
    r.fixedAmbiguities[i] = Math.max(r.fixedAmbiguities[i], b.fixedAmbiguities);
    const m = weightedMean(f, bFixed);
    if (m) {
      for (let a = 0; a < 3; a++) r.position[3 * i + a] = m.x[a];
      for (let a = 0; a < 6; a++) r.covariance[6 * i + a] = m.c[a];
    } else {
      for (let a = 0; a < 3; a++) r.position[3 * i + a] = 0.5 * (r.position[3 * i + a] + b.position[a]);
    }
    return 1;
  }
  if (kf !== kb) {
    const [fx, fl] = kf === 2 ? [f, bFloat] : [bFixed, fFloat];
    if (consistent(fx, fl)) {
      if (kf !== 2) { set(2, b.position, b.covariance, 0, 0); r.fixedAmbiguities[i] = b.fixedAmbiguities; }
      return kf === 2 ? 1 : 2;
    }
  }
  // Float: covariance-weighted mean of the two float solutions (no fixed ambiguity).
  r.fixedAmbiguities[i] = 0;
  // A pass's fix was not taken: its ratio no longer describes the epoch (a ratio >= the threshold, or
  // the held fix's 10000, on a float row would pass a filter on the ratio).
  if (kf === 2 || kb === 2) r.ratio[i] = NaN;
  // Both passes fixed and disagree, or their floats contradict each other: one of the two is wrong and
  // the data at hand cannot tell which (a pass holding its integers is as sure of its float as of its
  // fix; one that has just started is over-confident): the covariance is that of the two candidates.
  const bothFixed = kf === 2 && kb === 2;
  const contradict = bothFixed || !consistent(fFloat, bFloat);
  const m = weightedMean(fFloat, bFloat);
  let x: number[], c: number[];
  if (m) { x = m.x; c = m.c; } else {
    // A singular covariance: the pass whose float covariance inverts (the forward's when neither does).
    const s = inv3(fFloat.covariance, 6 * i) === null && inv3(bFloat.covariance, 0) !== null ? bFloat : fFloat;
    x = [s.position[3 * s.i], s.position[3 * s.i + 1], s.position[3 * s.i + 2]];
    c = [s.covariance[6 * s.i], s.covariance[6 * s.i + 1], s.covariance[6 * s.i + 2], s.covariance[6 * s.i + 3], s.covariance[6 * s.i + 4], s.covariance[6 * s.i + 5]];
  }
  if (contradict) c = candidatesCovariance(bothFixed ? f : fFloat, bothFixed ? bFixed : bFloat, x);
  set(1, x, c, 0, 0);
  return from;
}

/**
 * The covariance about x of two equally likely candidates a and b (one of them wrong): the moment-matched
 * covariance of their mixture, 1/2 [C_a + (x_a - x)(x_a - x)'] + 1/2 [C_b + (x_b - x)(x_b - x)'] (the
 * mixture's second moment about x, as the combination step of an interacting multiple model estimator;
 * Bar-Shalom, Li & Kirubarajan 2001, Estimation with Applications to Tracking and Navigation, ch. 11,
 * from memory). Two fixes 3 m apart give about 2 m about either; a position sure
 * to millimetres that the other candidate contradicts by metres is no longer given millimetres.
 */
function candidatesCovariance(a: Solution, b: Solution, x: readonly number[]): number[] {
  const c = [0, 0, 0, 0, 0, 0];
  for (const s of [a, b]) {
    const d = [s.position[3 * s.i] - x[0], s.position[3 * s.i + 1] - x[1], s.position[3 * s.i + 2] - x[2]];
    const o = 6 * s.i;
    // Symmetric 3x3 stored as [xx xy xz yy yz zz].
    c[0] += 0.5 * (s.covariance[o] + d[0] * d[0]); c[1] += 0.5 * (s.covariance[o + 1] + d[0] * d[1]);
    c[2] += 0.5 * (s.covariance[o + 2] + d[0] * d[2]); c[3] += 0.5 * (s.covariance[o + 3] + d[1] * d[1]);
    c[4] += 0.5 * (s.covariance[o + 4] + d[1] * d[2]); c[5] += 0.5 * (s.covariance[o + 5] + d[2] * d[2]);
  }
  return c;
}

/** D' (C_a + C_b)^-1 D for the difference D of two solutions (Infinity when the sum is singular). */
function mahalanobis2(fx: Solution, fl: Solution): number {
  const o = 6 * fx.i, p = 6 * fl.i;
  const w = inv3([fx.covariance[o] + fl.covariance[p], fx.covariance[o + 1] + fl.covariance[p + 1], fx.covariance[o + 2] + fl.covariance[p + 2],
    fx.covariance[o + 3] + fl.covariance[p + 3], fx.covariance[o + 4] + fl.covariance[p + 4], fx.covariance[o + 5] + fl.covariance[p + 5]], 0);
  if (!w) return Infinity;
  const d = [fx.position[3 * fx.i] - fl.position[3 * fl.i], fx.position[3 * fx.i + 1] - fl.position[3 * fl.i + 1], fx.position[3 * fx.i + 2] - fl.position[3 * fl.i + 2]];
  const wd = mulSym(w, d);
  return d[0] * wd[0] + d[1] * wd[1] + d[2] * wd[2];
}

/**
 * Whether two solutions are consistent (a pass's fixed position with the other pass's float one, or the
 * two passes' float ones): the squared Mahalanobis distance of their difference with the sum of their
 * covariances within chi-square(3 dof) at FIX_FLOAT_ALPHA. The two passes share the epoch's own
 * measurements only, so the sum is close to the difference's covariance.
 */
function consistent(fx: Solution, fl: Solution): boolean {
  return mahalanobis2(fx, fl) <= FIX_FLOAT_CRITICAL;
}

/**
 * Covariance-weighted mean of two passes' positions at epoch k, with its covariance (null when a
 * covariance is singular). Both passes hold the epoch's own measurements, so the covariance is somewhat
 * optimistic; the weights matter where one pass is far better than the other: at the first epochs of a
 * static occupation the forward pass has only those epochs while the backward pass has the whole of it.
 */
function weightedMean(f: Solution, b: Solution): { x: number[]; c: number[] } | null {
  const wf = inv3(f.covariance, 6 * f.i), wb = inv3(b.covariance, 6 * b.i);
  if (!wf || !wb) return null;
  const c = inv3([wf[0] + wb[0], wf[1] + wb[1], wf[2] + wb[2], wf[3] + wb[3], wf[4] + wb[4], wf[5] + wb[5]], 0);
  if (!c) return null;
  const xf = [f.position[3 * f.i], f.position[3 * f.i + 1], f.position[3 * f.i + 2]];
  const xb = [b.position[3 * b.i], b.position[3 * b.i + 1], b.position[3 * b.i + 2]];
  const s1 = mulSym(wf, xf), s2 = mulSym(wb, xb);
  return { x: mulSym(c, [s1[0] + s2[0], s1[1] + s2[1], s1[2] + s2[2]]), c };
}
