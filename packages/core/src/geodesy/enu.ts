/**
 * Local east-north-up frame at an origin on the ellipsoid (geodetic latitude/longitude of the origin),
 * and azimuth/elevation of a target. Rotation from ECEF to ENU: e.g. Hofmann-Wellenhof, Lichtenegger,
 * Wasle, "GNSS" (2008), eq. 2.21 / Misra & Enge (2011) eq. 2.16.
 */
import type { EcefM, EnuM, GeodeticRad } from '../gnss/index.js';
import { WGS84, type Ellipsoid } from './ellipsoid.js';
import { ecefToGeodetic, geodeticToEcef } from './geodetic.js';

/** Rotation of an ECEF difference vector into ENU at geodetic (lat, lon). */
export function ecefDeltaToEnu(d: EcefM, latRad: number, lonRad: number): EnuM {
  const sl = Math.sin(lonRad), cl = Math.cos(lonRad);
  const sp = Math.sin(latRad), cp = Math.cos(latRad);
  return {
    e: -sl * d.x + cl * d.y,
    n: -sp * cl * d.x - sp * sl * d.y + cp * d.z,
    u: cp * cl * d.x + cp * sl * d.y + sp * d.z,
  };
}

/** Inverse rotation: ENU vector at (lat, lon) to an ECEF difference vector. */
export function enuToEcefDelta(v: EnuM, latRad: number, lonRad: number): EcefM {
  const sl = Math.sin(lonRad), cl = Math.cos(lonRad);
  const sp = Math.sin(latRad), cp = Math.cos(latRad);
  return {
    x: -sl * v.e - sp * cl * v.n + cp * cl * v.u,
    y: cl * v.e - sp * sl * v.n + cp * sl * v.u,
    z: cp * v.n + sp * v.u,
  };
}

/** ENU of a point relative to an origin given in ECEF (origin's geodetic latitude/longitude on `ell`). */
export function ecefToEnu(p: EcefM, origin: EcefM, ell: Ellipsoid = WGS84): EnuM {
  const g = ecefToGeodetic(origin, ell);
  return ecefDeltaToEnu({ x: p.x - origin.x, y: p.y - origin.y, z: p.z - origin.z }, g.latRad, g.lonRad);
}

/** ENU of a point relative to an origin given geodetically. */
export function geodeticToEnu(p: GeodeticRad, origin: GeodeticRad, ell: Ellipsoid = WGS84): EnuM {
  const a = geodeticToEcef(p, ell);
  const o = geodeticToEcef(origin, ell);
  return ecefDeltaToEnu({ x: a.x - o.x, y: a.y - o.y, z: a.z - o.z }, origin.latRad, origin.lonRad);
}

export interface AzEl {
  readonly azimuthRad: number;
  readonly elevationRad: number;
}

/** Azimuth (from north, clockwise, 0..2pi) and elevation of a target seen from a receiver at geodetic (lat, lon). */
export function azimuthElevation(receiver: EcefM, target: EcefM, latRad: number, lonRad: number): AzEl {
  const v = ecefDeltaToEnu({ x: target.x - receiver.x, y: target.y - receiver.y, z: target.z - receiver.z }, latRad, lonRad);
  const horiz = Math.hypot(v.e, v.n);
  let az = Math.atan2(v.e, v.n);
  if (az < 0) az += 2 * Math.PI;
  return { azimuthRad: az, elevationRad: Math.atan2(v.u, horiz) };
}

export function distanceM(a: EcefM, b: EcefM): number {
  return Math.hypot(a.x - b.x, a.y - b.y, a.z - b.z);
}

export function addEcef(a: EcefM, b: EcefM): EcefM {
  return { x: a.x + b.x, y: a.y + b.y, z: a.z + b.z };
}

export function subEcef(a: EcefM, b: EcefM): EcefM {
  return { x: a.x - b.x, y: a.y - b.y, z: a.z - b.z };
}
