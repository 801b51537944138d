/**
 * Everything a session decides before its first epoch: which constellations (the user's choice, limited by
 * the navigation data and the GLONASS policy), the reference coordinate with its frame and epoch, the
 * GLONASS frequency channels, the weights and the test levels. Pure: notes and warnings are returned or
 * handed to the sink, nothing is read.
 */
import type { AntennaOffset, EcefM, FrameEpoch, GnssSystem, ObsHeader, ObsStream } from '../gnss/index.js';
import { SYSTEM_NAMES } from '../gnss/index.js';
import { ProcessingError, type WarningSink } from '../errors.js';
import { EphemerisStore } from '../orbit/index.js';
import { decimalYearFromGpsS } from '../time/index.js';
import { elevationVarianceM2, type ElevationWeightParams, type FixOptions } from '../solve/index.js';
import type { NavData } from '../gnss/index.js';
import type { SessionOptions } from './options.js';

const DEG = Math.PI / 180;

/** How GLONASS takes part in the solution. */
export type GlonassUse =
  /** Not used (option, or no ephemeris). */
  | 'excluded'
  /** One relative clock, biases trusted to cancel. */
  | 'one-clock'
  /** One relative clock plus a code offset per frequency channel estimated from the whole session. */
  | 'channel-offsets';

export interface SessionSetup {
  readonly store: EphemerisStore;
  readonly navSystems: ReadonlySet<GnssSystem>;
  /** Constellations in use. */
  readonly systems: readonly GnssSystem[];
  readonly glonassUse: GlonassUse;
  /** Both receivers report the same known receiver type. */
  readonly sameReceiver: boolean;
  readonly refMark: EcefM;
  readonly frame: FrameEpoch;
  readonly refSource: string;
  /** Reference antenna offset in force at the start (files may change it later). */
  readonly refAntenna: AntennaOffset;
  readonly roverAntenna: AntennaOffset;
  readonly glonassChannels: ReadonlyMap<number, number>;
  readonly weighting: ElevationWeightParams;
  readonly maskRad: number;
  readonly fixOptions: FixOptions;
  readonly notes: string[];
}

function isKnownReceiver(t: string): boolean {
  const s = t.trim().toLowerCase();
  return s !== '' && s !== 'unknown' && s !== 'unk';
}

/** Why a satellite of a constellation that is not in use is left out. */
export function systemLeftOutReason(system: GnssSystem, options: SessionOptions, navSystems: ReadonlySet<GnssSystem>): string {
  return !options.systems.includes(system) ? 'constellation not selected' : !navSystems.has(system) ? 'no ephemeris for this constellation' : 'GLONASS excluded by option';
}

/**
 * systemLeftOutReason for one session, as an object with a method: asked for every satellite of a system
 * left out, at every epoch, it is one call target for every session of a batch (a closure made per
 * session would be a new one each time, and the optimised code calling it would be discarded).
 */
export class LeftOutSystems {
  constructor(private readonly options: SessionOptions, private readonly navSystems: ReadonlySet<GnssSystem>) {}

  reasonFor(system: GnssSystem): string {
    return systemLeftOutReason(system, this.options, this.navSystems);
  }
}

export function prepareSession(rover: ObsStream, references: readonly ObsStream[], nav: NavData, options: SessionOptions, warn: WarningSink, wholeSession: boolean): SessionSetup {
  if (references.length === 0) throw new ProcessingError('no reference observation file was given');
  const store = new EphemerisStore(nav);
  if (store.satellites().length === 0) throw new ProcessingError('the navigation files hold no usable ephemeris');
  const refHeader = references[0].header;
  const notes: string[] = [];

  const navSystems = store.systemsWithEphemeris();
  let systems = options.systems.filter((s) => navSystems.has(s));
  const sameReceiver = isKnownReceiver(rover.header.receiverType) &&
    references.every((r) => r.header.receiverType.trim() === rover.header.receiverType.trim());
  let glonassUse: GlonassUse = 'excluded';
  if (systems.includes('R')) {
    if (options.glonass === 'exclude') {
      systems = systems.filter((s) => s !== 'R');
      notes.push('GLONASS excluded by option');
    } else if (options.glonass === 'include') {
      glonassUse = 'one-clock';
      notes.push('GLONASS used by option with one relative clock (inter-frequency code biases are assumed to cancel)');
    } else if (!wholeSession) {
      glonassUse = 'one-clock';
      notes.push('GLONASS used with one relative clock: the session was read once, so no per-channel code offsets could be estimated');
    } else {
      glonassUse = 'channel-offsets';
      notes.push(`GLONASS used with a code offset per frequency channel estimated over the whole session (rover '${rover.header.receiverType.trim() || 'unknown'}', reference '${refHeader.receiverType.trim() || 'unknown'}'): between-receiver inter-frequency code biases differ per channel, even between receivers of one model`);
    }
  }
  for (const s of options.systems) if (!navSystems.has(s)) notes.push(`${SYSTEM_NAMES[s]} not used: no ephemeris in the navigation files`);
  if (systems.length === 0) throw new ProcessingError(`no navigation data for the constellations asked for (${options.systems.map((s) => SYSTEM_NAMES[s]).join(', ')})`);

  const ref = referenceCoordinate(rover.header, references[0], options, warn);
  notes.push(...ref.notes);

  // Frequency channels: navigation records, then the reference header, then the rover header.
  const glonassChannels = new Map<number, number>(store.glonassChannels());
  for (const h of [refHeader, rover.header]) for (const [slot, k] of h.glonassChannels) glonassChannels.set(slot, k);

  const weighting: ElevationWeightParams = {
    aM: options.weighting.aM,
    bM: options.weighting.bM,
    minElevationRad: 5 * DEG,
    ...(options.weighting.useStrength ? { referenceCn0DbHz: 45 } : {}),
  };
  return {
    store, navSystems, systems, glonassUse, sameReceiver,
    refMark: ref.mark, frame: ref.frame, refSource: ref.source,
    refAntenna: options.reference.antenna ?? refHeader.antennaOffset,
    roverAntenna: options.roverAntenna ?? rover.header.antennaOffset,
    glonassChannels, weighting, maskRad: options.elevationMaskDeg * DEG,
    fixOptions: {
      maxIterations: 12, convergenceM: 1e-4,
      alphaGlobal: options.quality.alphaGlobal, alphaLocal: options.quality.alphaLocal, bMethod: options.quality.testLevels === 'b-method',
      minSatellites: options.quality.minSatellites, maxRejections: options.quality.maxRejections,
    },
    notes,
  };
}

/** One receiver's code variance (m^2): elevation model times the signal-strength factor when enabled (solve/weights.ts). */
/**
 * One receiver's code variance with the session's weighting. An object with a method, not a closure made
 * per session: asked for every satellite of every epoch, it is one call target for every session.
 */
export class CodeVariance {
  constructor(private readonly weighting: ElevationWeightParams) {}

  varianceM2(elevationRad: number, cn0DbHz: number): number {
    return elevationVarianceM2(elevationRad, this.weighting, cn0DbHz);
  }
}

export function codeVarianceOf(setup: SessionSetup): CodeVariance {
  return new CodeVariance(setup.weighting);
}

function referenceCoordinate(roverHeader: ObsHeader, reference: ObsStream, options: SessionOptions, warn: WarningSink): { mark: EcefM; frame: FrameEpoch; source: string; notes: string[] } {
  if (options.reference.position) {
    return { mark: options.reference.position.ecef, frame: options.reference.position.frame, source: options.reference.source ?? 'given by the user', notes: [] };
  }
  const h = reference.header;
  if (!h.approxPosition) throw new ProcessingError(`${reference.file}: no reference coordinate given and the file header has no APPROX POSITION XYZ`);
  const firstS = roverHeader.firstObsGpsS ?? h.firstObsGpsS;
  const msg = `reference coordinate taken from the header of ${reference.file}: header coordinates can be approximate, and its frame is not stated`;
  warn({ file: reference.file, code: 'header-reference-coordinate', message: msg });
  return {
    mark: h.approxPosition,
    frame: { name: 'unstated', epochYear: firstS !== null ? Math.round(decimalYearFromGpsS(firstS) * 100) / 100 : NaN },
    source: `APPROX POSITION XYZ of ${reference.file}`,
    notes: [msg],
  };
}
