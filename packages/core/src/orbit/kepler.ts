/**
 * Satellite position and velocity (ECEF) from a Keplerian broadcast ephemeris.
 *
 * GPS/QZSS/NavIC: IS-GPS-200 table 20-IV ("Elements of coordinate systems", user algorithm for
 * ephemeris determination), velocity by the analytic derivative of the same equations (IS-GPS-200
 * table 20-IV, second part, in revisions that carry it). Galileo: OS SIS ICD 5.1.1 (the same equations
 * with its own mu). BeiDou: ICD B1I 5.2.4.12, including the GEO satellites (PRN 1-5 and 59-63), whose
 * orbit is computed in an inertial-like frame and then rotated by R_Z(omegaE tk) R_X(-5 deg).
 * Accuracy: the user algorithm reproduces the broadcast orbit to well below a millimetre; the Kepler
 * equation is iterated until the correction is below 1e-13 rad.
 */
import type { KeplerEphemeris } from '../gnss/index.js';
import { wrapWeekS } from '../time/index.js';
import { keplerConstantsFor, type KeplerConstants } from './constants.js';

/** Per-ephemeris constants that do not depend on t (cached: satelliteState is the hot path). */
interface KeplerDerived {
  readonly c: KeplerConstants;
  readonly aM: number;
  /** Corrected mean motion n = n0 + deltaN (rad/s): IS-GPS-200 table 20-IV. */
  readonly nRadS: number;
  readonly sqrt1mE2: number;
  readonly isBeidouGeo: boolean;
}

const derivedCache = new WeakMap<KeplerEphemeris, KeplerDerived>();

/** BeiDou GEO satellites: PRN 1-5 and 59-63 (BeiDou ICD B1I 5.2.4.12; BDS-3 GEO PRNs from memory). */
export function isBeidouGeo(eph: Pick<KeplerEphemeris, 'system' | 'sat'>): boolean {
  if (eph.system !== 'C') return false;
  const prn = Number(eph.sat.slice(1));
  return (prn >= 1 && prn <= 5) || (prn >= 59 && prn <= 63);
}

function derived(eph: KeplerEphemeris): KeplerDerived {
  let d = derivedCache.get(eph);
  if (d === undefined) {
    const c = keplerConstantsFor(eph.system);
    const aM = eph.sqrtA * eph.sqrtA; // A = (sqrt A)^2
    const n0 = Math.sqrt(c.muM3S2 / (aM * aM * aM)); // n0 = sqrt(mu / A^3)
    d = { c, aM, nRadS: n0 + eph.deltaN, sqrt1mE2: Math.sqrt(1 - eph.e * eph.e), isBeidouGeo: isBeidouGeo(eph) };
    derivedCache.set(eph, d);
  }
  return d;
}

/**
 * Solves Kepler's equation M = E - e sin E by Newton iteration (IS-GPS-200 table 20-IV, "may be
 * solved by iteration"), to |dE| < 1e-13 rad.
 */
/** The last solveKepler call: a satellite's clock and its orbit are wanted at the same instant (orbit/transmit.ts). */
let lastMeanAnomalyRad = NaN;
let lastEccentricity = NaN;
let lastEccentricAnomalyRad = NaN;

export function solveKepler(meanAnomalyRad: number, e: number): number {
  // The same arguments give the same result: the clock and the state at one transmission time solve once.
  if (meanAnomalyRad === lastMeanAnomalyRad && e === lastEccentricity) return lastEccentricAnomalyRad;
  const E = iterateKepler(meanAnomalyRad, e);
  lastMeanAnomalyRad = meanAnomalyRad;
  lastEccentricity = e;
  lastEccentricAnomalyRad = E;
  return E;
}

function iterateKepler(meanAnomalyRad: number, e: number): number {
  let E = meanAnomalyRad;
  for (let k = 0; k < 30; k++) {
    const dE = (E - e * Math.sin(E) - meanAnomalyRad) / (1 - e * Math.cos(E));
    E -= dE;
    if (Math.abs(dE) < 1e-13) break;
  }
  return E;
}

/** Eccentric anomaly E (rad) and its rate (rad/s) at t: what the relativistic clock term needs. */
export function eccentricAnomaly(eph: KeplerEphemeris, tGpsS: number): { eRad: number; eDotRadS: number } {
  const d = derived(eph);
  const tk = tGpsS - eph.toeGpsS;
  const E = solveKepler(eph.m0 + d.nRadS * tk, eph.e);
  return { eRad: E, eDotRadS: d.nRadS / (1 - eph.e * Math.cos(E)) };
}

/** Time from ephemeris epoch given two times of week: IS-GPS-200 20.3.3.4.3 week-crossing rule. */
export function timeFromEphemerisEpochS(tSowS: number, toeSowS: number): number {
  return wrapWeekS(tSowS - toeSowS);
}

// -5 deg tilt of the BeiDou GEO computation frame: BeiDou ICD B1I 5.2.4.12.
const GEO_TILT_RAD = (-5 * Math.PI) / 180;
const COS_TILT = Math.cos(GEO_TILT_RAD);
const SIN_TILT = Math.sin(GEO_TILT_RAD);

/**
 * Writes the ECEF position (m) and velocity (m/s) at GPS time t into out[0..5] (x, y, z, vx, vy, vz).
 * No allocation after the first call for an ephemeris.
 */
export function keplerStateInto(eph: KeplerEphemeris, tGpsS: number, out: Float64Array): void {
  const d = derived(eph);
  const we = d.c.omegaERadS;
  // tk = t - toe; both are continuous GPS seconds, so the week-crossing rule of IS-GPS-200 20.3.3.4.3 is implicit.
  const tk = tGpsS - eph.toeGpsS;
  const e = eph.e;
  const Mk = eph.m0 + d.nRadS * tk; // Mk = M0 + n tk
  const Ek = solveKepler(Mk, e);
  const sinE = Math.sin(Ek);
  const cosE = Math.cos(Ek);
  const oneMinusECosE = 1 - e * cosE;
  const vk = Math.atan2(d.sqrt1mE2 * sinE, cosE - e); // true anomaly
  const phi = vk + eph.omega; // argument of latitude Phi_k = v_k + omega
  const sin2p = Math.sin(2 * phi);
  const cos2p = Math.cos(2 * phi);
  // Second harmonic perturbations: IS-GPS-200 table 20-IV.
  const du = eph.cus * sin2p + eph.cuc * cos2p;
  const dr = eph.crs * sin2p + eph.crc * cos2p;
  const di = eph.cis * sin2p + eph.cic * cos2p;
  const u = phi + du;
  const r = d.aM * oneMinusECosE + dr;
  const inc = eph.i0 + di + eph.idot * tk;
  const cosU = Math.cos(u);
  const sinU = Math.sin(u);
  const xp = r * cosU; // position in the orbital plane
  const yp = r * sinU;
  // Rates: derivative of the above (IS-GPS-200 table 20-IV, velocity part).
  const eDot = d.nRadS / oneMinusECosE;
  const vDot = (eDot * d.sqrt1mE2) / oneMinusECosE;
  const uDot = vDot * (1 + 2 * (eph.cus * cos2p - eph.cuc * sin2p));
  const rDot = d.aM * e * sinE * eDot + 2 * vDot * (eph.crs * cos2p - eph.crc * sin2p);
  const iDot = eph.idot + 2 * vDot * (eph.cis * cos2p - eph.cic * sin2p);
  const xpDot = rDot * cosU - r * uDot * sinU;
  const ypDot = rDot * sinU + r * uDot * cosU;
  const cosI = Math.cos(inc);
  const sinI = Math.sin(inc);
  // Longitude of the ascending node: Omega_k = Omega0 + (OmegaDot - omegaE) tk - omegaE toe (IS-GPS-200),
  // toe in seconds of the system's own week (BDT week for BeiDou, ICD B1I 5.2.4.12).
  // For BeiDou GEO: Omega_k = Omega0 + OmegaDot tk - omegaE toe (inertial-like frame).
  const omegaKDot = d.isBeidouGeo ? eph.omegaDot : eph.omegaDot - we;
  const omegaK = eph.omega0 + omegaKDot * tk - we * eph.toeSowS;
  const cosO = Math.cos(omegaK);
  const sinO = Math.sin(omegaK);
  const x = xp * cosO - yp * cosI * sinO;
  const y = xp * sinO + yp * cosI * cosO;
  const z = yp * sinI;
  const vx = xpDot * cosO - ypDot * cosI * sinO + yp * sinI * iDot * sinO - y * omegaKDot;
  const vy = xpDot * sinO + ypDot * cosI * cosO - yp * sinI * iDot * cosO + x * omegaKDot;
  const vz = ypDot * sinI + yp * cosI * iDot;
  if (!d.isBeidouGeo) {
    out[0] = x; out[1] = y; out[2] = z; out[3] = vx; out[4] = vy; out[5] = vz;
    return;
  }
  // BeiDou GEO: [X Y Z] = R_Z(omegaE tk) R_X(-5 deg) [XG YG ZG] (ICD B1I 5.2.4.12), where
  // R_X(p) = [[1,0,0],[0,cos p,sin p],[0,-sin p,cos p]], R_Z(p) = [[cos p,sin p,0],[-sin p,cos p,0],[0,0,1]].
  const xg = x;
  const yg = COS_TILT * y + SIN_TILT * z;
  const zg = -SIN_TILT * y + COS_TILT * z;
  const vxg = vx;
  const vyg = COS_TILT * vy + SIN_TILT * vz;
  const vzg = -SIN_TILT * vy + COS_TILT * vz;
  const a = we * tk;
  const cz = Math.cos(a);
  const sz = Math.sin(a);
  out[0] = cz * xg + sz * yg;
  out[1] = -sz * xg + cz * yg;
  out[2] = zg;
  // Velocity: R_Z v_G + (d R_Z / dt) p_G, d R_Z/dt = omegaE [[-sin, cos, 0], [-cos, -sin, 0], [0, 0, 0]].
  out[3] = cz * vxg + sz * vyg + we * (-sz * xg + cz * yg);
  out[4] = -sz * vxg + cz * vyg + we * (-cz * xg - sz * yg);
  out[5] = vzg;
}
