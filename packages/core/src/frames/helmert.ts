/**
 * 14-parameter (7 + rates) similarity transformation between terrestrial reference frames.
 *
 * IERS Conventions (2010), IERS TN 36, section 4.2.3, eq. 4.13 (the same form as EUREF Technical Note 1,
 * Boucher & Altamimi, "Memo: Specifications for reference frame fixing in the analysis of a EUREF GPS
 * campaign", eq. 1-3):
 *
 *   X2 = X1 + T + D X1 + R X1,   R = [[0, -R3, R2], [R3, 0, -R1], [-R2, R1, 0]]
 *
 * with every parameter P evaluated at the coordinate's epoch t: P(t) = P(t0) + Pdot (t - t0)
 * (IERS Conventions 2010 eq. 4.14). Units as published: T in mm, D in ppb (1e-9), R in mas
 * (milliarcseconds), rates per year.
 *
 * The inverse is the same form with every parameter negated (first order). The neglected terms are
 * products of two parameters, e.g. R^2 X and D R X: for |R| <= 30 mas (1.5e-7 rad) and |X| ~ 6.4e6 m
 * that is 1.5e-7^2 * 6.4e6 ~ 1e-7 m, far below 1 mm (checked by the round-trip test).
 */
import type { EcefM } from '../gnss/index.js';

export type Vec3 = readonly [number, number, number];

export interface HelmertParams {
  /** Normalised frame names (see normaliseFrameName). */
  readonly from: string;
  readonly to: string;
  /** Reference epoch t0 of the parameters, decimal year. */
  readonly epochYear: number;
  readonly tMm: Vec3;
  readonly dPpb: number;
  readonly rMas: Vec3;
  readonly tdotMmPerYr: Vec3;
  readonly ddotPpbPerYr: number;
  readonly rdotMasPerYr: Vec3;
  /** Where the numbers come from (publication, table). */
  readonly source: string;
}

const MM = 1e-3;
const PPB = 1e-9;
/** One milliarcsecond in radians: pi / (180 * 3600 * 1000). */
const MAS_RAD = Math.PI / (180 * 3600 * 1000);

/** Applies the transformation to an ECEF coordinate at epoch `epochYear` (decimal year). */
export function applyHelmert(p: EcefM, epochYear: number, h: HelmertParams): EcefM {
  const dt = epochYear - h.epochYear;
  // IERS Conventions 2010 eq. 4.14: parameters propagated to the epoch of the coordinate.
  const tx = (h.tMm[0] + h.tdotMmPerYr[0] * dt) * MM;
  const ty = (h.tMm[1] + h.tdotMmPerYr[1] * dt) * MM;
  const tz = (h.tMm[2] + h.tdotMmPerYr[2] * dt) * MM;
  const d = (h.dPpb + h.ddotPpbPerYr * dt) * PPB;
  const r1 = (h.rMas[0] + h.rdotMasPerYr[0] * dt) * MAS_RAD;
  const r2 = (h.rMas[1] + h.rdotMasPerYr[1] * dt) * MAS_RAD;
  const r3 = (h.rMas[2] + h.rdotMasPerYr[2] * dt) * MAS_RAD;
  // IERS Conventions 2010 eq. 4.13: X2 = X1 + T + D X1 + R X1.
  return {
    x: p.x + tx + d * p.x - r3 * p.y + r2 * p.z,
    y: p.y + ty + r3 * p.x + d * p.y - r1 * p.z,
    z: p.z + tz - r2 * p.x + r1 * p.y + d * p.z,
  };
}

const neg = (v: Vec3): Vec3 => [-v[0], -v[1], -v[2]];

/** The reverse transformation (to -> from) by negating every parameter: first order, error ~1e-7 m. */
export function invertHelmert(h: HelmertParams): HelmertParams {
  return {
    from: h.to,
    to: h.from,
    epochYear: h.epochYear,
    tMm: neg(h.tMm),
    dPpb: -h.dPpb,
    rMas: neg(h.rMas),
    tdotMmPerYr: neg(h.tdotMmPerYr),
    ddotPpbPerYr: -h.ddotPpbPerYr,
    rdotMasPerYr: neg(h.rdotMasPerYr),
    source: `inverse of: ${h.source}`,
  };
}
