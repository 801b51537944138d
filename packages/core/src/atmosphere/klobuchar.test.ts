import { describe, expect, it } from 'vitest';
import { beidouKlobucharDelayM, klobucharDelayM, scaleIonosphereDelayM } from './klobuchar.js';
import type { KlobucharCoefficients } from '../gnss/nav-types.js';

const DEG = Math.PI / 180;
// check-values.md #1 coefficients
const COEFFS: KlobucharCoefficients = {
  alpha: [0.382e-7, 0.149e-7, -0.179e-6, 0],
  beta: [0.143e6, 0, -0.328e6, 0.113e6],
};

describe('Klobuchar', () => {
  it('GPS L1 delay for the published case', () => {
    // check-values.md #1, IS-GPS-200 fig. 20-4: 40 N, 100 W, el 20, az 210, TOW 593100 -> 23.784 m (+-0.001)
    const d = klobucharDelayM(COEFFS, 40 * DEG, -100 * DEG, 20 * DEG, 210 * DEG, 593100);
    expect(Math.abs(d - 23.784)).toBeLessThanOrEqual(0.001);
  });

  it('night-time floor: 5 ns times the obliquity factor', () => {
    // IS-GPS-200 fig. 20-4: T_iono = F * 5e-9 s when |x| >= 1.57; at zenith F = 1 + 16 (0.53 - 0.5)^3
    const tow = (100 / 180) * 43200; // local midnight at the 100 W pierce point (t = 43200 lambda_I + tow = 0)
    const d = klobucharDelayM(COEFFS, 0, -100 * DEG, 90 * DEG, 0, tow);
    expect(d).toBeCloseTo((1 + 16 * 0.03 ** 3) * 5e-9 * 299792458, 6);
  });

  it('scales with (f1/f)^2', () => {
    // first-order ionosphere delay proportional to 1/f^2 (IS-GPS-200 20.3.3.3.3.2)
    expect(scaleIonosphereDelayM(10, 1227.6e6)).toBeCloseTo(10 * (1575.42 / 1227.6) ** 2, 12);
  });

  it('BeiDou variant: same order of magnitude as the GPS model with the same coefficients (plausibility)', () => {
    // BDS-SIS-ICD-B1I 5.2.4.7 (from memory): a different shell and latitude, so only order of magnitude is comparable
    for (const [el, az, tow] of [[20, 210, 593100], [45, 0, 50400 + 100 * 240], [70, 90, 30000], [10, 300, 70000]]) {
      const gps = klobucharDelayM(COEFFS, 40 * DEG, -100 * DEG, el * DEG, az * DEG, tow);
      const bds = beidouKlobucharDelayM(COEFFS, 40 * DEG, -100 * DEG, el * DEG, az * DEG, tow);
      expect(bds).toBeGreaterThan(gps / 1.5);
      expect(bds).toBeLessThan(gps * 1.5);
    }
    // zenith at night: exactly 5 ns (no obliquity at zenith), ICD 5.2.4.7
    const night = beidouKlobucharDelayM(COEFFS, 0, 0, 90 * DEG, 0, 14 + 0);
    expect(night).toBeCloseTo(5e-9 * 299792458, 9);
  });
});
