/**
 * Map projection of geodetic coordinates with the proj4 library (browser-safe). The projection is
 * applied to latitude/longitude already in the projection's frame: proj4 is never allowed to shift
 * datums. The user's string is stripped of +towgs84, +nadgrids and +datum (a +datum is replaced by
 * its ellipsoid's +a/+b), and the source of every conversion is '+proj=longlat' on that same bare
 * ellipsoid, so no geocentric datum step can run (even an identity one costs proj4 ~1 mm of round-trip
 * noise, measured in the tests).
 */
import proj4 from 'proj4';
import { resolveProjectionSpec, type AreaOfUse, type EpsgLookup, type NearPoint } from './projection-spec.js';

export interface ProjectedM {
  readonly eastingM: number;
  readonly northingM: number;
}

export interface Projection {
  readonly name: string;
  readonly projString: string;
  /** EPSG code and OGC WKT 1 of the CRS, when known (projection-spec.ts). */
  readonly epsg: number | null;
  readonly wkt: string | null;
  readonly units: 'm' | 'deg';
  /** EPSG code of the base geographic CRS (the datum the parameters belong to), when known. */
  readonly baseGeographicEpsg: number | null;
  /** True when only the parameters are meant, not the datum (projection-spec.ts, 'utm'). */
  readonly parametersOnly: boolean;
  /** The EPSG CRS's area of use, when known (grid-area.ts). */
  readonly areaOfUse: AreaOfUse | null;
  forward(latDeg: number, lonDeg: number): ProjectedM;
  inverse(eastingM: number, northingM: number): { latDeg: number; lonDeg: number };
  /** Semi-major axis and first eccentricity squared of the projection's ellipsoid. */
  readonly ellipsoid: { readonly aM: number; readonly e2: number };
}

interface Converter {
  forward(c: number[]): number[];
  inverse(c: number[]): number[];
}

const SHIFT_TOKENS = /^\+(towgs84|nadgrids|datum|type)=/;
const ELLIPSOID_TOKENS = /^\+(ellps|a|b|rf|f|R)=/;

/** The PROJ string without any datum-shift tokens; a +datum is replaced by its ellipsoid's axes. */
export function withoutDatumShift(projString: string): string {
  const tokens = projString.trim().split(/\s+/);
  const kept = tokens.filter((t) => !SHIFT_TOKENS.test(t));
  if (!kept.some((t) => ELLIPSOID_TOKENS.test(t)) && tokens.some((t) => t.startsWith('+datum='))) {
    const p = proj4.Proj(projString) as unknown as { a: number; b: number };
    kept.push(`+a=${p.a}`, `+b=${p.b}`);
  }
  return kept.join(' ');
}

/** '+proj=longlat' on the ellipsoid tokens of a (shift-free) PROJ string. */
export function sameEllipsoidLongLat(projString: string): string {
  const tokens = projString.split(/\s+/).filter((t) => ELLIPSOID_TOKENS.test(t));
  return ['+proj=longlat', ...tokens, '+no_defs'].join(' ');
}

export function makeProjection(spec: string, near?: NearPoint, lookup?: EpsgLookup, frameName?: string): Projection {
  const r = resolveProjectionSpec(spec, near, lookup, frameName);
  let conv: Converter;
  let aM: number;
  let e2: number;
  try {
    const bare = withoutDatumShift(r.projString);
    conv = proj4(sameEllipsoidLongLat(bare), bare) as unknown as Converter;
    const p = proj4.Proj(bare) as unknown as { a: number; es: number };
    aM = p.a;
    e2 = p.es;
  } catch (e) {
    throw new RangeError(`projection '${spec}' could not be set up (${e instanceof Error ? e.message : String(e)})`);
  }
  if (!Number.isFinite(aM) || !Number.isFinite(e2)) throw new RangeError(`projection '${spec}': no ellipsoid could be read from '${r.projString}'`);
  return {
    name: r.name,
    projString: r.projString,
    epsg: r.epsg,
    wkt: r.wkt,
    units: r.units,
    baseGeographicEpsg: r.baseGeographicEpsg,
    parametersOnly: r.parametersOnly,
    areaOfUse: r.areaOfUse,
    ellipsoid: { aM, e2 },
    forward(latDeg, lonDeg) {
      const [x, y] = conv.forward([lonDeg, latDeg]);
      return { eastingM: x!, northingM: y! };
    },
    inverse(eastingM, northingM) {
      const [lon, lat] = conv.inverse([eastingM, northingM]);
      return { latDeg: lat!, lonDeg: lon! };
    },
  };
}
