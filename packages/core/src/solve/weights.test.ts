import { describe, expect, it } from 'vitest';
import {
  CODE_ELEVATION_WEIGHT_DEFAULTS, elevationVarianceM2, sigmaEpsilonVarianceM2, singleDifferenceVariance,
  strengthVarianceFactor,
} from './weights.js';
import { strengthToDbHz } from '../observables/index.js';

const DEG = Math.PI / 180;

describe('observation weights', () => {
  it('elevation model a^2 + b^2/sin^2(el) with the defaults (common practice)', () => {
    // check-values.md "Weighting": sigma^2 = a^2 + b^2 / sin^2(elevation), a = b = 0.3 m
    expect(elevationVarianceM2(90 * DEG)).toBeCloseTo(0.18, 12);
    expect(elevationVarianceM2(30 * DEG)).toBeCloseTo(0.09 + 0.09 / 0.25, 12);
    // clamped below 5 deg
    expect(elevationVarianceM2(-2 * DEG)).toBeCloseTo(elevationVarianceM2(5 * DEG), 12);
  });
  it('a between-receiver difference has the sum of both variances', () => {
    // error propagation of independent errors (Teunissen, Adjustment theory 2000, 1.3)
    expect(singleDifferenceVariance(40 * DEG, 40 * DEG)).toBeCloseTo(2 * elevationVarianceM2(40 * DEG), 12);
    expect(singleDifferenceVariance(20 * DEG, 70 * DEG)).toBeCloseTo(elevationVarianceM2(20 * DEG) + elevationVarianceM2(70 * DEG), 12);
  });
  it('SIGMA-epsilon: 10 dB less C/N0 is 10 times the variance', () => {
    // Hartinger & Brunner 1999, eq. 3: sigma^2 = C 10^(-cn0/10)
    expect(sigmaEpsilonVarianceM2(35, 1) / sigmaEpsilonVarianceM2(45, 1)).toBeCloseTo(10, 12);
    expect(strengthVarianceFactor(35, 45)).toBeCloseTo(10, 12);
    expect(strengthVarianceFactor(50, 45)).toBe(1);
    const p = { ...CODE_ELEVATION_WEIGHT_DEFAULTS, referenceCn0DbHz: 45 };
    expect(elevationVarianceM2(30 * DEG, p, 42)).toBeCloseTo(elevationVarianceM2(30 * DEG) * 10 ** 0.3, 12);
    expect(elevationVarianceM2(30 * DEG, p, NaN)).toBeCloseTo(elevationVarianceM2(30 * DEG), 12);
  });
  it('RINEX 2 strength digits land inside the RINEX 3.05 dB-Hz bands', () => {
    // RINEX 3.05 signal strength table: 1 <12, 2 12-17, ..., 8 48-53, 9 >=54 dBHz
    const bands: Array<[number, number, number]> = [[1, -Infinity, 12], [2, 12, 18], [3, 18, 24], [4, 24, 30], [5, 30, 36], [6, 36, 42], [7, 42, 48], [8, 48, 54], [9, 54, Infinity]];
    for (const [d, lo, hi] of bands) {
      const v = strengthToDbHz(d, 'rinex2-digit');
      expect(v).toBeGreaterThanOrEqual(lo);
      expect(v).toBeLessThan(hi);
    }
    expect(strengthToDbHz(0, 'rinex2-digit')).toBeNaN();
    expect(strengthToDbHz(44.25, 'dbhz')).toBe(44.25);
    expect(strengthToDbHz(NaN, 'dbhz')).toBeNaN();
  });
});
