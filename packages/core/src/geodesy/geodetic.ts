/**
 * ECEF <-> geodetic conversion.
 *
 * Forward: the closed form (e.g. NIMA TR8350.2 eq. 4-14). Reverse: the exact closed-form solution of
 * H. Vermeille, "An analytical method to transform geocentric into geodetic coordinates",
 * J. Geodesy 85 (2011) 105-117, doi:10.1007/s00190-010-0419-x, in the form given by C. F. F. Karney
 * (GeographicLib, Geocentric::Reverse), which stays exact at the poles, on the equator and inside the
 * evolute near the Earth's centre (where a naive iteration converges to the wrong branch).
 */
import type { EcefM, GeodeticRad } from '../gnss/index.js';
import { WGS84, type Ellipsoid } from './ellipsoid.js';

export function geodeticToEcef(g: GeodeticRad, ell: Ellipsoid = WGS84): EcefM {
  const e2 = ell.f * (2 - ell.f);
  const sphi = Math.sin(g.latRad);
  const cphi = Math.cos(g.latRad);
  // Prime vertical radius of curvature N = a / sqrt(1 - e^2 sin^2 phi)
  const n = ell.aM / Math.sqrt(1 - e2 * sphi * sphi);
  return {
    x: (n + g.heightM) * cphi * Math.cos(g.lonRad),
    y: (n + g.heightM) * cphi * Math.sin(g.lonRad),
    z: (n * (1 - e2) + g.heightM) * sphi,
  };
}

export function ecefToGeodetic(p: EcefM, ell: Ellipsoid = WGS84): GeodeticRad {
  const a = ell.aM;
  const f = ell.f;
  const e2 = f * (2 - f);
  const e2m = (1 - f) * (1 - f);
  const e2a = Math.abs(e2);
  const e4a = e2 * e2;
  const R = Math.hypot(p.x, p.y);
  const lonRad = Math.atan2(p.y, p.x);
  const Z = p.z;
  // Vermeille (2011) eqs. 2-10, with p, q, r as in the paper scaled by a.
  const pp = (R / a) * (R / a);
  const q = e2m * (Z / a) * (Z / a);
  const r = (pp + q - e4a) / 6;
  let sphi: number;
  let cphi: number;
  let h: number;
  if (!(e4a * q === 0 && r <= 0)) {
    const S = (e4a * pp * q) / 4;
    const r2 = r * r;
    const r3 = r * r2;
    const disc = S * (2 * r3 + S);
    let u = r;
    if (disc >= 0) {
      let T3 = S + r3;
      // Pick the sign of the root so that T3 does not suffer cancellation.
      T3 += T3 < 0 ? -Math.sqrt(disc) : Math.sqrt(disc);
      const T = Math.cbrt(T3);
      u += T + (T !== 0 ? r2 / T : 0);
    } else {
      // T is complex: its real part via the cosine of a third of the angle.
      const ang = Math.atan2(Math.sqrt(-disc), -(S + r3));
      u += 2 * r * Math.cos(ang / 3);
    }
    const v = Math.sqrt(u * u + e4a * q);
    const uv = u < 0 ? (e4a * q) / (v - u) : u + v;
    const w = Math.max(0, (e2a * (uv - q)) / (2 * v));
    const k = uv / (Math.sqrt(uv + w * w) + w);
    const k1 = k;
    const k2 = k + e2;
    const d = (k1 * R) / k2;
    const H = Math.hypot(Z / k1, R / k2);
    sphi = Z / k1 / H;
    cphi = R / k2 / H;
    h = (1 - e2m / k1) * Math.hypot(d, Z);
  } else {
    // On the equatorial plane inside the evolute: latitude from the evolute's geometry.
    const zz = Math.sqrt((e4a - pp) / e2m);
    const xx = Math.sqrt(pp);
    const H = Math.hypot(zz, xx);
    sphi = zz / H;
    cphi = xx / H;
    if (Z < 0) sphi = -sphi;
    h = (-a * e2m * H) / e2a;
  }
  return { latRad: Math.atan2(sphi, cphi), lonRad, heightM: h };
}

export const DEG = Math.PI / 180;

export function degToRad(d: number): number {
  return d * DEG;
}

export function radToDeg(r: number): number {
  return r / DEG;
}
