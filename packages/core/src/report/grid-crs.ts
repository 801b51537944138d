/**
 * The CRS that grid coordinates (easting/northing of points.csv) are actually in. A projection is
 * applied to the latitude/longitude of the points' own frame without any datum shift
 * (projection/projection.ts), so the grid coordinates are in the projection's CRS only when that CRS's
 * datum is the points' frame. The label therefore follows the points' frame, never the code asked for:
 *
 * - same datum (WGS 84 points, EPSG:32629; ETRS89 points, EPSG:25829): the EPSG CRS as it is;
 * - 'utm' in a frame without an EPSG UTM CRS (ITRF2014, ETRF2000...): the UTM parameters on the frame's
 *   geographic CRS, no EPSG code;
 * - another datum (WGS 84 points, EPSG:2157 on IRENET95; EPSG:27700 on OSGB36): a warning, and the
 *   projection's parameters on the points' geographic CRS (when the ellipsoids agree within 1 mm, as
 *   GRS80 and WGS 84 do: 0.1 mm in b), else on an unknown datum with the projection's ellipsoid; no EPSG
 *   code (the coordinates are not that CRS's: ITRF/WGS 84 and ETRS89 differ by about 0.7 m in Europe in
 *   2018, other datums by metres to hundreds of metres);
 * - points in an unstated frame: the projection's parameters on an unknown datum (GDAL's
 *   GEOGCS["unknown",DATUM["unknown",...]] idiom), no EPSG code, and a warning.
 * A projection given as a PROJ string is stated as given (no WKT, no .prj).
 */
import type { FrameEpoch } from '../gnss/index.js';
import { crsOfFrame } from '../frames/index.js';
import {
  geogcsOf, NO_DATUM_SHIFT_WORDS, projcsOnGeogcs, projectionDatumName, projectionDatumRelation, spheroidOf, unknownDatumGeogcs, type Projection,
} from '../projection/index.js';

export interface GridCrs {
  /** EPSG code of the grid coordinates' CRS, null when they are in no EPSG CRS. */
  readonly epsg: number | null;
  /** What the grid coordinates are, e.g. 'ETRS89 / UTM zone 29N (EPSG:25829)', 'unknown datum / UTM zone 29N'. */
  readonly name: string;
  /** OGC WKT 1 of that CRS (the .prj), null when none can be written. */
  readonly wkt: string | null;
  /** How the projection's datum relates to the points' frame. */
  readonly datum: 'same' | 'frame-parameters' | 'differs' | 'unstated' | 'as-given';
  /** One sentence on the datum, for the metadata. */
  readonly datumNote: string;
  /** A warning sentence when the grid coordinates are not in the CRS asked for, else null. */
  readonly warning: string | null;
}

/** The projection's name without its datum prefix and EPSG code: 'IRENET95 / Irish Transverse Mercator (EPSG:2157)' -> 'Irish Transverse Mercator'. */
function parametersName(p: Projection): string {
  return p.name.replace(/\s*\(EPSG:\d+\)\s*$/, '').replace(/^[^/]*\/\s*/, '');
}

/** Ellipsoids agreeing within 1 mm in both axes (GRS80 and WGS 84: 0.1 mm in b). */
function sameEllipsoid(a: string, b: string): boolean {
  const x = spheroidOf(a), y = spheroidOf(b);
  if (!x || !y) return false;
  const bx = x.aM * (1 - 1 / x.inverseFlattening), by = y.aM * (1 - 1 / y.inverseFlattening);
  return Math.abs(x.aM - y.aM) < 1e-3 && Math.abs(bx - by) < 1e-3;
}

/**
 * The CRS of grid coordinates made by `projection` from latitude/longitude in `frame`. `wkt` gives the
 * OGC WKT 1 of an EPSG code (the caller's EPSG dataset), null when unknown.
 */
export function gridCrsOf(projection: Projection, frame: FrameEpoch, wkt: (epsg: number) => string | null): GridCrs {
  const params = parametersName(projection);
  const relation = projectionDatumRelation(projection, frame.name);
  if (relation === 'as-given') {
    return {
      epsg: null, name: projection.name, wkt: null, datum: 'as-given',
      datumNote: `a PROJ string, applied to latitude/longitude in ${frame.name} as they are (its datum is not checked)`, warning: null,
    };
  }
  const framed = crsOfFrame(frame.name);
  const spheroid = projection.wkt ? spheroidOf(projection.wkt) : null;
  const unknownWkt = (name: string) => (projection.wkt && spheroid ? projcsOnGeogcs(projection.wkt, unknownDatumGeogcs(spheroid), name) : null);
  if (relation === 'unstated' || !framed) {
    const name = `unknown datum / ${params}`;
    return {
      epsg: null, name, wkt: unknownWkt(name), datum: 'unstated',
      datumNote: `the points' frame is not stated ('${frame.name}'): easting/northing are ${params} grid coordinates on an unknown datum (not ${projection.parametersOnly ? 'WGS 84 or any other datum' : projection.name})`,
      warning: `the points' frame is not stated ('${frame.name}'): easting/northing are ${params} grid coordinates on an unknown datum, not ${projection.parametersOnly ? `WGS 84 / ${params}` : projection.name}; their .prj says so (a GIS must not assume any datum)`,
    };
  }
  if (relation === 'same') {
    return {
      epsg: projection.epsg, name: projection.name, wkt: projection.wkt, datum: 'same',
      datumNote: `the projection's datum is the points' frame (${framed.epsgName})`, warning: null,
    };
  }
  const frameGeog = wkt(framed.geographic2d);
  const onFrame = frameGeog && projection.wkt && sameEllipsoid(frameGeog, projection.wkt) ? geogcsOf(frameGeog) : null;
  if (relation === 'frame-parameters') {
    const name = onFrame ? `${framed.epsgName} / ${params}` : `unknown datum / ${params}`;
    return {
      epsg: null, name, wkt: onFrame && projection.wkt ? projcsOnGeogcs(projection.wkt, onFrame, name) : unknownWkt(name), datum: 'frame-parameters',
      datumNote: `${framed.epsgName} has no EPSG ${params} CRS: the ${params} parameters on ${framed.epsgName} (no EPSG code)`, warning: null,
    };
  }
  const name = onFrame ? `${framed.epsgName} / ${params} parameters (not EPSG:${projection.epsg})` : `unknown datum / ${params} parameters (not EPSG:${projection.epsg})`;
  const theirs = projectionDatumName(projection);
  return {
    epsg: null, name, wkt: onFrame && projection.wkt ? projcsOnGeogcs(projection.wkt, onFrame, name) : unknownWkt(name), datum: 'differs',
    datumNote: `${projection.name} is on ${theirs}, the points are in ${frame.name}: its parameters are applied to ${frame.name} latitude/longitude without a datum shift`,
    warning: `${projection.name} is on a datum other than the points' frame ${frame.name} (${theirs}): latitude/longitude are projected as they are, without a datum shift, ` +
      `so easting/northing are not ${projection.name} coordinates (${NO_DATUM_SHIFT_WORDS}); they are labelled ${name}. ` +
      `Transform the points into ${theirs} first for true grid coordinates`,
  };
}
