import { describe, expect, it } from 'vitest';
import { IonoTruth } from './iono-truth.js';
import { DEFAULT_IONO_ERROR } from './errors.js';

const DEG = Math.PI / 180;
const CHECK_COEFFS = { alpha: [0.382e-7, 0.149e-7, -0.179e-6, 0] as [number, number, number, number], beta: [0.143e6, 0, -0.328e6, 0.113e6] as [number, number, number, number] };

describe('simulated ionosphere', () => {
  it('with scale 1 and no gradient it is the broadcast Klobuchar delay', () => {
    const m = new IonoTruth({ ...DEFAULT_IONO_ERROR, klobucharScale: 1, gradientMPerKm: 0 }, CHECK_COEFFS, { latRad: 40 * DEG, lonRad: -100 * DEG }, 0);
    // check-values.md #1, IS-GPS-200 fig. 20-4: 40 N 100 W, el 20, az 210, tow 593100 -> 23.784 m.
    expect(m.slantDelayL1M(40 * DEG, -100 * DEG, 20 * DEG, 210 * DEG, 593100)).toBeCloseTo(23.784, 3);
  });

  it('is larger at low elevation, and the difference between two receivers grows with their distance', () => {
    const origin = { latRad: 47 * DEG, lonRad: 8 * DEG };
    const m = new IonoTruth(DEFAULT_IONO_ERROR, CHECK_COEFFS, origin, 0.3);
    const t = 1_400_000_000;
    // Obliquity factor F = 1 + 16 (0.53 - E)^3 grows as E falls (IS-GPS-200 fig. 20-4).
    expect(m.slantDelayL1M(origin.latRad, origin.lonRad, 10 * DEG, 0, t)).toBeGreaterThan(m.slantDelayL1M(origin.latRad, origin.lonRad, 80 * DEG, 0, t));
    const meanDiff = (km: number) => {
      let s = 0, n = 0;
      for (let az = 0; az < 360; az += 30) for (const el of [15, 30, 60]) {
        const a = m.slantDelayL1M(origin.latRad, origin.lonRad, el * DEG, az * DEG, t);
        const b = m.slantDelayL1M(origin.latRad - (km / 6371) * Math.cos(150 * DEG), origin.lonRad + ((km / 6371) * Math.sin(150 * DEG)) / Math.cos(origin.latRad), el * DEG, az * DEG, t);
        s += Math.abs(a - b); n++;
      }
      return s / n;
    };
    const d1 = meanDiff(1), d10 = meanDiff(10), d100 = meanDiff(100);
    expect(d10).toBeGreaterThan(d1);
    expect(d100).toBeGreaterThan(d10);
    // About gradient x distance x obliquity (1-4 mm/km vertical: the chosen 2 mm/km): 1 km -> a few mm.
    expect(d1).toBeGreaterThan(0.0005);
    expect(d1).toBeLessThan(0.02);
  });
});
