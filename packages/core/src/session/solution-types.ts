/**
 * What the engine hands out: one typed solution per rover epoch, and a summary per session.
 * Every coordinate carries its frame and epoch (FramedEcef); every rejected satellite or epoch carries
 * its reason as words.
 */
import type { ConstantOffsetEstimate } from '../solve/index.js';
import type { EcefM, EnuM, FrameEpoch, FramedEcef, GeodeticRad, GnssSystem, SatId } from '../gnss/index.js';

/**
 * The solution kind, as a word: code ('differential'), carrier-smoothed code ('smoothed'), carrier phase
 * with integer ambiguities fixed ('fixed') or not ('float'), the rover alone ('standalone'), or none.
 */
export type SolutionKind = 'differential' | 'smoothed' | 'fixed' | 'float' | 'standalone' | 'none';

/** Kinds positioned relative to the reference (code or carrier phase). */
export function isRelativeKind(kind: SolutionKind): boolean {
  return kind === 'differential' || kind === 'smoothed' || kind === 'fixed' || kind === 'float';
}

/**
 * The a-posteriori variance factor an epoch's formal position sigma may be rescaled by (points, base
 * tie): a code epoch's (its residuals against the weights of that epoch's least squares). A carrier
 * epoch's factor comes from the filter's innovations, which judge the prediction from earlier epochs as
 * well as the epoch's own data: it is a test statistic there, and the filter's sigma is used as it is.
 */
export function sigmaRescaleFactor(kind: SolutionKind, quality: { readonly varianceFactor: number } | null | undefined): number | undefined {
  return kind === 'fixed' || kind === 'float' ? undefined : quality?.varianceFactor;
}

/** Which physical point a coordinate refers to. */
export type PointReference = 'antenna-reference-point' | 'ground-mark';

export interface Dops {
  readonly gdop: number;
  readonly pdop: number;
  readonly hdop: number;
  readonly vdop: number;
  readonly tdop: number;
}

export type { SatelliteResidual } from '../solve/index.js';
import type { SatelliteResidual } from '../solve/index.js';

export interface QualityTest {
  /** A-posteriori variance factor v'Pv / dof (NaN when dof = 0). */
  readonly varianceFactor: number;
  /** v'Pv. */
  readonly chiSquare: number;
  readonly dof: number;
  /** Critical value of the global test at the configured level. */
  readonly critical: number;
  /** true: passed; false: failed even after data snooping; null: no redundancy to test. */
  readonly passed: boolean | null;
}

export interface EpochSolution {
  /** Epoch tag as recorded (receiver time), GPS seconds. */
  readonly tagGpsS: number;
  /** Estimated GPS time of the epoch (tag minus the estimated receiver clock offset). */
  readonly timeGpsS: number;
  readonly kind: SolutionKind;
  /** Why there is no (differential) solution, in words; empty otherwise. */
  readonly reason: string;
  /** Name of the point (occupation) the epoch belongs to, from events or windows; empty when unknown. */
  readonly pointName: string;
  /** Rover position (frame and epoch of the reference coordinate); null when kind = 'none'. */
  readonly position: FramedEcef | null;
  readonly geodetic: GeodeticRad | null;
  /** Which point `position` refers to. */
  readonly pointReference: PointReference;
  /** Rover minus reference (m), ECEF and ENU at the reference. Null for standalone/none. */
  readonly baselineEcef: EcefM | null;
  readonly baselineEnu: EnuM | null;
  /** Relative receiver clock (rover minus reference, m) per constellation used; empty for standalone and none. */
  readonly relativeClockM: Readonly<Partial<Record<GnssSystem, number>>>;
  readonly satellitesUsed: number;
  readonly dops: Dops | null;
  /** Formal precision from the covariance (scaled by the a-priori variance, not the a-posteriori factor). */
  readonly sigmaEnuM: EnuM | null;
  readonly quality: QualityTest | null;
  /** Age of the reference corrections used (s): the larger distance to a reference epoch used. */
  readonly correctionAgeS: number;
  readonly satellites: readonly SatelliteResidual[];
  /** Rover speed over ground (m/s) from a Doppler velocity solution; NaN when not available. */
  readonly speedMS: number;
  /** The occupation event met just before this epoch in the rover file (flag 3 / flag 2), if any. */
  readonly occupationEvent: 'new-occupation' | 'start-moving' | null;
  /** Rover antenna height (ANTENNA: DELTA H) in force at this epoch (m). */
  readonly antennaHeightM: number;
}

export interface RejectionCount {
  readonly reason: string;
  readonly count: number;
}

/** A between-receiver code offset estimated over the whole session (session/code-offsets.ts). */
export interface CodeOffsetReport extends ConstantOffsetEstimate {
  /** 'R channel +1' for a GLONASS frequency channel, else the satellite ('G05'). */
  readonly key: string;
  /** Removed from the satellite's single differences (GLONASS channels always; others are only reported). */
  readonly applied: boolean;
  /** GLONASS: the offset less the mean over channels (the mean is part of the GLONASS relative clock). */
  relativeToChannelMeanM?: number;
}

export interface SessionSummary {
  readonly frame: FrameEpoch;
  readonly referencePosition: FramedEcef;
  readonly referencePositionSource: string;
  readonly epochsRover: number;
  readonly epochsByKind: Readonly<Record<SolutionKind, number>>;
  readonly epochsWithoutCorrections: number;
  readonly satelliteRejections: readonly RejectionCount[];
  readonly epochRejections: readonly RejectionCount[];
  readonly systemsUsed: readonly GnssSystem[];
  readonly notes: readonly string[];
  readonly firstGpsS: number;
  readonly lastGpsS: number;
  /** Session-constant code offsets (empty when the session was read once). */
  readonly codeOffsets: readonly CodeOffsetReport[];
  /** How many passes over the inputs the session made (1, or 2 for whole-session estimates). */
  readonly passes: number;
}
