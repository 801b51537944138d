import { readFileSync } from 'node:fs';
import { describe, expect, it } from 'vitest';
import type { GlonassEphemeris } from '../gnss/nav-types.js';
import { glonassStateInto } from './glonass.js';
import { satelliteState } from './state.js';

// GLONASS records transcribed from glw1277m.18g (RINEX 2.10, 2018-10-04; file and line in each record).
const REC = JSON.parse(readFileSync(new URL('./broadcast-records.test-data.json', import.meta.url), 'utf8'),
  (_k, v) => (v === 'NaN' ? NaN : v)) as Record<string, GlonassEphemeris>;

const diff = (a: { x: number; y: number; z: number }, b: { x: number; y: number; z: number }) =>
  Math.hypot(a.x - b.x, a.y - b.y, a.z - b.z);

function stateVector(tb: number, posKm: number[], velKmS: number[], accMS2: [number, number, number] = [0, 0, 0]): GlonassEphemeris {
  return {
    kind: 'glonass', sat: 'R01', system: 'R', message: '', tbGpsS: tb, clockBiasS: 0, gammaN: 0, frameTimeS: 0,
    posM: [posKm[0] * 1e3, posKm[1] * 1e3, posKm[2] * 1e3], velMS: [velKmS[0] * 1e3, velKmS[1] * 1e3, velKmS[2] * 1e3],
    accMS2, health: 0, channel: 1, ageDays: 0, file: 'check-values.md', line: 0,
  };
}

describe('GLONASS Runge-Kutta integration (GLONASS ICD 5.1 A.3.1.2)', () => {
  it('reproduces check-values.md #6 to within 1 m (no luni-solar accelerations given)', () => {
    // check-values.md #6 (GLONASS CDMA ICD 2016 example, via Orekit tests; secondary): t_b 11700 s,
    // state -> at 12300 s 7523.174819, -10506.961965, 21999.239413 km. The published result includes
    // luni-solar accelerations that are not given with the example (check-values.md: ~0.45 m without them),
    // so the tolerance is 1 m; measured 0.50 m.
    const eph = stateVector(11_700, [7003.008789, -12206.626953, 21280.765625], [0.7835417, 2.804253, 1.352515]);
    const s = satelliteState(eph, 12_300);
    const d = diff(s.posM, { x: 7523.174819e3, y: -10506.961965e3, z: 21999.239413e3 });
    expect(d).toBeLessThan(1);
    expect(d).toBeGreaterThan(0.2); // the missing luni-solar part is visible: the J2/Coriolis terms are in
  });

  it('integrating forward from one broadcast and backward from the next (30 min apart) agrees to a few metres', () => {
    const a = REC['glo-R07-1215'];
    const b = REC['glo-R07-1245'];
    const t = (a.tbGpsS + b.tbGpsS) / 2;
    // Two independent broadcast state vectors of R07 (t_b 12:15 and 12:45 UTC); measured 0.60 m.
    expect(diff(satelliteState(a, t).posM, satelliteState(b, t).posM)).toBeLessThan(3);
    // And each reaches the other's epoch with the broadcast position within the state's own accuracy.
    const atB = satelliteState(a, b.tbGpsS).posM;
    expect(diff(atB, { x: b.posM[0], y: b.posM[1], z: b.posM[2] })).toBeLessThan(5); // measured 1.6 m
  });

  it('velocity is the derivative of position, and results do not depend on call order', () => {
    const a = REC['glo-R07-1215'];
    const t = a.tbGpsS + 437.3;
    const h = 0.5;
    const p1 = satelliteState(a, t - h).posM;
    const p2 = satelliteState(a, t + h).posM;
    const v = satelliteState(a, t).velMS;
    expect(diff(v, { x: (p2.x - p1.x) / (2 * h), y: (p2.y - p1.y) / (2 * h), z: (p2.z - p1.z) / (2 * h) })).toBeLessThan(1e-3);
    // A fresh copy (empty node cache) asked first at t gives the same bits as the used one.
    const fresh: GlonassEphemeris = { ...a };
    const out = new Float64Array(6);
    glonassStateInto(fresh, t, out);
    const again = satelliteState(a, t).posM;
    expect([out[0], out[1], out[2]]).toEqual([again.x, again.y, again.z]);
  });

  it('returns the broadcast state itself at t_b and refuses integrations past an hour', () => {
    const a = REC['glo-R07-1215'];
    const s = satelliteState(a, a.tbGpsS);
    expect([s.posM.x, s.posM.y, s.posM.z]).toEqual([...a.posM]);
    expect(() => satelliteState(a, a.tbGpsS + 3601)).toThrow(RangeError);
  });
});
