import { describe, expect, it } from 'vitest';
import fc from 'fast-check';
import { SingularValueDecomposition, Matrix } from 'ml-matrix';
import { solveWeightedLeastSquares, solveWeightedLeastSquaresSmall } from './wls.js';
import type { WlsSolution, WlsSolver } from './wls.js';
import { rng } from '../../../../test/support/random.js';

/** Deterministic generator (mulberry32, common practice) so a fast-check seed reproduces a whole problem. */

const solvers: Array<[string, WlsSolver]> = [
  ['ml-matrix', solveWeightedLeastSquares],
  ['hand-written', solveWeightedLeastSquaresSmall],
];

describe.each(solvers)('WLS (%s)', (_name, solve) => {
  it('weighted straight-line fit equals the closed-form normal-equation solution', () => {
    // Weighted regression y = c0 + c1 t: c1 = Sw*Swty - Swt*Swy / (Sw*Swtt - Swt^2) (Gauss normal
    // equations for two parameters; e.g. Press et al., Numerical Recipes 15.2, eq. 15.2.6)
    const t = [0, 1, 2, 3, 4, 5];
    const y = [1.1, 2.9, 5.2, 7.1, 8.8, 11.3];
    const s2 = [1, 4, 1, 2, 1, 0.5];
    const design = new Float64Array(t.flatMap((ti) => [1, ti]));
    const r = solve(design, 6, 2, Float64Array.from(y), Float64Array.from(s2));
    expect(r.ok).toBe(true);
    const s = r as WlsSolution;
    let S = 0, Sx = 0, Sy = 0, Sxx = 0, Sxy = 0;
    for (let i = 0; i < 6; i++) {
      const w = 1 / s2[i];
      S += w; Sx += w * t[i]; Sy += w * y[i]; Sxx += w * t[i] * t[i]; Sxy += w * t[i] * y[i];
    }
    const delta = S * Sxx - Sx * Sx;
    const c0 = (Sxx * Sy - Sx * Sxy) / delta; // NR eq. 15.2.6
    const c1 = (S * Sxy - Sx * Sy) / delta;
    expect(s.x[0]).toBeCloseTo(c0, 12);
    expect(s.x[1]).toBeCloseTo(c1, 12);
    // NR eq. 15.2.9: var(c0) = Sxx/delta, var(c1) = S/delta, cov = -Sx/delta
    expect(s.qxx[0]).toBeCloseTo(Sxx / delta, 12);
    expect(s.qxx[3]).toBeCloseTo(S / delta, 12);
    expect(s.qxx[1]).toBeCloseTo(-Sx / delta, 12);
    let vtpv = 0;
    for (let i = 0; i < 6; i++) vtpv += (y[i] - c0 - c1 * t[i]) ** 2 / s2[i];
    expect(s.vtpv).toBeCloseTo(vtpv, 10);
    expect(s.dof).toBe(4);
    expect(s.sigma0Sq).toBeCloseTo(vtpv / 4, 10);
    // Redundancy numbers r_i = Qvv_ii / Qyy_ii sum to m - n (Teunissen, Adjustment theory 2000; Baarda 1968)
    let rsum = 0;
    for (let i = 0; i < 6; i++) rsum += s.qvvDiag[i] / s2[i];
    expect(rsum).toBeCloseTo(4, 10);
  });

  it('m == n: exact solution, zero residuals, sigma0Sq NaN', () => {
    // 2x + y = 5, x - y = 1 -> x = 2, y = 1 (elementary algebra)
    const r = solve(Float64Array.from([2, 1, 1, -1]), 2, 2, Float64Array.from([5, 1]), Float64Array.from([1, 1]));
    expect(r.ok).toBe(true);
    const s = r as WlsSolution;
    expect(s.x[0]).toBeCloseTo(2, 12);
    expect(s.x[1]).toBeCloseTo(1, 12);
    expect(Number.isNaN(s.sigma0Sq)).toBe(true);
    expect(s.qvvDiag[0]).toBeCloseTo(0, 12);
  });

  it('singular geometry (two equal columns, or m < n) is a typed failure', () => {
    const design = Float64Array.from([1, 1, 0.5, 2, 2, 0.1, 3, 3, -1, 4, 4, 2]);
    const r = solve(design, 4, 3, Float64Array.from([1, 2, 3, 4]), Float64Array.from([1, 1, 1, 1]));
    expect(r).toMatchObject({ ok: false, reason: 'singular' });
    const r2 = solve(Float64Array.from([1, 2, 3]), 1, 3, Float64Array.from([1]), Float64Array.from([1]));
    expect(r2).toMatchObject({ ok: false, reason: 'singular' });
  });

  it('rejects a non-positive variance at the boundary', () => {
    expect(() => solve(Float64Array.from([1, 1]), 2, 1, Float64Array.from([1, 2]), Float64Array.from([1, 0]))).toThrow(RangeError);
  });
});

describe('WLS: hand-written solver agrees with ml-matrix', () => {
  it('thousands of random well-conditioned problems to 1e-9 relative (fast-check)', () => {
    let tested = 0;
    fc.assert(
      fc.property(fc.integer({ min: 1, max: 8 }), fc.integer({ min: 0, max: 12 }), fc.integer(), (n, extra, seed) => {
        const m = n + extra;
        const r = rng(seed);
        const design = Float64Array.from({ length: m * n }, () => 2 * r() - 1);
        const y = Float64Array.from({ length: m }, () => 100 * (2 * r() - 1));
        const variances = Float64Array.from({ length: m }, () => 0.1 + 10 * r());
        // keep problems with condition number < 1e4 (well-conditioned by construction of the property)
        const cond = new SingularValueDecomposition(new Matrix(Array.from({ length: m }, (_, i) => Array.from(design.subarray(i * n, i * n + n))))).condition;
        fc.pre(cond < 1e4);
        tested++;
        const a = solveWeightedLeastSquares(design, m, n, y, variances);
        const b = solveWeightedLeastSquaresSmall(design, m, n, y, variances);
        expect(a.ok && b.ok).toBe(true);
        if (!a.ok || !b.ok) return;
        // relative to the vector's largest entry, or to the input's scale when the vector is ~0 (m == n)
        const close = (p: Float64Array, q: Float64Array, inputScale: number) => {
          let scale = inputScale;
          for (const v of p) scale = Math.max(scale, Math.abs(v));
          for (let i = 0; i < p.length; i++) expect(Math.abs(p[i] - q[i])).toBeLessThanOrEqual(1e-9 * scale);
        };
        close(a.x, b.x, 0);
        close(a.qxx, b.qxx, 0);
        close(a.residuals, b.residuals, 100);
        close(a.qvvDiag, b.qvvDiag, 10);
        expect(Math.abs(a.vtpv - b.vtpv)).toBeLessThanOrEqual(1e-9 * Math.max(a.vtpv, 1));
      }),
      { numRuns: 3000, seed: 20240611 },
    );
    expect(tested).toBeGreaterThan(2000);
  });
});
