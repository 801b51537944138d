import { describe, expect, it } from 'vitest';
import { bMethodGlobalAlpha, bMethodNonCentrality, nonCentralChiSquareCdf } from './b-method.js';
import { chiSquareCdf, normalCdf } from './distributions.js';

describe('B-method test levels', () => {
  it('lambda0 = 17.07 for alpha0 = 0.1 % and power 80 % (Baarda 1968; tabulated in Teunissen 2000, "Testing theory", table 4.1)', () => {
    expect(bMethodNonCentrality(0.001, 0.8)).toBeCloseTo(17.07, 2);
  });
  it('with lambda = 0 the non-central chi-square is the central one (definition)', () => {
    for (const [x, k] of [[3, 2], [10, 5], [25, 12]]) expect(nonCentralChiSquareCdf(x, k, 0)).toBeCloseTo(chiSquareCdf(x, k), 10);
  });
  it('with one degree of freedom it is the folded normal: P(|z + sqrt(lambda)| <= sqrt(x)) (definition)', () => {
    const lambda = 4, x = 9;
    const expected = normalCdf(Math.sqrt(x) - Math.sqrt(lambda)) - normalCdf(-Math.sqrt(x) - Math.sqrt(lambda));
    expect(nonCentralChiSquareCdf(x, 1, lambda)).toBeCloseTo(expected, 9);
  });
  it('one degree of freedom: the global test is the w-test; more degrees: a larger level, growing with dof', () => {
    expect(bMethodGlobalAlpha(0.001, 1)).toBe(0.001);
    const a5 = bMethodGlobalAlpha(0.001, 5), a20 = bMethodGlobalAlpha(0.001, 20);
    expect(a5).toBeGreaterThan(0.001);
    expect(a20).toBeGreaterThan(a5);
    // The same power: the non-central distribution at the critical value leaves 80 % above it.
    expect(a5).toBeLessThan(0.1);
  });
});
