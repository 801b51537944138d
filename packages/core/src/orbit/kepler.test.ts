import { readFileSync } from 'node:fs';
import { describe, expect, it } from 'vitest';
import fc from 'fast-check';
import type { KeplerEphemeris } from '../gnss/nav-types.js';
import {
  BEIDOU_CONSTANTS, GALILEO_CONSTANTS, GPS_CONSTANTS, SPEED_OF_LIGHT_MS,
} from './constants.js';
import { keplerStateInto, solveKepler, timeFromEphemerisEpochS } from './kepler.js';
import { satelliteState } from './state.js';

// Broadcast records transcribed from real navigation files (file and line in each record):
// glw1277m.18n (RINEX 2.10, 2018-10-04) and BRDC00IGS_R_20240100000_01D_MN.rnx.gz (RINEX 3, 2024-01-10).
const REC = JSON.parse(readFileSync(new URL('./broadcast-records.test-data.json', import.meta.url), 'utf8'),
  (_k, v) => (v === 'NaN' ? NaN : v)) as Record<string, KeplerEphemeris>;

const norm = (a: { x: number; y: number; z: number }) => Math.hypot(a.x, a.y, a.z);
const diff = (a: { x: number; y: number; z: number }, b: { x: number; y: number; z: number }) =>
  Math.hypot(a.x - b.x, a.y - b.y, a.z - b.z);

describe('orbit constants', () => {
  it('are the ones each interface document prescribes', () => {
    expect(GPS_CONSTANTS.muM3S2).toBe(3.986005e14); // check-values.md Constants, IS-GPS-200 table 20-IV
    expect(GPS_CONSTANTS.omegaERadS).toBe(7.2921151467e-5); // check-values.md, IS-GPS-200
    expect(GPS_CONSTANTS.relativisticF).toBeCloseTo(-4.442807633e-10, 18); // check-values.md, IS-GPS-200 20.3.3.3.3.1
    expect(SPEED_OF_LIGHT_MS).toBe(299792458); // SI definition
    expect(GALILEO_CONSTANTS.muM3S2).toBe(3.986004418e14); // check-values.md, Galileo OS SIS ICD
    expect(BEIDOU_CONSTANTS.omegaERadS).toBe(7.292115e-5); // check-values.md, BeiDou ICD B1I (differs from GPS)
  });
});

describe('Kepler equation', () => {
  it('E - e sin E = M to 1e-12 for any M and eccentricity up to 0.1 (IS-GPS-200 table 20-IV)', () => {
    fc.assert(fc.property(fc.double({ min: -10, max: 10, noNaN: true }), fc.double({ min: 0, max: 0.1, noNaN: true }), (M, e) => {
      const E = solveKepler(M, e);
      return Math.abs(E - e * Math.sin(E) - M) < 1e-12;
    }));
  });

  it('week crossing: toe 604784 s and t 10 s into the next week gives tk = 26 s (IS-GPS-200 20.3.3.4.3)', () => {
    expect(timeFromEphemerisEpochS(10, 604_784)).toBe(26);
    expect(timeFromEphemerisEpochS(604_790, 20)).toBe(-30);
  });
});

/** Velocity against central differences of the position (h = 0.5 s). */
function checkVelocity(eph: KeplerEphemeris, t: number, tolMS: number): void {
  const h = 0.5;
  const s = satelliteState(eph, t);
  const a = satelliteState(eph, t - h).posM;
  const b = satelliteState(eph, t + h).posM;
  const num = { x: (b.x - a.x) / (2 * h), y: (b.y - a.y) / (2 * h), z: (b.z - a.z) / (2 * h) };
  expect(diff(s.velMS, num)).toBeLessThan(tolMS);
}

/** Two consecutive broadcast issues (independent uploads/fits) must give the same orbit in their overlap. */
function overlapM(a: KeplerEphemeris, b: KeplerEphemeris, t: number): number {
  return diff(satelliteState(a, t).posM, satelliteState(b, t).posM);
}

describe('GPS (IS-GPS-200 table 20-IV) from glw1277m.18n G03', () => {
  const e12 = REC['gps-G03-12h'];
  const e14 = REC['gps-G03-14h'];

  it('radius is physically plausible at toe and toe + 1 h', () => {
    // A(1 - e) <= r <= A(1 + e) up to the harmonic corrections (|crs|, |crc| < 200 m here): Kepler's laws.
    const A = e12.sqrtA ** 2;
    for (const dt of [0, 3600]) {
      const r = norm(satelliteState(e12, e12.toeGpsS + dt).posM);
      expect(r).toBeGreaterThan(A * (1 - e12.e) - 200);
      expect(r).toBeLessThan(A * (1 + e12.e) + 200);
      expect(r / 1e3).toBeGreaterThan(26_400); // GPS semi-major axis about 26,560 km (common practice)
      expect(r / 1e3).toBeLessThan(26_700);
    }
  });

  it('two consecutive issues (IODE 66, 67) agree at their overlap to a few metres', () => {
    const t = e12.toeGpsS + 3600; // 13:00, midway
    const d = overlapM(e12, e14, t);
    expect(d).toBeLessThan(2); // broadcast orbit error ~1 m (SPS PS); measured 0.49 m
  });

  it('velocity is the derivative of position (central differences)', () => {
    checkVelocity(e12, e12.toeGpsS + 1800, 1e-4);
    const v = norm(satelliteState(e12, e12.toeGpsS).velMS);
    expect(v).toBeGreaterThan(2_500); // ECEF speed of a GPS satellite is 2.6-3.9 km/s (inertial 3.87 km/s minus Earth rotation)
    expect(v).toBeLessThan(4_000);
  });

  it('the output buffer form gives the same numbers as satelliteState', () => {
    const out = new Float64Array(6);
    keplerStateInto(e12, e12.toeGpsS + 100, out);
    const s = satelliteState(e12, e12.toeGpsS + 100);
    expect([out[0], out[1], out[2], out[3]]).toEqual([s.posM.x, s.posM.y, s.posM.z, s.velMS.x]);
  });
});

describe('Galileo (OS SIS ICD 5.1.1) from BRDC00IGS E11 I/NAV', () => {
  const a = REC['gal-E11-inav-1000'];
  const b = REC['gal-E11-inav-1140'];
  it('radius about 29,600 km and consecutive issues (IODnav 108, 118) agree to a few metres', () => {
    const r = norm(satelliteState(a, a.toeGpsS).posM) / 1e3;
    expect(r).toBeGreaterThan(29_400); // Galileo semi-major axis 29,600 km (Galileo OS SDD; common practice)
    expect(r).toBeLessThan(29_800);
    expect(overlapM(a, b, (a.toeGpsS + b.toeGpsS) / 2)).toBeLessThan(2); // measured 0.79 m
  });
  it('velocity is the derivative of position', () => checkVelocity(a, a.toeGpsS + 900, 1e-4));
});

describe('BeiDou (ICD B1I 5.2.4.12) from BRDC00IGS', () => {
  for (const [name, kind] of [['C23-meo', 'MEO'], ['C08-igso', 'IGSO'], ['C01-geo', 'GEO']] as const) {
    const a = REC[`bds-${name}-00h`];
    const b = REC[`bds-${name}-01h`];
    it(`${kind}: consecutive hourly issues agree at the half hour to a few metres`, () => {
      expect(overlapM(a, b, a.toeGpsS + 1800)).toBeLessThan(2); // measured 0.24 / 0.17 / 0.14 m
    });
    it(`${kind}: velocity is the derivative of position`, () => checkVelocity(a, a.toeGpsS + 600, 1e-4));
  }

  it('GEO C01 is geostationary: r ~ 42,164 km, equatorial, ECEF drift of metres per second', () => {
    const geo = REC['bds-C01-geo-00h'];
    const s = satelliteState(geo, geo.toeGpsS + 1200);
    // Geostationary radius (GM/omega^2)^(1/3) = 42,164 km (Kepler's third law).
    expect(norm(s.posM) / 1e3).toBeCloseTo(Math.cbrt(BEIDOU_CONSTANTS.muM3S2 / BEIDOU_CONSTANTS.omegaERadS ** 2) / 1e3, -2);
    // Without the R_Z R_X(-5 deg) rotation the result would move at ~3 km/s in ECEF. A GEO inclined by
    // ~1.6 deg oscillates north-south at up to v sin i ~ 85 m/s; its equatorial drift is ~1 m/s (measured 1.5).
    expect(Math.hypot(s.velMS.x, s.velMS.y)).toBeLessThan(10);
    expect(norm(s.velMS)).toBeLessThan(200);
    expect(Math.abs(s.posM.z) / 1e3).toBeLessThan(1_500); // |lat| < 2 deg
  });
});
