/**
 * The first of two passes over a session: everything that is constant over the session, or that needs
 * the future of an epoch, is learnt here before any epoch is solved in the second pass.
 * - GLONASS channel code offsets (code-offsets.ts), from raw code, when the session applies them: the
 *   only reason for fixes in this pass.
 * - The carrier-smoothing arcs of both receivers (smoothing/two-sided-arcs.ts) when smoothing is on.
 * Memory stays bounded as in the second pass: per-key sample series and per-arc bin summaries, no
 * observations are kept.
 */
import type { EcefM, NavData, ObsStream } from '../gnss/index.js';
import { ReferenceCorrections, SingleDifferenceEpoch, type DifferencingContext } from '../differencing/index.js';
import { ReceiverSmoother, SmoothingArcs } from '../smoothing/index.js';
import type { SessionOptions } from './options.js';
import { codeVarianceOf, LeftOutSystems, type SessionSetup } from './setup.js';
import { ReferenceFeed } from './reference-feed.js';
import { CodeOffsetSurvey, SessionCodeOffsets } from './code-offsets.js';

export interface SurveyResult {
  readonly offsets: SessionCodeOffsets;
  readonly roverArcs: SmoothingArcs | null;
  readonly referenceArcs: SmoothingArcs | null;
}

/** The constellation GLONASS samples are referred to: the first in use other than GLONASS. */
function clockSystemOf(setup: SessionSetup) {
  return setup.systems.find((s) => s !== 'R') ?? null;
}

/** Whether a first pass would learn anything: GLONASS channel offsets, or smoothing arcs. */
export function firstPassLearns(setup: SessionSetup, options: SessionOptions): boolean {
  return setup.glonassUse === 'channel-offsets' || options.smoothing.enabled || options.smoothing.reference;
}

/** The code offset survey of a session: filled by the first pass (GLONASS channels) and the second (other satellites). */
export function codeOffsetSurvey(setup: SessionSetup): CodeOffsetSurvey {
  return new CodeOffsetSurvey(setup.glonassUse === 'channel-offsets', clockSystemOf(setup), setup.fixOptions);
}

export async function surveySession(setup: SessionSetup, rover: ObsStream, references: readonly ObsStream[], nav: NavData, options: SessionOptions, survey: CodeOffsetSurvey): Promise<SurveyResult> {
  const sm = options.smoothing;
  const roverArcs = sm.enabled ? new SmoothingArcs(sm.timeConstantS) : null;
  const referenceArcs = sm.enabled || sm.reference ? new SmoothingArcs(sm.timeConstantS) : null;
  const recorder = (intervalS: number | null, arcs: SmoothingArcs | null) =>
    (arcs ? new ReceiverSmoother(intervalS ?? 1, sm.timeConstantS, setup.systems, setup.glonassChannels, sm.maxGapS, 'record', arcs) : null);
  const corrections = new ReferenceCorrections({ store: setup.store, iono: nav.ionosphere, systems: setup.systems, glonassChannels: setup.glonassChannels });
  const refRecorder = recorder(references[0].header.intervalS, referenceArcs);
  // Notes and warnings of the reference files are given by the second pass, once.
  const feed = new ReferenceFeed(references, corrections, setup.refMark, setup.refAntenna, options.reference.antenna !== undefined,
    refRecorder,
    options.maxCorrectionAgeS, [], () => undefined);
  const roverRecorder = recorder(rover.header.intervalS, roverArcs);
  const differencing: DifferencingContext = {
    store: setup.store, systems: setup.systems, leftOut: new LeftOutSystems(options, setup.navSystems), corrections,
    iono: nav.ionosphere, glonassChannels: setup.glonassChannels, maskRad: setup.maskRad, maxAgeS: options.maxCorrectionAgeS,
    codeVariance: codeVarianceOf(setup), offsets: null,
  };
  let position: EcefM | null = null;
  let clockM = NaN;
  let lastS = -Infinity;
  if (!survey.learnsInFirstPass) {
    // Only the arcs to record: the rover first, then the reference, as far as the interleaved reading
    // below would take it (it ends at the first epoch past the largest time asked for, whatever the order
    // of the asking), without the reference corrections it needs for fixes.
    let furthestS = -Infinity;
    for await (const e of rover.epochs) {
      if (e.event && e.flag === 1) roverRecorder?.reset();
      if (e.flag === 6) roverRecorder?.slipsReported(e);
      if (e.flag !== 0 && e.flag !== 1) continue;
      if (e.sats.length === 0 && e.event) continue;
      furthestS = Math.max(furthestS, e.tagGpsS + feed.lookaheadS);
      roverRecorder?.update(e);
      lastS = e.tagGpsS;
    }
    if (refRecorder && Number.isFinite(lastS)) await feed.filterUntil(Math.max(furthestS, lastS + 5 * sm.timeConstantS));
    roverArcs?.finish();
    referenceArcs?.finish();
    return { offsets: new SessionCodeOffsets(survey, setup.glonassUse === 'channel-offsets', options.quality.alphaLocal), roverArcs, referenceArcs };
  }
  // The same epochs reach the smoothers in the same order as in the second pass (session/solve-session.ts),
  // so the filters restart at the same epochs and the arcs match.
  for await (const e of rover.epochs) {
    if (e.event && e.flag === 1) roverRecorder?.reset();
    if (e.flag === 6) roverRecorder?.slipsReported(e);
    if (e.flag !== 0 && e.flag !== 1) continue;
    if (e.sats.length === 0 && e.event) continue;
    await feed.pullUntil(e.tagGpsS + feed.lookaheadS);
    corrections.prune(e.tagGpsS, options.maxCorrectionAgeS + 2);
    roverRecorder?.update(e);
    lastS = e.tagGpsS;
    if (e.sats.length === 0 || !survey.wants(e.tagGpsS) || corrections.nearestEpochS(e.tagGpsS) > options.maxCorrectionAgeS + 1) continue;
    try {
      const start = position ?? rover.header.approxPosition ?? feed.arpM;
      const sd = new SingleDifferenceEpoch(e, differencing, undefined, undefined, start, clockM);
      const solved = survey.learnChannels(sd, start);
      if (solved) { position = solved.positionM; clockM = solved.clockM; }
    } catch {
      // An epoch that cannot be modelled teaches nothing; the second pass reports it.
    }
  }
  // The reference's arcs go on after the rover's last epoch: five time constants weigh e^-5 in the average.
  if (refRecorder && Number.isFinite(lastS)) await feed.pullUntil(lastS + 5 * sm.timeConstantS);
  roverArcs?.finish();
  referenceArcs?.finish();
  return { offsets: new SessionCodeOffsets(survey, setup.glonassUse === 'channel-offsets', options.quality.alphaLocal), roverArcs, referenceArcs };
}
