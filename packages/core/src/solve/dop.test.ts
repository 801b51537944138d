import { describe, expect, it } from 'vitest';
import { dilutionOfPrecision, lineOfSightEnu } from './dop.js';
import { geodeticToEcef, enuToEcefDelta } from '../geodesy/index.js';

const DEG = Math.PI / 180;

/** check-values.md #9: one satellite at zenith, three at 0 deg elevation, azimuths 0/120/240. */
const CASE9 = [lineOfSightEnu(0, 90 * DEG), lineOfSightEnu(0, 0), lineOfSightEnu(120 * DEG, 0), lineOfSightEnu(240 * DEG, 0)];

describe('DOP', () => {
  it('analytic four-satellite geometry in ENU', () => {
    const d = dilutionOfPrecision({ lineOfSight: CASE9.flat(), frame: 'enu' });
    expect(d).not.toBeNull();
    // check-values.md #9 (analytic, derived): GDOP 1.7321, PDOP 1.6330, HDOP 1.1547, VDOP 1.1547, TDOP 0.5774
    expect(d!.gdop).toBeCloseTo(1.7321, 4);
    expect(d!.pdop).toBeCloseTo(1.633, 4);
    expect(d!.hdop).toBeCloseTo(1.1547, 4);
    expect(d!.vdop).toBeCloseTo(1.1547, 4);
    expect(d!.tdop).toBeCloseTo(0.5774, 4);
  });

  it('same geometry given in ECEF at an arbitrary receiver gives the same DOPs', () => {
    const rx = { latRad: 48.4 * DEG, lonRad: 10.9 * DEG, heightM: 500 };
    const los = CASE9.flatMap(([e, n, u]) => {
      const d = enuToEcefDelta({ e, n, u }, rx.latRad, rx.lonRad);
      return [d.x, d.y, d.z];
    });
    // check-values.md #9, rotated with the geodesy ENU frame
    const d1 = dilutionOfPrecision({ lineOfSight: los, frame: 'ecef', receiver: geodeticToEcef(rx) });
    const d2 = dilutionOfPrecision({ lineOfSight: los, frame: 'ecef', receiver: rx });
    for (const d of [d1, d2]) {
      expect(d!.hdop).toBeCloseTo(1.1547, 4);
      expect(d!.vdop).toBeCloseTo(1.1547, 4);
      expect(d!.tdop).toBeCloseTo(0.5774, 4);
    }
  });

  it('a second clock column raises GDOP; too few satellites or a degenerate geometry give null', () => {
    // Two systems, each with its own clock (self-consistency: an extra unknown cannot lower DOP)
    const los = [...CASE9, lineOfSightEnu(60 * DEG, 30 * DEG), lineOfSightEnu(200 * DEG, 45 * DEG)];
    const one = dilutionOfPrecision({ lineOfSight: los.flat(), frame: 'enu' })!;
    const two = dilutionOfPrecision({ lineOfSight: los.flat(), frame: 'enu', clockIndex: [0, 0, 0, 0, 1, 1] })!;
    expect(two.gdop).toBeGreaterThan(one.gdop);
    expect(two.pdop).toBeGreaterThanOrEqual(one.pdop - 1e-12);
    expect(dilutionOfPrecision({ lineOfSight: CASE9.slice(0, 3).flat(), frame: 'enu' })).toBeNull();
    // all four at zenith: horizontal position undetermined
    expect(dilutionOfPrecision({ lineOfSight: [0, 0, 1, 0, 0, 1, 0, 0, 1, 0, 0, 1], frame: 'enu' })).toBeNull();
  });
});
