/**
 * Whether points lie where a map grid is meant to be used. A projection gives numbers anywhere, but
 * away from its area they are distorted and are not what anyone using that grid expects (a Swiss
 * point in UTM zone 29 has easting 1,846 km; an Irish point in the British National Grid a negative
 * easting). The tests, by what is published about each grid:
 *
 * - UTM (+proj=utm, whatever its source): the zone's 6-degree longitude band, or where the Norway and
 *   Svalbard exceptions apply the zone's band there (DMA TM 8358.2; utm-zone.ts, utmZoneBands: 32V is
 *   3 E..12 E, 31V 0..3 E, 31X 0..9 E, 33X 9..21 E...), and its hemisphere, each widened by 0.5 degree
 *   (an exception band in latitude too): work a little past a zone edge in the neighbouring zone's grid
 *   is common practice (about 40 km at 45 N; the margin is our choice within that practice, from
 *   memory, not a published limit).
 * - A CRS from the EPSG dataset with an area of use (its bounding box, as the dataset publishes it):
 *   outside that box. The box is already the extent of the area (offshore parts included), so no
 *   margin is added.
 * - Any other Transverse Mercator (a PROJ string): the point scale factor. In TM
 *   k = k0 (1 + (1 + C) A^2 / 2 + ...), A = (lambda - lambda0) cos(phi), C = e'^2 cos^2(phi)
 *   (Snyder 1987, USGS PP 1395, eq. 8-11, from memory), so the scale error grows with the distance from
 *   the central meridian. Without a published area, the limit is UTM's design: the scale at 3.5 degrees
 *   of A (a 6-degree zone's half-width and the margin above), k0 (1 + A^2 / 2) = k0 * 1.00187. The
 *   point's k is computed exactly (grid-factors.ts), not from the series.
 * Other projection kinds without an area of use are not judged (no defensible limit without one).
 */
import { gridFactors } from './grid-factors.js';
import type { Projection } from './projection.js';
import type { AreaOfUse } from './projection-spec.js';
import { utmZoneBands, utmZoneFor, type UtmZoneBand } from './utm-zone.js';

/** The widening of a UTM zone's band and hemisphere (degrees): common practice, see above. */
export const UTM_ZONE_MARGIN_DEG = 0.5;
/** A = (lambda - lambda0) cos(phi) at which a Transverse Mercator without a published area is judged too far (degrees). */
export const TM_LIMIT_A_DEG = 3 + UTM_ZONE_MARGIN_DEG;

const DEG = Math.PI / 180;

/** A point to check, in the projection's own frame (degrees). */
export interface AreaPoint {
  readonly name: string;
  readonly latDeg: number;
  readonly lonDeg: number;
}

/** Longitude difference wrapped into -180..180. */
function lonDiffDeg(lonDeg: number, fromDeg: number): number {
  return ((((lonDeg - fromDeg) % 360) + 540) % 360) - 180;
}

const lat = (v: number) => `${Math.abs(v).toFixed(4)} ${v < 0 ? 'S' : 'N'}`;
const lon = (v: number) => `${Math.abs(v).toFixed(4)} ${v < 0 ? 'W' : 'E'}`;
const deg = (v: number) => `${Math.abs(v)} ${v < 0 ? 'W' : 'E'}`;

function utmParameters(projString: string): { zone: number; south: boolean } | null {
  if (!/\+proj=utm\b/.test(projString)) return null;
  const z = /\+zone=(\d+)/.exec(projString);
  return z ? { zone: Number(z[1]), south: /\+south\b/.test(projString) } : null;
}

/** True when the point is within `marginDeg` of the band (latitude and longitude). */
function nearBand(b: UtmZoneBand, latDeg: number, lonDeg: number, marginDeg: number): boolean {
  if (latDeg < b.southDeg - marginDeg || latDeg > b.northDeg + marginDeg) return false;
  return Math.abs(lonDiffDeg(lonDeg, (b.westDeg + b.eastDeg) / 2)) <= (b.eastDeg - b.westDeg) / 2 + marginDeg;
}

/** Why a point is outside a UTM zone's widened band: the zone's band at the point's latitude, in words. */
function outsideUtmBandReason(zone: number, bands: readonly UtmZoneBand[], latDeg: number): string {
  const widened = `widened by ${UTM_ZONE_MARGIN_DEG} deg`;
  const at = bands.find((b) => latDeg >= b.southDeg && latDeg < b.northDeg) ?? bands.find((b) => latDeg >= b.southDeg && latDeg <= b.northDeg);
  if (!at) return `outside zone ${zone}, which is not used from 72 N to 84 N (the Svalbard exception, DMA TM 8358.2), ${widened}`;
  const latitudes = at.exception ? ` from ${at.southDeg} N to ${at.northDeg} N (the ${at.exception} exception, DMA TM 8358.2)` : '';
  return `outside zone ${zone}'s band ${deg(at.westDeg)} to ${deg(at.eastDeg)}${latitudes} ${widened}`;
}

function isInside(area: AreaOfUse, latDeg: number, lonDeg: number): boolean {
  if (latDeg > area.northDeg || latDeg < area.southDeg) return false;
  const l = lonDiffDeg(lonDeg, 0);
  // A box across the antimeridian has west > east.
  return area.westDeg <= area.eastDeg ? l >= area.westDeg && l <= area.eastDeg : l >= area.westDeg || l <= area.eastDeg;
}

/**
 * Why a point is outside the grid's usable area, or null when it is inside. The reason does not depend
 * on the point (points outside for one reason are named together); `ownZone` is the point's UTM zone
 * when the grid is a UTM zone.
 */
export function outsideGridArea(p: Projection, latDeg: number, lonDeg: number): { readonly reason: string; readonly ownZone?: number } | null {
  const utm = utmParameters(p.projString);
  if (utm) {
    if (utm.south ? latDeg > UTM_ZONE_MARGIN_DEG : latDeg < -UTM_ZONE_MARGIN_DEG) {
      return { reason: `in the ${utm.south ? 'northern' : 'southern'} hemisphere (the grid is zone ${utm.zone}${utm.south ? 'S' : 'N'}, widened by ${UTM_ZONE_MARGIN_DEG} deg)` };
    }
    let own: number;
    try { own = utmZoneFor(latDeg, lonDeg).zone; } catch { return { reason: 'beyond the latitudes of UTM (80 S to 84 N)' }; }
    const bands = utmZoneBands(utm.zone);
    if (own === utm.zone || bands.some((b) => nearBand(b, latDeg, lonDeg, UTM_ZONE_MARGIN_DEG))) return null;
    return { reason: outsideUtmBandReason(utm.zone, bands, latDeg), ownZone: own };
  }
  if (p.areaOfUse) {
    if (isInside(p.areaOfUse, latDeg, lonDeg)) return null;
    const a = p.areaOfUse;
    return { reason: `outside its area of use in the EPSG dataset, ${lat(a.southDeg)} to ${lat(a.northDeg)}, ${lon(a.westDeg)} to ${lon(a.eastDeg)}${a.description ? ` (${a.description.replace(/\.\s*$/, '').replace(/\.\s+/g, '; ')})` : ''}` };
  }
  const tm = transverseMercator(p.projString);
  if (tm && p.units === 'm') {
    const limit = tm.k0 * (1 + (TM_LIMIT_A_DEG * DEG) ** 2 / 2);
    if (gridFactors(p, latDeg, lonDeg).pointScale <= limit) return null;
    return { reason: `where its point scale factor exceeds ${limit.toFixed(6)}, k0 (1 + A^2 / 2) at A = dlambda cos(phi) = ${TM_LIMIT_A_DEG} deg from its central meridian ${deg(tm.lon0Deg)} (a 6-degree zone's edge widened by ${UTM_ZONE_MARGIN_DEG} deg)` };
  }
  return null;
}

function transverseMercator(projString: string): { lon0Deg: number; k0: number } | null {
  if (!/\+proj=(tmerc|etmerc)\b/.test(projString)) return null;
  const lon0 = Number(/\+lon_0=(\S+)/.exec(projString)?.[1] ?? 0);
  const k0 = Number(/\+k(?:_0)?=(\S+)/.exec(projString)?.[1] ?? 1);
  return Number.isFinite(lon0) && Number.isFinite(k0) ? { lon0Deg: lon0, k0 } : null;
}

/** The point scale factor of a Transverse Mercator in metres (grid-factors.ts), else null. */
function transverseMercatorScale(p: Projection, latDeg: number, lonDeg: number): number | null {
  if (p.units !== 'm' || !/\+proj=(utm|tmerc|etmerc)\b/.test(p.projString)) return null;
  const k = gridFactors(p, latDeg, lonDeg).pointScale;
  return Number.isFinite(k) ? k : null;
}

/**
 * One warning sentence for the points (or marks given in the grid) outside the grid's usable area
 * (outsideGridArea), null when every one is inside: the points named (the first five of each reason) with the reason and, for a Transverse
 * Mercator, the largest point scale factor among them.
 */
export function gridAreaWarning(p: Projection, points: readonly AreaPoint[], what: 'points' | 'marks' = 'points'): string | null {
  const groups = new Map<string, { names: string[]; zones: Set<number>; maxK: number | null }>();
  let count = 0;
  for (const q of points) {
    const o = outsideGridArea(p, q.latDeg, q.lonDeg);
    if (o === null) continue;
    count++;
    const g = groups.get(o.reason) ?? { names: [], zones: new Set<number>(), maxK: null };
    groups.set(o.reason, g);
    g.names.push(`${q.name} (${lat(q.latDeg)}, ${lon(q.lonDeg)})`);
    if (o.ownZone !== undefined) g.zones.add(o.ownZone);
    const k = transverseMercatorScale(p, q.latDeg, q.lonDeg);
    if (k !== null && (g.maxK === null || Math.abs(k - 1) > Math.abs(g.maxK - 1))) g.maxK = k;
  }
  if (count === 0) return null;
  const parts = [...groups].map(([reason, g]) => {
    const names = g.names.slice(0, 5).join(', ') + (g.names.length > 5 ? ` and ${g.names.length - 5} more` : '');
    const zones = g.zones.size ? `; their own zone: ${[...g.zones].join(', ')}` : '';
    const scale = g.maxK !== null ? `; point scale factor up to ${g.maxK.toFixed(6)} (scale error ${Math.round((g.maxK - 1) * 1e6)} ppm)` : '';
    return `${names}: ${reason}${zones}${scale}`;
  });
  // A geographic CRS (units 'deg') holds longitude/latitude, not a grid's easting/northing.
  const geographic = p.units === 'deg';
  const values = geographic ? 'latitude/longitude' : 'easting/northing';
  const list = parts.join('; ');
  if (what === 'marks') {
    return `${count} of ${points.length} mark(s) given in ${p.name} fall outside its ${geographic ? 'area of use' : 'usable area'}: ${list}; their ${values} are most likely in another ${geographic ? 'CRS' : 'grid'}, so check the projection column`;
  }
  if (geographic) {
    return `${count} of ${points.length} point(s) lie outside the area of use of ${p.name}: ${list}; that CRS is not meant for them there, so choose the CRS of the area`;
  }
  return `${count} of ${points.length} point(s) lie outside the usable area of ${p.name}: ${list}; their easting/northing are what that projection gives there, ` +
    'not coordinates of that grid as anyone uses it, so choose the grid of the area (--projection utm takes the zone of the first point)';
}
