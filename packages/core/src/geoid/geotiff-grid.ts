/**
 * Geoid grids as GeoTIFF, the form PROJ distributes them in (PROJ "Geodetic TIFF grids" (GTG)
 * specification; e.g. us_nga_egm96_15.tif): band 1 holds the geoid undulation in metres on a
 * geographic grid. Read with the `geotiff` package. Node positions from the tie point and pixel scale:
 * with GTRasterTypeGeoKey PixelIsPoint (2) the tie point is the first node; with PixelIsArea (1, the
 * default) it is the outer corner and nodes are at pixel centres (GeoTIFF 1.1, OGC 19-008r4, 7.5).
 * The caller gives the file's bytes (the CLI reads files; the core stays browser-safe).
 */
import { fromArrayBuffer } from 'geotiff';
import type { GeoidModel } from './geoid-model.js';
import { regularGridModel } from './regular-grid.js';

/** True for TIFF bytes (little- or big-endian, classic or BigTIFF: TIFF 6.0 section 2, BigTIFF). */
export function looksLikeTiff(bytes: Uint8Array): boolean {
  if (bytes.length < 4) return false;
  const le = bytes[0] === 0x49 && bytes[1] === 0x49 && (bytes[2] === 42 || bytes[2] === 43) && bytes[3] === 0;
  const be = bytes[0] === 0x4d && bytes[1] === 0x4d && bytes[2] === 0 && (bytes[3] === 42 || bytes[3] === 43);
  return le || be;
}

export async function parseGeoTiffGeoid(file: string, bytes: Uint8Array): Promise<GeoidModel> {
  const ab = bytes.buffer.slice(bytes.byteOffset, bytes.byteOffset + bytes.byteLength) as ArrayBuffer;
  let tiff;
  try {
    tiff = await fromArrayBuffer(ab);
  } catch (e) {
    throw new RangeError(`${file}: not a readable GeoTIFF (${e instanceof Error ? e.message : String(e)})`);
  }
  const image = await tiff.getImage();
  const keys = (image.getGeoKeys() ?? {}) as Record<string, unknown>;
  if (keys.GTModelTypeGeoKey !== undefined && keys.GTModelTypeGeoKey !== 2) {
    throw new RangeError(`${file}: the GeoTIFF is not on a geographic (latitude/longitude) grid (GTModelTypeGeoKey ${String(keys.GTModelTypeGeoKey)})`);
  }
  const [originX, originY] = image.getOrigin();
  const [resX, resY] = image.getResolution();
  const width = image.getWidth(), height = image.getHeight();
  const pixelIsPoint = keys.GTRasterTypeGeoKey === 2;
  const half = pixelIsPoint ? 0 : 0.5;
  const rasters = await image.readRasters({ samples: [0] });
  const band = (rasters as unknown as ArrayLike<number>[])[0]!;
  const dLat = Math.abs(resY!), dLon = Math.abs(resX!);
  if (!(dLat > 0 && dLon > 0) || resY! > 0) throw new RangeError(`${file}: expected a north-up grid with a pixel scale`);
  const desc = (image.fileDirectory as unknown as Record<string, unknown>).ImageDescription;
  const base = file.split(/[\\/]/).pop()!;
  return regularGridModel({
    name: `${typeof desc === 'string' && desc.trim() ? desc.trim() : base} (GeoTIFF grid ${base})`,
    heightReference: `the geoid of ${base}`,
    northLatDeg: originY! - half * dLat, dLatDeg: dLat, westLonDeg: originX! + half * dLon, dLonDeg: dLon,
    rows: height, cols: width, values: band, noData: image.getGDALNoData(),
  });
}
