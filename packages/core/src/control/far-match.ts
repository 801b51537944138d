/**
 * A point matched to a mark by name but far from it. What can separate a point from its own mark: the
 * point's error (code differential about 1 m, standalone under 10 m at 95 %: check-values.md "Accuracy
 * facts"), frame differences (ITRF/WGS 84 against ETRS89 about 0.7 m in Europe in 2018) and datum
 * differences of classical national datums against WGS 84 (tens to a few hundred metres, e.g. about
 * 100 m for OSGB36 in Great Britain: from memory). Beyond 1 km none of these applies: the mark's
 * coordinates are not in the CRS the file says (another UTM zone moves them by hundreds of km, swapped
 * easting and northing or latitude and longitude by thousands), or the names pair different places.
 */
import type { EcefM } from '../gnss/index.js';
import { degToRad, ecefToEnu, ecefToGeodetic, geodeticToEcef, radToDeg } from '../geodesy/index.js';
import { makeProjection, type EpsgLookup, type Projection } from '../projection/index.js';
import { ellipsoidForFrame, type ControlMark } from './control-csv.js';

/** Horizontal distance (m) beyond which a match by name cannot be a measurement, frame or datum difference (see above). */
export const FAR_NAME_MATCH_M = 1000;

export interface NamedPair {
  readonly session?: string | null;
  readonly pointName: string;
  readonly markName: string;
  /** The mark's line in the marks file, when known. */
  readonly markLine?: number;
  readonly by: 'name' | 'proximity';
  readonly horizontalM: number;
  /** Another reading of the mark's values that puts it near the point (closerReading), when one does. */
  readonly closer?: CloserReading | null;
}

export interface CloserReading {
  /** How the values were read, e.g. 'as WGS 84 / UTM zone 29N (EPSG:32629)', 'with latitude and longitude swapped'. */
  readonly words: string;
  readonly horizontalM: number;
}

interface Reading { readonly words: string; readonly latDeg: number; readonly lonDeg: number }

/**
 * The usual mistakes with a mark's coordinates, tried on its values as written: latitude and longitude
 * swapped; easting and northing swapped; grid values of the point's own UTM zone (in the mark's frame)
 * declared as another projection, as they are or swapped. Each reading is in latitude/longitude.
 */
function otherReadings(mark: ControlMark, nearLatDeg: number, nearLonDeg: number, lookup?: EpsgLookup): Reading[] {
  const g = mark.given;
  if (!g) return [];
  if (g.kind === 'geodetic') return Math.abs(g.lonDeg) <= 90 ? [{ words: 'with latitude and longitude swapped', latDeg: g.lonDeg, lonDeg: g.latDeg }] : [];
  const out: Reading[] = [];
  const read = (p: Projection, swap: boolean, words: string) => {
    const ll = swap ? p.inverse(g.northingM, g.eastingM) : p.inverse(g.eastingM, g.northingM);
    if (Number.isFinite(ll.latDeg) && Number.isFinite(ll.lonDeg)) out.push({ words, ...ll });
  };
  try {
    read(makeProjection(g.projection, undefined, lookup), true, `with easting and northing swapped (${g.projection})`);
  } catch { /* the projection was read once already; nothing else to try with it */ }
  try {
    const zone = makeProjection('utm', { latDeg: nearLatDeg, lonDeg: nearLonDeg }, lookup, mark.position.frame.name);
    if (zone.projString !== makeProjection(g.projection, undefined, lookup).projString) {
      read(zone, false, `as ${zone.name}`);
      read(zone, true, `as ${zone.name} with easting and northing swapped`);
    }
  } catch { /* no UTM zone there (polar): no such reading */ }
  return out;
}

/**
 * The reading of a mark's values (otherReadings) that puts it closest to the point, when one puts it
 * within FAR_NAME_MATCH_M: what the marks file most likely meant. Heights are the mark's own.
 */
export function closerReading(mark: ControlMark, point: EcefM, lookup?: EpsgLookup): CloserReading | null {
  if (!mark.given) return null;
  const ell = ellipsoidForFrame(mark.position.frame.name);
  const p = ecefToGeodetic(point, ell);
  let best: CloserReading | null = null;
  for (const r of otherReadings(mark, radToDeg(p.latRad), radToDeg(p.lonRad), lookup)) {
    const at = geodeticToEcef({ latRad: degToRad(r.latDeg), lonRad: degToRad(r.lonDeg), heightM: mark.given.heightM }, ell);
    const v = ecefToEnu(point, at);
    const d = Math.hypot(v.e, v.n);
    if (d < FAR_NAME_MATCH_M && (best === null || d < best.horizontalM)) best = { words: r.words, horizontalM: d };
  }
  return best;
}

/** The pairs matched by name more than FAR_NAME_MATCH_M apart. */
export function farNameMatches<P extends NamedPair>(pairs: readonly P[]): P[] {
  return pairs.filter((p) => p.by === 'name' && p.horizontalM > FAR_NAME_MATCH_M);
}

/** One warning sentence for the pairs matched by name more than FAR_NAME_MATCH_M apart, or null. */
export function farNameMatchSentence(pairs: readonly NamedPair[], marksFile: string): string | null {
  const far = farNameMatches(pairs);
  if (far.length === 0) return null;
  const listed = far.slice(0, 5).map((p) => `${p.session ? `${p.session}/` : ''}${p.pointName} is ${(p.horizontalM / 1000).toFixed(p.horizontalM < 1e5 ? 2 : 0)} km from mark ${p.markName}` +
    (p.markLine !== undefined ? ` on line ${p.markLine}` : '') +
    (p.closer ? ` (its values read ${p.closer.words} put it ${p.closer.horizontalM < 10 ? p.closer.horizontalM.toFixed(3) : p.closer.horizontalM.toFixed(0)} m from the point)` : ''));
  return `${far.length} point(s) matched by name lie more than ${FAR_NAME_MATCH_M / 1000} km from their mark, ` +
    `far more than a measurement, frame or datum difference explains: ${listed.join('; ')}${far.length > 5 ? '; ...' : ''}; ` +
    `check the CRS of ${marksFile} (its projection code, UTM zone and hemisphere, and the order of its coordinates: easting before northing, latitude before longitude) ` +
    'or whether the names pair different places';
}
