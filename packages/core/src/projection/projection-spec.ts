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
 */
import { utmZoneFor } from './utm-zone.js';

export interface ProjectionSpec {
  readonly name: string;
  readonly projString: string;
  /** 'deg' for geographic output (EPSG:4326: easting = longitude, northing = latitude in degrees). */
  readonly units: 'm' | 'deg';
}

export interface NearPoint {
  readonly latDeg: number;
  readonly lonDeg: number;
}

const utm = (zone: number, south: boolean, ellps: string) =>
  `+proj=utm +zone=${zone}${south ? ' +south' : ''} +ellps=${ellps} +units=m +no_defs`;

export function resolveProjectionSpec(spec: string, near?: NearPoint): ProjectionSpec {
  const s = spec.trim();
  if (s.includes('+proj=')) {
    return { name: s, projString: s, units: /\+proj=(longlat|latlong|lonlat|latlon)\b/.test(s) ? 'deg' : 'm' };
  }
  if (s.toLowerCase() === 'utm') {
    if (!near) throw new RangeError("projection 'utm' chooses the zone from a point: give the point's latitude and longitude");
    const z = utmZoneFor(near.latDeg, near.lonDeg);
    return { name: `WGS 84 / UTM zone ${z.zone}${z.south ? 'S' : 'N'} (EPSG:${z.south ? 327 : 326}${String(z.zone).padStart(2, '0')})`, projString: utm(z.zone, z.south, 'WGS84'), units: 'm' };
  }
  const m = /^EPSG:(\d+)$/i.exec(s);
  if (!m) throw new RangeError(`unknown projection '${s}': give an EPSG code (e.g. EPSG:32633), 'utm', or a PROJ string starting with +proj=`);
  const code = Number(m[1]);
  if (code === 4326) return { name: 'WGS 84 (EPSG:4326)', projString: '+proj=longlat +ellps=WGS84 +no_defs', units: 'deg' };
  if (code === 3857) {
    return { name: 'WGS 84 / Pseudo-Mercator (EPSG:3857)', projString: '+proj=merc +a=6378137 +b=6378137 +lat_ts=0 +lon_0=0 +x_0=0 +y_0=0 +k=1 +units=m +no_defs', units: 'm' };
  }
  const zz = code % 100;
  const family = Math.floor(code / 100);
  if ((family === 326 || family === 327) && zz >= 1 && zz <= 60) {
    return { name: `WGS 84 / UTM zone ${zz}${family === 327 ? 'S' : 'N'} (EPSG:${code})`, projString: utm(zz, family === 327, 'WGS84'), units: 'm' };
  }
  if (family === 258 && zz >= 28 && zz <= 38) {
    return { name: `ETRS89 / UTM zone ${zz}N (EPSG:${code})`, projString: utm(zz, false, 'GRS80'), units: 'm' };
  }
  if (family === 269 && zz >= 1 && zz <= 23) {
    return { name: `NAD83 / UTM zone ${zz}N (EPSG:${code})`, projString: utm(zz, false, 'GRS80'), units: 'm' };
  }
  throw new RangeError(`EPSG:${code} is not built in: give its definition as a PROJ string (+proj=... with +ellps=...)`);
}
