/**
 * Physical constants used by the broadcast orbit and clock algorithms, each system its own: a user
 * algorithm must use the constants its interface document prescribes, not "better" ones, or the
 * computed orbit departs from the one the control segment fitted.
 *
 * Sources (see also ../shared/reference/check-values.md, "Constants"):
 *  - GPS: IS-GPS-200, table 20-IV (mu, omegaE) and 20.3.3.3.3.1 (F); pi per 20.3.3.4.3 (curve fits).
 *  - QZSS: IS-QZSS-PNT, same user algorithm and constants as GPS.
 *  - Galileo: Galileo OS SIS ICD 5.1.1 (table 57) and 5.1.4 (F).
 *  - BeiDou: BeiDou ICD B1I, 5.2.4.12 (CGCS2000 GM and omegaE).
 *  - NavIC: IRNSS SIS ICD for SPS, user algorithm as GPS (mu 3.986005e14, omegaE 7.2921151467e-5;
 *    from memory, not confirmed from a document here).
 *  - GLONASS: GLONASS ICD 5.1 (2008), table 3.2 (PZ-90). check-values.md gives GM 3.986004418e14 and
 *    omegaE 7.2921151467e-5; ICD 5.1 prints omegaE as 7.292115e-5 (from memory): the 1.5e-14 rad/s
 *    difference moves a 15-minute integration by far less than a millimetre.
 */
import type { GnssSystem } from '../gnss/index.js';

import { SPEED_OF_LIGHT_MS } from '../gnss/index.js';
export { SPEED_OF_LIGHT_MS };

/** The value of pi the GPS control segment uses in curve fits (IS-GPS-200 20.3.3.4.3). */
export const GPS_PI = 3.1415926535898;

/** Constants of one system's Keplerian user algorithm. */
export interface KeplerConstants {
  /** Earth's gravitational parameter (m^3/s^2). */
  readonly muM3S2: number;
  /** Earth rotation rate (rad/s). */
  readonly omegaERadS: number;
  /** Relativistic clock constant F = -2 sqrt(mu) / c^2 (s/m^0.5): IS-GPS-200 20.3.3.3.3.1. */
  readonly relativisticF: number;
}

function keplerConstants(muM3S2: number, omegaERadS: number): KeplerConstants {
  // IS-GPS-200 20.3.3.3.3.1: F = -2 sqrt(mu) / c^2; Galileo OS SIS ICD 5.1.4 and BeiDou ICD 5.2.4.10 likewise.
  return { muM3S2, omegaERadS, relativisticF: (-2 * Math.sqrt(muM3S2)) / (SPEED_OF_LIGHT_MS * SPEED_OF_LIGHT_MS) };
}

/** IS-GPS-200 table 20-IV: mu = 3.986005e14 m^3/s^2, omegaE = 7.2921151467e-5 rad/s. */
export const GPS_CONSTANTS: KeplerConstants = keplerConstants(3.986005e14, 7.2921151467e-5);
/** IS-QZSS-PNT: as GPS. */
export const QZSS_CONSTANTS: KeplerConstants = GPS_CONSTANTS;
/** Galileo OS SIS ICD 5.1.1: mu = 3.986004418e14, omegaE = 7.2921151467e-5. */
export const GALILEO_CONSTANTS: KeplerConstants = keplerConstants(3.986004418e14, 7.2921151467e-5);
/** BeiDou ICD B1I 5.2.4.12 (CGCS2000): mu = 3.986004418e14, omegaE = 7.2921150e-5. */
export const BEIDOU_CONSTANTS: KeplerConstants = keplerConstants(3.986004418e14, 7.292115e-5);
/** IRNSS SIS ICD: as GPS (from memory). */
export const NAVIC_CONSTANTS: KeplerConstants = GPS_CONSTANTS;

export function keplerConstantsFor(system: 'G' | 'E' | 'C' | 'J' | 'I'): KeplerConstants {
  switch (system) {
    case 'G': return GPS_CONSTANTS;
    case 'J': return QZSS_CONSTANTS;
    case 'E': return GALILEO_CONSTANTS;
    case 'C': return BEIDOU_CONSTANTS;
    case 'I': return NAVIC_CONSTANTS;
  }
}

/** PZ-90 constants for the GLONASS state-vector integration (GLONASS ICD 5.1, table 3.2; check-values.md). */
export const PZ90 = {
  /** Semi-major axis of the common terrestrial ellipsoid (m). */
  aeM: 6_378_136,
  /** Geocentric gravitational constant including the atmosphere (m^3/s^2). */
  muM3S2: 3.986004418e14,
  /** Second zonal harmonic J2 (= -C20). */
  j2: 1.08262575e-3,
  /** Earth rotation rate (rad/s). */
  omegaERadS: 7.2921151467e-5,
} as const;

/** Earth rotation rate used for the signal-flight rotation (Sagnac) of each system's satellites. */
export function earthRotationRadS(system: GnssSystem): number {
  switch (system) {
    case 'E': return GALILEO_CONSTANTS.omegaERadS;
    case 'C': return BEIDOU_CONSTANTS.omegaERadS;
    case 'R': return PZ90.omegaERadS;
    default: return GPS_CONSTANTS.omegaERadS; // GPS, QZSS, NavIC; SBAS positions are WGS 84 (common practice)
  }
}

/** L1, L2, L5 carrier frequencies (Hz): IS-GPS-200 3.3.1.1, IS-GPS-705. Galileo E1 = L1, E5a = L5. */
export const FREQ_L1_HZ = 1_575.42e6;
export const FREQ_L2_HZ = 1_227.6e6;
export const FREQ_L5_HZ = 1_176.45e6;
/** Galileo E5b (Hz): Galileo OS SIS ICD 2.3. */
export const FREQ_E5B_HZ = 1_207.14e6;
