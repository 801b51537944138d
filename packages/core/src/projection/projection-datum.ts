/**
 * How a projection's datum relates to the frame of the latitude/longitude it is applied to. A projection
 * is applied without any datum shift (projection.ts), so grid coordinates are in the projection's CRS
 * only when its datum is that frame. One rule for both directions: points projected to a grid
 * (report/grid-crs.ts) and marks given in a grid (control/control-csv.ts).
 *
 * - 'as-given': a PROJ string (its datum is not checked);
 * - 'unstated': the frame is not one we know (no EPSG CRS);
 * - 'same': the projection's base geographic CRS is the frame's (WGS 84 and EPSG:32629);
 * - 'frame-parameters': 'utm' in a frame without an EPSG UTM CRS (the parameters alone are meant);
 * - 'differs': any other case (WGS 84 and EPSG:2157 on IRENET95).
 */
import { crsOfFrame, frameOfGeographicEpsg, normaliseFrameName } from '../frames/index.js';
import type { Projection } from './projection.js';

export type ProjectionDatumRelation = 'same' | 'frame-parameters' | 'differs' | 'unstated' | 'as-given';

export function projectionDatumRelation(projection: Projection, frameName: string): ProjectionDatumRelation {
  if (projection.epsg === null && !projection.parametersOnly) return 'as-given';
  const framed = crsOfFrame(frameName);
  if (!framed) return 'unstated';
  const projFrame = projection.baseGeographicEpsg !== null ? frameOfGeographicEpsg(projection.baseGeographicEpsg) : null;
  if (!projection.parametersOnly && projFrame && normaliseFrameName(projFrame.frame) === normaliseFrameName(framed.frame)) return 'same';
  return projection.parametersOnly ? 'frame-parameters' : 'differs';
}

/** The projection's datum as a name: its base geographic CRS's (from the WKT), else its EPSG code. */
export function projectionDatumName(p: Projection): string {
  const g = p.wkt ? /GEOGCS\["([^"]*)"/.exec(p.wkt)?.[1] : undefined;
  return g ?? (p.baseGeographicEpsg !== null ? frameOfGeographicEpsg(p.baseGeographicEpsg)?.epsgName ?? `EPSG:${p.baseGeographicEpsg}` : 'its own datum');
}

/** What 'differs' means, in the words shared by points and marks: no datum shift, and by how much frames and datums differ. */
export const NO_DATUM_SHIFT_WORDS = 'frames differ by up to about a metre, datums by more';

/**
 * The warning for marks given in grid coordinates of a projection whose datum is not their stated frame
 * (the points' counterpart is in report/grid-crs.ts).
 */
export function marksGridDatumSentence(projection: Projection, frameName: string): string {
  const theirs = projectionDatumName(projection);
  return `${projection.name} is on a datum other than the marks' stated frame ${frameName} (${theirs}): easting/northing are turned into latitude/longitude as they are, ` +
    `without a datum shift, and taken as ${frameName} coordinates (${NO_DATUM_SHIFT_WORDS}). If the marks are ${theirs} coordinates, state their frame in the frame column ` +
    `(and give --transform when the points are in another frame)`;
}
