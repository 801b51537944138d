import { readFileSync } from 'node:fs';
import { describe, expect, it } from 'vitest';
import type { GlonassEphemeris, KeplerEphemeris } from '../gnss/nav-types.js';
import { GAMMA_L1_L2, isGalileoFnav, satelliteClock } from './clock.js';
import { FREQ_L1_HZ, FREQ_L2_HZ } from './constants.js';
import { eccentricAnomaly } from './kepler.js';

// Records transcribed from glw1277m.18n / glw1277m.18g (2018-10-04) and BRDC00IGS_R_20240100000_01D_MN.rnx.gz.
const REC = JSON.parse(readFileSync(new URL('./broadcast-records.test-data.json', import.meta.url), 'utf8'),
  (_k, v) => (v === 'NaN' ? NaN : v)) as Record<string, KeplerEphemeris>;
const GREC = REC as unknown as Record<string, GlonassEphemeris>;

describe('satellite clock (IS-GPS-200 20.3.3.3.3)', () => {
  const g12 = REC['gps-G03-12h'];
  const g14 = REC['gps-G03-14h'];

  it('gamma = (77/60)^2 = (f_L1/f_L2)^2', () => {
    expect(GAMMA_L1_L2).toBeCloseTo((FREQ_L1_HZ / FREQ_L2_HZ) ** 2, 14); // check-values.md: L1/L2 frequencies, gamma
  });

  it('offset = af0 + af1 dt + af2 dt^2 + F e sqrtA sin E - TGD for L1; gamma TGD for L2; 0 for L1/L2 IF', () => {
    const t = g12.tocGpsS + 1234;
    const dt = 1234;
    const E = eccentricAnomaly(g12, t).eRad;
    const rel = -4.442807633e-10 * g12.e * g12.sqrtA * Math.sin(E); // check-values.md: F (GPS), IS-GPS-200 20.3.3.3.3.1
    const poly = g12.af0 + g12.af1 * dt + g12.af2 * dt * dt;
    const l1 = satelliteClock(g12, t, 'L1');
    expect(l1.relativisticS).toBeCloseTo(rel, 17);
    expect(l1.offsetS).toBeCloseTo(poly + rel - g12.tgdS, 16);
    expect(satelliteClock(g12, t, 'L2').offsetS).toBeCloseTo(poly + rel - (77 / 60) ** 2 * g12.tgdS, 16);
    expect(satelliteClock(g12, t, 'L1L2-IF').offsetS).toBeCloseTo(poly + rel, 16);
    expect(satelliteClock(g12, t).offsetS).toBe(l1.offsetS); // default: L1
    // L5 approximation: (f_L1/f_L5)^2 = (154/115)^2 (check-values.md frequencies).
    expect(satelliteClock(g12, t, 'L5').groupDelayS).toBeCloseTo((154 / 115) ** 2 * g12.tgdS, 20);
    // |dt_r| <= |F| e sqrtA = 4.1 ns for this orbit (e = 0.0018).
    expect(Math.abs(rel)).toBeLessThan(4.2e-9);
  });

  it('drift is the derivative of the offset', () => {
    const t = g12.tocGpsS + 3000;
    const h = 10;
    const num = (satelliteClock(g12, t + h).offsetS - satelliteClock(g12, t - h).offsetS) / (2 * h);
    expect(satelliteClock(g12, t).driftSS).toBeCloseTo(num, 16);
  });

  it('two consecutive GPS issues give the same clock at their overlap to a few ns', () => {
    const t = g12.tocGpsS + 3600;
    // Independent broadcasts (IODC 66, 67); measured 0.08 ns.
    expect(Math.abs(satelliteClock(g12, t).offsetS - satelliteClock(g14, t).offsetS)).toBeLessThan(1e-9);
  });

  it('rejects a signal the system does not have', () => {
    expect(() => satelliteClock(g12, g12.tocGpsS, 'E1')).toThrow(RangeError);
  });
});

describe('Galileo clock (OS SIS ICD 5.1.4, 5.1.5)', () => {
  const inav = REC['gal-E11-inav-1000'];
  const fnav = REC['gal-E11-fnav-1000'];
  it('recognises I/NAV and F/NAV from the RINEX data-source bits (517, 258)', () => {
    expect(isGalileoFnav(inav)).toBe(false);
    expect(isGalileoFnav(fnav)).toBe(true);
  });
  it('E1 single-frequency: I/NAV with BGD(E1,E5b) and F/NAV with BGD(E1,E5a) give the same clock to < 1 ns', () => {
    const t = inav.tocGpsS + 600;
    const a = satelliteClock(inav, t, 'E1');
    const b = satelliteClock(fnav, t, 'E1');
    expect(a.groupDelayS).toBe(inav.tgd2S);
    expect(b.groupDelayS).toBe(fnav.tgdS);
    // Two clocks fitted for different signal pairs, each brought to E1 by its own BGD (an outside check).
    expect(Math.abs(a.offsetS - b.offsetS)).toBeLessThan(1e-9); // measured 0.22 ns
    expect(() => satelliteClock(inav, t, 'E5a')).toThrow(RangeError);
  });
});

describe('BeiDou clock (ICD B1I 5.2.4.10)', () => {
  const c = REC['bds-C23-meo-00h'];
  it('B3I reference: B1I subtracts TGD1, B2I TGD2, B3I nothing', () => {
    const t = c.tocGpsS + 100;
    const b3 = satelliteClock(c, t, 'B3I');
    expect(b3.groupDelayS).toBe(0);
    expect(satelliteClock(c, t, 'B1I').offsetS).toBeCloseTo(b3.offsetS - c.tgdS, 18);
    expect(satelliteClock(c, t, 'B2I').offsetS).toBeCloseTo(b3.offsetS - c.tgd2S, 18);
  });
  it('consecutive hourly issues agree at the half hour to a few ns', () => {
    const next = REC['bds-C23-meo-01h'];
    const t = c.tocGpsS + 1800;
    expect(Math.abs(satelliteClock(c, t).offsetS - satelliteClock(next, t).offsetS)).toBeLessThan(3e-9); // measured 0.46 ns
  });
});

describe('GLONASS clock (GLONASS ICD 5.1 3.3.3)', () => {
  const a = GREC['glo-R07-1215'];
  const b = GREC['glo-R07-1245'];
  it('dt = -TauN + GammaN (t - t_b), no relativistic term; consecutive records agree to a few ns', () => {
    const t = (a.tbGpsS + b.tbGpsS) / 2;
    const ca = satelliteClock(a, t);
    expect(ca.offsetS).toBe(a.clockBiasS + a.gammaN * 900);
    expect(ca.relativisticS).toBe(0);
    expect(Math.abs(ca.offsetS - satelliteClock(b, t).offsetS)).toBeLessThan(5e-9); // measured 0.93 ns
  });
});
