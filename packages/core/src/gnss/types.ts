/** Shared value types: satellite identifiers, systems, ECEF vectors, frames. */

/** RINEX 3 system letters. G GPS, R GLONASS, E Galileo, C BeiDou, J QZSS, S SBAS, I NavIC/IRNSS. */
export type GnssSystem = 'G' | 'R' | 'E' | 'C' | 'J' | 'S' | 'I';
export const GNSS_SYSTEMS: readonly GnssSystem[] = ['G', 'R', 'E', 'C', 'J', 'S', 'I'];
export const SYSTEM_NAMES: Readonly<Record<GnssSystem, string>> = {
  G: 'GPS', R: 'GLONASS', E: 'Galileo', C: 'BeiDou', J: 'QZSS', S: 'SBAS', I: 'NavIC',
};

/** Satellite identifier in RINEX 3 form: system letter + two-digit PRN/slot, e.g. 'G05', 'R17', 'E11'. */
export type SatId = string;

export function satSystem(sat: SatId): GnssSystem {
  return sat.charCodeAt(0) === 32 ? 'G' : (sat[0] as GnssSystem);
}

export function isGnssSystem(c: string): c is GnssSystem {
  return c.length === 1 && 'GRECJSI'.includes(c);
}

/** Earth-centred, Earth-fixed Cartesian coordinates in metres. */
/**
 * Values per satellite and code of one epoch (e.g. a receiver's carrier-smoothed pseudoranges, m), as
 * read by the stages that use them: a Map of Maps is one, and so is the smoother's own store.
 */
export interface CodeValuesBySat {
  get(sat: SatId): { get(code: string): number | undefined; has(code: string): boolean } | undefined;
}

export interface EcefM {
  readonly x: number;
  readonly y: number;
  readonly z: number;
}

/** Geodetic coordinates on an ellipsoid: radians and metres (ellipsoidal height). */
export interface GeodeticRad {
  readonly latRad: number;
  readonly lonRad: number;
  readonly heightM: number;
}

/** Local east-north-up vector in metres. */
export interface EnuM {
  readonly e: number;
  readonly n: number;
  readonly u: number;
}

/**
 * A terrestrial reference frame label and the epoch (decimal year) the coordinate refers to.
 * `name` is free text as the user gave it ('ITRF2014', 'ETRF2000', 'NAD83(2011)', 'WGS84',
 * 'unstated'); comparisons are by normalised name.
 */
export interface FrameEpoch {
  readonly name: string;
  readonly epochYear: number;
}

/** A coordinate that carries its frame and epoch. Positions never travel without them. */
export interface FramedEcef {
  readonly ecef: EcefM;
  readonly frame: FrameEpoch;
}
