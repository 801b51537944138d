/**
 * Broadcast navigation data model shared by the nav readers/writer, the orbit code and the simulator.
 * Times are GPS seconds since the GPS epoch (see time/gps-time.ts); each record also keeps what the file said.
 */
import type { GnssSystem, SatId } from './types.js';

/** Keplerian broadcast ephemeris: GPS/QZSS LNAV, Galileo I/NAV and F/NAV, BeiDou D1/D2, NavIC. */
export interface KeplerEphemeris {
  readonly kind: 'kepler';
  readonly sat: SatId;
  readonly system: Extract<GnssSystem, 'G' | 'E' | 'C' | 'J' | 'I'>;
  /** Message type: 'LNAV', 'CNAV', 'INAV', 'FNAV', 'D1', 'D2', or '' when the file does not say (RINEX 2/3). */
  readonly message: string;
  /** Clock reference time (GPS s). The record's own time system (BDT for BeiDou) is converted. */
  readonly tocGpsS: number;
  /** Ephemeris reference time (GPS s), from the record's week and toe; continuous. */
  readonly toeGpsS: number;
  /** toe as seconds of the system's own week (BDT week for BeiDou), as broadcast. */
  readonly toeSowS: number;
  /** af0 (s), af1 (s/s), af2 (s/s^2). */
  readonly af0: number;
  readonly af1: number;
  readonly af2: number;
  /** IODE (GPS/QZSS), IODnav (Galileo), AODE (BeiDou). */
  readonly iode: number;
  /** IODC (GPS/QZSS), AODC (BeiDou); NaN where not defined. */
  readonly iodc: number;
  readonly crs: number;
  readonly deltaN: number;
  readonly m0: number;
  readonly cuc: number;
  readonly e: number;
  readonly cus: number;
  readonly sqrtA: number;
  readonly cic: number;
  readonly omega0: number;
  readonly cis: number;
  readonly i0: number;
  readonly crc: number;
  readonly omega: number;
  readonly omegaDot: number;
  readonly idot: number;
  /** SV accuracy (m): URA (GPS), SISA (Galileo). NaN when absent. */
  readonly accuracyM: number;
  /** Health word as broadcast (0 = healthy for every system). */
  readonly health: number;
  /** GPS/QZSS TGD; Galileo BGD E1/E5a; BeiDou TGD1 (B1/B3) (s). */
  readonly tgdS: number;
  /** Galileo BGD E1/E5b; BeiDou TGD2 (B2/B3) (s); NaN otherwise. */
  readonly tgd2S: number;
  /** Galileo data-source bits (bit 0 I/NAV E1-B, bit 1 F/NAV E5a-I, bit 2 I/NAV E5b-I, bits 8/9 clock for E5a/E5b); 0 elsewhere. */
  readonly dataSource: number;
  /** Transmission time of message (GPS s), NaN when absent. */
  readonly transmitGpsS: number;
  /** Fit interval (hours) for GPS/QZSS; NaN when absent (then 4 h is assumed by selection). */
  readonly fitIntervalH: number;
  /** Where it came from, for messages. */
  readonly file: string;
  readonly line: number;
}

/** GLONASS FDMA broadcast state vector (PZ-90), RINEX units converted to metres. */
export interface GlonassEphemeris {
  readonly kind: 'glonass';
  readonly sat: SatId;
  readonly system: 'R';
  readonly message: string;
  /** Reference time t_b of the state vector (GPS s; the file gives it in UTC). */
  readonly tbGpsS: number;
  /** SV clock bias -TauN (s) as in RINEX: satellite clock offset dt = -TauN + GammaN (t - tb). */
  readonly clockBiasS: number;
  /** +GammaN relative frequency bias. */
  readonly gammaN: number;
  /** Message frame time (s of the UTC day/week as in the file). */
  readonly frameTimeS: number;
  /** Position (m), velocity (m/s) and luni-solar acceleration (m/s^2) in PZ-90 at tb. */
  readonly posM: readonly [number, number, number];
  readonly velMS: readonly [number, number, number];
  readonly accMS2: readonly [number, number, number];
  readonly health: number;
  /** Frequency channel number k (-7..+6). */
  readonly channel: number;
  /** Age of operational information (days). */
  readonly ageDays: number;
  readonly file: string;
  readonly line: number;
}

/** SBAS broadcast position/velocity record (GEO ranging), metres. */
export interface SbasEphemeris {
  readonly kind: 'sbas';
  readonly sat: SatId;
  readonly system: 'S';
  readonly message: string;
  readonly t0GpsS: number;
  readonly clockBiasS: number;
  readonly clockRateSS: number;
  readonly posM: readonly [number, number, number];
  readonly velMS: readonly [number, number, number];
  readonly accMS2: readonly [number, number, number];
  readonly health: number;
  readonly accuracyM: number;
  readonly iodn: number;
  /** Transmission time of message (GPS s; RINEX 3.05 table A10 'Transmission time of message (start of the message) in GPS seconds of the week'), NaN when absent. Optional: added by the nav readers. */
  readonly transmitGpsS?: number;
  readonly file: string;
  readonly line: number;
}

export type Ephemeris = KeplerEphemeris | GlonassEphemeris | SbasEphemeris;

/** Klobuchar-type ionosphere coefficients: alpha (s, s/semicircle, ...), beta (s, ...). */
export interface KlobucharCoefficients {
  readonly alpha: readonly [number, number, number, number];
  readonly beta: readonly [number, number, number, number];
}

export interface IonosphereCoefficients {
  /** GPS (ION ALPHA/BETA, IONOSPHERIC CORR GPSA/GPSB, RINEX 4 ION LNAV). */
  gps?: KlobucharCoefficients;
  /** QZSS Klobuchar (QZSA/QZSB). */
  qzss?: KlobucharCoefficients;
  /** BeiDou Klobuchar (BDSA/BDSB). */
  beidou?: KlobucharCoefficients;
  /** Galileo NeQuick ai0, ai1, ai2 (GAL). */
  galileo?: readonly [number, number, number];
}

/** A parsed navigation file (or several merged): records in file order, duplicates kept (selection removes them). */
export interface NavData {
  readonly files: readonly string[];
  readonly version: number;
  readonly ephemerides: readonly Ephemeris[];
  readonly ionosphere: IonosphereCoefficients;
  /** GPS - UTC leap seconds when the header gives them. */
  readonly leapSeconds: number | null;
  /** Time-system offsets: RINEX 3 header TIME SYSTEM CORR, RINEX 2 DELTA-UTC / CORR TO SYSTEM TIME, RINEX 4 STO records. Optional: added by the nav readers. */
  readonly systemTimeOffsets?: readonly SystemTimeOffset[];
  /** Earth orientation parameters of RINEX 4 EOP records. Optional: added by the nav readers. */
  readonly earthOrientation?: readonly EarthOrientation[];
}

/**
 * A broadcast time-offset polynomial: offset(t) = a0 + a1 (t - ref) + a2 (t - ref)^2 (RINEX 3.04 section
 * 5.4 'TIME SYSTEM CORR'; RINEX 4.00 STO record). The sign convention is the file's: code 'GPUT' gives
 * GPS - UTC, 'GAGP' gives GAL - GPS, 'GLUT' gives -TauC (GLONASS to UTC), etc.
 */
export interface SystemTimeOffset {
  /** 'GPUT', 'GAUT', 'GAGP', 'GPGA', 'GLUT', 'GLGP', 'BDUT', 'QZUT', 'QZGP', 'IRUT', 'IRGP', 'SBUT', ... as in the file. */
  readonly code: string;
  readonly a0S: number;
  readonly a1SS: number;
  readonly a2SS2: number;
  /** Reference epoch of the polynomial (GPS s); NaN when the file gives none (e.g. GLUT with week 0). */
  readonly refGpsS: number;
  /** Transmission time (GPS s) for RINEX 4 STO records; NaN otherwise. */
  readonly transmitGpsS: number;
  /** Broadcasting satellite ('' for header records) and message type ('' for header records). */
  readonly sat: SatId;
  readonly message: string;
  /** SBAS provider / UTC identifier as written ('' when absent). */
  readonly sbasId: string;
  readonly utcId: string;
  readonly file: string;
  readonly line: number;
}

/** Broadcast Earth orientation parameters (RINEX 4.00 EOP record: polar motion and UT1-UTC polynomials). */
export interface EarthOrientation {
  readonly sat: SatId;
  readonly message: string;
  /** Reference epoch (GPS s). */
  readonly refGpsS: number;
  /** Transmission time (GPS s), NaN when absent. */
  readonly transmitGpsS: number;
  readonly xpArcsec: number;
  readonly xpRateArcsecPerDay: number;
  readonly xpAccelArcsecPerDay2: number;
  readonly ypArcsec: number;
  readonly ypRateArcsecPerDay: number;
  readonly ypAccelArcsecPerDay2: number;
  readonly dut1S: number;
  readonly dut1RateSPerDay: number;
  readonly dut1AccelSPerDay2: number;
  readonly file: string;
  readonly line: number;
}
