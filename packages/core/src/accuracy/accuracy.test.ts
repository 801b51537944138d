import { describe, expect, it } from 'vitest';
import { circularErrorRadiusM, nssdaAccuracy, probabilityWithinRadius } from './index.js';

describe('NSSDA (FGDC-STD-007.3-1998 Part 3)', () => {
  it('hand-worked 5-point example', () => {
    const d = [
      { dEastM: 0.1, dNorthM: 0.2, dUpM: 0.3 },
      { dEastM: -0.2, dNorthM: 0.1, dUpM: -0.3 },
      { dEastM: 0.3, dNorthM: -0.1, dUpM: 0.2 },
      { dEastM: 0.0, dNorthM: -0.2, dUpM: 0.1 },
      { dEastM: -0.1, dNorthM: 0.1, dUpM: -0.4 },
    ];
    const r = nssdaAccuracy(d);
    // By hand (appendix 3-A, RMSE = sqrt(sum d^2 / n)):
    // east:  0.01 + 0.04 + 0.09 + 0 + 0.01 = 0.15; / 5 = 0.03;  sqrt = 0.173205
    // north: 0.04 + 0.01 + 0.01 + 0.04 + 0.01 = 0.11; / 5 = 0.022; sqrt = 0.148324
    // RMSE_r = sqrt(0.03 + 0.022) = sqrt(0.052) = 0.228035
    // ratio 0.148324 / 0.173205 = 0.8563 -> between 0.6 and 1.0: section 3.2.2,
    // Accuracy_r = 1.7308 * RMSE_r = 1.7308 * 0.228035 = 0.394683
    // (appendix 3-A alternative, reported only: 2.4477 * 0.5 * (0.173205 + 0.148324) = 2.4477 * 0.160765 = 0.393503)
    // up: 0.09 + 0.09 + 0.04 + 0.01 + 0.16 = 0.39; / 5 = 0.078; sqrt = 0.279285; x 1.9600 = 0.547398
    expect(r.n).toBe(5);
    expect(r.rmseEastM).toBeCloseTo(0.173205, 6);
    expect(r.rmseNorthM).toBeCloseTo(0.148324, 6);
    expect(r.rmseHorizontalM).toBeCloseTo(0.228035, 6);
    expect(r.method).toBe('circular-1.7308');
    expect(r.horizontal95M).toBeCloseTo(0.394683, 6);
    expect(r.approximation2_4477M).toBeCloseTo(0.393503, 6);
    expect(r.rmseVerticalM).toBeCloseTo(0.279285, 6);
    expect(r.vertical95M).toBeCloseTo(0.547398, 6);
    // section 3.2.1: at least 20 check points
    expect(r.warnings.map((w) => w.code)).toEqual(['nssda-few-check-points']);
  });

  it('switches method on the RMSE_min / RMSE_max ratio', () => {
    const make = (e: number, n: number, count: number) =>
      Array.from({ length: count }, (_, i) => ({ dEastM: i % 2 ? e : -e, dNorthM: i % 2 ? -n : n }));
    // equal components: case 1, 1.7308 RMSE_r (section 3.2.2)
    const eq = nssdaAccuracy(make(0.5, 0.5, 20));
    expect(eq.method).toBe('circular-1.7308');
    expect(eq.horizontal95M).toBeCloseTo(1.7308 * Math.hypot(0.5, 0.5), 9);
    expect(eq.warnings).toEqual([]);
    expect(Number.isNaN(eq.vertical95M)).toBe(true);
    // ratio exactly 0.6: still inside the 0.6-1.0 range of the circular formula (section 3.2.2)
    const r06 = nssdaAccuracy(make(1.0, 0.6, 20));
    expect(r06.method).toBe('circular-1.7308');
    expect(r06.horizontal95M).toBeCloseTo(1.7308 * Math.hypot(1.0, 0.6), 9);
    expect(r06.approximation2_4477M).toBeCloseTo(2.4477 * 0.8, 9);
    expect(r06.warnings).toEqual([]);
    // ratio 0.5: outside the approximation; exact radius, with a warning
    const r05 = nssdaAccuracy(make(1.0, 0.5, 20));
    expect(r05.method).toBe('bivariate-normal-exact');
    expect(r05.warnings.map((w) => w.code)).toEqual(['nssda-elongated-errors']);
    expect(r05.horizontal95M).toBeCloseTo(circularErrorRadiusM(0.95, 1.0, 0.5), 12);
  });
});

describe('circular error of a bivariate normal', () => {
  it('equal sigmas: Rayleigh radius sigma sqrt(-2 ln 0.05) = 2.4477 sigma (the NSSDA factor)', () => {
    // Rayleigh distribution quantile (closed form); NSSDA 3.2.2 prints 2.4477
    expect(circularErrorRadiusM(0.95, 0.3, 0.3) / 0.3).toBeCloseTo(Math.sqrt(-2 * Math.log(0.05)), 9);
    expect(circularErrorRadiusM(0.95, 1, 1)).toBeCloseTo(2.4477, 4);
  });
  it('one sigma -> 0: the one-dimensional 95 % quantile 1.9600 sigma', () => {
    // standard normal two-sided 95 % quantile 1.959964
    expect(circularErrorRadiusM(0.95, 1, 1e-6)).toBeCloseTo(1.959964, 4);
  });
  it('NSSDA case-2 approximation: 0.3 % low at ratio 0.9, 5.9 % low at ratio 0.6 (edge of its range)', () => {
    // measured here against the exact radius; the approximation always errs low for unequal sigmas
    const exact = circularErrorRadiusM(0.95, 1, 0.6);
    expect((exact - 2.4477 * 0.8) / exact).toBeGreaterThan(0.05);
    expect((exact - 2.4477 * 0.8) / exact).toBeLessThan(0.065);
    const e09 = circularErrorRadiusM(0.95, 1, 0.9);
    expect(Math.abs(2.4477 * 0.95 - e09) / e09).toBeLessThan(0.004);
    expect(probabilityWithinRadius(exact, 1, 0.6)).toBeCloseTo(0.95, 9);
  });
});
