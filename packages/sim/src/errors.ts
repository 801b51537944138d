/**
 * The simulator's error model: what each switch does and its default parameters. Every part is off
 * unless switched on; with everything off the observations are exact geometry (plus the broadcast
 * satellite clock, which is not an error: it is what the navigation file says).
 *
 * Magnitudes are typical values from the literature, "common practice" unless cited:
 *  - orbit: broadcast orbit error about 1 m RMS, mostly along-track (SPS Performance Standard 2020 3.4
 *    gives the signal-in-space range error budget; from memory), common to every receiver;
 *  - satellite clock: about 1 m RMS slowly varying (same source), common to every receiver;
 *  - ionosphere: the Klobuchar model (IS-GPS-200 fig. 20-4) scaled (the broadcast model removes only about
 *    half of the delay: Klobuchar 1987) plus a travelling wave whose horizontal gradient is 1-4 mm/km
 *    (vertical, quiet mid-latitude; from memory), mapped with the Klobuchar obliquity factor;
 *  - troposphere: Saastamoinen zenith delays of a standard atmosphere with Niell mapping (atmosphere/),
 *    plus a slowly varying zenith wet error per receiver (about 2 cm: common practice);
 *  - receiver clocks, noise, multipath, slips, gaps and faults: see the parameter comments below.
 */

export interface OrbitErrorParams {
  readonly radialSigmaM: number;
  readonly alongSigmaM: number;
  readonly crossSigmaM: number;
  readonly minPeriodS: number;
  readonly maxPeriodS: number;
}
export interface SatClockErrorParams {
  /** RMS of the clock error expressed as range (m). */
  readonly sigmaM: number;
  readonly minPeriodS: number;
  readonly maxPeriodS: number;
}
export interface IonoErrorParams {
  /** Truth vertical delay = scale x Klobuchar + wave (scale 1 with no gradient = the broadcast model exactly). */
  readonly klobucharScale: number;
  /** Largest horizontal gradient of the vertical L1 delay (m/km). */
  readonly gradientMPerKm: number;
  /** Wavelength (km), azimuth of travel (deg) and period (s) of the wave. */
  readonly waveLengthKm: number;
  readonly waveAzimuthDeg: number;
  readonly wavePeriodS: number;
}
export interface TropoErrorParams {
  /** RMS of the zenith wet delay error per receiver (m). */
  readonly zenithWetSigmaM: number;
  readonly minPeriodS: number;
  readonly maxPeriodS: number;
}
export interface MultipathParams {
  /** Amplitude range (m) of the code multipath per satellite at the horizon (scaled by cos^2 elevation). */
  readonly minAmplitudeM: number;
  readonly maxAmplitudeM: number;
  readonly minPeriodS: number;
  readonly maxPeriodS: number;
  /** Carrier multipath as a fraction of the code multipath (metres to metres; stays well below lambda/4). */
  readonly phaseFraction: number;
  /** Which receivers see it (default: the rover only). */
  readonly receivers: 'rover' | 'both';
}
export interface SlipParams {
  /** Expected cycle slips per satellite per hour of tracking. */
  readonly roverPerSatHour: number;
  readonly referencePerSatHour: number;
  /** Largest slip (cycles); each slip is a non-zero integer in [-max, max]. */
  readonly maxCycles: number;
}
export interface GapParams {
  /** Whole missing epochs (logging gaps), per hour, with lengths in [min, max] s. */
  readonly epochGapsPerHour: number;
  readonly epochGapMinS: number;
  readonly epochGapMaxS: number;
  /** One satellite lost for a while (obstruction), per hour; the phase is re-acquired with a new ambiguity. */
  readonly dropoutsPerHour: number;
  readonly dropoutMinS: number;
  readonly dropoutMaxS: number;
  readonly receivers: 'rover' | 'both';
}
export interface FaultParams {
  /** Faulty-satellite episodes per hour on the rover: a pseudorange step of [min, max] m for durationS. */
  readonly perHour: number;
  readonly minStepM: number;
  readonly maxStepM: number;
  readonly durationS: number;
}

/**
 * GLONASS inter-channel (inter-frequency) biases: code and phase delays of a receiver that grow linearly
 * with the frequency channel number k, set by its design (front end, correlator), so alike for receivers
 * of one type and different between types (Wanninger 2012, GPS Solutions 16:439-448; Sleewaegen et al.
 * 2012, "Demystifying GLONASS inter-frequency carrier phase biases", InsideGNSS). Each receiver type gets
 * slopes drawn uniformly within +-max from its type name. Magnitudes from memory: differential phase
 * slopes of a few millimetres per channel number between manufacturers, code slopes of decimetres.
 */
export interface GlonassInterChannelParams {
  readonly codeMaxMPerChannel: number;
  readonly phaseMaxMPerChannel: number;
}

type Switch<P> = boolean | Partial<P> | undefined;

/** Error switches of a scenario: false/absent = off, true = defaults, an object = on with overrides. */
export interface ErrorSpec {
  readonly orbit?: Switch<OrbitErrorParams>;
  readonly satClock?: Switch<SatClockErrorParams>;
  readonly iono?: Switch<IonoErrorParams>;
  readonly tropo?: Switch<TropoErrorParams>;
  /** Receiver clock offsets, drifts and millisecond jumps (parameters per receiver: see ReceiverProfile). */
  readonly rxClock?: boolean;
  /** Code and Doppler noise (sigma per receiver profile). */
  readonly codeNoise?: boolean;
  /** Carrier phase noise (default: follows codeNoise). */
  readonly phaseNoise?: boolean;
  readonly multipath?: Switch<MultipathParams>;
  readonly slips?: Switch<SlipParams>;
  readonly gaps?: Switch<GapParams>;
  readonly faults?: Switch<FaultParams>;
  /** GLONASS inter-channel biases per receiver type (not part of ALL_ERRORS_ON: a switch of its own). */
  readonly glonassInterChannel?: Switch<GlonassInterChannelParams>;
}

export const DEFAULT_ORBIT_ERROR: OrbitErrorParams = { radialSigmaM: 0.3, alongSigmaM: 1.0, crossSigmaM: 0.6, minPeriodS: 3600, maxPeriodS: 6 * 3600 };
export const DEFAULT_SAT_CLOCK_ERROR: SatClockErrorParams = { sigmaM: 1.0, minPeriodS: 1800, maxPeriodS: 4 * 3600 };
export const DEFAULT_IONO_ERROR: IonoErrorParams = { klobucharScale: 1.3, gradientMPerKm: 0.002, waveLengthKm: 1500, waveAzimuthDeg: 150, wavePeriodS: 3 * 3600 };
export const DEFAULT_TROPO_ERROR: TropoErrorParams = { zenithWetSigmaM: 0.02, minPeriodS: 1800, maxPeriodS: 6 * 3600 };
export const DEFAULT_MULTIPATH: MultipathParams = { minAmplitudeM: 0.5, maxAmplitudeM: 2.0, minPeriodS: 60, maxPeriodS: 600, phaseFraction: 0.005, receivers: 'rover' };
export const DEFAULT_SLIPS: SlipParams = { roverPerSatHour: 1.5, referencePerSatHour: 0.05, maxCycles: 30 };
export const DEFAULT_GAPS: GapParams = { epochGapsPerHour: 4, epochGapMinS: 2, epochGapMaxS: 12, dropoutsPerHour: 8, dropoutMinS: 10, dropoutMaxS: 90, receivers: 'rover' };
export const DEFAULT_FAULTS: FaultParams = { perHour: 2, minStepM: 20, maxStepM: 50, durationS: 60 };
export const DEFAULT_GLONASS_INTER_CHANNEL: GlonassInterChannelParams = { codeMaxMPerChannel: 0.1, phaseMaxMPerChannel: 0.005 };

/** Resolved switches: null = off. */
export interface ResolvedErrors {
  readonly orbit: OrbitErrorParams | null;
  readonly satClock: SatClockErrorParams | null;
  readonly iono: IonoErrorParams | null;
  readonly tropo: TropoErrorParams | null;
  readonly rxClock: boolean;
  readonly codeNoise: boolean;
  readonly phaseNoise: boolean;
  readonly multipath: MultipathParams | null;
  readonly slips: SlipParams | null;
  readonly gaps: GapParams | null;
  readonly faults: FaultParams | null;
  readonly glonassInterChannel: GlonassInterChannelParams | null;
}

function resolve<P>(s: Switch<P>, defaults: P): P | null {
  if (s === undefined || s === false) return null;
  if (s === true) return defaults;
  return { ...defaults, ...s };
}

export function resolveErrors(spec: ErrorSpec | undefined): ResolvedErrors {
  const s = spec ?? {};
  const codeNoise = s.codeNoise === true;
  return {
    orbit: resolve(s.orbit, DEFAULT_ORBIT_ERROR),
    satClock: resolve(s.satClock, DEFAULT_SAT_CLOCK_ERROR),
    iono: resolve(s.iono, DEFAULT_IONO_ERROR),
    tropo: resolve(s.tropo, DEFAULT_TROPO_ERROR),
    rxClock: s.rxClock === true,
    codeNoise,
    phaseNoise: s.phaseNoise ?? codeNoise,
    multipath: resolve(s.multipath, DEFAULT_MULTIPATH),
    slips: resolve(s.slips, DEFAULT_SLIPS),
    gaps: resolve(s.gaps, DEFAULT_GAPS),
    faults: resolve(s.faults, DEFAULT_FAULTS),
    glonassInterChannel: resolve(s.glonassInterChannel, DEFAULT_GLONASS_INTER_CHANNEL),
  };
}

/** Every switch on with its defaults (a realistic low-cost rover against a geodetic reference). */
export const ALL_ERRORS_ON: ErrorSpec = {
  orbit: true, satClock: true, iono: true, tropo: true, rxClock: true, codeNoise: true, phaseNoise: true,
  multipath: true, slips: true, gaps: true, faults: true,
};

/** How a receiver behaves: noise, signal strength and clock. */
export interface ReceiverProfile {
  /** Code noise sigma = aM + bM / sin(elevation) (m): the weighting form of check-values.md, common practice. */
  readonly codeNoiseAM: number;
  readonly codeNoiseBM: number;
  /** Carrier phase noise sigma at zenith (m), growing as (1 + 1/sin el)/2. */
  readonly phaseNoiseM: number;
  readonly dopplerNoiseHz: number;
  /** C/N0 at zenith and at the horizon (dB-Hz), interpolated in sin(elevation). */
  readonly cn0ZenithDbHz: number;
  readonly cn0HorizonDbHz: number;
  /** Clock offset at the start (s), drift (s/s) and a slow wander (s RMS). */
  readonly clockOffsetS: number;
  readonly clockDriftSS: number;
  readonly clockWanderS: number;
  /** Steered by 1 ms steps whenever |offset| exceeds 0.5 ms (pseudoranges jump by c x 1 ms). */
  readonly clockJumpsMs: boolean;
  /** When the clock jumps, the carrier phase jumps too (true) or stays continuous (false: many low-cost receivers). */
  readonly phaseFollowsJumps: boolean;
}

/** A low-cost single-frequency module: decimetre code noise, a drifting clock with millisecond jumps. */
export const LOW_COST_PROFILE: ReceiverProfile = {
  codeNoiseAM: 0.15, codeNoiseBM: 0.10, phaseNoiseM: 0.003, dopplerNoiseHz: 0.05,
  cn0ZenithDbHz: 47, cn0HorizonDbHz: 28,
  clockOffsetS: 2.0e-4, clockDriftSS: 4.0e-7, clockWanderS: 2e-8,
  clockJumpsMs: true, phaseFollowsJumps: false,
};

/** A geodetic reference receiver: centimetre code noise, a quiet clock. */
export const GEODETIC_PROFILE: ReceiverProfile = {
  codeNoiseAM: 0.02, codeNoiseBM: 0.03, phaseNoiseM: 0.001, dopplerNoiseHz: 0.01,
  cn0ZenithDbHz: 52, cn0HorizonDbHz: 36,
  clockOffsetS: 3.5e-8, clockDriftSS: 1.0e-10, clockWanderS: 3e-9,
  clockJumpsMs: false, phaseFollowsJumps: true,
};
