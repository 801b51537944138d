/**
 * A differential session: the rover's epochs solved against one or more reference files with bounded
 * memory (reference epochs are kept only while a rover epoch can still use them).
 *
 * Data flow per rover epoch: read -> time-align (rover clock from its own code, reference epochs on their
 * estimated GPS time) -> model (observables/) -> difference (differencing/: reference corrections and the
 * single-difference epoch) -> solve (an epoch solver: code.ts here) -> report (EpochSolution).
 */
import type { EcefM, ObsEpoch, ObsHeader, ObsStream, NavData } from '../gnss/index.js';
import { ProcessingError, type WarningSink } from '../errors.js';
import { isoFromSeconds } from '../time/index.js';
import { ReferenceCorrections, type CodeOffsetSource, type SingleDifferenceEpoch } from '../differencing/index.js';
import { dopplerVelocity } from '../velocity/index.js';
import { ReceiverSmoother, type SmoothingArcs } from '../smoothing/index.js';
import type { SessionOptions } from './options.js';
import type { EpochSolution, SessionSummary } from './solution-types.js';
import { codeVarianceOf, LeftOutSystems, prepareSession, type SessionSetup } from './setup.js';
import { ReferenceFeed } from './reference-feed.js';
import { RoverState } from './rover-state.js';
import { SessionTally } from './session-tally.js';
import { noSolution, type RecordContext } from './epoch-records.js';
import { solveCodeEpoch, type CodeSolverContext } from './code-solver.js';
import { codeOffsetSurvey, firstPassLearns, surveySession, type SurveyResult } from './survey-pass.js';
import { SessionCodeOffsets, type CodeOffsetSurvey } from './code-offsets.js';

export interface SessionInputs {
  readonly rover: ObsStream;
  readonly references: readonly ObsStream[];
  readonly nav: NavData;
  readonly onWarning?: WarningSink;
  /**
   * Opens the rover and reference files afresh. Given, the session reads them twice: a first pass learns
   * what is constant over the session (code offsets) or needs an epoch's future (carrier smoothing
   * forwards and backwards) before the second pass solves any epoch (survey-pass.ts). Without it, one
   * forward pass. The streams it returns should not repeat the readers' warnings.
   */
  readonly reopen?: () => Promise<{ readonly rover: ObsStream; readonly references: readonly ObsStream[] }>;
}

export interface SessionRun {
  readonly epochs: AsyncIterable<EpochSolution>;
  /** Valid once `epochs` has been consumed. */
  summary(): SessionSummary;
}

/**
 * Horizontal speed from the epoch's Doppler at the solved position (NaN without Doppler). An object with
 * a method rather than a closure made per session, so the call sites stay monomorphic across sessions.
 */
class DopplerSpeed {
  constructor(private readonly setup: SessionSetup) {}

  speedAt(e: ObsEpoch, at: EcefM, sd?: SingleDifferenceEpoch): number {
    const setup = this.setup;
    // The epoch's satellites looked up in the single differences themselves (SingleDifferenceEpoch.get), no Map per epoch.
    const v = dopplerVelocity(e, at, setup.store, sd
      ? { systems: setup.systems, elevationMaskRad: setup.maskRad, glonassChannels: setup.glonassChannels, satellites: sd }
      : { systems: setup.systems, elevationMaskRad: setup.maskRad, glonassChannels: setup.glonassChannels });
    return v ? v.speedMS : NaN;
  }
}

/** The code epoch solver's context for the second (or only) pass. */
function codeSolverFor(setup: SessionSetup, inputs: SessionInputs, options: SessionOptions, corrections: ReferenceCorrections, records: RecordContext, tally: SessionTally, offsets: CodeOffsetSource | null, roverHeader: ObsHeader, offsetSurvey: CodeOffsetSurvey, speed: DopplerSpeed): CodeSolverContext {
  return {
    differencing: {
      store: setup.store, systems: setup.systems, leftOut: new LeftOutSystems(options, setup.navSystems), corrections,
      iono: inputs.nav.ionosphere, glonassChannels: setup.glonassChannels, maskRad: setup.maskRad, maxAgeS: options.maxCorrectionAgeS,
      codeVariance: codeVarianceOf(setup), offsets,
    },
    records, tally, fixOptions: setup.fixOptions, maxPdop: options.quality.maxPdop,
    kind: options.smoothing.enabled ? 'smoothed' : 'differential', roverHeader,
    standalone: options.standaloneFallback ? {
      store: setup.store, iono: inputs.nav.ionosphere, systems: options.systems.filter((s) => setup.navSystems.has(s)), elevationMaskRad: setup.maskRad,
      weighting: setup.weighting, frequencyMode: 'auto', glonassChannels: setup.glonassChannels,
    } : null,
    speed,
    offsetSurvey,
  };
}

/** What a code session's loop and its summary share. */
class CodeSession {
  survey: SurveyResult | null = null;
  passes = 1;
  readonly warn: WarningSink;
  readonly setup: SessionSetup;
  readonly state: RoverState;
  readonly tally = new SessionTally();
  readonly speed: DopplerSpeed;
  readonly records: RecordContext;
  readonly corrections: ReferenceCorrections;
  readonly offsetSurvey: CodeOffsetSurvey;

  constructor(readonly inputs: SessionInputs, readonly options: SessionOptions) {
    this.warn = inputs.onWarning ?? (() => undefined);
    const setup = this.setup = prepareSession(inputs.rover, inputs.references, inputs.nav, options, this.warn, inputs.reopen !== undefined);
    this.state = new RoverState(inputs.rover.header.markerName, setup.roverAntenna, options.roverAntenna !== undefined);
    this.speed = new DopplerSpeed(setup);
    this.records = { rover: this.state, reduceToMark: options.reduceToMark, frame: setup.frame, refMark: setup.refMark, speed: this.speed };
    this.corrections = new ReferenceCorrections({ store: setup.store, iono: inputs.nav.ionosphere, systems: setup.systems, glonassChannels: setup.glonassChannels });
    this.offsetSurvey = codeOffsetSurvey(setup);
  }
}

/** The session's receiver smoother, or null when nothing is smoothed. Without a first pass the reference has no arcs: it is smoothed only with the rover, forwards. */
function smootherOf(session: CodeSession, intervalS: number | null, arcs: SmoothingArcs | null): ReceiverSmoother | null {
  const sm = session.options.smoothing;
  const setup = session.setup;
  return sm.enabled || arcs
    ? new ReceiverSmoother(intervalS ?? 1, sm.timeConstantS, setup.systems, setup.glonassChannels, sm.maxGapS, arcs ? 'combined' : 'forward', arcs)
    : null;
}

/** What the solving pass reads and solves with: the streams (opened afresh after a first pass), the smoother and the reference feed. */
interface SolvingPass {
  readonly rover: ObsStream;
  readonly references: readonly ObsStream[];
  readonly roverSmoother: ReceiverSmoother | null;
  readonly feed: ReferenceFeed;
  readonly solver: CodeSolverContext;
}

/**
 * The first pass when it learns something, then the solving pass set up. A function of its own, called
 * once per session: the callbacks it calls (reopen) are the session's own closures, which would tie the
 * optimised code of the epoch loop to one session if they were called there.
 */
async function solvingPass(session: CodeSession): Promise<SolvingPass> {
  const { inputs, options, setup, corrections, records, tally, warn } = session;
  let rover = inputs.rover, references = inputs.references;
  if (inputs.reopen && firstPassLearns(setup, options)) {
    session.survey = await surveySession(setup, rover, references, inputs.nav, options, session.offsetSurvey);
    ({ rover, references } = await inputs.reopen());
    session.passes = 2;
  }
  const survey = session.survey;
  const roverSmoother = smootherOf(session, rover.header.intervalS, survey?.roverArcs ?? null);
  const feed = new ReferenceFeed(references, corrections, setup.refMark, setup.refAntenna, options.reference.antenna !== undefined,
    smootherOf(session, references[0].header.intervalS, survey?.referenceArcs ?? null), options.maxCorrectionAgeS, setup.notes, warn);
  const solver = codeSolverFor(setup, inputs, options, corrections, records, tally, survey?.offsets ?? null, rover.header, session.offsetSurvey, session.speed);
  return { rover, references, roverSmoother, feed, solver };
}

/**
 * The session's epochs: every rover epoch solved. A module-level generator (not one made per session):
 * its generator objects share one hidden class, so the optimised code of the loops that consume them
 * serves every session of a batch; the loop calls no closure of the session's (solvingPass).
 */
async function* sessionEpochs(session: CodeSession): AsyncIterable<EpochSolution> {
  const { options, state, tally, records, corrections } = session;
  const { rover, references, roverSmoother, feed: f, solver } = await solvingPass(session);
  for await (const e of rover.epochs) {
    if (e.event) {
      state.applyEvent(e);
      if (e.flag === 1) roverSmoother?.reset();
    }
    if (e.flag === 6) roverSmoother?.slipsReported(e);
    if (e.flag !== 0 && e.flag !== 1) continue;
    if (e.sats.length === 0 && e.event) continue;
    tally.epochSeen(e.tagGpsS);
    await f.pullUntil(e.tagGpsS + f.lookaheadS);
    corrections.prune(e.tagGpsS, options.maxCorrectionAgeS + 2);
    const smoothed = roverSmoother?.update(e);
    let sol: EpochSolution;
    try {
      sol = e.sats.length === 0 ? noSolution(records, e, 'no satellites in the epoch', []) : solveCodeEpoch(solver, e, smoothed, roverSmoother?.factors, f.arpM);
    } catch (err) {
      sol = failedEpoch(session, rover.file, e, err);
    }
    state.pendingEvent = null;
    tally.epochOut(sol);
    yield sol;
  }
  if (tally.roverEpochs > 0 && tally.epochsInReach === 0) throwWithoutCorrections(session, f, references);
}

/** An epoch whose solving threw: warned about, and handed out without a solution. */
function failedEpoch(session: CodeSession, file: string, e: ObsEpoch, err: unknown): EpochSolution {
  const msg = err instanceof Error ? err.message : String(err);
  session.warn({ file, line: e.line, code: 'epoch-failed', message: `epoch at line ${e.line} could not be solved: ${msg}` });
  return noSolution(session.records, e, `could not be solved: ${msg}`, []);
}

/** Why no rover epoch had a reference correction: no reference epoch, no ephemeris, or no overlap in time. */
function throwWithoutCorrections(session: CodeSession, f: ReferenceFeed, references: readonly ObsStream[]): never {
  const { tally, options, inputs } = session;
  const span = (a: number, b: number) => (Number.isNaN(a) ? 'no epochs' : `${isoFromSeconds(a, ' GPST')} to ${isoFromSeconds(b, ' GPST')}`);
  if (Number.isNaN(f.firstGpsS)) throw new ProcessingError(`the reference file${references.length > 1 ? 's' : ''} ${references.map((x) => x.file).join(', ')} gave no readable observation epoch (see the warnings)`);
  const ageS = options.maxCorrectionAgeS;
  if (f.firstGpsS <= tally.lastGpsS + ageS && f.lastGpsS >= tally.firstGpsS - ageS) {
    // The times overlap, yet no reference epoch gave a correction: the orbits are what is missing.
    throw new ProcessingError(`the rover and reference observations overlap in time (rover ${span(tally.firstGpsS, tally.lastGpsS)}, reference ${span(f.firstGpsS, f.lastGpsS)}) but no reference epoch gave a correction: the navigation files ${inputs.nav.files.join(', ')} hold no usable ephemeris for these times (stale, for another day, or damaged)`);
  }
  throw new ProcessingError(`the rover and reference observations do not overlap in time (rover ${span(tally.firstGpsS, tally.lastGpsS)}, reference ${span(f.firstGpsS, f.lastGpsS)}, correction age limit ${options.maxCorrectionAgeS} s)`);
}

export async function solveSession(inputs: SessionInputs, options: SessionOptions): Promise<SessionRun> {
  const session = new CodeSession(inputs, options);
  const { setup, tally, corrections, offsetSurvey } = session;
  return {
    epochs: sessionEpochs(session),
    summary: (): SessionSummary => {
      const offsets = (session.survey?.offsets ?? new SessionCodeOffsets(offsetSurvey, false, options.quality.alphaLocal)).reports;
      const channelNote = offsets.some((r) => r.key.startsWith('R channel'))
        ? [`GLONASS per-channel code offsets about their mean (channel: m): ${offsets.filter((r) => r.key.startsWith('R channel')).map((r) => `${r.key.slice(10)}: ${(r.relativeToChannelMeanM ?? 0).toFixed(2)} +- ${r.sigmaM.toFixed(2)}`).join(', ')}`]
        : [];
      const satNote = offsets.filter((r) => !r.key.startsWith('R channel') && r.applied).map((r) => `code offset of ${r.key} removed: ${r.offsetM.toFixed(2)} +- ${r.sigmaM.toFixed(2)} m (significant and stable over the session)`);
      return {
        frame: setup.frame,
        referencePosition: { ecef: setup.refMark, frame: setup.frame },
        referencePositionSource: setup.refSource,
        epochsRover: tally.roverEpochs,
        epochsByKind: { ...tally.byKind },
        epochsWithoutCorrections: tally.withoutCorrections,
        satelliteRejections: tally.satRejections.list(),
        epochRejections: tally.epochRejections.list(),
        systemsUsed: [...tally.systemsUsed],
        notes: [...setup.notes, ...channelNote, ...satNote, ...(corrections.unusableEpochs > 0 ? [`${corrections.unusableEpochs} reference epochs had no satellite with an ephemeris and were not used`] : [])],
        firstGpsS: tally.firstGpsS, lastGpsS: tally.lastGpsS,
        codeOffsets: offsets,
        passes: session.passes,
      };
    },
  };
}
