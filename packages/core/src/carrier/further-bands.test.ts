/**
 * Signals of further bands for carrier phase, checked against the RINEX observation code tables (RINEX 2.11
 * 5.1 and the RINEX 2 -> 3 mapping of gnss/obs-codes.ts; RINEX 3.05 5.1 tables 4-10) with the code lists of
 * real headers in ../shared/data (glw1277m.18o: C1 L1 P2 L2 C2; BELE00BRA...crx: RINEX 3.05), and the
 * ionosphere factor against IS-GPS-200.
 */
import { describe, expect, it } from 'vitest';
import { bandSignal, furtherBandGroup, furtherBands } from './further-bands.js';
import { ionosphereFactor, ionosphereObliquity, ionosphereWeighting } from './ionosphere-weighting.js';
import { carrierWavelengthM, rinex2CodeList, type SatObservations } from '../gnss/index.js';

function sat(sat: string, codes: readonly string[], listed: readonly string[] = codes): SatObservations {
  return { sat, codes: [...listed], values: Float64Array.from(listed, (c) => (codes.includes(c) ? (c[0] === 'C' ? 2.2e7 : 1.1e8) : NaN)), lli: new Uint8Array(listed.length), ssi: new Uint8Array(listed.length) } as unknown as SatObservations;
}

describe('further bands for carrier phase (RINEX code tables)', () => {
  it('bands beyond the primary: GPS L2 then L5, GLONASS G2, Galileo E5a then E5b, BeiDou B3I then B2I', () => {
    expect(furtherBands('G')).toEqual(['2', '5']);
    expect(furtherBands('R')).toEqual(['2']);
    expect(furtherBands('E')).toEqual(['5', '7']);
    expect(furtherBands('C')).toEqual(['6', '7']);
    expect(furtherBands('S')).toEqual([]);
  });

  it('RINEX 2.11 list C1 L1 P2 L2 C2 (glw1277m.18o): GPS L2 is P2 with L2 (C2W/L2W), GLONASS G2 is P2 with L2 (C2P/L2P); C2 has no phase of its own', () => {
    const g = rinex2CodeList('G', ['C1', 'L1', 'P2', 'L2', 'C2']);
    const r = rinex2CodeList('R', ['C1', 'L1', 'P2', 'L2', 'C2']);
    expect(bandSignal('G', '2', sat('G05', g, g))).toBe('C2W');
    expect(bandSignal('R', '2', sat('R05', r, r))).toBe('C2P');
    expect(bandSignal('G', '5', sat('G05', g, g))).toBeNull();
  });

  it('RINEX 3.05 lists of BELE00BRA: GPS C2W (before C2X), L5 C5X; Galileo C5X, C7X; BeiDou C6I, C7I; GLONASS G2 C2C', () => {
    const gl = ['C1C', 'C2W', 'C2X', 'C5X', 'L1C', 'L2W', 'L2X', 'L5X', 'S1C', 'S2W', 'S2X', 'S5X'];
    expect(bandSignal('G', '2', sat('G10', gl))).toBe('C2W');
    expect(bandSignal('G', '5', sat('G10', gl))).toBe('C5X');
    const el = ['C1X', 'C5X', 'C7X', 'C8X', 'L1X', 'L5X', 'L7X', 'L8X', 'S1X', 'S5X', 'S7X', 'S8X'];
    expect(bandSignal('E', '5', sat('E11', el))).toBe('C5X');
    expect(bandSignal('E', '7', sat('E11', el))).toBe('C7X');
    const cl = ['C2I', 'C6I', 'C7I', 'L2I', 'L6I', 'L7I', 'S2I', 'S6I', 'S7I'];
    expect(bandSignal('C', '6', sat('C20', cl))).toBe('C6I');
    expect(bandSignal('C', '7', sat('C20', cl))).toBe('C7I');
    const rl = ['C1C', 'C1P', 'C2C', 'C2P', 'L1C', 'L1P', 'L2C', 'L2P', 'S1C', 'S1P', 'S2C', 'S2P'];
    expect(bandSignal('R', '2', sat('R03', rl))).toBe('C2C');
  });

  it('a blank pseudorange falls to the next code with phase; no code with phase: none', () => {
    const listed = ['C1C', 'C2W', 'C2X', 'L1C', 'L2W', 'L2X'];
    expect(bandSignal('G', '2', sat('G10', ['C1C', 'C2X', 'L1C', 'L2W', 'L2X'], listed))).toBe('C2X');
    expect(bandSignal('G', '2', sat('G10', ['C1C', 'C2W', 'L1C'], ['C1C', 'C2W', 'L1C']))).toBeNull();
  });

  it('group: constellation, band and both receivers\' signals', () => {
    expect(furtherBandGroup('G', '2', 'C2W', 'C2L')).toBe('G2:C2W/C2L');
  });
});

describe('ionosphere weighting', () => {
  it('GPS L2 delay per unit of L1 delay is gamma = (77/60)^2 (IS-GPS-200 20.3.3.3.3.2); Galileo E5a (1176.45 MHz) (154/115)^2', () => {
    expect(ionosphereFactor(carrierWavelengthM('G', 'L2W'), carrierWavelengthM('G', 'L1C'))).toBeCloseTo((77 / 60) ** 2, 12);
    expect(ionosphereFactor(carrierWavelengthM('E', 'L5Q'), carrierWavelengthM('E', 'L1C'))).toBeCloseTo((154 / 115) ** 2, 12);
  });

  it('obliquity 1 at zenith, growing to about 3 at the horizon (single layer at 350 km; IS-GPS-200 20.3.3.5.2.5 gives 3.38 with its own fit)', () => {
    expect(ionosphereObliquity(Math.PI / 2)).toBeCloseTo(1, 12);
    expect(ionosphereObliquity(0)).toBeGreaterThan(3);
    expect(ionosphereObliquity(0)).toBeLessThan(3.4);
  });

  it('prior grows with the baseline: 0.5 mm at zero, 4.5 mm at 1 km', () => {
    expect(ionosphereWeighting(0).verticalSigmaM).toBeCloseTo(0.0005, 12);
    expect(ionosphereWeighting(1000).verticalSigmaM).toBeCloseTo(0.0045, 12);
  });
});
