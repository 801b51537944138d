/**
 * LAMBDA checked against hand-computable cases and against an independent brute-force integer
 * least-squares search (every integer vector in a box around the float solution) on small random
 * problems: the second implementation is the outside check.
 */
import { describe, expect, it } from 'vitest';
import { decorrelate, lambdaSearch, ltdl } from './lambda.js';
import { fixPartially } from './partial-fix.js';
import { rng, gauss } from '../../../../test/support/random.js';

function quad(a: Float64Array, z: Float64Array, qinv: Float64Array, n: number): number {
  let s = 0;
  for (let i = 0; i < n; i++) for (let j = 0; j < n; j++) s += (a[i] - z[i]) * qinv[i * n + j] * (a[j] - z[j]);
  return s;
}

function inverse(q: Float64Array, n: number): Float64Array {
  const a = new Float64Array(n * 2 * n);
  for (let i = 0; i < n; i++) { for (let j = 0; j < n; j++) a[i * 2 * n + j] = q[i * n + j]; a[i * 2 * n + n + i] = 1; }
  for (let c = 0; c < n; c++) {
    const p = a[c * 2 * n + c];
    for (let j = 0; j < 2 * n; j++) a[c * 2 * n + j] /= p;
    for (let r = 0; r < n; r++) if (r !== c) { const f = a[r * 2 * n + c]; for (let j = 0; j < 2 * n; j++) a[r * 2 * n + j] -= f * a[c * 2 * n + j]; }
  }
  const out = new Float64Array(n * n);
  for (let i = 0; i < n; i++) for (let j = 0; j < n; j++) out[i * n + j] = a[i * 2 * n + n + j];
  return out;
}

/** Every integer vector within +-r of the rounded float solution: best and second-best norms. */
function bruteForce(a: Float64Array, q: Float64Array, n: number, r: number): { best: number[]; norms: [number, number] } {
  const qi = inverse(q, n);
  const base = Array.from(a, Math.round);
  const z = new Float64Array(n);
  let b1 = Infinity, b2 = Infinity, best: number[] = [];
  const rec = (k: number): void => {
    if (k === n) {
      const s = quad(a, z, qi, n);
      if (s < b1) { b2 = b1; b1 = s; best = Array.from(z); } else if (s < b2) b2 = s;
      return;
    }
    for (let d = -r; d <= r; d++) { z[k] = base[k] + d; rec(k + 1); }
  };
  rec(0);
  return { best, norms: [b1, b2] };
}

describe('LAMBDA integer least squares', () => {
  it('LtDL: Q = L\'DL on a hand-checkable 2x2 (Q = [[4,2],[2,3]]: D = [4-4/3, 3], L21 = 2/3)', () => {
    const f = ltdl(Float64Array.of(4, 2, 2, 3), 2)!;
    expect(f.d[1]).toBeCloseTo(3, 12);
    expect(f.d[0]).toBeCloseTo(4 - 4 / 3, 12);
    expect(f.l[2]).toBeCloseTo(2 / 3, 12);
    expect(f.l[0]).toBe(1);
  });

  it('uncorrelated ambiguities: the best vector is plain rounding, the second moves the least precise-weighted one (hand-checkable)', () => {
    // a = (1.2, -3.4), Q = diag(0.01, 0.04): best (1, -3), norm 0.04/0.01 + 0.16/0.04 = 8;
    // candidates (2,-3): 0.64/0.01 + 4 = 68; (1,-4): 4 + 0.36/0.04 = 13 -> second (1,-4), ratio 13/8.
    const r = lambdaSearch(Float64Array.of(1.2, -3.4), Float64Array.of(0.01, 0, 0, 0.04), 2)!;
    expect(Array.from(r.best)).toEqual([1, -3]);
    expect(Array.from(r.second)).toEqual([1, -4]);
    expect(r.bestNorm).toBeCloseTo(8, 10);
    expect(r.ratio).toBeCloseTo(13 / 8, 10);
  });

  it('decorrelation returns a unimodular Z and a transformed covariance with ordered conditional variances', () => {
    const q = Float64Array.of(6.29, 5.978, 0.544, 5.978, 6.292, 2.34, 0.544, 2.34, 6.288); // de Jonge & Tiberius 1996 example 3.2
    const f = ltdl(q, 3)!;
    const z = decorrelate(f.l, f.d, 3);
    const det = z[0] * (z[4] * z[8] - z[5] * z[7]) - z[1] * (z[3] * z[8] - z[5] * z[6]) + z[2] * (z[3] * z[7] - z[4] * z[6]);
    expect(Math.abs(det)).toBeCloseTo(1, 12);
    for (const v of z) expect(Number.isInteger(v)).toBe(true);
    expect(f.d[0] + 1e-6).toBeGreaterThanOrEqual(f.d[1] - 1e-9);
  });

  it('agrees with a brute-force search on 300 small random problems (n = 2..5, strongly correlated)', () => {
    const r = rng(20261202);
    for (let t = 0; t < 300; t++) {
      const n = 2 + (t % 4);
      // Q = G G' + small diagonal: correlated like double-difference ambiguities.
      const g = new Float64Array(n * n);
      for (let i = 0; i < g.length; i++) g[i] = gauss(r) * 0.6;
      const q = new Float64Array(n * n);
      for (let i = 0; i < n; i++) for (let j = 0; j < n; j++) {
        let s = 0;
        for (let k = 0; k < n; k++) s += g[i * n + k] * g[j * n + k];
        q[i * n + j] = s + (i === j ? 0.02 : 0);
      }
      const a = new Float64Array(n);
      for (let i = 0; i < n; i++) a[i] = gauss(r) * 20;
      const l = lambdaSearch(a, q, n)!;
      const b = bruteForce(a, q, n, n <= 3 ? 8 : 4);
      expect(Array.from(l.best)).toEqual(b.best);
      expect(l.bestNorm).toBeCloseTo(b.norms[0], 6);
      expect(l.secondNorm).toBeCloseTo(b.norms[1], 6);
    }
  });

  it('partial fixing leaves the imprecise ambiguity float and fixes the rest', () => {
    // Two precise ambiguities near integers, one imprecise one half-way: the full set fails the ratio test.
    const a = Float64Array.of(3.02, -7.01, 0.5);
    const q = Float64Array.of(0.001, 0, 0, 0, 0.001, 0, 0, 0, 0.5);
    const f = fixPartially(a, q, 3, [2, 0, 1], { ratioThreshold: 3, minFixed: 2 });
    expect(f.indices).toEqual([0, 1]);
    expect(Array.from((f as { integers: Float64Array }).integers)).toEqual([3, -7]);
    const none = fixPartially(a, q, 3, [2, 0, 1], { ratioThreshold: 3, minFixed: 3 });
    expect(none.indices).toEqual([]);
  });
});
