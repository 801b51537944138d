/**
 * A carrier-phase session: the rover against one reference, with integer ambiguities, forwards and
 * backwards.
 *
 * 1. One reading of the inputs prepares every rover epoch (estimated GPS time from the rover's code;
 *    reference phase and code carried to that time within one arc, reference-phase.ts; the rover's
 *    linearisation point from a code double-difference fix; arcs of both receivers, arc-tracker.ts) into
 *    compact typed arrays (epoch-records.ts).
 * 2. The Kalman filter runs over them forwards, then backwards (float-filter.ts), each pass fixing
 *    ambiguities with LAMBDA and holding them within arcs.
 * 3. The backward pass is combined with the forward one epoch by epoch as it runs (combine-passes.ts;
 *    the results wait in the records' store chunk by chunk, pass-results.ts); every rover epoch is yielded with its kind
 *    ('fixed', 'float' or 'none'), ratio, number of fixed ambiguities and formal precision.
 *
 * Frequencies: the primary band of each constellation, and (option `frequencies`, default all) the further
 * bands both receivers recorded with phase (further-bands.ts), each signal pair with its own ambiguities,
 * arcs (its own slip tests), antenna calibration and clocks.
 *
 * Baseline length: differential troposphere is modelled (Saastamoinen + Niell at both ends). The differential
 * ionosphere is neglected on the primary band alone: below about 10 km it is a few millimetres to a few
 * centimetres per double difference on L1 in quiet conditions (e.g. Odijk 2002, PhD thesis, Delft), which
 * single-frequency ambiguity fixing tolerates only over short baselines. Satellites with further bands have
 * it estimated, weighted by the baseline length (ionosphere-weighting.ts, with its measured limit). Beyond
 * 10 km a warning is given either way.
 *
 * Antennas: with an ANTEX calibration (antex.ts) the phase-centre offset and variation of each receiver's
 * antenna (type from its RINEX header) are applied; without one, different antenna types at the two ends
 * leave their phase-centre difference (millimetres to centimetres, mostly vertical) in the result: warned.
 *
 * GLONASS: its ambiguities are fixed only between receivers of the same type (the inter-channel phase
 * biases of FDMA signals then cancel, e.g. Wanninger 2012, GPS Solutions 16:439-448); between unlike
 * receivers they stay float (they still help the float solution).
 */
import type { EcefM, FrameEpoch, FramedEcef, GeodeticRad, GnssSystem, SatId } from '../gnss/index.js';
import { satSystem, SYSTEM_NAMES } from '../gnss/index.js';
import type { AntennaOffset, ObsEpoch, ObsStream } from '../gnss/index.js';
import type { NavData } from '../gnss/index.js';
import { ProcessingError, type WarningSink } from '../errors.js';
import { EphemerisStore } from '../orbit/index.js';
import { arpToMark, azimuthElevation, ecefDeltaToEnu, ecefToGeodetic, markToArp } from '../geodesy/index.js';
import { decimalYearFromGpsS, isoFromSeconds } from '../time/index.js';
import { dayOfYear, troposphereDelayM } from '../observables/index.js';
import { dopplerVelocity } from '../velocity/index.js';
import { bMethodGlobalAlpha, chiSquareQuantile, dilutionOfPrecision } from '../solve/index.js';
import { joinReferenceStreams, type EpochSolution, type QualityTest, type SessionOptions } from '../session/index.js';
import { ArcTracker, type ArcInput } from './arc-tracker.js';
import { placeSatellite, prepareReceiverEpoch, type ReceiverContext, type ReceiverEpoch, type ReceiverSat, type ReceiverSignal } from './receiver-epoch.js';
import { ReferencePhaseBuffer, reduceReferenceEpoch, type AlignedReference, type AlignedReferenceSat, type BandArcs } from './reference-phase.js';
import { EpochRecords, MemoryRecordStore, type RecordStore } from './epoch-records.js';
import { codeVarianceScale, runPasses, singleDifferenceVarianceM2, type EpochConsumer, type EpochResult, type FixedDoubleDifference, type SatelliteInfo } from './float-filter.js';
import { combineEpoch } from './combine-passes.js';
import { PassResults } from './pass-results.js';
import type { CarrierOptions } from './options.js';
import { antennaCorrectionM, findAntenna, type AntennaCalibration, type AntexData } from './antex.js';
import { codeFixPosition, type CodeRow } from './code-fix.js';
import { furtherBandGroup } from './further-bands.js';
import { GeometryFreeMonitor } from './geometry-free.js';
import { ionosphereFactor, ionosphereWeighting } from './ionosphere-weighting.js';
import { findTimeDifferencedSlips, SLIP_MIN_CYCLES, SLIP_MIN_CYCLES_REFERENCE_SWITCH, type TimeDifferencedPhase } from './time-differenced-slips.js';
import { keepShape } from './kept-shapes.js';
import { CAUSE_DISTURBED, CAUSE_TOO_FEW_SATELLITES, combinedFloatReason, tooFewSatellitesReason, type CauseLimits } from './float-causes.js';

export interface CarrierInputs {
  readonly rover: ObsStream;
  readonly references: readonly ObsStream[];
  readonly nav: NavData;
  /** Antenna calibrations (ANTEX), when given. */
  readonly antennas?: AntexData;
  readonly onWarning?: WarningSink;
  /** Told the integers each pass fixed at each epoch (epoch tag, double differences): for checks against known integers. */
  readonly onFixedAmbiguities?: (fix: { readonly pass: 'forward' | 'backward'; readonly tagGpsS: number; readonly ambiguities: readonly FixedDoubleDifference[] }) => void;
  /** Where the prepared records wait for the passes (epoch-records.ts); default: in memory. Closed when the last epoch has been yielded. */
  readonly recordStore?: RecordStore;
}

/** Opens the inputs (again); called once per reading. */
export type CarrierInputFactory = () => Promise<CarrierInputs>;

export type CarrierSolutionKind = 'fixed' | 'float' | 'none';

/** One rover epoch of a carrier-phase session: an EpochSolution with the carrier-phase kinds and fix quality. */
export interface CarrierEpochSolution extends Omit<EpochSolution, 'kind'> {
  readonly kind: CarrierSolutionKind;
  /** Ratio test statistic of the epoch's integer search (the larger of the two passes; NaN when none ran). */
  readonly ratio: number;
  /** Double-difference ambiguities fixed. */
  readonly fixedAmbiguities: number;
  /** Formal 3-D precision (m, 1 sigma). */
  readonly sigma3dM: number;
  readonly forwardKind: CarrierSolutionKind;
  readonly backwardKind: CarrierSolutionKind;
}

export interface PassShares {
  readonly fixed: number;
  readonly float: number;
  readonly none: number;
}

export interface CarrierSummary {
  readonly frame: FrameEpoch;
  readonly referencePosition: FramedEcef;
  readonly referencePositionSource: string;
  readonly epochsRover: number;
  readonly forward: PassShares;
  readonly backward: PassShares;
  readonly combined: PassShares;
  readonly fixableSystems: readonly GnssSystem[];
  /** Phase signals of the rover used, per constellation and band ('G L1C', 'G L2W'...), in order of first use. */
  readonly signals: readonly string[];
  /** Arcs started per cause at each receiver (arc-tracker.ts). */
  readonly slips: { readonly rover: Readonly<Record<string, number>>; readonly reference: Readonly<Record<string, number>> };
  /** Median antenna-to-antenna distance of the solved epochs (m). */
  readonly baselineLengthM: number;
  readonly notes: readonly string[];
  /**
   * Satellites left out of the epochs' solutions, per reason (as the satellites' reasons in the epochs, without
   * their numbers), one count per satellite and band of an epoch (a row of residuals.csv): as the code
   * engine's summary, which has one band per satellite. Counted as the epochs
   * are yielded: complete once they all have been.
   */
  readonly satelliteRejections: readonly { readonly reason: string; readonly count: number }[];
  /** Memory of the prepared records (bytes). */
  readonly recordBytes: number;
}

export interface CarrierRun {
  /**
   * The epochs' solutions, in order. Iterate it to its end (or stop iterating it, which returns it): that
   * releases the session's records and results. A run whose epochs are never iterated keeps them until
   * the next carrier session starts (kept-shapes.ts).
   */
  readonly epochs: AsyncIterable<CarrierEpochSolution>;
  summary(): CarrierSummary;
}

const DEG = Math.PI / 180;
/** A satellite's reason below the elevation mask (its elevation follows in brackets), and its count's in the summary. */
const BELOW_MASK = 'below elevation mask';
const KIND: readonly CarrierSolutionKind[] = ['none', 'float', 'fixed'];

function isKnownType(t: string): boolean {
  const s = t.trim().toLowerCase();
  return s !== '' && s !== 'unknown' && s !== 'unk';
}

interface EpochContext {
  readonly pointName: string;
  readonly event: 'new-occupation' | 'start-moving' | null;
  readonly antenna: AntennaOffset;
}

export async function solveCarrierSession(open: CarrierInputFactory, options: SessionOptions, carrier: CarrierOptions): Promise<CarrierRun> {
  const inputs = await open();
  const warn: WarningSink = inputs.onWarning ?? (() => undefined);
  if (inputs.references.length === 0) throw new ProcessingError('no reference observation file was given');
  const store = new EphemerisStore(inputs.nav);
  if (store.satellites().length === 0) throw new ProcessingError('the navigation files hold no usable ephemeris');
  const rover = inputs.rover;
  const refHeader = inputs.references[0].header;
  const notes: string[] = [];

  const navSystems = store.systemsWithEphemeris();
  // SBAS and NavIC are left out: their single-frequency phase is rarely logged by both receivers.
  const systems = options.systems.filter((s) => navSystems.has(s) && s !== 'S' && s !== 'I' && !(s === 'R' && options.glonass === 'exclude'));
  if (systems.length === 0) throw new ProcessingError(`no navigation data for the constellations asked for (${options.systems.map((s) => SYSTEM_NAMES[s]).join(', ')})`);
  const likeReceivers = isKnownType(rover.header.receiverType) && inputs.references.every((r) => r.header.receiverType.trim() === rover.header.receiverType.trim());
  const fixable = new Set<GnssSystem>(systems.filter((s) => s !== 'R'));
  if (systems.includes('R')) {
    if (carrier.glonassFix === 'always' || (carrier.glonassFix === 'auto' && likeReceivers)) {
      fixable.add('R');
      notes.push(carrier.glonassFix === 'always' ? 'GLONASS ambiguities fixed by option' : `GLONASS ambiguities fixed: both receivers report type '${rover.header.receiverType.trim()}', so inter-channel phase biases cancel`);
    } else {
      notes.push(`GLONASS ambiguities kept float: the receivers are not known to match (rover '${rover.header.receiverType.trim() || 'unknown'}', reference '${refHeader.receiverType.trim() || 'unknown'}'), so inter-channel phase biases do not cancel`);
    }
  }

  // Reference coordinate and frame (as the code engine: session/solve-session.ts).
  let refMark: EcefM;
  let frame: FrameEpoch;
  let refSource: string;
  if (options.reference.position) {
    refMark = options.reference.position.ecef;
    frame = options.reference.position.frame;
    refSource = options.reference.source ?? 'given by the user';
  } else {
    if (!refHeader.approxPosition) throw new ProcessingError(`${inputs.references[0].file}: no reference coordinate given and the file header has no APPROX POSITION XYZ`);
    refMark = refHeader.approxPosition;
    const firstS = rover.header.firstObsGpsS ?? refHeader.firstObsGpsS;
    frame = { name: 'unstated', epochYear: firstS !== null ? Math.round(decimalYearFromGpsS(firstS) * 100) / 100 : NaN };
    refSource = `APPROX POSITION XYZ of ${inputs.references[0].file}`;
    const msg = `reference coordinate taken from the header of ${inputs.references[0].file}: header coordinates can be approximate, and its frame is not stated`;
    notes.push(msg);
    warn({ file: inputs.references[0].file, code: 'header-reference-coordinate', message: msg });
  }
  const refAntenna: AntennaOffset = options.reference.antenna ?? refHeader.antennaOffset;
  const refArp = markToArp(refMark, refAntenna);
  const refGeo = ecefToGeodetic(refArp);

  // Antennas.
  const roverAntType = rover.header.antennaType.trim();
  const refAntType = refHeader.antennaType.trim();
  const antex = inputs.antennas;
  const roverCal = antex ? findAntenna(antex, roverAntType) : null;
  const refCal = antex ? findAntenna(antex, refAntType) : null;
  if (antex) {
    for (const [t, c, f] of [[roverAntType, roverCal, rover.file], [refAntType, refCal, inputs.references[0].file]] as const) {
      if (!c) {
        // The warning names its observation file; the note has no file of its own.
        const msg = `antenna type '${t || 'unknown'}' is not in ${antex.file}: its phase-centre offset and variation are not applied`;
        notes.push(`${f}: ${msg}`);
        warn({ file: f, code: 'antenna-not-calibrated', message: msg });
      }
    }
  }
  if (roverAntType !== refAntType && (!roverCal || !refCal)) {
    const lacking = [...new Set([roverCal ? null : roverAntType || 'unknown', refCal ? null : refAntType || 'unknown'].filter((x) => x !== null))];
    const advice = antex
      ? `${lacking.length > 1 ? 'the antennas' : 'the antenna'} ${lacking.map((x) => `'${x}'`).join(' and ')} ${lacking.length > 1 ? 'are' : 'is'} not in ${antex.file}`
      : 'give --antennas with an ANTEX file';
    const msg = `the antennas differ (rover '${roverAntType || 'unknown'}', reference '${refAntType || 'unknown'}') and no calibration is applied to both: their phase-centre difference (millimetres to centimetres, mostly in height) stays in the results; ${advice}`;
    notes.push(msg);
    warn({ file: rover.file, code: 'antenna-types-differ', message: msg });
  }

  const glonassChannels = new Map<number, number>(store.glonassChannels());
  for (const h of [refHeader, rover.header]) for (const [slot, k] of h.glonassChannels) glonassChannels.set(slot, k);
  const ctx: ReceiverContext = { store, systems, glonassChannels, frequencies: carrier.frequencies };
  const maskRad = options.elevationMaskDeg * DEG;

  // Reading: one pass over the rover, building the records (RoverReader).
  const recordStore = inputs.recordStore ?? new MemoryRecordStore();
  const reader = new RoverReader({
    carrier, maskRad, refArp, refGeo, refCal, roverCal, refIntervalS: refHeader.intervalS,
    recordStore, roverAntenna: options.roverAntenna ?? rover.header.antennaOffset, roverAntennaGiven: Boolean(options.roverAntenna),
    pointName: rover.header.markerName.trim(), x0: rover.header.approxPosition ?? refArp,
  });
  // The reader, the records and the results are kept beyond the session (kept-shapes.ts): a session that
  // fails from here on releases what it holds before the error goes on (a finished one releases it in run()).
  let passResults: PassResults | null = null;
  try {
    await reader.read(rover.epochs, { ctx, references: joinReferenceStreams(inputs.references)[Symbol.asyncIterator]() });
    const rec = reader.rec;
    const satellites = reader.satellites;
    const maxBaselineM = reader.maxBaselineM;
    if (rec.count > 0 && reader.epochsWithReference === 0) {
      const files = (xs: readonly { file: string }[]) => xs.map((x) => x.file).join(', ');
      const roverSeen = reader.roverSeen, refSeen = reader.refSeen;
      if (roverSeen.positioned === 0) {
        throw new ProcessingError(`no rover epoch could be used: the navigation files ${inputs.nav.files.join(', ')} hold no usable ephemeris for the rover's satellites at its times (${isoFromSeconds(roverSeen.firstGpsS, ' GPST')} to ${isoFromSeconds(roverSeen.lastGpsS, ' GPST')}; stale, for another day, unhealthy or damaged), or ${rover.file} holds no usable pseudorange`);
      }
      if (Number.isNaN(refSeen.firstGpsS)) throw new ProcessingError(`the reference file${inputs.references.length > 1 ? 's' : ''} ${files(inputs.references)} gave no readable observation epoch (see the warnings)`);
      if (refSeen.positioned === 0) {
        // Reference epochs were read but none could be used: the orbits are what is missing, not the overlap.
        throw new ProcessingError(`no reference epoch could be used: the navigation files ${inputs.nav.files.join(', ')} hold no usable ephemeris for the reference's times (${isoFromSeconds(refSeen.firstGpsS, ' GPST')} to ${isoFromSeconds(refSeen.lastGpsS, ' GPST')}; stale, for another day, unhealthy or damaged)`);
      }
      throw new ProcessingError(`the rover and reference observations do not overlap in time (no reference epoch within ${carrier.maxReferenceAgeS} s of any rover epoch)`);
    }
    if (maxBaselineM > 10_000) {
      const msg = `baseline up to ${(maxBaselineM / 1000).toFixed(1)} km: the differential ionosphere can reach several centimetres per double difference beyond about 10 km (neglected with one frequency, estimated with a prior when further frequencies are used), and ambiguities may then be fixed wrongly or not at all`;
      notes.push(msg);
      warn({ file: rover.file, code: 'long-baseline', message: msg });
    }

    // Forward and backward passes, then their combination.
    notes.push(`${reader.timeDifferencedSlips} slips found by the time-differenced phase test (single differences of consecutive epochs against a fitted change of position and clocks)${reader.halfCycleSlips ? `, ${reader.halfCycleSlips} of them by an odd number of half cycles (arcs then left float until a further half-cycle jump or a new arc)` : ''}${reader.unexplainedEpochs ? `; ${reader.unexplainedEpochs} epochs whose changes the test could not explain (global test at 1e-5: every arc tested restarted)` : ''}`);
    // Further bands: the differential ionosphere is estimated, weighted by the baseline (ionosphere-weighting.ts).
    const ionosphere = satellites.some((x) => !x.primary) ? ionosphereWeighting(maxBaselineM) : null;
    if (ionosphere) notes.push(`${reader.geometryFreeSlips} slips found by the geometry-free test on the single differences (further bands)`);
    if (ionosphere) notes.push(`further frequencies used (${[...new Set(satellites.filter((x) => !x.primary).map((x) => x.phaseCode.slice(0, 2) + ' ' + SYSTEM_NAMES[x.system]))].join(', ')}): the differential ionosphere is estimated per satellite, prior ${(1000 * ionosphere.verticalSigmaM).toFixed(1)} mm at zenith for a ${(maxBaselineM / 1000).toFixed(1)} km baseline`);
    const setup = { satellites, fixableSystems: fixable, elevationMaskRad: maskRad, options: carrier, ionosphere };
    const sink = inputs.onFixedAmbiguities;
    const onFix = (pass: 'forward' | 'backward') => sink ? (k: number, ambiguities: readonly FixedDoubleDifference[]) => sink({ pass, tagGpsS: rec.tagGpsS[rec.indexOf(k)], ambiguities }) : undefined;
    // The forward pass's results wait in the record store, chunk by chunk; the backward pass combines each
    // epoch with them as it goes (pass-results.ts): no pass holds a whole session's results.
    const results = new PassResults(rec, recordStore);
    passResults = results;
    const forward = new ForwardConsumer(results);
    const backward = new BackwardConsumer(rec, results, carrier.passAgreementM, refArp);
    const [fwd, bwd] = runPasses(rec, setup, [
      { direction: 1, onFix: onFix('forward'), consumer: forward },
      { direction: -1, onFix: onFix('backward'), consumer: backward },
    ]);
    results.finish();
    notes.push(`filter: ${fwd.codeOutliers + bwd.codeOutliers} code outliers left out (the two passes counted together); tracking disturbed (more than half of the arcs started or ended since the pass's previous epoch: no fix tried) at ${fwd.disturbedEpochs} epochs of the forward pass and ${bwd.disturbedEpochs} of the backward pass; ${backward.disturbedFloat} epochs of the result are float where a pass was disturbed`);

    const writer = new SolutionWriter({
      rec, results, satellites, contexts: reader.contexts, reasons: reader.reasons,
      lastContext: { pointName: reader.pointName, event: null, antenna: reader.roverAntenna },
      maskRad, carrier, codeScale: codeVarianceScale(rec, carrier), reduceToMark: options.reduceToMark,
      refMark, refArp, frame, quality: options.quality,
    });

    async function* run(): AsyncIterable<CarrierEpochSolution> {
      try {
        for (let k = 0; k < rec.count; k++) yield writer.solutionAt(k);
      } finally {
        results.release();
        rec.close();
      }
    }

    const recordBytes = rec.count * 80 + rec.satTotal * 40;
    const baselineLengthM = backward.medianLengthM();
    const roverTracker = reader.roverTracker, refTracker = reader.refTracker;
    const roverBandTrackers = reader.roverBandTrackers, refBandTrackers = reader.refBandTrackers;
    const forwardShares = forward.shares, backwardShares = backward.shares, combinedShares = backward.combinedShares;
    return {
      epochs: run(),
      summary: (): CarrierSummary => ({
        frame, referencePosition: { ecef: refMark, frame }, referencePositionSource: refSource,
        epochsRover: rec.count, forward: forwardShares.plain(), backward: backwardShares.plain(), combined: combinedShares.plain(),
        fixableSystems: [...fixable], signals: [...new Set(satellites.map((x) => `${x.system} ${x.phaseCode}`))], slips: { rover: allCauses(roverTracker, roverBandTrackers), reference: allCauses(refTracker, refBandTrackers) },
        baselineLengthM, notes, satelliteRejections: writer.rejections(), recordBytes,
      }),
    };
  } catch (e) {
    passResults?.release();
    reader.rec.close();
    throw e;
  }
}

/** What a RoverReader reads from: the receivers' context, and the reference's epochs (joined files), read as far as the rover needs. */
interface ReaderFeed {
  readonly ctx: ReceiverContext;
  readonly references: AsyncIterator<{ readonly epoch: ObsEpoch }>;
}

/** What a RoverReader is given. */
interface ReaderSetup {
  readonly carrier: CarrierOptions;
  readonly maskRad: number;
  /** The reference's antenna reference point and its geodetic coordinates. */
  readonly refArp: EcefM;
  readonly refGeo: GeodeticRad;
  /** Antenna calibrations of the two receivers, when given and found. */
  readonly refCal: AntennaCalibration | null;
  readonly roverCal: AntennaCalibration | null;
  readonly refIntervalS: number | null;
  readonly recordStore: RecordStore;
  /** The rover's antenna offset at the start; given by the user (events then do not change it). */
  readonly roverAntenna: AntennaOffset;
  readonly roverAntennaGiven: boolean;
  /** The rover's point name at the start (its marker name). */
  readonly pointName: string;
  /** The rover's first linearisation point. */
  readonly x0: EcefM;
}

/** Shares of a pass's epochs by kind. */
class Shares implements PassShares {
  fixed = 0;
  float = 0;
  none = 0;

  constructor() {
    keepShape(this);
  }

  count(kind: number): void {
    if (kind === 2) this.fixed++; else if (kind === 1) this.float++; else this.none++;
  }

  /** The counts as a plain object (for the summary). */
  plain(): PassShares {
    return { fixed: this.fixed, float: this.float, none: this.none };
  }
}

/**
 * Reads the rover once, with the reference as far as each rover epoch needs, and prepares every epoch
 * into the records (file comment, step 1). A class, not closures of solveCarrierSession: the engine's
 * optimised code of its methods serves every session of the process, where that of per-session closures
 * was thrown away with the session (and compiled again for the next).
 */
class RoverReader {
  readonly rec: EpochRecords;
  /** Signal table: a satellite's primary-band signal (group: its constellation) and each further-band signal pair (group: further-bands.ts) is one entry of the records. */
  readonly satellites: SatelliteInfo[] = [];
  private readonly satIndex = new Map<string, number>();
  /** Per primary-band entry of the signal table, the entries of its further-band signal pairs (furtherIndexOf). */
  private readonly furtherEntries: { readonly band: string; readonly code: string; readonly refCode: string; readonly entry: number }[][] = [];
  /** Contexts of the records (EpochRecords.context): one per occupation or event, not per epoch. */
  readonly contexts: EpochContext[] = [];
  /** Why epochs cannot be solved: the records keep an index into this table (EpochRecords.reason). */
  readonly reasons: string[] = [''];
  // The trackers of arcs: the primary band's at each receiver, and per band digit of the further bands
  // (each band's own slip tests).
  readonly refTracker = new ArcTracker(30);
  readonly roverTracker = new ArcTracker(30);
  readonly refBandTrackers = new Map<string, ArcTracker>();
  readonly roverBandTrackers = new Map<string, ArcTracker>();
  /** Span of the reference epochs read, and how many could be positioned (for the sentence when none is in reach). */
  readonly refSeen = { firstGpsS: NaN, lastGpsS: NaN, positioned: 0 };
  readonly roverSeen = { firstGpsS: NaN, lastGpsS: NaN, positioned: 0 };
  /** The rover's antenna and point name as last set (by the header, the user or an event). */
  roverAntenna: AntennaOffset;
  pointName: string;
  maxBaselineM = 0;
  geometryFreeSlips = 0;
  timeDifferencedSlips = 0;
  /** Of those, the jumps by an odd number of half cycles (restartTimeDifferencedSlips). */
  halfCycleSlips = 0;
  /** Epochs whose time differences the test left unexplained: every arc tested restarted (restartSlipped). */
  unexplainedEpochs = 0;
  epochsWithReference = 0;

  private readonly maskRad: number;
  // The options used per epoch, read once.
  private readonly dynamics: CarrierOptions['dynamics'];
  private readonly maxReferenceAgeS: number;
  private readonly phaseAM: number;
  private readonly phaseBM: number;
  private readonly refArp: EcefM;
  private readonly refGeo: GeodeticRad;
  private readonly refCal: AntennaCalibration | null;
  private readonly roverCal: AntennaCalibration | null;
  private readonly roverAntennaGiven: boolean;
  // Reference feed.
  private readonly refBuffer: ReferencePhaseBuffer;
  private refDone = false;
  private refClockM = NaN;
  private pendingEvent: EpochContext['event'] = null;
  private occupied = false;
  /** The rover's linearisation point (the last code fix) and clock. */
  private x0: EcefM;
  private roverClockM = NaN;
  /**
   * Single-difference arc per record entry (signal table index): a new one whenever either receiver's arc
   * changes, or the geometry-free test across bands finds a slip on the satellite (its count in `gfSlips`).
   */
  private readonly sdArcs = new Map<number, { r: number; b: number; g: number; id: number; half: boolean }>();
  private readonly gfSlips = new Map<SatId, number>();
  /** Per satellite with further bands, the arcs of every band at both receivers at its last epoch. */
  private readonly receiverArcs = new Map<SatId, number[]>();
  private readonly geometryFree = new GeometryFreeMonitor(30);
  private nextArc = 1;
  /** The last record with satellites (the time-differenced slip test's previous epoch). */
  private previousRecord = -1;
  /** Times of the reference epochs the current record's and the previous record's values come from (AlignedReference). */
  private refFromGpsS = NaN;
  private refToGpsS = NaN;
  private previousRefFromGpsS = NaN;
  private previousRefToGpsS = NaN;
  /** The reference's phase values (m, reduced: reference-phase.ts) of the current and the previous record's entries, by signal table entry. */
  private refPhaseM = new Map<number, number>();
  private previousRefPhaseM = new Map<number, number>();
  private firstEvent: 'start-moving' | 'new-occupation' | null = null;
  private firstMovingRecord = 0;

  constructor(s: ReaderSetup) {
    this.maskRad = s.maskRad;
    this.dynamics = s.carrier.dynamics;
    this.maxReferenceAgeS = s.carrier.maxReferenceAgeS;
    this.phaseAM = s.carrier.phaseAM;
    this.phaseBM = s.carrier.phaseBM;
    this.refArp = s.refArp;
    this.refGeo = s.refGeo;
    this.refCal = s.refCal;
    this.roverCal = s.roverCal;
    this.roverAntennaGiven = s.roverAntennaGiven;
    this.refBuffer = new ReferencePhaseBuffer(s.carrier.maxReferenceAgeS, s.refIntervalS);
    this.rec = new EpochRecords(s.recordStore);
    this.roverAntenna = s.roverAntenna;
    this.pointName = s.pointName;
    this.x0 = s.x0;
    keepShape(this);
  }

  /**
   * Reads the rover's epochs into the records, with their contexts (occupations and events). The feed is
   * handed from method to method, not kept: the reader is kept beyond its session (kept-shapes.ts), and
   * the ephemerides of a day can take tens of megabytes.
   */
  async read(epochs: AsyncIterable<ObsEpoch>, feed: ReaderFeed): Promise<void> {
    const rec = this.rec, contexts = this.contexts;
    for await (const e of epochs) {
      if (e.event) {
        const ev = e.event;
        if (ev.kind === 'new-occupation') { this.pointName = (ev.markerName ?? '').trim() || this.pointName; this.pendingEvent = 'new-occupation'; this.occupied = true; }
        if (ev.kind === 'start-moving') {
          this.pointName = ''; this.pendingEvent = 'start-moving'; this.occupied = false;
          // RINEX 3.05 6.4: the antenna starts moving at flag 2, so it stood still before the first one.
          if (this.firstEvent === null) { this.firstEvent = 'start-moving'; this.firstMovingRecord = rec.count; }
        }
        if (ev.kind === 'new-occupation' && this.firstEvent === null) this.firstEvent = 'new-occupation';
        if (ev.antennaOffset && !this.roverAntennaGiven) this.roverAntenna = ev.antennaOffset;
      }
      if (e.flag !== 0 && e.flag !== 1) continue;
      if (e.sats.length === 0) continue;
      // Consecutive epochs share their context (one object per occupation or event, not per epoch).
      const last = contexts[contexts.length - 1];
      const same = last !== undefined && last.pointName === this.pointName && last.event === this.pendingEvent && last.antenna === this.roverAntenna;
      if (!same) contexts.push({ pointName: this.pointName, event: this.pendingEvent, antenna: this.roverAntenna });
      const context = contexts.length - 1;
      this.pendingEvent = null;
      const isStatic = this.dynamics === 'static' || (this.dynamics === 'auto' && this.occupied);
      const reason = await this.prepareRoverEpoch(e, isStatic, context, feed);
      if (reason) {
        const reasons = this.reasons;
        let r = reasons.indexOf(reason);
        if (r < 0) { r = reasons.length; reasons.push(reason); }
        // A few fixed sentences (prepareRoverEpoch).
        if (r > 255) throw new Error('more than 255 reasons for unsolved epochs');
        rec.reason[rec.indexOf(rec.count - 1)] = r;
      }
    }
    if (this.dynamics === 'auto' && this.firstEvent === 'start-moving') rec.staticBefore(this.firstMovingRecord);
  }

  /** The signal table's entry of a satellite's signal (added when new): the primary band's, or a further band's (`further`). */
  private indexOf(sat: SatId, wavelengthM: number, code: string, further: { group: string; primaryWavelengthM: number } | null): number {
    const key = further ? `${sat}/${further.group}` : sat;
    let i = this.satIndex.get(key);
    if (i === undefined) {
      const system = satSystem(sat);
      i = this.satellites.length;
      this.satellites.push({ id: sat, system, wavelengthM, group: further ? further.group : system, primary: further === null, code, phaseCode: 'L' + code.slice(1), ionoFactor: further ? ionosphereFactor(wavelengthM, further.primaryWavelengthM) : 1 });
      this.satIndex.set(key, i);
    }
    return i;
  }

  /**
   * The signal table's entry of a further band's signal pair (rover signal m, reference code) of the
   * satellite s whose primary band is entry `primary`: indexOf's, found once per pair (no key strings per
   * satellite and epoch).
   */
  private furtherIndexOf(primary: number, s: ReceiverSat, m: ReceiverSignal, refCode: string): number {
    let list = this.furtherEntries[primary];
    if (!list) this.furtherEntries[primary] = list = [];
    for (const f of list) if (f.band === m.band && f.code === m.code && f.refCode === refCode) return f.entry;
    const entry = this.indexOf(s.sat, m.wavelengthM, m.code, { group: furtherBandGroup(s.system, m.band, m.code, refCode), primaryWavelengthM: s.wavelengthM });
    list.push({ band: m.band, code: m.code, refCode, entry });
    return entry;
  }

  /** Arcs of the further-band signals of an epoch, per band. */
  private furtherArcs(trackers: Map<string, ArcTracker>, ep: ReceiverEpoch): Map<string, BandArcs> {
    const byBand = new Map<string, ArcInput[]>();
    for (const s of ep.sats) {
      for (const m of s.more) {
        let l = byBand.get(m.band);
        if (!l) byBand.set(m.band, (l = []));
        l.push({ sat: s.sat, phaseCycles: m.phaseCycles, codeM: m.codeM, dopplerHz: m.dopplerHz, lli: m.lli, wavelengthM: m.wavelengthM });
      }
    }
    const out = new Map<string, BandArcs>();
    for (const [band, list] of byBand) {
      let tr = trackers.get(band);
      if (!tr) trackers.set(band, (tr = new ArcTracker(30)));
      const t = tr;
      out.set(band, { arcs: t.update(ep.timeGpsS, list, null), halfCycle: (sat) => t.halfCycleUnresolved(sat) });
    }
    return out;
  }

  /** Reads reference epochs into the buffer until one is later than the given time (or the files end). */
  private async pullReference(untilGpsS: number, feed: ReaderFeed): Promise<void> {
    const refBuffer = this.refBuffer, refSeen = this.refSeen, refTracker = this.refTracker;
    while (!this.refDone && refBuffer.latestTimeGpsS <= untilGpsS) {
      const r = await feed.references.next();
      if (r.done) { this.refDone = true; break; }
      const e = r.value.epoch;
      if (e.flag > 1 || e.sats.length === 0) continue;
      if (Number.isNaN(refSeen.firstGpsS)) refSeen.firstGpsS = e.tagGpsS;
      refSeen.lastGpsS = e.tagGpsS;
      const ep = prepareReceiverEpoch(e, feed.ctx, this.refArp, this.refClockM);
      if (!Number.isFinite(ep.clockM)) continue;
      refSeen.positioned++;
      this.refClockM = ep.clockM;
      if (this.refCal) applyAntenna(ep, this.refArp, this.refGeo, this.refCal);
      const arcs = refTracker.update(ep.timeGpsS, ep.sats, ep.listed);
      refBuffer.add(reduceReferenceEpoch(ep, this.refArp, this.refGeo, arcs, (sat) => refTracker.halfCycleUnresolved(sat), refTracker.codeClockStepsM, this.furtherArcs(this.refBandTrackers, ep)));
    }
  }

  /**
   * The single-difference arc of a record entry for the receivers' arcs and the satellite's geometry-free
   * slips (sdArcs). A new one starts with an integer ambiguity (`half` false): a receiver that may be half a
   * cycle off says so with its half-cycle bit.
   */
  private sdArcOf(entry: number, rArc: number, bArc: number, sat: SatId): number {
    const g = this.gfSlips.get(sat) ?? 0;
    const prev = this.sdArcs.get(entry);
    if (prev && prev.r === rArc && prev.b === bArc && prev.g === g) return prev.id;
    const id = this.nextArc++;
    this.sdArcs.set(entry, { r: rArc, b: bArc, g, id, half: false });
    return id;
  }

  /**
   * Prepares one rover epoch into the records; returns why it cannot be solved ('' when it can). In steps
   * of their own (each optimised on its own: a branch met late has only its step compiled again).
   */
  private async prepareRoverEpoch(e: ObsEpoch, isStatic: boolean, context: number, feed: ReaderFeed): Promise<string> {
    const rec = this.rec, roverSeen = this.roverSeen, roverTracker = this.roverTracker;
    if (Number.isNaN(roverSeen.firstGpsS)) roverSeen.firstGpsS = e.tagGpsS;
    roverSeen.lastGpsS = e.tagGpsS;
    const ep = prepareReceiverEpoch(e, feed.ctx, this.x0, this.roverClockM);
    if (!Number.isFinite(ep.clockM)) { rec.beginEpoch(e.tagGpsS, e.tagGpsS, this.x0, isStatic, NaN, context); return 'no usable satellite'; }
    this.roverClockM = ep.clockM;
    roverSeen.positioned++;
    const t = ep.timeGpsS;
    if (this.roverCal) applyAntenna(ep, this.x0, ecefToGeodetic(this.x0), this.roverCal);
    const arcs = roverTracker.update(t, ep.sats, ep.listed);
    const roverFurther = this.furtherArcs(this.roverBandTrackers, ep);
    await this.pullReference(t, feed);
    this.refBuffer.prune(t);
    const al = this.refBuffer.align(t, ep.sats.some((s) => s.more.length > 0));
    if (!al) {
      rec.beginEpoch(t, e.tagGpsS, this.x0, isStatic, NaN, context);
      // Past the reference's last epoch (its files read to the end) or before its first: said so (reference-phase.ts).
      if (this.refDone && t > this.refSeen.lastGpsS) return 'after the reference\'s last epoch';
      if (!(t >= this.refSeen.firstGpsS)) return 'before the reference\'s first epoch';
      return `no reference epoch within ${this.maxReferenceAgeS} s`;
    }
    this.epochsWithReference++;
    const both = commonSatellites(ep, al);
    const doy = dayOfYear(t);
    const fix = codeFixPosition(codeRows(both), this.x0, this.maskRad, doy);
    if (fix) this.x0 = fix;
    const x0 = this.x0;
    const k = rec.beginEpoch(t, e.tagGpsS, x0, isStatic, al.ageS, context);
    this.refFromGpsS = al.fromGpsS; this.refToGpsS = al.toGpsS;
    const refArp = this.refArp;
    this.maxBaselineM = Math.max(this.maxBaselineM, Math.hypot(x0.x - refArp.x, x0.y - refArp.y, x0.z - refArp.z));
    this.testGeometryFree(t, both, arcs, roverFurther);
    this.restartWithOtherBands(both, arcs, roverFurther);
    this.addEntries(k, both, arcs, roverFurther, x0, doy);
    this.restartTimeDifferencedSlips(k);
    if (!isStatic) this.setVelocity(e, k, x0, feed.ctx);
    return rec.satCount[rec.indexOf(k)] === 0 ? 'no satellite common to rover and reference' : '';
  }

  /**
   * The geometry-free test on the single differences (geometry-free.ts): the primary band against the
   * first further band both receivers have, within the arcs of both bands at both receivers.
   */
  private testGeometryFree(t: number, both: readonly CommonSat[], arcs: ReadonlyMap<SatId, number>, roverFurther: ReadonlyMap<string, BandArcs>): void {
    const gfSlips = this.gfSlips;
    const gfItems: { key: string; gfM: number; sat: SatId }[] = [];
    for (const { s, ra } of both) {
      const rArc = arcs.get(s.sat) ?? 0;
      if (s.more.length === 0 || !ra.more?.length || !(rArc > 0 && ra.arc > 0 && Number.isFinite(ra.phaseM))) continue;
      for (const m of s.more) {
        const rm = ra.more.find((q) => q.band === m.band);
        const mArc = roverFurther.get(m.band)?.arcs.get(s.sat) ?? 0;
        if (!rm || !(mArc > 0 && rm.arc > 0 && Number.isFinite(rm.phaseM))) continue;
        // The receivers' modelled ranges are the same on both bands: they cancel.
        const gfM = s.phaseCycles * s.wavelengthM - m.phaseCycles * m.wavelengthM - (ra.phaseM - rm.phaseM);
        gfItems.push({ key: `${s.sat}${m.band}:${rArc}:${ra.arc}:${mArc}:${rm.arc}`, gfM, sat: s.sat });
        break;
      }
    }
    if (gfItems.length) {
      const jumped = this.geometryFree.update(t, gfItems);
      for (const it of gfItems) if (jumped.has(it.key)) { gfSlips.set(it.sat, (gfSlips.get(it.sat) ?? 0) + 1); this.geometryFreeSlips++; }
    }
  }

  /**
   * A slip found on one band at either receiver (an arc followed by another, not a blank) restarts every
   * band of the satellite: tracking loops of one satellite share their carrier, so a slip on one band
   * often comes with a smaller one on another that its own tests miss (common practice).
   */
  private restartWithOtherBands(both: readonly CommonSat[], arcs: ReadonlyMap<SatId, number>, roverFurther: ReadonlyMap<string, BandArcs>): void {
    const receiverArcs = this.receiverArcs, gfSlips = this.gfSlips;
    for (const { s, ra } of both) {
      if (s.more.length === 0) continue;
      const now = [arcs.get(s.sat) ?? 0, ra.arc];
      for (const m of s.more) {
        const rm = ra.more?.find((q) => q.band === m.band);
        now.push(roverFurther.get(m.band)?.arcs.get(s.sat) ?? 0, rm?.arc ?? 0);
      }
      const before = receiverArcs.get(s.sat);
      receiverArcs.set(s.sat, now);
      if (before && before.length === now.length && now.some((a, i) => a > 0 && before[i] > 0 && a !== before[i]) && now.some((a, i) => a > 0 && a === before[i])) gfSlips.set(s.sat, (gfSlips.get(s.sat) ?? 0) + 1);
    }
  }

  /** The record entries of epoch k: per common satellite its primary band and its further bands, at the linearisation point x0. */
  private addEntries(k: number, both: readonly CommonSat[], arcs: ReadonlyMap<SatId, number>, roverFurther: ReadonlyMap<string, BandArcs>, x0: EcefM, doy: number): void {
    const rec = this.rec, roverTracker = this.roverTracker, refPhaseM = this.refPhaseM;
    const g0 = ecefToGeodetic(x0);
    refPhaseM.clear();
    for (const { s, ra } of both) {
      const dx = s.posM.x - x0.x, dy = s.posM.y - x0.y, dz = s.posM.z - x0.z;
      const rho = Math.sqrt(dx * dx + dy * dy + dz * dz);
      const ae = azimuthElevation(x0, s.posM, g0.latRad, g0.lonRad);
      if (ae.elevationRad < 0) continue;
      const model = rho - s.satClockM + troposphereDelayM(g0, ae.elevationRad, doy);
      const rArc = arcs.get(s.sat) ?? 0;
      const withPhase = rArc > 0 && ra.arc > 0 && Number.isFinite(ra.phaseM);
      const entry = this.indexOf(s.sat, s.wavelengthM, s.code, null);
      const arc = withPhase ? this.sdArcOf(entry, rArc, ra.arc, s.sat) : 0;
      if (withPhase) refPhaseM.set(entry, ra.phaseM);
      const half = roverTracker.halfCycleUnresolved(s.sat) || ra.halfCycle || this.halfCycleOff(entry, arc);
      const el = Math.min(ae.elevationRad, ra.elevationRad);
      rec.addSatellite(k, entry, arc,
        withPhase ? s.phaseCycles * s.wavelengthM + roverTracker.codeClockStepsM - model - ra.phaseM : NaN,
        Number.isFinite(s.codeM) ? s.codeM - model - ra.codeM : NaN,
        dx / rho, dy / rho, dz / rho, el, !half);
      // Further bands recorded at both receivers: entries of their own (own arcs, own group clocks).
      for (const m of s.more) {
        const rm = ra.more?.find((q) => q.band === m.band);
        if (!rm) continue;
        const b = roverFurther.get(m.band);
        const mArc = b?.arcs.get(s.sat) ?? 0;
        const mPhase = mArc > 0 && rm.arc > 0 && Number.isFinite(rm.phaseM);
        const mEntry = this.furtherIndexOf(entry, s, m, rm.code);
        const mSdArc = mPhase ? this.sdArcOf(mEntry, mArc, rm.arc, s.sat) : 0;
        if (mPhase) refPhaseM.set(mEntry, rm.phaseM);
        rec.addSatellite(k, mEntry, mSdArc,
          mPhase ? m.phaseCycles * m.wavelengthM + roverTracker.codeClockStepsM - model - rm.phaseM : NaN,
          Number.isFinite(m.codeM) ? m.codeM - model - rm.codeM : NaN,
          dx / rho, dy / rho, dz / rho, el, !((b?.halfCycle(s.sat) ?? false) || rm.halfCycle || this.halfCycleOff(mEntry, mSdArc)));
      }
    }
  }

  /** Whether the single-difference arc `arc` of a record entry is half a cycle off (restartTimeDifferencedSlips). */
  private halfCycleOff(entry: number, arc: number): boolean {
    const s = this.sdArcs.get(entry);
    return arc > 0 && s !== undefined && s.id === arc && s.half;
  }

  /** The rover's Doppler velocity at epoch k (a moving epoch), when it can be found. */
  private setVelocity(e: ObsEpoch, k: number, x0: EcefM, ctx: ReceiverContext): void {
    const v = dopplerVelocity(e, x0, ctx.store, { systems: ctx.systems, elevationMaskRad: this.maskRad, glonassChannels: ctx.glonassChannels });
    if (v) {
      const sig = Math.max(v.sigmaEnuMS.e, v.sigmaEnuMS.n, v.sigmaEnuMS.u);
      this.rec.setVelocity(k, v.velocityEcefMS.x, v.velocityEcefMS.y, v.velocityEcefMS.z, Number.isFinite(sig) ? sig : 0.1);
    }
  }

  /**
   * The time-differenced test (time-differenced-slips.ts) of an epoch's phase single differences against the
   * previous epoch's of the same arcs: a slipped one starts a new arc, with every band of its satellite.
   * A jump by an odd number of half cycles (the estimate rounded to the nearest half cycle) turns the
   * slipped signal's ambiguity half-integer, or back: its arcs are not fixed while it is half a cycle off,
   * as those of a receiver's half-cycle bit (arc-tracker.ts). A half-integer ambiguity fixed to an integer
   * would put its double differences 0.5 cycle (9.5 cm on L1) off and the fixed position with them.
   *
   * Where the two epochs' reference values come from different reference epochs, one of them held across a
   * gap in its logging (reference-phase.ts), their difference holds the change over the gap of the errors a reference
   * epoch carries (orbits, satellite clocks, atmosphere: 0.25 to 0.35 cycle on the real static run at such
   * switches after gaps of 14 to 24 s, on GLONASS most), which the test's noise model does not hold. The
   * rover's own phase (the single differences with the reference's values added back: the same model
   * without the reference, one receiver's noise) carries instead the change of those errors over the rover's
   * interval: where that is the shorter time (a rover logging every second), it is tested first, with the
   * quarter-cycle floor; then the single differences left, for the reference's slips over its gap, with a
   * floor of half a cycle (SLIP_MIN_CYCLES_REFERENCE_SWITCH). (The rover's phase alone over a rover gap of
   * 24 s, against a reference interpolated, showed jumps of 0.4 to 0.7 cycle on GLONASS: the same errors.)
   */
  private restartTimeDifferencedSlips(k: number): void {
    const rec = this.rec;
    const p = this.previousRecord;
    const e = rec.indexOf(k);
    if (rec.satCount[e] === 0) return;
    this.previousRecord = k;
    const prevFrom = this.previousRefFromGpsS, prevTo = this.previousRefToGpsS, from = this.refFromGpsS, to = this.refToGpsS;
    this.previousRefFromGpsS = from; this.previousRefToGpsS = to;
    const refNow = this.refPhaseM, refBefore = this.previousRefPhaseM;
    this.previousRefPhaseM = refNow; this.refPhaseM = refBefore;
    if (p < 0) return;
    // The previous epoch with satellites is still in the chunk being recorded (EpochRecords.beginEpoch).
    const q = rec.indexOf(p);
    if (!(rec.timeGpsS[e] - rec.timeGpsS[q] <= 30)) return;
    // Values interpolated at both epochs (one line through the reference's epochs, which runs on across
    // them) or from a common reference epoch: the reference's errors change smoothly between the two epochs.
    const interpolatedBoth = from !== to && prevFrom !== prevTo;
    const sharedReference = interpolatedBoth || from === prevFrom || from === prevTo || to === prevFrom || to === prevTo;
    if (sharedReference) { this.restartSlipped(e, q, null, SLIP_MIN_CYCLES); return; }
    // Time over which the satellites' orbit and clock errors change unmodelled: the rover's interval for its
    // phase alone; for the single differences, the change of the reference's offset from the rover's time
    // (0 where interpolated, the age where held).
    const offset = (t: number, a: number, b: number) => (a === b ? t - a : 0);
    const roverSpanS = rec.timeGpsS[e] - rec.timeGpsS[q];
    const differenceSpanS = Math.abs(offset(rec.timeGpsS[e], from, to) - offset(rec.timeGpsS[q], prevFrom, prevTo));
    if (roverSpanS < differenceSpanS) this.restartSlipped(e, q, { now: refNow, before: refBefore }, SLIP_MIN_CYCLES);
    this.restartSlipped(e, q, null, SLIP_MIN_CYCLES_REFERENCE_SWITCH);
  }

  /**
   * One run of the time-differenced test between records e and q (restartTimeDifferencedSlips), on the
   * single differences, or with `roverAlone` on the rover's phase (the reference's values of both epochs
   * added back), with the floor `minCycles`; restarts the arcs of the slipped signals' satellites.
   */
  private restartSlipped(e: number, q: number, roverAlone: { now: ReadonlyMap<number, number>; before: ReadonlyMap<number, number> } | null, minCycles: number): void {
    const rec = this.rec, satellites = this.satellites;
    const before = new Map<number, number>();
    for (let i = rec.satStart[q]; i < rec.satStart[q] + rec.satCount[q]; i++) if (rec.arc[i] > 0) before.set(rec.sat[i], i);
    // The previous epoch's single difference carried to this epoch's linearisation point:
    // + u_prev . (x0_k - x0_prev) (epoch-records.ts: sd = -u . (x - x0) + ...).
    const ddx = rec.x0[3 * e] - rec.x0[3 * q], ddy = rec.x0[3 * e + 1] - rec.x0[3 * q + 1], ddz = rec.x0[3 * e + 2] - rec.x0[3 * q + 2];
    const js: number[] = [];
    const obs: TimeDifferencedPhase[] = [];
    for (let j = rec.satStart[e]; j < rec.satStart[e] + rec.satCount[e]; j++) {
      const i = before.get(rec.sat[j]);
      if (i === undefined || rec.arc[j] <= 0 || rec.arc[i] !== rec.arc[j] || rec.elevationRad[j] < this.maskRad || !Number.isFinite(rec.phaseM[j]) || !Number.isFinite(rec.phaseM[i])) continue;
      // The reference's change between its epochs used, added back (rover alone): sd = rover - z.
      const referenceChangeM = roverAlone ? (roverAlone.now.get(rec.sat[j]) ?? NaN) - (roverAlone.before.get(rec.sat[j]) ?? NaN) : 0;
      if (!Number.isFinite(referenceChangeM)) continue;
      const info = satellites[rec.sat[j]];
      const carriedM = rec.phaseM[i] + rec.los[3 * i] * ddx + rec.los[3 * i + 1] * ddy + rec.los[3 * i + 2] * ddz;
      // Two epochs of the single difference (two receivers), or of the rover alone.
      const epochsOfReceivers = roverAlone ? 1 : 2;
      js.push(j);
      obs.push({
        changeM: rec.phaseM[j] - carriedM + referenceChangeM, ux: rec.los[3 * j], uy: rec.los[3 * j + 1], uz: rec.los[3 * j + 2], group: info.group,
        varianceM2: epochsOfReceivers * singleDifferenceVarianceM2(this.phaseAM, this.phaseBM, rec.elevationRad[j]), wavelengthM: info.wavelengthM,
      });
    }
    const jumpsM: number[] = [];
    const verdict = { unexplained: false };
    const slipped = findTimeDifferencedSlips(obs, jumpsM, minCycles, verdict);
    for (let n = 0; n < slipped.length; n++) {
      this.timeDifferencedSlips++;
      const tested = rec.sat[js[slipped[n]]];
      const oddHalf = Math.round(2 * jumpsM[n] / satellites[tested].wavelengthM) % 2 !== 0;
      if (oddHalf) this.halfCycleSlips++;
      this.restartSatellite(e, satellites[tested].id, oddHalf ? tested : -1);
    }
    // Left unexplained (time-differenced-slips.ts: several slips at once can hide one another), where the
    // noise model holds: no arc tested can be vouched for.
    if (verdict.unexplained && minCycles === SLIP_MIN_CYCLES) {
      this.unexplainedEpochs++;
      const restarted = new Set<SatId>();
      for (const j of js) {
        const sat = satellites[rec.sat[j]].id;
        if (rec.arc[j] > 0 && !restarted.has(sat)) { restarted.add(sat); this.restartSatellite(e, sat, -1); }
      }
    }
  }

  /**
   * New arcs for every band of a satellite at record e; `halfEntry`: the signal table entry whose jump was
   * an odd number of half cycles (its half-cycle state turns over), -1 for none.
   */
  private restartSatellite(e: number, sat: SatId, halfEntry: number): void {
    const rec = this.rec, satellites = this.satellites;
    for (let j = rec.satStart[e]; j < rec.satStart[e] + rec.satCount[e]; j++) {
      if (rec.arc[j] <= 0 || satellites[rec.sat[j]].id !== sat) continue;
      const id = this.nextArc++;
      rec.arc[j] = id;
      const s = this.sdArcs.get(rec.sat[j]);
      if (!s) continue;
      s.id = id;
      if (rec.sat[j] === halfEntry) s.half = !s.half;
      if (s.half) rec.fixable[j] = 0;
    }
  }
}

/** A satellite of a rover epoch with the reference's values carried to the epoch. */
interface CommonSat {
  readonly s: ReceiverSat;
  readonly ra: AlignedReferenceSat;
}

/**
 * The rover epoch's satellites the reference has, each placed anew from the reference's broadcast issue
 * when the rover's differs (the same issue at both ends, so the satellite clock cancels exactly).
 */
function commonSatellites(ep: ReceiverEpoch, al: AlignedReference): CommonSat[] {
  const both: CommonSat[] = [];
  for (const s of ep.sats) {
    const ra = al.sats.get(s.sat);
    if (!ra) continue;
    if (ra.eph !== s.eph) { s.eph = ra.eph; placeSatellite(s, ep.tagGpsS, ep.clockM); }
    both.push({ s, ra });
  }
  return both;
}

/**
 * The code differences for the linearisation point (code-fix.ts), in an array built by push (an array from
 * map could come in another shape, and the optimised code of codeFixPosition was thrown away for it).
 */
function codeRows(both: readonly CommonSat[]): CodeRow[] {
  const rows: CodeRow[] = [];
  for (const { s, ra } of both) rows.push({ system: s.system, satM: s.posM, satClockM: s.satClockM, codeM: s.codeM - ra.codeM });
  return rows;
}

/** Phase-centre offset and variation turned into a correction of the phase (cycles) to the antenna reference point. */
function applyAntenna(ep: ReceiverEpoch, at: EcefM, g: GeodeticRad, cal: AntennaCalibration): void {
  for (const s of ep.sats) {
    if (!Number.isFinite(s.phaseCycles)) continue;
    const ae = azimuthElevation(at, s.posM, g.latRad, g.lonRad);
    const c = antennaCorrectionM(cal, s.system, s.code[1], ae.elevationRad, ae.azimuthRad);
    // The phase centre is nearer the satellite by the correction: add it back to refer to the ARP.
    (s as { phaseCycles: number }).phaseCycles += c / s.wavelengthM;
    // Each further band with its own calibration (ANTEX frequency of the same band).
    for (const m of s.more) {
      if (Number.isFinite(m.phaseCycles)) (m as { phaseCycles: number }).phaseCycles += antennaCorrectionM(cal, s.system, m.band, ae.elevationRad, ae.azimuthRad) / m.wavelengthM;
    }
  }
}

/** The forward pass's consumer: counts its kinds and keeps its results for the backward pass (pass-results.ts). */
class ForwardConsumer implements EpochConsumer {
  readonly shares = new Shares();

  constructor(private readonly results: PassResults) {
    keepShape(this);
  }

  epoch(k: number, r: EpochResult): void {
    this.shares.count(r.kind);
    this.results.putForward(k, r);
  }
}

/**
 * The backward pass's consumer: combines each epoch with the forward pass's result (combine-passes.ts),
 * counts the kinds, and keeps the antenna-to-antenna distance of each solved epoch (their median goes into
 * the summary).
 */
class BackwardConsumer implements EpochConsumer {
  readonly shares = new Shares();
  readonly combinedShares = new Shares();
  /** Epochs float in the combination where a pass found its tracking disturbed (float-causes.ts CAUSE_DISTURBED). */
  disturbedFloat = 0;
  private lengths: Float64Array;
  private solvedCount = 0;

  constructor(private readonly rec: EpochRecords, private readonly results: PassResults, private readonly agreementM: number, private readonly refArp: EcefM) {
    this.lengths = new Float64Array(rec.count);
    keepShape(this);
  }

  epoch(k: number, r: EpochResult): void {
    const rec = this.rec, results = this.results, refArp = this.refArp;
    this.shares.count(r.kind);
    const i = results.at(k, 'combine');
    const e = rec.indexOf(k);
    combineEpoch(results, i, rec.satStart[e], rec.satCount[e], r, this.agreementM);
    this.combinedShares.count(results.kind[i]);
    if (results.kind[i] === 1 && (results.forwardCause[i] === CAUSE_DISTURBED || results.backwardCause[i] === CAUSE_DISTURBED)) this.disturbedFloat++;
    if (results.kind[i] !== 0) this.lengths[this.solvedCount++] = Math.hypot(results.position[3 * i] - refArp.x, results.position[3 * i + 1] - refArp.y, results.position[3 * i + 2] - refArp.z);
  }

  /** Median antenna-to-antenna distance of the solved epochs (m); NaN when none was solved. Called once: the distances are released. */
  medianLengthM(): number {
    const n = this.solvedCount;
    const solvedLengths = this.lengths.subarray(0, n).sort();
    const median = n ? solvedLengths[n >> 1] : NaN;
    this.lengths = new Float64Array(0);
    return median;
  }
}

/** What a SolutionWriter is given. */
interface WriterSetup {
  readonly rec: EpochRecords;
  readonly results: PassResults;
  readonly satellites: readonly SatelliteInfo[];
  readonly contexts: readonly EpochContext[];
  readonly reasons: readonly string[];
  /** The context of records without one (the rover's point and antenna as last set). */
  readonly lastContext: EpochContext;
  readonly maskRad: number;
  readonly carrier: CarrierOptions;
  readonly codeScale: number;
  readonly reduceToMark: boolean;
  readonly refMark: EcefM;
  readonly refArp: EcefM;
  readonly frame: FrameEpoch;
  /** The levels of the code epochs' global test, given to the carrier epochs' test (SolutionWriter.quality). */
  readonly quality: SessionOptions['quality'];
}

/** Turns the combined results of the records into the epochs' solutions, one at a time (file comment, step 3). */
class SolutionWriter {
  private readonly rec: EpochRecords;
  private readonly results: PassResults;
  private readonly satellites: readonly SatelliteInfo[];
  private readonly contexts: readonly EpochContext[];
  private readonly reasons: readonly string[];
  private readonly lastContext: EpochContext;
  private readonly maskRad: number;
  private readonly phaseAM: number;
  private readonly phaseBM: number;
  private readonly codeAM: number;
  private readonly codeBM: number;
  private readonly codeScale: number;
  private readonly reduceToMark: boolean;
  private readonly refMark: EcefM;
  private readonly refArp: EcefM;
  private readonly frame: FrameEpoch;
  /** The reference mark's geodetic coordinates: ENU axes of the look angles, DOPs and baselines. */
  private readonly gRef: GeodeticRad;
  private readonly alphaGlobal: number;
  private readonly alphaLocal: number;
  private readonly bMethod: boolean;
  /** Critical values of the epochs' test by degrees of freedom (NaN: not computed yet). */
  private critical = new Float64Array(0);
  /** The options the words of the float causes quote (float-causes.ts). */
  private readonly limits: CauseLimits;
  /** Satellites left out of the epochs written so far, per reason (rejections()). */
  private belowMaskCount = 0;
  private unsolvedCount = 0;

  constructor(s: WriterSetup) {
    this.rec = s.rec;
    this.results = s.results;
    this.satellites = s.satellites;
    this.contexts = s.contexts;
    this.reasons = s.reasons;
    this.lastContext = s.lastContext;
    this.maskRad = s.maskRad;
    this.phaseAM = s.carrier.phaseAM; this.phaseBM = s.carrier.phaseBM;
    this.codeAM = s.carrier.codeAM; this.codeBM = s.carrier.codeBM;
    this.codeScale = s.codeScale;
    this.reduceToMark = s.reduceToMark;
    this.refMark = s.refMark;
    this.refArp = s.refArp;
    this.frame = s.frame;
    this.gRef = ecefToGeodetic(s.refMark);
    this.alphaGlobal = s.quality.alphaGlobal;
    this.alphaLocal = s.quality.alphaLocal;
    this.bMethod = s.quality.testLevels === 'b-method';
    this.limits = { ratioThreshold: s.carrier.ratioThreshold, minSuccessRate: s.carrier.minSuccessRate };
    keepShape(this);
  }

  /**
   * The epoch's test from the filter's innovations (EpochResult.chiSquare): chi-square, its degrees of
   * freedom, the variance factor chi-square / dof, and the critical value at the level of the code epochs'
   * global test (Baarda's B-method from the w-test's level for these degrees of freedom, or the global level
   * as set: session options, quality). Null without a solution.
   */
  private quality(i: number, solved: boolean): QualityTest | null {
    if (!solved) return null;
    const chiSquare = this.results.chiSquare[i], dof = this.results.dof[i];
    const critical = this.criticalValue(dof);
    return { varianceFactor: dof > 0 ? chiSquare / dof : NaN, chiSquare, dof, critical, passed: dof > 0 ? chiSquare <= critical : null };
  }

  /** The chi-square quantile for `dof` degrees of freedom at the global test's level (NaN for none), kept per dof. */
  private criticalValue(dof: number): number {
    if (!(dof > 0)) return NaN;
    if (this.critical.length <= dof) {
      const grown = new Float64Array(Math.max(2 * dof, 64)).fill(NaN);
      grown.set(this.critical);
      this.critical = grown;
    }
    let c = this.critical[dof];
    if (Number.isNaN(c)) {
      const alpha = this.bMethod ? bMethodGlobalAlpha(this.alphaLocal, dof) : this.alphaGlobal;
      c = this.critical[dof] = chiSquareQuantile(1 - alpha, dof);
    }
    return c;
  }

  /** Why the combined result i is float (float-causes.ts), from the two passes' kinds and causes. */
  private floatReason(i: number): string {
    const r = this.results;
    return combinedFloatReason([r.forwardKind[i], r.backwardKind[i]], [r.forwardCause[i], r.backwardCause[i]],
      [r.forwardCauseA[i], r.backwardCauseA[i]], [r.forwardCauseB[i], r.backwardCauseB[i]], this.limits);
  }

  /**
   * Why record e (result i), which had satellites, has no solution: the satellites used by the better pass
   * against those needed, and the satellites common to both receivers above the horizon (primary band),
   * of them below the elevation mask.
   */
  private unsolvedReason(i: number, e: number): string {
    const r = this.results, rec = this.rec;
    const f = r.forwardCause[i] === CAUSE_TOO_FEW_SATELLITES ? r.forwardCauseA[i] : -1;
    const b = r.backwardCause[i] === CAUSE_TOO_FEW_SATELLITES ? r.backwardCauseA[i] : -1;
    if (f < 0 && b < 0) return 'too few satellites for a solution';
    const forward = f >= b;
    let common = 0, belowMask = 0;
    for (let j = rec.satStart[e]; j < rec.satStart[e] + rec.satCount[e]; j++) {
      if (!this.satellites[rec.sat[j]].primary) continue;
      common++;
      if (rec.elevationRad[j] < this.maskRad) belowMask++;
    }
    return tooFewSatellitesReason({
      used: forward ? f : b, needed: forward ? r.forwardCauseB[i] : r.backwardCauseB[i], common, belowMask, maskDeg: this.maskRad / DEG,
    });
  }

  /**
   * Satellites left out of the epochs written so far, per reason, most frequent first: below the elevation
   * mask (the satellites' reason without its number), or in an epoch without solution ('no solution', as
   * the code engine's satellites of an epoch it could not solve).
   */
  rejections(): { reason: string; count: number }[] {
    const out: { reason: string; count: number }[] = [];
    if (this.belowMaskCount > 0) out.push({ reason: BELOW_MASK, count: this.belowMaskCount });
    if (this.unsolvedCount > 0) out.push({ reason: 'no solution', count: this.unsolvedCount });
    return out.sort((a, b) => b.count - a.count);
  }

  /** The solution of record k (read from the combined results). */
  solutionAt(k: number): CarrierEpochSolution {
    const rec = this.rec, results = this.results, satellites = this.satellites, maskRad = this.maskRad, gRef = this.gRef;
    const e = rec.visit(k);
    const i = results.at(k, 'read');
    const c = this.contexts[rec.context[e]] ?? this.lastContext;
    const kind = KIND[results.kind[i]];
    const pointReference = this.reduceToMark ? 'ground-mark' as const : 'antenna-reference-point' as const;
    const j0 = rec.satStart[e], j1 = j0 + rec.satCount[e];
    const sats = [];
    // Look angles and DOPs from the recorded lines of sight (ENU at the reference: a short baseline).
    const used: number[] = [], clockIndex: number[] = [], systemsSeen: GnssSystem[] = [];
    let belowMask = 0;
    for (let j = j0; j < j1; j++) {
      const ux = rec.los[3 * j], uy = rec.los[3 * j + 1], uz = rec.los[3 * j + 2];
      const e = -Math.sin(gRef.lonRad) * ux + Math.cos(gRef.lonRad) * uy;
      const n = -Math.sin(gRef.latRad) * Math.cos(gRef.lonRad) * ux - Math.sin(gRef.latRad) * Math.sin(gRef.lonRad) * uy + Math.cos(gRef.latRad) * uz;
      const az = (Math.atan2(e, n) / DEG + 360) % 360;
      if (rec.elevationRad[j] >= maskRad) {
        const sys = satSystem(satellites[rec.sat[j]].id);
        if (!systemsSeen.includes(sys)) systemsSeen.push(sys);
        used.push(ux, uy, uz);
        clockIndex.push(systemsSeen.indexOf(sys));
      }
      // The residual of the pass whose solution the epoch carries (combine-passes.ts): of the phase when
      // it was used (signal: its phase code), else of the code (signal: the pseudorange code).
      const info = satellites[rec.sat[j]];
      const withPhase = Number.isFinite(rec.phaseM[j]);
      const residualM = results.residualM[j];
      const variance = withPhase ? singleDifferenceVarianceM2(this.phaseAM, this.phaseBM, rec.elevationRad[j]) : this.codeScale * singleDifferenceVarianceM2(this.codeAM, this.codeBM, rec.elevationRad[j]);
      if (rec.elevationRad[j] < maskRad) belowMask++;
      sats.push({
        sat: info.id, signal: withPhase ? info.phaseCode : info.code, elevationDeg: rec.elevationRad[j] / DEG, azimuthDeg: az,
        residualM, weight: 1 / variance, wTest: NaN, used: rec.elevationRad[j] >= maskRad && kind !== 'none',
        reason: rec.elevationRad[j] < maskRad ? `${BELOW_MASK} (${(rec.elevationRad[j] / DEG).toFixed(1)} deg)` : withPhase ? '' : 'no phase at both receivers (code only)',
      });
    }
    // One object literal per epoch, no spread of a shared part: V8 copies a spread object through a slow
    // path that allocates in the old generation, which made the heap of a long session grow several-fold.
    const solved = kind !== 'none';
    // The satellites left out (rejections()): below the mask, and the others of an epoch without solution.
    this.belowMaskCount += belowMask;
    if (!solved) this.unsolvedCount += j1 - j0 - belowMask;
    const arp = { x: results.position[3 * i], y: results.position[3 * i + 1], z: results.position[3 * i + 2] };
    const pos = solved && this.reduceToMark ? arpToMark(arp, c.antenna) : arp;
    const refPoint = this.reduceToMark ? this.refMark : this.refArp;
    const baselineEcef = solved ? { x: pos.x - refPoint.x, y: pos.y - refPoint.y, z: pos.z - refPoint.z } : null;
    const cv = results.covariance.subarray(6 * i, 6 * i + 6);
    const g = solved ? ecefToGeodetic(pos) : null;
    return {
      tagGpsS: rec.tagGpsS[e], timeGpsS: rec.timeGpsS[e], pointName: c.pointName, pointReference,
      relativeClockM: {}, dops: dilutionOfPrecision({ lineOfSight: used, frame: 'ecef', receiver: gRef, clockIndex }), quality: this.quality(i, solved), correctionAgeS: rec.referenceAgeS[e], satellites: sats,
      speedMS: Number.isFinite(rec.velocity[4 * e]) ? Math.hypot(rec.velocity[4 * e], rec.velocity[4 * e + 1], rec.velocity[4 * e + 2]) : NaN,
      occupationEvent: c.event, antennaHeightM: c.antenna.heightM,
      forwardKind: KIND[results.forwardKind[i]], backwardKind: KIND[results.backwardKind[i]],
      ratio: results.ratio[i] > 0 ? results.ratio[i] : NaN, fixedAmbiguities: results.fixedAmbiguities[i],
      kind,
      reason: !solved ? this.reasons[rec.reason[e]] || this.unsolvedReason(i, e) : kind === 'float' ? this.floatReason(i) : '',
      position: solved ? { ecef: pos, frame: this.frame } : null, geodetic: g,
      baselineEcef, baselineEnu: baselineEcef ? ecefDeltaToEnu(baselineEcef, gRef.latRad, gRef.lonRad) : null,
      satellitesUsed: solved ? results.satellitesUsed[i] : 0, sigmaEnuM: g ? enuSigma(cv, g.latRad, g.lonRad) : null, sigma3dM: solved ? Math.sqrt(cv[0] + cv[3] + cv[5]) : NaN,
    };
  }
}

/** Arcs started per cause, over every band's tracker of a receiver. */
function allCauses(primary: ArcTracker, further: ReadonlyMap<string, ArcTracker>): Record<string, number> {
  const out: Record<string, number> = { ...primary.causes };
  for (const t of further.values()) for (const [k, v] of Object.entries(t.causes)) out[k] = (out[k] ?? 0) + v;
  return out;
}

/** Standard deviations east/north/up from an ECEF covariance (xx, xy, xz, yy, yz, zz). */
function enuSigma(c: ArrayLike<number>, lat: number, lon: number): { e: number; n: number; u: number } {
  const sl = Math.sin(lat), cl = Math.cos(lat), so = Math.sin(lon), co = Math.cos(lon);
  const rows = [[-so, co, 0], [-sl * co, -sl * so, cl], [cl * co, cl * so, sl]];
  const m = [[c[0], c[1], c[2]], [c[1], c[3], c[4]], [c[2], c[4], c[5]]];
  return { e: axisSigma(rows[0], m), n: axisSigma(rows[1], m), u: axisSigma(rows[2], m) };
}

/** Standard deviation along the unit vector r of a 3 x 3 covariance m: sqrt(r' m r). */
function axisSigma(r: readonly number[], m: readonly (readonly number[])[]): number {
  let s = 0;
  for (let i = 0; i < 3; i++) for (let j = 0; j < 3; j++) s += r[i] * m[i][j] * r[j];
  return Math.sqrt(Math.max(s, 0));
}
