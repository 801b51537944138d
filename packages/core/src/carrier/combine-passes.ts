/**
 * Forward and backward passes combined per epoch:
 *  - both fixed and within `agreementM` (3-D) of each other: fixed, at their covariance-weighted mean;
 *  - one fixed, the other float with the fixed position inside its 3-sigma box (plus the agreement
 *    distance): fixed, at the fixed position (the float pass has not converged yet, and does not object);
 *  - otherwise float: the two float solutions weighted by their covariances (the combination of a
 *    forward and a backward filter, Fraser & Potter 1969, shares only the epoch's own measurements);
 *  - one pass only: that pass's solution.
 * An epoch's residuals (PassResult.residualM) come from the pass whose solution it carries: forward when
 * both fixed and agree; for a float combination, the float pass with the smaller formal variance (none
 * when both passes fixed and disagree: neither pass's residuals belong to the combined float position).
 */
import { PassResult } from './float-filter.js';

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

/**
 * The combined passes, written into `out`: by default a new PassResult, or the forward float result fFloat
 * itself, which saves a day's worth of memory (at each epoch fFloat is read before it is written, and
 * what an epoch leaves unwritten there is what a new result holds: no solution, no fixed ambiguity).
 */
export function combinePasses(f: PassResult, fFloat: PassResult, b: PassResult, bFloat: PassResult, agreementM: number, out: PassResult = new PassResult(f.kind.length)): PassResult {
  const n = f.kind.length;
  const copy = (src: PassResult, k: number, kind: number): void => {
    out.kind[k] = kind;
    for (let i = 0; i < 3; i++) out.position[3 * k + i] = src.position[3 * k + i];
    for (let i = 0; i < 6; i++) out.covariance[6 * k + i] = src.covariance[6 * k + i];
  };
  for (let k = 0; k < n; k++) {
    const kf = f.kind[k], kb = b.kind[k];
    out.ratio[k] = Math.max(Number.isNaN(f.ratio[k]) ? 0 : f.ratio[k], Number.isNaN(b.ratio[k]) ? 0 : b.ratio[k]);
    out.satellitesUsed[k] = Math.max(f.satellitesUsed[k], b.satellitesUsed[k]);
    if (kf === 0 && kb === 0) continue;
    if (kf === 0) { copy(b, k, kb); out.fixedAmbiguities[k] = b.fixedAmbiguities[k]; out.residualFrom[k] = 2; continue; }
    if (kb === 0) { copy(f, k, kf); out.fixedAmbiguities[k] = f.fixedAmbiguities[k]; out.residualFrom[k] = 1; continue; }
    const trace = (r: PassResult): number => r.covariance[6 * k] + r.covariance[6 * k + 3] + r.covariance[6 * k + 5];
    out.residualFrom[k] = kf === 2 && kb === 2 ? 0 : kf === 2 ? 2 : kb === 2 ? 1 : trace(f) <= trace(b) ? 1 : 2;
    const d = [0, 1, 2].map((i) => f.position[3 * k + i] - b.position[3 * k + i]);
    if (kf === 2 && kb === 2 && Math.hypot(d[0], d[1], d[2]) <= agreementM) {
      copy(f, k, 2);
      out.fixedAmbiguities[k] = Math.max(f.fixedAmbiguities[k], b.fixedAmbiguities[k]);
      out.residualFrom[k] = 1;
      const m = weightedMean(f, b, k);
      if (m) {
        for (let i = 0; i < 3; i++) out.position[3 * k + i] = m.x[i];
        for (let i = 0; i < 6; i++) out.covariance[6 * k + i] = m.c[i];
      } else {
        for (let i = 0; i < 3; i++) out.position[3 * k + i] = 0.5 * (f.position[3 * k + i] + b.position[3 * k + i]);
      }
      continue;
    }
    if (kf !== kb) {
      const [fx, fl] = kf === 2 ? [f, bFloat] : [b, fFloat];
      const ok = [0, 1, 2].every((i) => Math.abs(fx.position[3 * k + i] - fl.position[3 * k + i]) <= 3 * Math.sqrt(fl.covariance[6 * k + [0, 3, 5][i]]) + agreementM);
      if (ok) { copy(fx, k, 2); out.fixedAmbiguities[k] = fx.fixedAmbiguities[k]; out.residualFrom[k] = kf === 2 ? 1 : 2; continue; }
    }
    // Float: covariance-weighted mean of the two float solutions.
    const m = weightedMean(fFloat, bFloat, k);
    if (!m) { copy(fFloat, k, 1); continue; }
    out.kind[k] = 1;
    for (let i = 0; i < 3; i++) out.position[3 * k + i] = m.x[i];
    for (let i = 0; i < 6; i++) out.covariance[6 * k + i] = m.c[i];
  }
  return out;
}

/**
 * Covariance-weighted mean of two passes' positions at epoch k, with its covariance (null when a
 * covariance is singular). Both passes hold the epoch's own measurements, so the covariance is somewhat
 * optimistic; the weights matter where one pass is far better than the other: at the first epochs of a
 * static occupation the forward pass has only those epochs while the backward pass has the whole of it.
 */
function weightedMean(f: PassResult, b: PassResult, k: number): { x: number[]; c: number[] } | null {
  const wf = inv3(f.covariance, 6 * k), wb = inv3(b.covariance, 6 * k);
  if (!wf || !wb) return null;
  const c = inv3(wf.map((v, i) => v + wb[i]), 0);
  if (!c) return null;
  const xf = [0, 1, 2].map((i) => f.position[3 * k + i]);
  const xb = [0, 1, 2].map((i) => b.position[3 * k + i]);
  const s1 = mulSym(wf, xf), s2 = mulSym(wb, xb);
  return { x: mulSym(c, [s1[0] + s2[0], s1[1] + s2[1], s1[2] + s2[2]]), c };
}
