import { execFileSync } from 'node:child_process';
import { readFileSync } from 'node:fs';
import { createRequire } from 'node:module';
import { dirname, join } from 'node:path';
import { describe, expect, it } from 'vitest';
import { gridAreaWarning, gridFactors, makeProjection, outsideGridArea, resolveProjectionSpec, TM_LIMIT_A_DEG, utmZoneBands, utmZoneFor, type EpsgLookup } from './index.js';

// The outside reference: the EPSG dataset as shipped in the npm package epsg-index (name, kind, PROJ
// string, WKT and area of use per code).
const epsgDir = join(dirname(createRequire(import.meta.url).resolve('epsg-index/package.json')), 's');
const lookup: EpsgLookup = (code) => {
  try {
    const j = JSON.parse(readFileSync(join(epsgDir, `${code}.json`), 'utf8')) as { name: string; kind: string; proj4: string | null; wkt: string | null; bbox: number[]; area: string };
    const [northDeg, westDeg, southDeg, eastDeg] = j.bbox;
    return { code, name: j.name, kind: j.kind, proj4: j.proj4 ?? '', wkt: j.wkt, areaOfUse: { northDeg: northDeg!, westDeg: westDeg!, southDeg: southDeg!, eastDeg: eastDeg!, description: j.area } };
  } catch {
    return undefined;
  }
};
const proj = (spec: string) => makeProjection(spec, undefined, lookup);

/** PROJ's own point scale ('proj -V': "Parallel scale (k)"), or null without the PROJ command-line tools. */
function projScale(projString: string, latDeg: number, lonDeg: number): number | null {
  try {
    const out = execFileSync('proj', ['-V', ...projString.split(' ')], { input: `${lonDeg} ${latDeg}\n`, encoding: 'utf8' });
    return Number(/Parallel scale \(k\)\s*:\s*([0-9.]+)/.exec(out)?.[1]);
  } catch {
    return null;
  }
}

const SWISS = { latDeg: 47.131109820, lonDeg: 8.781292543 }; // the demo's first point (zone 32)
const GALWAY = { latDeg: 53.28, lonDeg: -9.06 }; // the static run (zone 29)

describe('points outside the usable area of a grid', () => {
  it('UTM: the zone band widened by 0.5 deg (common practice), with the Norway exception; the point scale as PROJ gives it', () => {
    const z29 = proj('EPSG:32629');
    expect(outsideGridArea(z29, GALWAY.latDeg, GALWAY.lonDeg)).toBeNull();
    expect(outsideGridArea(z29, 53, -12.4)).toBeNull(); // 0.4 deg west of the band
    expect(outsideGridArea(z29, 53, -12.6)).toMatchObject({ reason: "outside zone 29's band 12 W to 6 W widened by 0.5 deg", ownZone: 28 });
    expect(outsideGridArea(proj('EPSG:32632'), 60, 4)).toBeNull(); // Bergen area: zone 32V reaches 3 E (DMA TM 8358.2)
    expect(outsideGridArea(proj('EPSG:32729'), GALWAY.latDeg, GALWAY.lonDeg)?.reason).toMatch(/^in the northern hemisphere/);
    const w = gridAreaWarning(z29, [{ name: 'MILLSTONE', ...SWISS }, { name: 'HOME', ...GALWAY }])!;
    expect(w).toMatch(/^1 of 2 point\(s\) lie outside the usable area of WGS 84 \/ UTM zone 29N \(EPSG:32629\): MILLSTONE \(47\.1311 N, 8\.7813 E\): outside zone 29's band 12 W to 6 W widened by 0\.5 deg; their own zone: 32; point scale factor up to 1\.021962/);
    // PROJ 9 'proj -V +proj=utm +zone=29 +ellps=WGS84' at this point: Parallel scale (k) 1.02196233 (easting 1846610.40 m).
    const k = projScale('+proj=utm +zone=29 +ellps=WGS84', SWISS.latDeg, SWISS.lonDeg);
    if (k !== null) expect(gridFactors(z29, SWISS.latDeg, SWISS.lonDeg).pointScale).toBeCloseTo(k, 7);
    expect(z29.forward(SWISS.latDeg, SWISS.lonDeg).eastingM).toBeCloseTo(1846610.40, 1);
  });

  it('UTM exceptions (DMA TM 8358.2, from memory: 32V 3-12 E for 56-64 N; 31X 0-9 E, 33X 9-21 E, 35X 21-33 E, 37X 33-42 E for 72-84 N): their bands widened by the same 0.5 deg', () => {
    const z = (n: number) => proj(`EPSG:${32600 + n}`);
    const norway = '(the Norway exception, DMA TM 8358.2) widened by 0.5 deg';
    // Zone 31 stops at 3 E between 56 N and 64 N: 4 E at 60 N is 32V's.
    expect(outsideGridArea(z(31), 60, 3.4)).toBeNull();
    expect(outsideGridArea(z(31), 60, 3.6)).toEqual({ reason: `outside zone 31's band 0 E to 3 E from 56 N to 64 N ${norway}`, ownZone: 32 });
    expect(outsideGridArea(z(31), 60, 4)).toMatchObject({ ownZone: 32 });
    // Zone 32 reaches 3 E there, so 0.5 deg west of it too; at 64.6 N, past the exception's 64 N and its margin, it is the 6 E band again.
    expect(outsideGridArea(z(32), 60, 2.6)).toBeNull();
    expect(outsideGridArea(z(32), 60, 2.4)).toEqual({ reason: `outside zone 32's band 3 E to 12 E from 56 N to 64 N ${norway}`, ownZone: 31 });
    expect(outsideGridArea(z(32), 64.4, 4)).toBeNull();
    expect(outsideGridArea(z(32), 64.6, 4)).toEqual({ reason: "outside zone 32's band 6 E to 12 E widened by 0.5 deg", ownZone: 31 });
    // Svalbard: each of 31X, 33X, 35X, 37X at both edges, 0.4 deg inside the margin and 0.1 deg beyond it.
    const svalbard = '(the Svalbard exception, DMA TM 8358.2) widened by 0.5 deg';
    for (const [zone, west, east] of [[31, 0, 9], [33, 9, 21], [35, 21, 33], [37, 33, 42]] as const) {
      expect(outsideGridArea(z(zone), 78, west - 0.4)).toBeNull();
      expect(outsideGridArea(z(zone), 78, east + 0.4)).toBeNull();
      for (const lonDeg of [west - 0.6, east + 0.6]) {
        expect(outsideGridArea(z(zone), 78, lonDeg)).toEqual({ reason: `outside zone ${zone}'s band ${west} E to ${east} E from 72 N to 84 N ${svalbard}`, ownZone: utmZoneFor(78, lonDeg).zone });
      }
    }
    // 32X, 34X, 36X are not used; 32 still reaches 0.5 deg north of 72 N.
    expect(outsideGridArea(z(32), 78, 9)?.reason).toBe('outside zone 32, which is not used from 72 N to 84 N (the Svalbard exception, DMA TM 8358.2), widened by 0.5 deg');
    expect(outsideGridArea(z(32), 72.4, 9)).toBeNull();
    // The bands are the zones utmZoneFor assigns: on a 0.5-deg grid each point is in a band of its own zone only.
    for (let latDeg = 50.25; latDeg < 84; latDeg += 0.5) {
      for (let lonDeg = -5.25; lonDeg < 48; lonDeg += 0.5) {
        const inside = [29, 30, 31, 32, 33, 34, 35, 36, 37, 38].filter((n) => utmZoneBands(n).some((b) => latDeg >= b.southDeg && latDeg < b.northDeg && lonDeg >= b.westDeg && lonDeg < b.eastDeg));
        expect(inside).toEqual([utmZoneFor(latDeg, lonDeg).zone]);
      }
    }
  });

  it('an EPSG CRS: its area of use as the EPSG dataset publishes it (EPSG:27700 stops at 9 W, Galway is at 9.06 W)', () => {
    const bng = proj('EPSG:27700');
    expect(outsideGridArea(bng, 51.5, -0.12)).toBeNull();
    expect(outsideGridArea(bng, GALWAY.latDeg, GALWAY.lonDeg)?.reason).toMatch(/^outside its area of use in the EPSG dataset, 49\.7500 N to 61\.0100 N, 9\.0000 W to 2\.0100 E \(United Kingdom/);
    expect(bng.forward(GALWAY.latDeg, GALWAY.lonDeg).eastingM).toBeLessThan(0); // what the user saw: a negative easting
    // One sentence, the dataset's area description ('...Scotland). Isle of Man onshore.') included.
    const w = gridAreaWarning(bng, [{ name: 'HOME', ...GALWAY }])!;
    expect(w).toMatch(/^1 of 1 point\(s\) lie outside the usable area of OSGB36 \/ British National Grid \(EPSG:27700\): HOME .*Scotland\); Isle of Man onshore\); point scale factor up to 1\.002318 .*; their easting\/northing are what that projection gives there, .*, so choose the grid of the area/);
    expect(w).not.toMatch(/[.!?]\s/);
    // A geographic CRS with an area of use (GDA94, EPSG:4283: Australia) holds latitude/longitude, not easting/northing.
    const gda94 = proj('EPSG:4283');
    expect(gda94.units).toBe('deg');
    for (const what of ['points', 'marks'] as const) {
      const g = gridAreaWarning(gda94, [{ name: 'HOME', ...GALWAY }], what)!;
      expect(g).toMatch(/GDA94 \(EPSG:4283\)/);
      expect(g).toMatch(what === 'points' ? /lie outside the area of use of .*that CRS is not meant for them there, so choose the CRS of the area$/ : /fall outside its area of use: .*their latitude\/longitude are most likely in another CRS, so check the projection column$/);
      expect(g).not.toMatch(/easting|northing|grid|[.!?]\s/);
    }
    expect(outsideGridArea(proj('EPSG:2157'), GALWAY.latDeg, GALWAY.lonDeg)).toBeNull();
    expect(outsideGridArea(proj('EPSG:2056'), SWISS.latDeg, SWISS.lonDeg)).toBeNull();
  });

  it('a Transverse Mercator PROJ string: the point scale k against k0 (1 + A^2 / 2) at A = 3.5 deg (Snyder 1987 eq. 8-11, leading term)', () => {
    const tm = makeProjection('+proj=tmerc +lat_0=0 +lon_0=-8 +k=0.99982 +x_0=600000 +y_0=0 +ellps=GRS80 +units=m');
    const limit = 0.99982 * (1 + (TM_LIMIT_A_DEG * Math.PI / 180) ** 2 / 2);
    expect(limit).toBeCloseTo(1.001685, 6);
    expect(outsideGridArea(tm, GALWAY.latDeg, GALWAY.lonDeg)).toBeNull();
    // 5.5 deg of longitude at 53 N is A = 3.3 deg: inside; 6.5 deg is A = 3.9 deg: outside.
    expect(outsideGridArea(tm, 53, -13.5)).toBeNull();
    expect(outsideGridArea(tm, 53, -14.5)?.reason).toMatch(/point scale factor exceeds 1\.001685/);
    const k = projScale('+proj=tmerc +lat_0=0 +lon_0=-8 +k=0.99982 +x_0=600000 +y_0=0 +ellps=GRS80', 53, -14.5);
    if (k !== null) {
      expect(gridFactors(tm, 53, -14.5).pointScale).toBeCloseTo(k, 7);
      expect(k).toBeGreaterThan(limit);
    }
    // No published area and not a TM: not judged.
    expect(outsideGridArea(makeProjection('+proj=lcc +lat_1=45 +lat_2=50 +lon_0=0 +ellps=GRS80 +units=m'), SWISS.latDeg, SWISS.lonDeg)).toBeNull();
  });
});

describe('projections refused in plain words', () => {
  it('vertical, geocentric, 3-D and compound CRSs say what they are (kinds from the EPSG dataset; projinfo prints VERTCRS, GEODCRS, COMPOUNDCRS for them)', () => {
    expect(() => resolveProjectionSpec('EPSG:5773', undefined, lookup)).toThrow(/^EPSG:5773 \(EGM96 height\) is a vertical CRS \(heights only\), not a map grid: give a projected CRS/);
    expect(() => resolveProjectionSpec('EPSG:4978', undefined, lookup)).toThrow(/^EPSG:4978 \(WGS 84\) is a geocentric CRS \(Earth-centred X, Y, Z\), not a map grid/);
    expect(() => resolveProjectionSpec('EPSG:4979', undefined, lookup)).toThrow(/geographic 3-D CRS/);
    expect(() => resolveProjectionSpec('EPSG:7405', undefined, lookup)).toThrow(/^EPSG:7405 \(OSGB36 \/ British National Grid \+ ODN height\) is a compound CRS .*: give its projected part, EPSG:27700$/);
    for (const c of ['EPSG:5773', 'EPSG:4978']) expect(() => resolveProjectionSpec(c, undefined, lookup)).not.toThrow(/geographic 2-D/);
  });
  it('a PROJ string proj4 cannot use, and a bare EPSG number', () => {
    expect(() => resolveProjectionSpec('+proj=foo')).toThrow(/^the PROJ string names a projection proj4 does not know \('\+proj=foo'\): give an EPSG code/);
    expect(() => resolveProjectionSpec('+proj=tmerc +lon_0=-2 +ellps=airy +nadgrids=OSTN15_NTv2_OSGBtoETRS.gsb')).not.toThrow();
    expect(() => resolveProjectionSpec('2157', undefined, lookup)).toThrow(/^unknown projection '2157': did you mean EPSG:2157\?$/);
    expect(() => resolveProjectionSpec('epsg 2157', undefined, lookup)).toThrow(/did you mean EPSG:2157\?/);
  });
});
