/**
 * Options of the carrier-phase solution, with their defaults and where each comes from.
 */
import type { CarrierFrequencies } from './further-bands.js';

export type CarrierDynamics =
  /** Antenna fixed for the whole session: position constant (no process noise). */
  | 'static'
  /** Antenna moving: position predicted from the Doppler velocity, or free per epoch without Doppler. */
  | 'kinematic'
  /**
   * Static between an occupation event (epoch flag 3) and a start-moving event (flag 2), and before the
   * first start-moving event (the antenna stood still until then, RINEX 3.05 6.4); kinematic otherwise
   * (a file without events is taken as moving: safe for a static antenna, at the price of slower fixing).
   */
  | 'auto';

export interface CarrierOptions {
  /** Ratio test threshold (second-best / best squared norm): 3 is common practice (a heuristic, not a test with a known failure rate). */
  readonly ratioThreshold: number;
  /**
   * Least formal success rate of integer bootstrapping for a fix (Teunissen 1998): the ratio test alone
   * accepts wrong fixes when the float solution is still far from converged; 0.999 is the fixed failure
   * rate of 0.1 % common in the literature (e.g. Verhagen & Teunissen 2013, GPS Solutions 17).
   */
  readonly minSuccessRate: number;
  /** Elevation mask for ambiguities to be fixed (deg); lower satellites stay float (multipath, common practice 15 deg). */
  readonly ambiguityMaskDeg: number;
  /** Fewest double-difference ambiguities in a fix: 3 position unknowns plus 2 redundant (common practice). */
  readonly minFixedAmbiguities: number;
  readonly dynamics: CarrierDynamics;
  /**
   * Per-receiver undifferenced phase noise sigma^2 = a^2 + b^2 / sin^2(el) (m): a = b = 3 mm is common practice
   * for L1 phase (a few mm at zenith, growing with the mapping of the noise at low elevation).
   */
  readonly phaseAM: number;
  readonly phaseBM: number;
  /** Per-receiver code noise, same model (m); the code engine's defaults for low-cost L1 receivers (session/options.ts). */
  readonly codeAM: number;
  readonly codeBM: number;
  /**
   * Correlation time of code errors (s). Code multipath is correlated over tens of seconds to minutes
   * (e.g. Misra & Enge 2011, 5.5), while the filter takes each epoch's code as independent: without a
   * correction the float position (and the ambiguities' formal precision) would shrink like 1/sqrt(epochs)
   * and the integer search would trust a biased float. The code variance is scaled by
   * max(1, correlation time / logging interval), the variance of a mean of correlated samples.
   */
  readonly codeCorrelationTimeS: number;
  /**
   * Largest distance in time over which a reference epoch may stand in for the rover epoch when no
   * bracketing pair exists (s). The double-differenced error of holding a reference epoch is the change of
   * the orbit, satellite clock and atmosphere errors over that time: millimetres over 30 s on short
   * baselines (common practice in real-time kinematic work).
   */
  readonly maxReferenceAgeS: number;
  /**
   * Two forward/backward fixed solutions agree when they differ by at most this (m, 3-D): a few
   * centimetres, several times the centimetre precision of a fixed single-frequency solution.
   */
  readonly passAgreementM: number;
  /** Fixed DD ambiguities are held (constrained in the filter) once fixed to the same integer this many epochs in a row. */
  readonly holdAfterEpochs: number;
  /** Fix GLONASS ambiguities: 'auto' only between receivers reporting the same type (inter-channel biases cancel). */
  readonly glonassFix: 'auto' | 'never' | 'always';
  /**
   * 'all': the further bands both receivers recorded with phase (GPS L2/L5, GLONASS G2, Galileo E5a/E5b,
   * BeiDou B3I/B2I: further-bands.ts) join the primary band, each with its own ambiguities; 'single': the
   * primary band alone.
   */
  readonly frequencies: CarrierFrequencies;
}

export const DEFAULT_CARRIER_OPTIONS: CarrierOptions = {
  ratioThreshold: 3,
  minSuccessRate: 0.999,
  ambiguityMaskDeg: 15,
  minFixedAmbiguities: 5,
  dynamics: 'auto',
  phaseAM: 0.003,
  phaseBM: 0.003,
  codeAM: 0.25,
  codeBM: 0.5,
  codeCorrelationTimeS: 20,
  maxReferenceAgeS: 30,
  passAgreementM: 0.05,
  holdAfterEpochs: 5,
  glonassFix: 'auto',
  frequencies: 'all',
};

export function withCarrierDefaults(partial: Partial<CarrierOptions>): CarrierOptions {
  return { ...DEFAULT_CARRIER_OPTIONS, ...partial };
}
