import { readFileSync } from 'node:fs';
import { createRequire } from 'node:module';
import { dirname, join } from 'node:path';
import { describe, expect, it } from 'vitest';
import { crsOfFrame, isKnownFrameName, KNOWN_FRAME_NAMES } from './frame-crs.js';

// The outside reference: the EPSG dataset as shipped in the npm package epsg-index (one JSON per code).
const epsgDir = join(dirname(createRequire(import.meta.url).resolve('epsg-index/package.json')), 's');
const epsg = (code: number): { name: string; kind: string } => JSON.parse(readFileSync(join(epsgDir, `${code}.json`), 'utf8'));

describe('frame -> EPSG CRS codes, checked against the EPSG dataset (epsg-index)', () => {
  it('every code names the frame with the right kind', () => {
    for (const f of KNOWN_FRAME_NAMES) {
      const c = crsOfFrame(f)!;
      expect(epsg(c.geographic2d), `${f} 2D`).toMatchObject({ name: c.epsgName, kind: 'CRS-GEOGCRS' });
      if (c.geographic3d !== null) expect(epsg(c.geographic3d), `${f} 3D`).toMatchObject({ name: c.epsgName, kind: 'CRS-GEOG3DCRS' });
      if (c.geocentric !== null) expect(epsg(c.geocentric), `${f} geocentric`).toMatchObject({ name: c.epsgName, kind: 'CRS-GCENCRS' });
    }
  });
  it('labels as written map through the frame-name normalisation; unstated and unknown have none', () => {
    expect(crsOfFrame('itrf 2014')?.geographic2d).toBe(9000);
    expect(crsOfFrame('WGS-84(G1762)')?.geographic2d).toBe(4326);
    expect(crsOfFrame('WGS84 (broadcast orbits)')?.geographic3d).toBe(4979);
    expect(crsOfFrame('ETRF2000')?.geographic3d).toBe(7931);
    expect(crsOfFrame('unstated')).toBeNull();
    expect(crsOfFrame('ETRF2OOO')).toBeNull();
    expect(isKnownFrameName('ETRF2OOO')).toBe(false);
    expect(isKnownFrameName('unstated')).toBe(true);
  });
});

describe('shipped transformations by name', async () => {
  const { shippedTransformation, looksLikeTransformationName } = await import('./shipped-transformations.js');
  it('a name selects the shipped set in either direction; an unknown name lists the shipped ones', () => {
    expect(shippedTransformation('ITRF2014>ETRF2000').to).toBe('ETRF2000');
    expect(shippedTransformation('etrf2000>itrf2014').from).toBe('ITRF2014');
    expect(shippedTransformation('WGS84=ITRF2014').source).toMatch(/identity/);
    expect(() => shippedTransformation('ITRF2014>NAD83')).toThrow(/ITRF2014>ETRF2000, .*WGS84=ITRF2014/);
    expect(looksLikeTransformationName('ITRF2014>ETRF2000')).toBe(true);
    expect(looksLikeTransformationName('helmert.json')).toBe(false);
  });
});
