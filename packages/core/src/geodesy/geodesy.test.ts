import { describe, expect, it } from 'vitest';
import fc from 'fast-check';
import proj4 from 'proj4';
import { azimuthElevation, degToRad, ecefToEnu, ecefToGeodetic, enuToEcefDelta, ecefDeltaToEnu, geodeticToEcef, geodeticToEnu, radToDeg } from './index.js';

const dms = (d: number, m: number, s: number) => d + m / 60 + s / 3600;

describe('geodetic <-> ECEF (WGS-84)', () => {
  it('33.3 N 44.4 E 6000 m', () => {
    // check-values.md #2: GeographicLib CartConvert manual, EXAMPLES (verified)
    const p = geodeticToEcef({ latRad: degToRad(33.3), lonRad: degToRad(44.4), heightM: 6000 });
    expect(p.x).toBeCloseTo(3816209.60, 2);
    expect(p.y).toBeCloseTo(3737108.55, 2);
    expect(p.z).toBeCloseTo(3485109.57, 2);
    const g = ecefToGeodetic(p);
    expect(radToDeg(g.latRad)).toBeCloseTo(33.3, 11);
    expect(radToDeg(g.lonRad)).toBeCloseTo(44.4, 11);
    expect(g.heightM).toBeCloseTo(6000, 6);
  });
  it('local ENU of the same point at origin 33 N 44 E 20 m', () => {
    // check-values.md #3: GeographicLib CartConvert manual, EXAMPLES (verified)
    const enu = geodeticToEnu(
      { latRad: degToRad(33.3), lonRad: degToRad(44.4), heightM: 6000 },
      { latRad: degToRad(33), lonRad: degToRad(44), heightM: 20 },
    );
    expect(enu.e).toBeCloseTo(37288.97, 2);
    expect(enu.n).toBeCloseTo(33374.29, 2);
    // the manual prints centimetres; we agree within 7 mm on the up component
    expect(Math.abs(enu.u - 5783.64)).toBeLessThan(0.01);
  });
  it('near the centre: (30000, 30000, 0) -> 6.483 N, 45 E, -6335709.73 m', () => {
    // check-values.md #4: GeographicLib CartConvert manual (a naive iteration gives 0 N, -6335710.59 m)
    const g = ecefToGeodetic({ x: 30000, y: 30000, z: 0 });
    expect(radToDeg(g.latRad)).toBeCloseTo(6.483, 3);
    expect(radToDeg(g.lonRad)).toBeCloseTo(45, 10);
    expect(g.heightM).toBeCloseTo(-6335709.73, 2);
  });
  it('published station coordinates: ONSA and AUBG', () => {
    // check-values.md #5: the stations' published site logs (IGS/EUREF)
    const onsa = ecefToGeodetic({ x: 3370658.832, y: 711876.939, z: 5349786.745 });
    expect(radToDeg(onsa.latRad)).toBeCloseTo(dms(57, 23, 43.07), 5);
    expect(radToDeg(onsa.lonRad)).toBeCloseTo(dms(11, 55, 31.85), 5);
    expect(onsa.heightM).toBeCloseTo(45.5, 1);
    const aubg = ecefToGeodetic({ x: 4164312.9, y: 803525.9, z: 4748474.9 });
    expect(radToDeg(aubg.latRad)).toBeCloseTo(dms(48, 25, 16.69), 5);
    expect(radToDeg(aubg.lonRad)).toBeCloseTo(dms(10, 55, 16.68), 5);
    expect(aubg.heightM).toBeCloseTo(508.6, 1);
  });
  it('poles and the equator', () => {
    const np = ecefToGeodetic({ x: 0, y: 0, z: 6356752.314245 + 100 });
    expect(radToDeg(np.latRad)).toBeCloseTo(90, 12);
    expect(np.heightM).toBeCloseTo(100, 6);
    const sp = ecefToGeodetic({ x: 0, y: 0, z: -6356752.314245 });
    expect(radToDeg(sp.latRad)).toBeCloseTo(-90, 12);
    expect(sp.heightM).toBeCloseTo(0, 6);
    const eq = ecefToGeodetic({ x: 6378137 + 5, y: 0, z: 0 });
    expect(eq.latRad).toBe(0);
    expect(eq.heightM).toBeCloseTo(5, 8);
  });
  it('agrees with proj4 (reference library) on 3000 random points', () => {
    // proj4 (npm, reference implementation of PROJ's geocent/longlat conversion)
    const conv = proj4('+proj=longlat +datum=WGS84 +no_defs', '+proj=geocent +datum=WGS84 +units=m +no_defs');
    fc.assert(
      fc.property(
        fc.double({ min: -89.999, max: 89.999, noNaN: true }),
        fc.double({ min: -180, max: 180, noNaN: true }),
        fc.double({ min: -1000, max: 40000, noNaN: true }),
        (lat, lon, h) => {
          const ref = conv.forward([lon, lat, h]) as number[];
          const p = geodeticToEcef({ latRad: degToRad(lat), lonRad: degToRad(lon), heightM: h });
          expect(Math.abs(p.x - ref[0]!)).toBeLessThan(1e-6);
          expect(Math.abs(p.y - ref[1]!)).toBeLessThan(1e-6);
          expect(Math.abs(p.z - ref[2]!)).toBeLessThan(1e-6);
          const back = conv.inverse(ref) as number[];
          const g = ecefToGeodetic(p);
          expect(Math.abs(radToDeg(g.latRad) - back[1]!)).toBeLessThan(1e-9);
          expect(Math.abs(radToDeg(g.lonRad) - back[0]!)).toBeLessThan(1e-9);
          expect(Math.abs(g.heightM - back[2]!)).toBeLessThan(1e-4);
        },
      ),
      { numRuns: 3000 },
    );
  });
});

describe('ENU and azimuth/elevation', () => {
  it('ENU rotation is orthonormal (round trip)', () => {
    const d = { x: 123.4, y: -567.8, z: 910.11 };
    const lat = degToRad(47.1), lon = degToRad(-12.3);
    const back = enuToEcefDelta(ecefDeltaToEnu(d, lat, lon), lat, lon);
    expect(back.x).toBeCloseTo(d.x, 9);
    expect(back.y).toBeCloseTo(d.y, 9);
    expect(back.z).toBeCloseTo(d.z, 9);
  });
  it('a target straight up has elevation 90 deg; one due north on the horizon plane has azimuth 0', () => {
    const o = { latRad: degToRad(40), lonRad: degToRad(-100), heightM: 0 };
    const rx = geodeticToEcef(o);
    const up = geodeticToEcef({ ...o, heightM: 20_000_000 });
    expect(radToDeg(azimuthElevation(rx, up, o.latRad, o.lonRad).elevationRad)).toBeCloseTo(90, 9);
    const north = { x: rx.x + enuToEcefDelta({ e: 0, n: 1000, u: 0 }, o.latRad, o.lonRad).x, y: rx.y + enuToEcefDelta({ e: 0, n: 1000, u: 0 }, o.latRad, o.lonRad).y, z: rx.z + enuToEcefDelta({ e: 0, n: 1000, u: 0 }, o.latRad, o.lonRad).z };
    const ae = azimuthElevation(rx, north, o.latRad, o.lonRad);
    expect(radToDeg(ae.azimuthRad)).toBeCloseTo(0, 9);
    expect(radToDeg(ae.elevationRad)).toBeCloseTo(0, 9);
    expect(ecefToEnu(north, rx).n).toBeCloseTo(1000, 6);
  });
});
