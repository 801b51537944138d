/**
 * What a points run adds to summary.json: the scatter about each point's own mean, the grid CRS and the
 * heights in words. Constructed positions whose scatter is known by construction.
 */
import { describe, expect, it } from 'vitest';
import { degToRad, enuToEcefDelta, geodeticToEcef } from '../geodesy/index.js';
import type { EcefM } from '../gnss/index.js';
import { gridCrsWords, heightsStatement, pooledPointScatter, withPointsRun } from './points-run-summary.js';
import { positionScatter } from './statistics.js';
import type { PointEpoch, PointResult } from './points-summary.js';
import { EGM96_NOT_A_DATUM_NOTE } from './points-table.js';

const LAT = degToRad(47.13), LON = degToRad(8.78);
const ORIGIN = geodeticToEcef({ latRad: LAT, lonRad: LON, heightM: 400 });
function at(eastM: number, northM: number, upM = 0): EcefM {
  const d = enuToEcefDelta({ e: eastM, n: northM, u: upM }, LAT, LON);
  return { x: ORIGIN.x + d.x, y: ORIGIN.y + d.y, z: ORIGIN.z + d.z };
}

/** Two occupations 200 m apart, each epoch 1 cm east or west of its point; walking epochs between them. */
function walk(): { epochs: PointEpoch[]; points: PointResult[] } {
  const epochs: PointEpoch[] = [];
  const add = (t: number, p: EcefM) => epochs.push({ tagGpsS: t, ecef: p, kind: 'fixed', pdop: 1.5, antennaHeightM: 1.8 });
  for (let t = 0; t < 60; t++) add(t, at(t % 2 ? 0.01 : -0.01, 0));
  for (let t = 60; t < 100; t++) add(t, at(5 * (t - 60), 0)); // walking
  for (let t = 100; t < 160; t++) add(t, at(200 + (t % 2 ? 0.01 : -0.01), 0));
  const point = (name: string, startGpsS: number, endGpsS: number) => ({ name, startGpsS, endGpsS }) as unknown as PointResult;
  return { epochs, points: [point('A', 0, 59), point('B', 100, 159)] };
}

describe('scatter of a points run (constructed positions)', () => {
  it("is each epoch about its own point's mean, pooled: 1 cm here, where one mean of the whole session gives the size of the walk", () => {
    const { epochs, points } = walk();
    const pooled = pooledPointScatter(epochs, points);
    expect(pooled.points).toBe(2);
    expect(pooled.count).toBe(120); // the walking epochs are left out
    expect(pooled.horizontalMedianM).toBeCloseTo(0.01, 6);
    expect(pooled.horizontal95M).toBeCloseTo(0.01, 6);
    expect(pooled.meanEcef).toBeNull();
    // The old figure: every epoch about one mean, about 100 m for points 200 m apart.
    expect(positionScatter(epochs.map((e) => e.ecef)).horizontalMedianM).toBeGreaterThan(50);
  });
});

describe('grid CRS and heights in words', () => {
  it('an EPSG CRS by its name and code; no EPSG CRS as custom parameters on their datum', () => {
    expect(gridCrsWords({ epsg: 32632, name: 'WGS 84 / UTM zone 32N (EPSG:32632)', definition: '+proj=utm +zone=32' })).toBe('WGS 84 / UTM zone 32N (EPSG:32632)');
    expect(gridCrsWords({ epsg: 25829, name: 'ETRS89 / UTM zone 29N', definition: '+proj=utm +zone=29' })).toBe('ETRS89 / UTM zone 29N (EPSG:25829)');
    const itm = '+proj=tmerc +lat_0=53.5 +lon_0=-8 +k=0.99982 +x_0=600000 +y_0=750000 +ellps=GRS80 +units=m +no_defs';
    expect(gridCrsWords({ epsg: null, name: 'WGS 84 / Irish Transverse Mercator parameters (not EPSG:2157)', definition: itm }))
      .toBe(`custom: ${itm} on WGS 84 (WGS 84 / Irish Transverse Mercator parameters (not EPSG:2157); no EPSG code)`);
    expect(gridCrsWords({ epsg: null, name: 'unknown datum / UTM zone 29N', definition: '+proj=utm +zone=29' })).toMatch(/^custom: \+proj=utm \+zone=29 on an unknown datum /);
    expect(gridCrsWords({ epsg: null, name: '+proj=tmerc +lon_0=9', definition: '+proj=tmerc +lon_0=9' })).toMatch(/^custom: \+proj=tmerc \+lon_0=9 \(a PROJ string as given; its datum is not checked/);
  });

  it("heights: ellipsoidal alone without a geoid; with EGM96 the geoid module's caution that it is not a national height datum", () => {
    const frame = { name: 'WGS84', epochYear: 2024.3672 };
    const none = heightsStatement(frame);
    expect(none.orthometric).toBeNull();
    expect(none.caution).toBeNull();
    expect(none.label).toMatch(/^ellipsoidal .* only/);
    const egm = heightsStatement(frame, { name: 'EGM96 (NGA 15-minute grid, bilinear)', heightReference: 'EGM96 geoid', undulationM: () => 47 });
    expect(egm.label).toMatch(/orthometric .* above EGM96 geoid/);
    // The label's examples as documented: the frame's name without its epoch.
    expect(none.label).toBe('ellipsoidal (height_m, above the ellipsoid of WGS84) only (no geoid model given)');
    expect(egm.label).toBe('ellipsoidal (height_m, above the ellipsoid of WGS84); orthometric (orthometric_height_m = height_m - N) above EGM96 geoid (EGM96 (NGA 15-minute grid, bilinear))');
    expect(egm.caution).toBe(EGM96_NOT_A_DATUM_NOTE);
    // A national model read from a grid file states its own height datum: no EGM96 caution.
    expect(heightsStatement(frame, { name: 'OSGM15 (ISG grid)', heightReference: 'Malin Head', undulationM: () => 57 }).caution).toBeNull();
  });

  it("summary.json of a points run: the solve options kept, the points stage's added; no grid CRS without a projection", () => {
    const doc = withPointsRun({ options: { elevation_mask_deg: 10 }, statistics: { over: 'x' } }, { toleranceHM: 1, toleranceVM: 2, geoidSpec: 'egm96' }, { frame: { name: 'WGS84', epochYear: 2024.3672 } }, null);
    expect(doc.options).toEqual({ elevation_mask_deg: 10, projection: null, geoid: 'egm96', windows: null, tolerance_h_m: 1, tolerance_v_m: 2 });
    expect(doc.grid_crs).toBeNull();
    expect(doc.statistics).toEqual({ over: 'x' });
  });
});
