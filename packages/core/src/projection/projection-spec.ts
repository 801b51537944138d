/**
 * Turns a user's projection name into a PROJ string. Supported EPSG codes (parameters from the EPSG
 * dataset definitions, written out here: common practice):
 * - EPSG:4326 WGS 84 geographic (degrees), EPSG:3857 WGS 84 / Pseudo-Mercator (spherical formulas on
 *   a = 6378137 m applied to geodetic latitude);
 * - EPSG:32601..32660 / 32701..32760 WGS 84 / UTM zone N / S;
 * - EPSG:25828..25838 ETRS89 / UTM zone 28N..38N (GRS80);
 * - EPSG:26901..26923 NAD83 / UTM zone 1N..23N (GRS80);
 * - 'utm': the zone of a given point (utm-zone.ts), on WGS 84;
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

/** One EPSG CRS definition as a dataset gives it. */
export interface EpsgDefinition {
  readonly code: number;
  readonly name: string;
  /** 'CRS-PROJCRS', 'CRS-GEOGCRS', ... (epsg-index kinds). */
  readonly kind: string;
  readonly proj4: string;
  /** OGC WKT 1 (as .prj files hold it), when the dataset has one. */
  readonly wkt: string | null;
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
}

export interface NearPoint {
  readonly latDeg: number;
  readonly lonDeg: number;
}

const utm = (zone: number, south: boolean, ellps: string) =>
  `+proj=utm +zone=${zone}${south ? ' +south' : ''} +ellps=${ellps} +units=m +no_defs`;

function fromLookup(code: number, lookup: EpsgLookup): ProjectionSpec {
  const d = lookup(code);
  if (!d) throw new RangeError(`EPSG:${code} is not in the EPSG dataset`);
  if (d.kind !== 'CRS-PROJCRS' && d.kind !== 'CRS-GEOGCRS') {
    throw new RangeError(`EPSG:${code} (${d.name}) is a ${d.kind.replace(/^CRS-/, '').toLowerCase()} CRS: give a projected (grid) CRS or a geographic 2-D one`);
  }
  if (!/\+(ellps|datum|a)=/.test(d.proj4)) throw new RangeError(`EPSG:${code} (${d.name}) has no PROJ definition with an ellipsoid in the EPSG dataset`);
  return { name: `${d.name} (EPSG:${code})`, projString: d.proj4, epsg: code, wkt: d.wkt, units: d.kind === 'CRS-GEOGCRS' ? 'deg' : 'm' };
}

export function resolveProjectionSpec(spec: string, near?: NearPoint, lookup?: EpsgLookup): ProjectionSpec {
  const s = spec.trim();
  if (s.includes('+proj=')) {
    return { name: s, projString: s, epsg: null, wkt: null, units: /\+proj=(longlat|latlong|lonlat|latlon)\b/.test(s) ? 'deg' : 'm' };
  }
  if (s.toLowerCase() === 'utm') {
    if (!near) throw new RangeError("projection 'utm' chooses the zone from a point: give the point's latitude and longitude");
    const z = utmZoneFor(near.latDeg, near.lonDeg);
    const code = (z.south ? 32700 : 32600) + z.zone;
    if (lookup) return fromLookup(code, lookup);
    return { name: `WGS 84 / UTM zone ${z.zone}${z.south ? 'S' : 'N'} (EPSG:${code})`, projString: utm(z.zone, z.south, 'WGS84'), epsg: code, wkt: null, units: 'm' };
  }
  const m = /^EPSG:(\d+)$/i.exec(s);
  if (!m) throw new RangeError(`unknown projection '${s}': give an EPSG code (e.g. EPSG:32633), 'utm', or a PROJ string starting with +proj=`);
  const code = Number(m[1]);
  if (lookup) return fromLookup(code, lookup);
  if (code === 4326) return { name: 'WGS 84 (EPSG:4326)', projString: '+proj=longlat +ellps=WGS84 +no_defs', epsg: code, wkt: null, units: 'deg' };
  if (code === 3857) {
    return { name: 'WGS 84 / Pseudo-Mercator (EPSG:3857)', projString: '+proj=merc +a=6378137 +b=6378137 +lat_ts=0 +lon_0=0 +x_0=0 +y_0=0 +k=1 +units=m +no_defs', epsg: code, wkt: null, units: 'm' };
  }
  const zz = code % 100;
  const family = Math.floor(code / 100);
  if ((family === 326 || family === 327) && zz >= 1 && zz <= 60) {
    return { name: `WGS 84 / UTM zone ${zz}${family === 327 ? 'S' : 'N'} (EPSG:${code})`, projString: utm(zz, family === 327, 'WGS84'), epsg: code, wkt: null, units: 'm' };
  }
  if (family === 258 && zz >= 28 && zz <= 38) {
    return { name: `ETRS89 / UTM zone ${zz}N (EPSG:${code})`, projString: utm(zz, false, 'GRS80'), epsg: code, wkt: null, units: 'm' };
  }
  if (family === 269 && zz >= 1 && zz <= 23) {
    return { name: `NAD83 / UTM zone ${zz}N (EPSG:${code})`, projString: utm(zz, false, 'GRS80'), epsg: code, wkt: null, units: 'm' };
  }
  throw new RangeError(`EPSG:${code} is not built in (no EPSG dataset was given): give its definition as a PROJ string (+proj=... with +ellps=...)`);
}
