/**
 * A complete simulated session: a reference receiver on a known mark and a rover following a scripted
 * plan, the broadcast navigation data both use, and the truth. The truth is in WGS 84 at the scenario
 * epoch (the frame of the simulated broadcast orbits): every coordinate here is "WGS84 @ decimal year".
 */
import type { EcefM, FrameEpoch } from '@refdelta/core';
import type { HeaderEvent, ObsEpoch, ObsHeader } from '@refdelta/core';
import type { NavData } from '@refdelta/core';
import { ecefToGeodetic, enuToEcefDelta } from '@refdelta/core';
import { decimalYearFromGpsS } from '@refdelta/core';
import { glonassChannelsOf, simulateConstellation, TYPICAL_KLOBUCHAR, SIM_LEAP_SECONDS } from './constellation.js';
import { GEODETIC_PROFILE, LOW_COST_PROFILE, resolveErrors, type ErrorSpec, type ReceiverProfile } from './errors.js';
import { IonoTruth } from './iono-truth.js';
import { TropoTruth } from './tropo-truth.js';
import { PERFECT_CLOCK, SteeredReceiverClock, type ReceiverClock } from './receiver-clock.js';
import { TrueSky } from './true-sky.js';
import { Rng } from './rng.js';
import { sumOfProcesses, sumOfSinusoids } from './slow-process.js';
import { ReceiverSimulation } from './observations.js';
import { antennaPosition, ecefFromDegrees, RoverTrajectory, type Occupation, type PlanStep } from './trajectory.js';
import { GLONASS_DUAL_FREQUENCY_CODES, GPS_DUAL_FREQUENCY_CODES, SINGLE_FREQUENCY_CODES, type SimSystem } from './signals.js';

export interface GeodeticDeg {
  readonly latDeg: number;
  readonly lonDeg: number;
  readonly heightM: number;
}
/** A point: east/north/up (m) from the reference mark, or geodetic degrees (WGS 84). */
export type PointSpec = { readonly e: number; readonly n: number; readonly u: number } | GeodeticDeg;

export interface ReceiverSpecCommon {
  readonly intervalS: number;
  readonly receiverType?: string;
  readonly antennaType?: string;
  /** Behaviour preset (default: 'geodetic' for the reference, 'low-cost' for the rover) and overrides. */
  readonly profile?: 'geodetic' | 'low-cost' | ReceiverProfile;
  readonly profileOverrides?: Partial<ReceiverProfile>;
  /** Record C1W/C2W/L2W/D2W/S2W for GPS as well (a CORS-like list). Default: reference yes, rover no. */
  readonly dualFrequency?: boolean;
}

export interface ScenarioSpec {
  readonly seed: number | string;
  readonly startGpsS: number;
  /** Length of the reference session (s); the rover's plan must fit inside. */
  readonly durationS: number;
  readonly reference: ReceiverSpecCommon & {
    readonly markGeodetic: GeodeticDeg;
    readonly antennaHeightM: number;
    readonly markerName?: string;
    readonly markerNumber?: string;
  };
  readonly rover: ReceiverSpecCommon & {
    readonly plan: readonly PlanStep[];
    /** Seconds after startGpsS at which the rover starts logging (default 0). */
    readonly startOffsetS?: number;
    readonly markerNumber?: string;
  };
  readonly points: Readonly<Record<string, PointSpec>>;
  /** Constellations: GPS, Galileo, GLONASS (FDMA, glonass-constellation.ts). */
  readonly systems: readonly SimSystem[];
  readonly errors?: ErrorSpec;
  /** Header COMMENT lines added to both observation files. */
  readonly comments?: readonly string[];
}

export interface PointOccupationTruth {
  readonly name: string;
  readonly markEcef: EcefM;
  readonly antennaHeightM: number;
  readonly startGpsS: number;
  readonly endGpsS: number;
}

export interface ScenarioTruth {
  /** Frame of every truth coordinate: WGS84 at the scenario's mid epoch (decimal year). */
  readonly frame: FrameEpoch;
  /** The rover's antenna reference point at true GPS time t. */
  roverAt(tGpsS: number): EcefM;
  /** The point occupied at an epoch tag, or null while walking. */
  occupationAt(tagGpsS: number): PointOccupationTruth | null;
  readonly points: readonly PointOccupationTruth[];
  /** Every named point's mark (rounded to 0.1 mm, as written in files). */
  readonly marks: ReadonlyMap<string, EcefM>;
  readonly referenceMark: EcefM;
  readonly referenceArp: EcefM;
  /** The true receiver clock offsets (s) at true time t (code), for checks. */
  referenceClockS(tGpsS: number): number;
  roverClockS(tGpsS: number): number;
  /** True GPS time of a rover epoch tag (tag = t + dt_rx(t), solved). */
  roverTrueTime(tagGpsS: number): number;
}

export interface SimulatedScenario {
  readonly nav: NavData;
  readonly referenceHeader: ObsHeader;
  referenceEpochs(): Iterable<ObsEpoch>;
  readonly roverHeader: ObsHeader;
  roverEpochs(): Iterable<ObsEpoch>;
  readonly truth: ScenarioTruth;
  /** The generators (planned gaps, dropouts, faults) for inspection. */
  readonly reference: ReceiverSimulation;
  readonly rover: ReceiverSimulation;
  /** The sky (true orbits and clocks) both receivers see. */
  readonly sky: TrueSky;
}

/** Rounds to 0.1 mm, the resolution of RINEX header coordinates (F14.4). */
function round4(v: number): number {
  return Math.round(v * 1e4) / 1e4;
}
function roundEcef(p: EcefM): EcefM {
  return { x: round4(p.x), y: round4(p.y), z: round4(p.z) };
}

function profileOf(spec: ReceiverSpecCommon, fallback: ReceiverProfile): ReceiverProfile {
  const base = spec.profile === 'geodetic' ? GEODETIC_PROFILE : spec.profile === 'low-cost' ? LOW_COST_PROFILE : spec.profile ?? fallback;
  return { ...base, ...(spec.profileOverrides ?? {}) };
}

function header(args: {
  markerName: string; markerNumber: string; receiverType: string; antennaType: string; approx: EcefM; heightM: number;
  codes: Readonly<Partial<Record<SimSystem, readonly string[]>>>; intervalS: number; first: number; last: number; comments: readonly string[];
  glonassChannels: ReadonlyMap<number, number>;
}): ObsHeader {
  return {
    version: 3.04,
    fileType: 'O',
    systemField: 'M',
    markerName: args.markerName,
    markerNumber: args.markerNumber,
    receiverType: args.receiverType,
    receiverNumber: 'SIM-0001',
    antennaType: args.antennaType,
    antennaNumber: 'SIM-0001',
    approxPosition: args.approx,
    antennaOffset: { heightM: args.heightM, eastM: 0, northM: 0 },
    obsCodes: args.codes,
    fileObsCodes: args.codes,
    intervalS: args.intervalS,
    firstObsGpsS: args.first,
    lastObsGpsS: args.last,
    timeSystem: 'GPS',
    glonassChannels: new Map(args.codes.R !== undefined ? args.glonassChannels : []),
    // RINEX 3.04 5.4 (mandatory with GLONASS since 3.02): the code-phase alignment the observations need, none here.
    glonassCodePhaseBias: args.codes.R !== undefined ? { C1C: 0, C1P: 0, C2C: 0, C2P: 0 } : {},
    phaseShifts: {},
    scaleFactors: {},
    clockOffsetApplied: false,
    leapSeconds: SIM_LEAP_SECONDS,
    comments: args.comments,
    headerLines: 0,
    receiverVersion: 'SIM 1.0',
  };
}

export function simulateScenario(spec: ScenarioSpec): SimulatedScenario {
  if (!(spec.durationS > 0)) throw new RangeError('durationS must be > 0');
  if (!(spec.reference.intervalS > 0) || !(spec.rover.intervalS > 0)) throw new RangeError('intervals must be > 0');
  const errors = resolveErrors(spec.errors);
  const seed = spec.seed;
  const endGpsS = spec.startGpsS + spec.durationS;
  const frame: FrameEpoch = { name: 'WGS84', epochYear: Math.round(decimalYearFromGpsS(spec.startGpsS + spec.durationS / 2) * 1e4) / 1e4 };

  const m = spec.reference.markGeodetic;
  const referenceMark = roundEcef(ecefFromDegrees(m.latDeg, m.lonDeg, m.heightM));
  const refGeo = ecefToGeodetic(referenceMark);
  const refHeightM = round4(spec.reference.antennaHeightM);
  const referenceArp = antennaPosition(referenceMark, refHeightM);

  const marks = new Map<string, EcefM>();
  for (const [name, p] of Object.entries(spec.points)) {
    if ('e' in p) {
      const d = enuToEcefDelta(p, refGeo.latRad, refGeo.lonRad);
      marks.set(name, roundEcef({ x: referenceMark.x + d.x, y: referenceMark.y + d.y, z: referenceMark.z + d.z }));
    } else {
      marks.set(name, roundEcef(ecefFromDegrees(p.latDeg, p.lonDeg, p.heightM)));
    }
  }
  const plan = spec.rover.plan.map((st) => (st.kind === 'static' ? { ...st, antennaHeightM: round4(st.antennaHeightM) } : st));
  const roverStart = spec.startGpsS + (spec.rover.startOffsetS ?? 0);
  const trajectory = new RoverTrajectory(plan, marks, roverStart);
  if (trajectory.endGpsS > endGpsS) throw new RangeError(`the rover plan ends ${trajectory.endGpsS - endGpsS} s after the session`);

  const nav = simulateConstellation({ seed, startGpsS: spec.startGpsS, endGpsS, systems: spec.systems });
  const sky = new TrueSky(nav, seed, errors.orbit, errors.satClock);
  const iono = errors.iono === null
    ? null
    : new IonoTruth(errors.iono, nav.ionosphere.gps ?? TYPICAL_KLOBUCHAR, refGeo, new Rng(seed, 'iono').between(0, 2 * Math.PI));
  // The zenith wet error is a field: the reference sees its value there, the rover the same value plus
  // the difference a distance d brings (wetDifferenceSigmaM), not an independent draw of its own.
  const wetAtReference = errors.tropo === null ? null
    : sumOfSinusoids(new Rng(seed, 'tropo', 'reference'), errors.tropo.zenithWetSigmaM, errors.tropo.minPeriodS, errors.tropo.maxPeriodS);
  const firstMark = trajectory.occupations[0]?.markEcef ?? referenceArp;
  const distanceM = Math.hypot(firstMark.x - referenceArp.x, firstMark.y - referenceArp.y, firstMark.z - referenceArp.z);
  const tropoFor = (role: string) => errors.tropo === null || wetAtReference === null
    ? null
    : new TropoTruth(role === 'reference' ? wetAtReference : sumOfProcesses(wetAtReference, sumOfSinusoids(new Rng(seed, 'tropo', role),
      wetDifferenceSigmaM(errors.tropo.zenithWetSigmaM, distanceM), errors.tropo.minPeriodS, errors.tropo.maxPeriodS)));

  const refProfile = profileOf(spec.reference, GEODETIC_PROFILE);
  const roverProfile = profileOf(spec.rover, LOW_COST_PROFILE);
  const clockFor = (role: string, p: ReceiverProfile): ReceiverClock => errors.rxClock
    ? new SteeredReceiverClock(p, spec.startGpsS, sumOfSinusoids(new Rng(seed, 'rxclock', role), p.clockWanderS, 600, 7200))
    : PERFECT_CLOCK;
  const refClock = clockFor('reference', refProfile);
  const roverClock = clockFor('rover', roverProfile);

  const codesFor = (dual: boolean): Partial<Record<SimSystem, readonly string[]>> => {
    const c: Partial<Record<SimSystem, readonly string[]>> = {};
    if (spec.systems.includes('G')) c.G = dual ? GPS_DUAL_FREQUENCY_CODES : SINGLE_FREQUENCY_CODES;
    if (spec.systems.includes('E')) c.E = SINGLE_FREQUENCY_CODES;
    if (spec.systems.includes('R')) c.R = dual ? GLONASS_DUAL_FREQUENCY_CODES : SINGLE_FREQUENCY_CODES;
    return c;
  };
  const glonassChannels = glonassChannelsOf(nav);
  const refType = spec.reference.receiverType ?? 'SIM GEODETIC L1L2';
  const roverType = spec.rover.receiverType ?? 'SIM LOWCOST L1';
  // Inter-channel bias slopes follow the receiver type (errors.ts): equal types, equal biases.
  const icb = errors.glonassInterChannel;
  const biasFor = (type: string) => {
    if (icb === null) return undefined;
    const r = new Rng('glonass-inter-channel', type.trim());
    return { code: r.between(-icb.codeMaxMPerChannel, icb.codeMaxMPerChannel), phase: r.between(-icb.phaseMaxMPerChannel, icb.phaseMaxMPerChannel) };
  };
  const refCodes = codesFor(spec.reference.dualFrequency ?? true);
  const roverCodes = codesFor(spec.rover.dualFrequency ?? false);

  const refCount = Math.floor(spec.durationS / spec.reference.intervalS + 1e-9);
  const reference = new ReceiverSimulation({
    role: 'reference', seed, sky, profile: refProfile, errors, iono, tropo: tropoFor('reference'), clock: refClock,
    positionAt: () => referenceArp, velocityAt: () => ({ x: 0, y: 0, z: 0 }),
    firstTagGpsS: spec.startGpsS, intervalS: spec.reference.intervalS, epochCount: refCount, codes: refCodes,
    glonassChannels, glonassBiasMPerChannel: biasFor(refType),
  });

  // Rover epochs: tags from the plan's start to its end; events where occupations begin and end.
  const roverCount = Math.floor((trajectory.endGpsS - roverStart) / spec.rover.intervalS + 1e-9);
  const events = new Map<number, HeaderEvent[]>();
  const tagIndex = (t: number) => Math.ceil((t - roverStart) / spec.rover.intervalS - 1e-9);
  const occ = trajectory.occupations;
  const roverNumber = spec.rover.markerNumber ?? '';
  for (let i = 0; i < occ.length; i++) {
    const o = occ[i]!;
    if (i > 0) {
      const k = tagIndex(o.startGpsS);
      const list = events.get(k) ?? [];
      list.push({ kind: 'new-occupation', markerName: o.name, markerNumber: roverNumber, antennaOffset: { heightM: o.antennaHeightM, eastM: 0, northM: 0 }, comments: [] });
      events.set(k, list);
    }
    if (i < occ.length - 1 && occ[i + 1]!.startGpsS > o.endGpsS) {
      const k = tagIndex(o.endGpsS);
      const list = events.get(k) ?? [];
      list.push({ kind: 'start-moving', comments: [] });
      events.set(k, list);
    }
  }
  const rover = new ReceiverSimulation({
    role: 'rover', seed, sky, profile: roverProfile, errors, iono, tropo: tropoFor('rover'), clock: roverClock,
    positionAt: (t) => trajectory.positionAt(t), velocityAt: (t) => trajectory.velocityAt(t),
    firstTagGpsS: roverStart, intervalS: spec.rover.intervalS, epochCount: roverCount, codes: roverCodes, eventsBefore: events,
    glonassChannels, glonassBiasMPerChannel: biasFor(roverType),
  });

  const frameComment = `Truth frame: ${frame.name} at epoch ${frame.epochYear.toFixed(4)}`;
  const comments = ['SIMULATED DATA (refdelta sim): not a real recording', frameComment, ...(spec.comments ?? [])];
  const first = occ[0]!;
  const roverApprox = { x: Math.round(first.markEcef.x), y: Math.round(first.markEcef.y), z: Math.round(first.markEcef.z) };
  const referenceHeader = header({
    markerName: spec.reference.markerName ?? 'REF', markerNumber: spec.reference.markerNumber ?? '',
    receiverType: refType, antennaType: spec.reference.antennaType ?? 'SIMCHOKE        NONE', glonassChannels,
    approx: referenceMark, heightM: refHeightM, codes: refCodes, intervalS: spec.reference.intervalS,
    first: spec.startGpsS, last: reference.lastTagGpsS, comments,
  });
  const roverHeader = header({
    markerName: first.name, markerNumber: roverNumber,
    receiverType: roverType, antennaType: spec.rover.antennaType ?? 'SIMPATCH        NONE', glonassChannels,
    approx: roverApprox, heightM: first.antennaHeightM, codes: roverCodes, intervalS: spec.rover.intervalS,
    first: roverStart, last: rover.lastTagGpsS, comments,
  });

  const toTruth = (o: Occupation): PointOccupationTruth => ({ ...o });
  const truth: ScenarioTruth = {
    frame,
    roverAt: (t) => trajectory.positionAt(t),
    occupationAt: (tag) => {
      const o = trajectory.occupationAt(tag);
      return o === null ? null : toTruth(o);
    },
    points: occ.map(toTruth),
    marks,
    referenceMark,
    referenceArp,
    referenceClockS: (t) => refClock.codeOffsetS(t),
    roverClockS: (t) => roverClock.codeOffsetS(t),
    roverTrueTime: (tag) => {
      let t = tag;
      for (let i = 0; i < 3; i++) t = tag - roverClock.codeOffsetS(t);
      return t;
    },
  };
  return {
    nav,
    referenceHeader,
    referenceEpochs: () => reference.epochs(),
    roverHeader,
    roverEpochs: () => rover.epochs(),
    truth,
    reference,
    rover,
    sky,
  };
}

/**
 * Standard deviation (m) of the difference of zenith wet delay between two sites d metres apart: the
 * 2/3-power structure function of tropospheric turbulence (Treuhaft & Lanyi 1987, Radio Science 22(2)),
 * scaled to about 1 cm at 10 km (from memory: the usual order of differential wet delay at that distance),
 * never more than two independent sites (sqrt(2) sigma).
 */
export function wetDifferenceSigmaM(zenithWetSigmaM: number, distanceM: number): number {
  return Math.min(Math.SQRT2 * zenithWetSigmaM, 0.01 * Math.cbrt(Math.max(distanceM, 0) / 10_000));
}
