/**
 * Satellite clock offset from the broadcast clock parameters, per signal.
 *
 * Kepler systems: dt_sv = af0 + af1 (t - toc) + af2 (t - toc)^2 + dt_r   (IS-GPS-200 20.3.3.3.3.1,
 * Galileo OS SIS ICD 5.1.4, BeiDou ICD B1I 5.2.4.9), dt_r = F e sqrt(A) sin E_k (relativistic
 * eccentricity term, same sections), then the group delay of the signal used is subtracted:
 *  - GPS/QZSS (IS-GPS-200 20.3.3.3.3.2): L1 C/A and L1 P(Y): TGD; L2 P(Y): gamma TGD with
 *    gamma = (77/60)^2 = (f_L1/f_L2)^2; L1/L2 P(Y) ionosphere-free combination: 0. L5 from LNAV
 *    parameters: (f_L1/f_L5)^2 TGD, an approximation that treats the delay as scaling with 1/f^2 (common
 *    practice when no CNAV inter-signal correction is at hand; IS-GPS-705 20.3.3.3.1.2 defines the exact
 *    form with ISC_L5, which RINEX 2/3 LNAV records do not carry).
 *  - Galileo (OS SIS ICD 5.1.5): the clock is referenced to the E1/E5a (F/NAV) or E1/E5b (I/NAV)
 *    ionosphere-free combination; single-frequency E1: BGD(E1,E5a) with F/NAV, BGD(E1,E5b) with
 *    I/NAV; E5a: (f_E1/f_E5a)^2 BGD(E1,E5a) (F/NAV); E5b: (f_E1/f_E5b)^2 BGD(E1,E5b) (I/NAV).
 *  - BeiDou (ICD B1I 5.2.4.10): clock referenced to B3I; B1I: TGD1, B2I: TGD2, B3I: 0.
 *  - NavIC (IRNSS SIS ICD): L5 single-frequency: TGD (from memory).
 * GLONASS (ICD 5.1, 3.3.3): dt_sv = -TauN + GammaN (t - t_b); no separate relativistic term (the
 * broadcast clock already contains it); no group delay in RINEX FDMA records. The offset is relative
 * to GLONASS system time; GLONASS-GPS system time difference is left to the solver (inter-system bias).
 * SBAS: dt_sv = a_Gf0 + a_Gf1 (t - t0) (RINEX SBAS record; DO-229 A.4.4.11).
 */
import type { Ephemeris, KeplerEphemeris } from '../gnss/index.js';
import { FREQ_E5B_HZ, FREQ_L1_HZ, FREQ_L5_HZ, keplerConstantsFor } from './constants.js';
import { solveKepler } from './kepler.js';

/** The code signal whose pseudorange the clock offset is meant for. */
export type SignalKind =
  | 'L1' | 'L2' | 'L1L2-IF' // GPS, QZSS (L1 C/A or P(Y), L2 P(Y))
  | 'L5' // NavIC SPS; GPS/QZSS L5 (approximate, see above)
  | 'E1' | 'E5a' | 'E5b' | 'E1E5a-IF' | 'E1E5b-IF' // Galileo
  | 'B1I' | 'B2I' | 'B3I' // BeiDou
  | 'G1' | 'G2'; // GLONASS FDMA

export interface SatelliteClock {
  /** Satellite clock offset for the signal (s), relativistic term included, group delay removed. */
  readonly offsetS: number;
  /** Clock drift (s/s), relativistic rate included. */
  readonly driftSS: number;
  /** The relativistic eccentricity term included in offsetS (s). */
  readonly relativisticS: number;
  /** The group delay subtracted from offsetS (s). */
  readonly groupDelayS: number;
}

/** gamma = (f_L1 / f_L2)^2 = (77/60)^2: IS-GPS-200 20.3.3.3.3.2. */
export const GAMMA_L1_L2 = (77 / 60) ** 2;

/** True when a Galileo record carries an F/NAV clock (E1/E5a), from the message or RINEX data-source bits. */
export function isGalileoFnav(eph: KeplerEphemeris): boolean {
  if (eph.message === 'FNAV') return true;
  if (eph.message === 'INAV') return false;
  // RINEX 3 Galileo data sources: bit 1 F/NAV E5a-I, bit 8 clock for E5a,E1 (RINEX 3.05 table A8).
  return (eph.dataSource & 0b10) !== 0 || ((eph.dataSource & 0x100) !== 0 && (eph.dataSource & 0b101) === 0);
}

/** The primary single-frequency signal of each system, used when no signal is named. */
export function defaultSignal(eph: Ephemeris): SignalKind {
  switch (eph.system) {
    case 'E': return 'E1';
    case 'C': return 'B1I';
    case 'R': return 'G1';
    case 'I': return 'L5';
    default: return 'L1';
  }
}

function mismatch(eph: Ephemeris, signal: SignalKind): never {
  throw new RangeError(`signal ${signal} is not defined for ${eph.sat} (${eph.kind}${eph.kind === 'kepler' && eph.system === 'E' ? (isGalileoFnav(eph) ? ' F/NAV' : ' I/NAV') : ''} clock)`);
}

/** Group delay (s) to subtract from the clock polynomial for the signal: sections cited above. */
export function groupDelayS(eph: KeplerEphemeris, signal: SignalKind): number {
  switch (eph.system) {
    case 'G': case 'J':
      if (signal === 'L1') return eph.tgdS;
      if (signal === 'L2') return GAMMA_L1_L2 * eph.tgdS;
      if (signal === 'L1L2-IF') return 0;
      if (signal === 'L5') return (FREQ_L1_HZ / FREQ_L5_HZ) ** 2 * eph.tgdS;
      return mismatch(eph, signal);
    case 'I':
      if (signal === 'L5') return eph.tgdS;
      return mismatch(eph, signal);
    case 'C':
      if (signal === 'B1I') return eph.tgdS;
      if (signal === 'B2I') return eph.tgd2S;
      if (signal === 'B3I') return 0;
      return mismatch(eph, signal);
    case 'E': {
      const fnav = isGalileoFnav(eph);
      if (fnav) {
        if (signal === 'E1') return eph.tgdS;
        if (signal === 'E5a') return (FREQ_L1_HZ / FREQ_L5_HZ) ** 2 * eph.tgdS;
        if (signal === 'E1E5a-IF') return 0;
      } else {
        if (signal === 'E1') return eph.tgd2S;
        if (signal === 'E5b') return (FREQ_L1_HZ / FREQ_E5B_HZ) ** 2 * eph.tgd2S;
        if (signal === 'E1E5b-IF') return 0;
      }
      return mismatch(eph, signal);
    }
  }
}

/**
 * satelliteClock(eph, t, signal).offsetS without the object (the same arithmetic, so the same double): the
 * transmission time's first step needs the offset alone.
 */
export function satelliteClockOffsetS(eph: Ephemeris, tGpsS: number, signal?: SignalKind): number {
  if (eph.kind !== 'kepler') return satelliteClock(eph, tGpsS, signal).offsetS;
  const sig = signal ?? defaultSignal(eph);
  const c = keplerConstantsFor(eph.system);
  const dt = tGpsS - eph.tocGpsS;
  const A = eph.sqrtA * eph.sqrtA;
  const n = Math.sqrt(c.muM3S2 / (A * A * A)) + eph.deltaN;
  const E = solveKepler(eph.m0 + n * (tGpsS - eph.toeGpsS), eph.e);
  const rel = c.relativisticF * eph.e * eph.sqrtA * Math.sin(E);
  const gd = groupDelayS(eph, sig);
  return eph.af0 + eph.af1 * dt + eph.af2 * dt * dt + rel - gd;
}

/** Satellite clock offset and drift at GPS time t (s) for the signal (default: the system's primary one). */
export function satelliteClock(eph: Ephemeris, tGpsS: number, signal?: SignalKind): SatelliteClock {
  const sig = signal ?? defaultSignal(eph);
  switch (eph.kind) {
    case 'kepler': {
      const c = keplerConstantsFor(eph.system);
      const dt = tGpsS - eph.tocGpsS; // continuous GPS seconds: week crossing implicit (IS-GPS-200 20.3.3.3.3.1)
      const A = eph.sqrtA * eph.sqrtA;
      const n = Math.sqrt(c.muM3S2 / (A * A * A)) + eph.deltaN;
      const E = solveKepler(eph.m0 + n * (tGpsS - eph.toeGpsS), eph.e);
      const eDot = n / (1 - eph.e * Math.cos(E));
      const rel = c.relativisticF * eph.e * eph.sqrtA * Math.sin(E); // dt_r = F e sqrt(A) sin E_k
      const relRate = c.relativisticF * eph.e * eph.sqrtA * Math.cos(E) * eDot;
      const gd = groupDelayS(eph, sig);
      return {
        offsetS: eph.af0 + eph.af1 * dt + eph.af2 * dt * dt + rel - gd,
        driftSS: eph.af1 + 2 * eph.af2 * dt + relRate,
        relativisticS: rel,
        groupDelayS: gd,
      };
    }
    case 'glonass':
      if (sig !== 'G1' && sig !== 'G2') mismatch(eph, sig);
      // GLONASS ICD 5.1 3.3.3: t_sv - t_GLO = -TauN + GammaN (t - t_b); RINEX stores -TauN.
      return { offsetS: eph.clockBiasS + eph.gammaN * (tGpsS - eph.tbGpsS), driftSS: eph.gammaN, relativisticS: 0, groupDelayS: 0 };
    case 'sbas':
      return { offsetS: eph.clockBiasS + eph.clockRateSS * (tGpsS - eph.t0GpsS), driftSS: eph.clockRateSS, relativisticS: 0, groupDelayS: 0 };
  }
}
