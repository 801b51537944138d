/**
 * Turns a user's projection name into a PROJ string. Supported EPSG codes (parameters from the EPSG
 * dataset definitions, written out here: common practice):
 * - EPSG:4326 WGS 84 geographic (degrees: `units` 'deg'; `points` refuses a geographic CRS, the marks
 *   reader too), EPSG:3857 WGS 84 / Pseudo-Mercator (spherical formulas on a = 6378137 m applied to
 *   geodetic latitude);
 * - EPSG:32601..32660 / 32701..32760 WGS 84 / UTM zone N / S;
 * - EPSG:25828..25838 ETRS89 / UTM zone 28N..38N (GRS80);
 * - EPSG:26901..26923 NAD83 / UTM zone 1N..23N (GRS80);
 * - 'utm': the zone of a given point (utm-zone.ts), in the points' frame: the EPSG UTM CRS of that frame
 *   where the dataset has one (WGS 84 32601..32760, ETRS89 25828..25837 (25838 is deprecated),
 *   NAD83 26901..26923, GDA94 / MGA 28348..28358, GDA2020 / MGA 7846..7859), else the UTM parameters alone (`parametersOnly`: the
 *   coordinates are labelled with the points' own frame, report/grid-crs.ts);
 * - any '+proj=...' PROJ string as given.
 * The strings carry an ellipsoid only, never a datum shift: coordinates are expected to be in the
 * projection's frame already (see frames/ for frame transformations).
 *
 * Any other EPSG code (national grids such as EPSG:2157, EPSG:2056, EPSG:27700) comes from an
 * `EpsgLookup` the caller gives: the definitions of a maintained copy of the EPSG dataset (the CLI
 * reads the npm package epsg-index). With a lookup, every EPSG code (the ones above included) is taken
 * from it, with its WKT for .prj files; the built-in codes remain for callers without one.
 */
import { utmZoneFor } from './utm-zone.js';
import proj4 from 'proj4';
import { firstElement, geogcsOf, ownEpsgCode } from './wkt1.js';
import { normaliseFrameName } from '../frames/index.js';

/** One EPSG CRS definition as a dataset gives it. */
export interface EpsgDefinition {
  readonly code: number;
  readonly name: string;
  /** 'CRS-PROJCRS', 'CRS-GEOGCRS', ... (epsg-index kinds). */
  readonly kind: string;
  readonly proj4: string;
  /** OGC WKT 1 (as .prj files hold it), when the dataset has one. */
  readonly wkt: string | null;
  /** The area of use the dataset publishes for the CRS, when it gives one. */
  readonly areaOfUse?: AreaOfUse | null;
}

/** A CRS's area of use: its bounding box in degrees (west > east across the antimeridian) and the dataset's words. */
export interface AreaOfUse {
  readonly northDeg: number;
  readonly westDeg: number;
  readonly southDeg: number;
  readonly eastDeg: number;
  readonly description: string;
}

export type EpsgLookup = (code: number) => EpsgDefinition | undefined;

export interface ProjectionSpec {
  readonly name: string;
  readonly projString: string;
  /** The EPSG code, when the projection is one (null for a PROJ string). */
  readonly epsg: number | null;
  /** OGC WKT 1 of the CRS, when known (from the lookup). */
  readonly wkt: string | null;
  /** 'deg' for geographic output (EPSG:4326: easting = longitude, northing = latitude in degrees). */
  readonly units: 'm' | 'deg';
  /** EPSG code of the CRS's base geographic CRS (its datum), when known. */
  readonly baseGeographicEpsg: number | null;
  /** True when only the projection's parameters are meant, not its datum ('utm' in a frame without an EPSG UTM CRS). */
  readonly parametersOnly: boolean;
  /** The area of use of the EPSG CRS, when the dataset gives one (grid-area.ts). */
  readonly areaOfUse: AreaOfUse | null;
}

export interface NearPoint {
  readonly latDeg: number;
  readonly lonDeg: number;
}

const utm = (zone: number, south: boolean, ellps: string) =>
  `+proj=utm +zone=${zone}${south ? ' +south' : ''} +ellps=${ellps} +units=m +no_defs`;

/** What a CRS of another kind than projected or geographic is, in plain words (EPSG dataset kinds). */
const KIND_WORDS: Readonly<Record<string, string>> = {
  'CRS-VERTCRS': 'a vertical CRS (heights only)',
  'CRS-GCENCRS': 'a geocentric CRS (Earth-centred X, Y, Z)',
  'CRS-GEOG3DCRS': 'a geographic 3-D CRS (latitude, longitude, ellipsoidal height)',
  'CRS-COMPOUNDCRS': 'a compound CRS (a horizontal CRS with a vertical one)',
  'CRS-ENGCRS': 'an engineering CRS (a local system not tied to the Earth)',
  'CRS-DRVDCRS': 'a derived CRS',
};

/**
 * The sentence refusing a CRS that is not a map grid. A compound CRS built on a projected one names that
 * part (its WKT's PROJCS element and its own EPSG code).
 */
function notAGridSentence(code: number, d: EpsgDefinition): string {
  const what = KIND_WORDS[d.kind] ?? `a CRS of kind ${d.kind.replace(/^CRS-/, '').toLowerCase()}`;
  const projected = d.kind === 'CRS-COMPOUNDCRS' && d.wkt ? projectedPartCode(d.wkt) : null;
  const give = projected !== null ? `give its projected part, EPSG:${projected}` : 'give a projected CRS (a map grid of eastings and northings), e.g. utm or the EPSG code of a national grid';
  return `EPSG:${code} (${d.name}) is ${what}, not a map grid: ${give}`;
}

/** The EPSG code of the PROJCS inside a WKT 1 COMPD_CS, or null. */
function projectedPartCode(wkt: string): number | null {
  const projcs = firstElement(wkt, 'PROJCS');
  return projcs ? ownEpsgCode(projcs) : null;
}

function fromLookup(code: number, lookup: EpsgLookup): ProjectionSpec {
  const d = lookup(code);
  if (!d) throw new RangeError(`EPSG:${code} is not in the EPSG dataset`);
  if (d.kind !== 'CRS-PROJCRS' && d.kind !== 'CRS-GEOGCRS') throw new RangeError(notAGridSentence(code, d));
  if (!/\+(ellps|datum|a)=/.test(d.proj4)) throw new RangeError(`EPSG:${code} (${d.name}) has no PROJ definition with an ellipsoid in the EPSG dataset`);
  const geographic = d.kind === 'CRS-GEOGCRS';
  const base = geographic ? code : d.wkt ? ownEpsgCode(geogcsOf(d.wkt) ?? '') : null;
  return { name: `${d.name} (EPSG:${code})`, projString: d.proj4, epsg: code, wkt: d.wkt, units: geographic ? 'deg' : 'm', baseGeographicEpsg: base, parametersOnly: false, areaOfUse: d.areaOfUse ?? null };
}

/**
 * The EPSG UTM CRS of a frame for a zone, or null when the EPSG dataset has none (codes: EPSG dataset,
 * checked against epsg-index in projection.test.ts). MGA zones are the UTM zones of Australia.
 */
export function utmEpsgOfFrame(frameName: string, zone: number, south: boolean): number | null {
  switch (normaliseFrameName(frameName)) {
    case 'WGS84': return (south ? 32700 : 32600) + zone;
    case 'ETRS89': return !south && zone >= 28 && zone <= 37 ? 25800 + zone : null;
    case 'NAD83': return !south && zone >= 1 && zone <= 23 ? 26900 + zone : null;
    case 'GDA94': return south && zone >= 48 && zone <= 58 ? 28300 + zone : null;
    case 'GDA2020': return south && zone >= 46 && zone <= 59 ? 7800 + zone : null;
    default: return null;
  }
}

/** The built-in codes' base geographic CRS (their datum). */
function builtInBase(family: number): number | null {
  if (family === 326 || family === 327) return 4326;
  if (family === 258) return 4258;
  if (family === 269) return 4269;
  return null;
}

const DATUM_SHIFT_TOKEN = /^\+(towgs84|nadgrids|geoidgrids|type)=/;

/**
 * A PROJ string proj4 cannot set up ('+proj=foo', a misspelt name) is refused here, with the name it
 * does not know, so that a command line can say so before any work. The datum-shift tokens are left out
 * of the test: they are never applied (projection.ts), so a grid file name proj4 lacks does not matter.
 */
function requireKnownProjString(s: string): void {
  const bare = s.split(/\s+/).filter((t) => t !== '' && !DATUM_SHIFT_TOKEN.test(t)).join(' ');
  try {
    proj4.Proj(bare);
  } catch (e) {
    const name = /\+proj=(\S*)/.exec(s)?.[1] ?? '';
    const message = e instanceof Error ? e.message : String(e);
    // proj4 says 'Could not get projection name from: ...' (older releases: an empty error) for a name it does not have.
    const what = !message || message === 'undefined' || /projection name/i.test(message) ? `the PROJ string names a projection proj4 does not know ('+proj=${name}')` : `the PROJ string cannot be set up (${message})`;
    throw new RangeError(`${what}: give an EPSG code, 'utm', or a PROJ string such as '+proj=tmerc +lat_0=0 +lon_0=-9 +k=0.9996 +x_0=500000 +y_0=0 +ellps=GRS80 +units=m'`);
  }
}

/**
 * `frameName`: the frame of the points to project ('utm' takes that frame's UTM CRS); without it, 'utm'
 * is WGS 84 UTM.
 */
export function resolveProjectionSpec(spec: string, near?: NearPoint, lookup?: EpsgLookup, frameName = 'WGS84'): ProjectionSpec {
  const s = spec.trim();
  if (s.includes('+proj=')) {
    requireKnownProjString(s);
    return { name: s, projString: s, epsg: null, wkt: null, units: /\+proj=(longlat|latlong|lonlat|latlon)\b/.test(s) ? 'deg' : 'm', baseGeographicEpsg: null, parametersOnly: false, areaOfUse: null };
  }
  if (s.toLowerCase() === 'utm') {
    if (!near) throw new RangeError("projection 'utm' chooses the zone from a point: give the point's latitude and longitude");
    const z = utmZoneFor(near.latDeg, near.lonDeg);
    const own = utmEpsgOfFrame(frameName, z.zone, z.south);
    if (own !== null && lookup) return fromLookup(own, lookup);
    if (own !== null && builtInBase(Math.floor(own / 100)) !== null) return resolveProjectionSpec(`EPSG:${own}`);
    // No UTM CRS of the frame: the WGS 84 UTM parameters (GRS80 and WGS 84 grids agree within 0.1 mm), labelled with the frame.
    const wgs = (z.south ? 32700 : 32600) + z.zone;
    const w = lookup ? fromLookup(wgs, lookup) : resolveProjectionSpec(`EPSG:${wgs}`);
    return { ...w, name: `UTM zone ${z.zone}${z.south ? 'S' : 'N'}`, epsg: null, parametersOnly: true };
  }
  const m = /^EPSG:(\d+)$/i.exec(s);
  if (!m) {
    // A bare number or 'EPSG 2157' is an EPSG code written another way: name the form we read.
    const code = /^(?:epsg)?[\s:_-]*(\d{4,5})$/i.exec(s)?.[1];
    const hint = code ? `: did you mean EPSG:${code}?` : `: give an EPSG code (e.g. EPSG:32633), 'utm', or a PROJ string starting with +proj=`;
    throw new RangeError(`unknown projection '${s}'${hint}`);
  }
  const code = Number(m[1]);
  if (lookup) return fromLookup(code, lookup);
  if (code === 4326) return { name: 'WGS 84 (EPSG:4326)', projString: '+proj=longlat +ellps=WGS84 +no_defs', epsg: code, wkt: null, units: 'deg', baseGeographicEpsg: 4326, parametersOnly: false, areaOfUse: null };
  if (code === 3857) {
    return { name: 'WGS 84 / Pseudo-Mercator (EPSG:3857)', projString: '+proj=merc +a=6378137 +b=6378137 +lat_ts=0 +lon_0=0 +x_0=0 +y_0=0 +k=1 +units=m +no_defs', epsg: code, wkt: null, units: 'm', baseGeographicEpsg: 4326, parametersOnly: false, areaOfUse: null };
  }
  const zz = code % 100;
  const family = Math.floor(code / 100);
  if ((family === 326 || family === 327) && zz >= 1 && zz <= 60) {
    return { name: `WGS 84 / UTM zone ${zz}${family === 327 ? 'S' : 'N'} (EPSG:${code})`, projString: utm(zz, family === 327, 'WGS84'), epsg: code, wkt: null, units: 'm', baseGeographicEpsg: builtInBase(family), parametersOnly: false, areaOfUse: null };
  }
  if (family === 258 && zz >= 28 && zz <= 38) {
    return { name: `ETRS89 / UTM zone ${zz}N (EPSG:${code})`, projString: utm(zz, false, 'GRS80'), epsg: code, wkt: null, units: 'm', baseGeographicEpsg: builtInBase(family), parametersOnly: false, areaOfUse: null };
  }
  if (family === 269 && zz >= 1 && zz <= 23) {
    return { name: `NAD83 / UTM zone ${zz}N (EPSG:${code})`, projString: utm(zz, false, 'GRS80'), epsg: code, wkt: null, units: 'm', baseGeographicEpsg: builtInBase(family), parametersOnly: false, areaOfUse: null };
  }
  throw new RangeError(`EPSG:${code} is not built in (no EPSG dataset was given): give its definition as a PROJ string (+proj=... with +ellps=...)`);
}
