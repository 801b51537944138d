import { describe, expect, it } from 'vitest';
import { dataSnooping, globalTest, qualityControlLoop } from './tests.js';
import { solveWeightedLeastSquares, solveWeightedLeastSquaresSmall } from './wls.js';
import type { WlsSolution } from './wls.js';
import { rng, gauss } from '../../../../test/support/random.js';


/** Line fit y = 2 + 0.5 t with sigma 0.1 noise, one blunder of `blunder` on row `bad`. */
function regression(blunder: number, bad: number, seed = 7) {
  const r = rng(seed);
  const m = 20;
  const design = new Float64Array(2 * m);
  const misclosure = new Float64Array(m);
  const variances = new Float64Array(m).fill(0.01);
  for (let i = 0; i < m; i++) {
    design[2 * i] = 1;
    design[2 * i + 1] = i;
    misclosure[i] = 2 + 0.5 * i + 0.1 * gauss(r) + (i === bad ? blunder : 0);
  }
  return { design, m, n: 2, misclosure, variances };
}

describe('statistical testing', () => {
  it('global test critical value is the chi-square table value', () => {
    // NIST/SEMATECH table 1.3.6.7.4: chi2_0.99(5) = 15.086
    expect(globalTest(15.0, 5, 0.01)).toMatchObject({ passed: true });
    expect(globalTest(15.2, 5, 0.01)).toMatchObject({ passed: false });
    expect(globalTest(15.0, 5, 0.01).critical).toBeCloseTo(15.086, 3);
    expect(globalTest(7, 0, 0.01).passed).toBe(true);
  });

  it('w-test critical value for alpha 0.001 is 3.29', () => {
    // Baarda 1968: k = N^-1(1 - alpha/2) = 3.29 for alpha = 0.001 (normal table 3.290527)
    const p = regression(0, -1);
    const s = solveWeightedLeastSquares(p.design, p.m, p.n, p.misclosure, p.variances) as WlsSolution;
    const d = dataSnooping(s, p.variances, 0.001);
    expect(d.critical).toBeCloseTo(3.290527, 6);
  });

  it('the loop removes a single 1 m blunder and nothing else (self-consistency, synthetic)', () => {
    for (const solver of [solveWeightedLeastSquares, solveWeightedLeastSquaresSmall]) {
      const qc = qualityControlLoop(regression(1.0, 13), { solver });
      expect(qc.removed.map((x) => x.index)).toEqual([13]);
      expect(Math.abs(qc.removed[0].w)).toBeGreaterThan(3.29);
      expect(qc.removed[0].reason).toMatch(/global test failed/);
      expect(qc.accepted).toBe(true);
      expect(qc.keptIndices.length).toBe(19);
      const s = qc.solution as WlsSolution;
      expect(s.x[0]).toBeCloseTo(2, 0);
      expect(s.x[1]).toBeCloseTo(0.5, 1);
    }
  });

  it('clean data: nothing removed; too little redundancy: nothing removed and not accepted', () => {
    const qc = qualityControlLoop(regression(0, -1));
    expect(qc.removed).toEqual([]);
    expect(qc.accepted).toBe(true);
    // 3 observations, 2 unknowns, a blunder: dof 1 < 2, cannot identify (self-consistency)
    const tiny = {
      design: Float64Array.from([1, 0, 1, 1, 1, 2]), m: 3, n: 2,
      misclosure: Float64Array.from([0, 1, 7]), variances: Float64Array.from([0.01, 0.01, 0.01]),
    };
    const q2 = qualityControlLoop(tiny);
    expect(q2.removed).toEqual([]);
    expect(q2.accepted).toBe(false);
  });
});
