/**
 * Processing options for a differential session, with documented defaults.
 */
import type { AntennaOffset } from '../gnss/index.js';
import type { FramedEcef, GnssSystem } from '../gnss/index.js';

export type GlonassPolicy =
  /**
   * GLONASS with one relative clock plus a code offset per frequency channel estimated over the whole
   * session (session/code-offsets.ts), whatever the receiver types say; one clock alone when the session
   * can be read only once.
   */
  | 'auto'
  /** Never use GLONASS. */
  | 'exclude'
  /** Always use GLONASS with one relative clock, trusting the biases to cancel. */
  | 'include'
  /** The same as 'auto' (kept for older command lines). */
  | 'estimate';

export interface WeightingOptions {
  /** sigma^2 = a^2 + b^2 / sin^2(elevation) per receiver (common practice). */
  readonly aM: number;
  readonly bM: number;
  /** Also scale by signal strength (C/N0) when both sides report it. */
  readonly useStrength: boolean;
}

export interface SmoothingOptions {
  readonly enabled: boolean;
  /** Hatch filter time constant (s). */
  readonly timeConstantS: number;
  /**
   * Longest gap in the logged epochs (s) over which a filter is kept. Receivers keep tracking while
   * they skip logging epochs, so a gap alone is no slip; lost lock (LLI) and the code-carrier jump test
   * still restart the filter.
   */
  readonly maxGapS: number;
  /**
   * Smooth the reference receiver's code even when the rover's is not (forwards and backwards over the whole
   * session, so only when the session is read twice): the corrections of a static reference are carrier-
   * smoothed as is usual for code-differential corrections (e.g. RTCM 10402.3 reference stations; Navipedia
   * "DGNSS Fundamentals"), while each rover epoch stays a code solution of its own.
   */
  readonly reference: boolean;
}

export interface QualityOptions {
  /** Significance level of the global chi-square test when `testLevels` is 'separate'. */
  readonly alphaGlobal: number;
  /**
   * 'b-method' (default): the global test's level follows from alphaLocal for each epoch's redundancy, so
   * both tests detect the same error with the same power (Baarda's B-method, solve/b-method.ts);
   * 'separate': alphaGlobal as given.
   */
  readonly testLevels: 'b-method' | 'separate';
  /** Significance level of each w-test in data snooping. */
  readonly alphaLocal: number;
  /** Minimum satellites in a solution (4 + extra clocks). */
  readonly minSatellites: number;
  /** Epochs with a larger PDOP are reported and given kind 'none'. */
  readonly maxPdop: number;
  /** Largest number of satellites data snooping may remove from one epoch. */
  readonly maxRejections: number;
}

export interface ReferenceSpec {
  /** Known coordinate of the reference antenna's ground mark (or ARP when `isArp`), with frame and epoch. Null: use the file header's (a warning is raised). */
  readonly position: FramedEcef | null;
  /** Where the coordinate came from, in words, for the summary (default 'given by the user'). */
  readonly source?: string;
  /** Antenna offset override (else the header's ANTENNA: DELTA H/E/N and in-file events). */
  readonly antenna?: AntennaOffset;
}

export interface SessionOptions {
  readonly reference: ReferenceSpec;
  /** Rover antenna offset override (else header and in-file events). */
  readonly roverAntenna?: AntennaOffset;
  readonly elevationMaskDeg: number;
  readonly systems: readonly GnssSystem[];
  readonly glonass: GlonassPolicy;
  readonly weighting: WeightingOptions;
  readonly smoothing: SmoothingOptions;
  readonly quality: QualityOptions;
  /** Largest allowed distance in time between a rover epoch and the reference epochs used (s). */
  readonly maxCorrectionAgeS: number;
  /** When no differential solution is possible, give a standalone one (kind 'standalone'). */
  readonly standaloneFallback: boolean;
  /** Report the rover position at the ground mark (ARP minus antenna height) instead of at the ARP. */
  readonly reduceToMark: boolean;
}

export const DEFAULT_OPTIONS: SessionOptions = {
  reference: { position: null },
  // 10 deg keeps enough satellites for low-cost receivers; 15 deg is the mapping-grade custom (check-values.md).
  elevationMaskDeg: 10,
  systems: ['G', 'R', 'E', 'C', 'J'],
  glonass: 'auto',
  // Per receiver: sigma^2 = a^2 + b^2/sin^2(el), times max(1, 10^((45 - C/N0)/10)) (solve/weights.ts).
  // a = 0.25 m, b = 0.5 m put the a-posteriori variance factor of low-cost L1 receivers near 1 (measured on
  // the shared static run: median 0.84); geodetic receivers come out below 1 (pessimistic, safe for testing).
  weighting: { aM: 0.25, bM: 0.5, useStrength: true },
  smoothing: { enabled: false, timeConstantS: 100, maxGapS: 30, reference: true },
  quality: { alphaGlobal: 0.001, alphaLocal: 0.001, testLevels: 'b-method', minSatellites: 5, maxPdop: 8, maxRejections: 3 },
  // 30 s CORS data: an epoch half-way between two is 15 s away; allow one missed reference epoch.
  maxCorrectionAgeS: 65,
  standaloneFallback: false,
  reduceToMark: true,
};

export function withDefaults(partial: Partial<SessionOptions>): SessionOptions {
  return {
    ...DEFAULT_OPTIONS,
    ...partial,
    weighting: { ...DEFAULT_OPTIONS.weighting, ...(partial.weighting ?? {}) },
    smoothing: { ...DEFAULT_OPTIONS.smoothing, ...(partial.smoothing ?? {}) },
    quality: { ...DEFAULT_OPTIONS.quality, ...(partial.quality ?? {}) },
  };
}
