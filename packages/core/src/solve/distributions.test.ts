import { describe, expect, it } from 'vitest';
import { chiSquareCdf, chiSquareQuantile, logGamma, normalCdf, normalQuantile, regularizedGammaP, regularizedGammaQ } from './distributions.js';

describe('distributions', () => {
  it('log-gamma against exact values', () => {
    // Gamma(n) = (n-1)!, Gamma(1/2) = sqrt(pi) (A&S 6.1.6, 6.1.8)
    expect(logGamma(10)).toBeCloseTo(Math.log(362880), 12);
    expect(logGamma(0.5)).toBeCloseTo(0.5 * Math.log(Math.PI), 12);
    expect(logGamma(1)).toBeCloseTo(0, 13);
    expect(logGamma(30)).toBeCloseTo(Math.log(8.841761993739701e30), 10);
  });
  it('incomplete gamma: P(1, x) = 1 - e^-x and P + Q = 1', () => {
    // A&S 6.5.13 special case a = 1
    for (const x of [0.1, 1, 2.5, 10]) expect(regularizedGammaP(1, x)).toBeCloseTo(1 - Math.exp(-x), 13);
    for (const [a, x] of [[0.5, 3], [4, 2], [7.5, 12]]) expect(regularizedGammaP(a, x) + regularizedGammaQ(a, x)).toBeCloseTo(1, 14);
  });
  it('chi-square quantiles match the standard tables', () => {
    // NIST/SEMATECH e-Handbook of Statistical Methods, table 1.3.6.7.4 (upper critical values of chi-square)
    expect(chiSquareQuantile(0.95, 1)).toBeCloseTo(3.841, 3);
    expect(chiSquareQuantile(0.95, 10)).toBeCloseTo(18.307, 3);
    expect(chiSquareQuantile(0.99, 5)).toBeCloseTo(15.086, 3);
    expect(chiSquareQuantile(0.999, 3)).toBeCloseTo(16.266, 3);
    expect(chiSquareQuantile(0.95, 100)).toBeCloseTo(124.342, 3);
    // lower tail, same table: chi2_0.05(10) = 3.940
    expect(chiSquareQuantile(0.05, 10)).toBeCloseTo(3.94, 3);
    // CDF is the inverse: chi2 with 2 dof is exponential, CDF 1 - e^(-x/2) (A&S 26.4.21 special case)
    expect(chiSquareCdf(5.991464547, 2)).toBeCloseTo(0.95, 9);
    for (const [p, k] of [[0.5, 3], [0.9, 17], [0.001, 4]]) expect(chiSquareCdf(chiSquareQuantile(p, k), k)).toBeCloseTo(p, 12);
  });
  it('normal quantiles match the tables', () => {
    // standard normal table values (e.g. NIST/SEMATECH e-Handbook 1.3.6.7.1): 1.959964 at 0.975, 3.290527 at 0.9995
    expect(normalQuantile(0.975)).toBeCloseTo(1.959964, 6);
    expect(normalQuantile(0.9995)).toBeCloseTo(3.290527, 6);
    expect(normalQuantile(0.5)).toBeCloseTo(0, 14);
    expect(normalQuantile(0.025)).toBeCloseTo(-1.959964, 6);
    expect(normalQuantile(1e-10)).toBeCloseTo(-6.361341, 5); // A&S table 26.1 extended (memory), also checked by the CDF below
    for (const p of [1e-10, 0.01, 0.3, 0.9, 0.999999]) expect(normalCdf(normalQuantile(p)) / p).toBeCloseTo(1, 10);
    // Phi(1) = 0.8413447461 (A&S table 26.1)
    expect(normalCdf(1)).toBeCloseTo(0.8413447461, 10);
  });
});
