import { readFileSync } from 'node:fs';
import { describe, expect, it } from 'vitest';
import type { Ephemeris, KeplerEphemeris } from '../gnss/nav-types.js';
import { GPS_CONSTANTS, SPEED_OF_LIGHT_MS } from './constants.js';
import { satelliteState } from './state.js';
import { earthRotationCorrection, satelliteAtTransmission } from './transmit.js';

// Records transcribed from glw1277m.18n (G03, 2018-10-04) and BRDC00IGS (2024-01-10).
const REC = JSON.parse(readFileSync(new URL('./broadcast-records.test-data.json', import.meta.url), 'utf8'),
  (_k, v) => (v === 'NaN' ? NaN : v)) as Record<string, Ephemeris>;
const G03 = REC['gps-G03-12h'] as KeplerEphemeris;
// CORS glw1 header APPROX POSITION XYZ (../shared/data/README.md).
const RX = { x: 3774050.9626, y: -601852.6734, z: 5089350.3688 };
const dist = (a: { x: number; y: number; z: number }, b: { x: number; y: number; z: number }) =>
  Math.hypot(a.x - b.x, a.y - b.y, a.z - b.z);

describe('signal transmission time and Earth rotation (IS-GPS-200 20.3.3.4.3.3.2)', () => {
  const tRx = G03.toeGpsS + 1800;

  it('geometric light time: c tau equals the range to the rotated satellite position', () => {
    const s = satelliteAtTransmission(G03, tRx, null, RX);
    expect(s.flightTimeS).toBeGreaterThan(0.064); // 20,000-26,000 km: 67-86 ms (geometry)
    expect(s.flightTimeS).toBeLessThan(0.09);
    expect(Math.abs(s.rangeM! - SPEED_OF_LIGHT_MS * s.flightTimeS)).toBeLessThan(1e-4);
  });

  it('the Earth-rotation correction moves the satellite by omegaE tau r_xy, at most ~145 m for 0.075 s', () => {
    const s = satelliteAtTransmission(G03, tRx, null, RX);
    const unrotated = satelliteState(G03, tRx - s.flightTimeS).posM;
    const moved = dist(s.posM, unrotated);
    // Rotation by omegaE tau about z moves a point by 2 r_xy sin(omegaE tau / 2) (derived).
    const rxy = Math.hypot(unrotated.x, unrotated.y);
    expect(moved).toBeCloseTo(2 * rxy * Math.sin((GPS_CONSTANTS.omegaERadS * s.flightTimeS) / 2), 6);
    expect(moved).toBeLessThan(GPS_CONSTANTS.omegaERadS * 0.09 * 26_700e3); // < 175 m for any GPS geometry
    // Rotation direction: eastward Earth rotation during flight moves the satellite westward in the receive-time frame.
    const back = earthRotationCorrection(s.posM, -s.flightTimeS, GPS_CONSTANTS.omegaERadS);
    expect(dist(back, unrotated)).toBeLessThan(1e-6);
  });

  it('from a pseudorange: recovers the flight time of a simulated measurement to < 1 ps', () => {
    const geo = satelliteAtTransmission(G03, tRx, null, RX, 'L1');
    // Receiver clock 0: P = c (t_rx - t_tx) + c (0 - dt_sv)  (pseudorange definition, IS-GPS-200 20.3.3.3.3.1).
    const P = SPEED_OF_LIGHT_MS * geo.flightTimeS - SPEED_OF_LIGHT_MS * geo.clock.offsetS;
    const fromP = satelliteAtTransmission(G03, tRx, P, RX, 'L1');
    expect(Math.abs(fromP.flightTimeS - geo.flightTimeS)).toBeLessThan(1e-12);
    expect(dist(fromP.posM, geo.posM)).toBeLessThan(1e-5);
    expect(fromP.rangeM!).toBeCloseTo(geo.rangeM!, 4);
  });

  it('uses the BeiDou rotation rate for BeiDou and refuses a call with neither pseudorange nor receiver', () => {
    const c = REC['bds-C23-meo-00h'] as KeplerEphemeris;
    const s = satelliteAtTransmission(c, c.toeGpsS, null, RX);
    const raw = satelliteState(c, c.toeGpsS - s.flightTimeS).posM;
    const ang = Math.atan2(raw.y, raw.x) - Math.atan2(s.posM.y, s.posM.x);
    expect(ang / s.flightTimeS).toBeCloseTo(7.292115e-5, 12); // check-values.md: BeiDou rotation rate
    expect(() => satelliteAtTransmission(c, c.toeGpsS, null, null)).toThrow(RangeError);
  });
});
