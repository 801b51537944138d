/**
 * KML 2.2 (OGC 07-147r2) of epoch positions and points: one Placemark per position with its name, the
 * coordinates "longitude,latitude,height" (section 16.9.1) and every vocabulary field as
 * ExtendedData/Data (section 9.3). KML coordinates are WGS 84 by definition (section 6.2, EPSG:4979):
 * the positions are not transformed, and the document's description and each placemark's `frame`
 * say which frame they are really in. altitudeMode is left at its default (clampToGround): KML's
 * altitude is above sea level, our heights are ellipsoidal, so a viewer draws the points on its terrain
 * and the ellipsoidal height travels as data (height_m).
 */
import type { FrameEpoch } from '../gnss/index.js';
import { crsOfFrame } from '../frames/index.js';
import { frameEpochText, jsonNumber } from './format.js';

/** XML character data / attribute value with the five predefined entities escaped (XML 1.0 section 2.4). */
export function xmlText(s: string): string {
  return s.replace(/&/g, '&amp;').replace(/</g, '&lt;').replace(/>/g, '&gt;').replace(/"/g, '&quot;').replace(/'/g, '&apos;')
    // Characters XML 1.0 does not allow (section 2.2) are dropped.
    .replace(/[\u0000-\u0008\u000B\u000C\u000E-\u001F]/g, '');
}

/** What the document says about the frame of its coordinates. */
export function kmlFrameNote(frame: FrameEpoch): string {
  const c = crsOfFrame(frame.name);
  const where = `${frame.name} at epoch ${frameEpochText(frame.epochYear)}`;
  if (!c) return `KML coordinates are WGS 84 by definition, but these are in the frame ${where}, which has no known EPSG CRS: they are not WGS 84 coordinates.`;
  if (c.geographic2d === 4326) return `Coordinates in ${where} (KML's own frame). Heights are ellipsoidal (height_m), not above sea level.`;
  return `KML coordinates are WGS 84 by definition; these are NOT transformed: they are in ${where} (EPSG:${c.geographic3d ?? c.geographic2d}). Heights are ellipsoidal (height_m).`;
}

export function kmlStart(title: string, frame: FrameEpoch): string {
  return '<?xml version="1.0" encoding="UTF-8"?>\n<kml xmlns="http://www.opengis.net/kml/2.2">\n<Document>\n' +
    `<name>${xmlText(title)}</name>\n<description>${xmlText(kmlFrameNote(frame))}</description>\n`;
}

export function kmlEnd(): string {
  return '</Document>\n</kml>\n';
}

/** One Placemark; `fields` become ExtendedData (empty values are left out). */
export function kmlPlacemark(name: string, lonDeg: number, latDeg: number, heightM: number, fields: Readonly<Record<string, string | number | null>>): string {
  const data = Object.entries(fields)
    .filter(([, v]) => v !== null && v !== '')
    .map(([k, v]) => `<Data name="${xmlText(k)}"><value>${xmlText(String(v))}</value></Data>`).join('');
  return `<Placemark><name>${xmlText(name)}</name><ExtendedData>${data}</ExtendedData>` +
    `<Point><coordinates>${jsonNumber(lonDeg, 9)},${jsonNumber(latDeg, 9)},${jsonNumber(heightM, 4)}</coordinates></Point></Placemark>\n`;
}
