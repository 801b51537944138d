/**
 * The carrier-phase options of `solve` and the run adapted to the code engine's outputs: epochs carry the
 * kinds 'fixed' and 'float' (or 'none'), with the ratio and the number of fixed ambiguities, and the
 * summary gives the fix shares of each pass.
 */
import {
  readAntex, ReasonCounter, solveCarrierSession, withCarrierDefaults,
  type AntexData, type CarrierDynamics, type CarrierEpochSolution, type CarrierOptions, type CarrierSummary, type EpochSolution,
  type GnssSystem, type NavData, type ObsHeader, type ObsStream, type SessionOptions, type SessionSummary, type SolutionKind, type WarningSink,
} from '@refdelta/core';
import { parseChoice, parseNumber } from './parse-values.js';
import { openTextFile } from './node-io.js';
import { FileRecordStore } from './record-file.js';
import { UsageError } from './usage-error.js';
import type { CarrierArgs } from './carrier-option-definitions.js';

/** Whether a header lists a carrier-phase observation. */
export function recordsPhase(h: ObsHeader): boolean {
  return Object.values(h.obsCodes).some((codes) => (codes ?? []).some((c) => c[0] === 'L'));
}

export interface CarrierChoice {
  readonly on: boolean;
  readonly options: CarrierOptions;
  readonly antennasPath: string | null;
}

/**
 * The carrier-phase choice from the command line. Not given: on when both headers list phase and no
 * code-only processing was asked for (--smooth, --fallback-standalone).
 */
export function parseCarrierChoice(a: CarrierArgs, command: string, rover: ObsHeader, reference: ObsHeader, session: SessionOptions): CarrierChoice {
  const given = a.carrierPhase === undefined ? 'auto' : parseChoice('carrier-phase', a.carrierPhase, ['on', 'off'] as const);
  const both = recordsPhase(rover) && recordsPhase(reference);
  if (given === 'on' && !both) throw new UsageError('--carrier-phase on needs carrier phase in both the rover and the reference file (their headers list no L observation)');
  if (given === 'on' && (session.smoothing.enabled || session.standaloneFallback)) throw new UsageError('--carrier-phase on cannot be combined with --smooth or --fallback-standalone (code-only processing)');
  const codeOnly = session.smoothing.enabled || session.standaloneFallback;
  // solve, points and batch alike (command names the one asking, for messages).
  void command;
  const on = given === 'on' || (given === 'auto' && both && !codeOnly);
  const options = withCarrierDefaults({
    ...(a.ratioThreshold !== undefined ? { ratioThreshold: parseNumber('ratio-threshold', a.ratioThreshold, 1, 1000) } : {}),
    ...(a.ambiguityMask !== undefined ? { ambiguityMaskDeg: parseNumber('ambiguity-mask', a.ambiguityMask, 0, 60) } : {}),
    ...(a.dynamics !== undefined ? { dynamics: parseChoice('dynamics', a.dynamics, ['auto', 'static', 'kinematic'] as const) as CarrierDynamics } : {}),
    ...(a.frequencies !== undefined ? { frequencies: parseChoice('frequencies', a.frequencies, ['all', 'single'] as const) } : {}),
  });
  return { on, options, antennasPath: a.antennas === undefined ? null : String(a.antennas) };
}

export interface CarrierSessionRun {
  readonly epochs: AsyncIterable<EpochSolution>;
  summary(): SessionSummary;
  carrierSummary(): CarrierSummary;
}

/** A carrier-phase run presented like a code run: solution kinds 'fixed' / 'float' / 'none'. */
export async function runCarrierSession(
  inputs: { rover: ObsStream; references: readonly ObsStream[]; nav: NavData; onWarning: WarningSink },
  options: SessionOptions, choice: CarrierChoice,
): Promise<CarrierSessionRun> {
  let antennas: AntexData | undefined;
  if (choice.antennasPath) {
    antennas = await readAntexFile(choice.antennasPath, inputs.onWarning);
  }
  // The records wait for the backward pass in a temporary file, not in memory (record-file.ts).
  const recordStore = new FileRecordStore();
  let run: Awaited<ReturnType<typeof solveCarrierSession>>;
  try {
    run = await solveCarrierSession(async () => ({ ...inputs, ...(antennas ? { antennas } : {}), recordStore }), options, choice.options);
  } catch (e) {
    recordStore.close();
    throw e;
  }
  const tally = new CarrierEpochTally();
  return {
    epochs: tallied(run.epochs, tally),
    carrierSummary: () => run.summary(),
    summary: (): SessionSummary => {
      const c = run.summary();
      return {
        frame: c.frame, referencePosition: c.referencePosition, referencePositionSource: c.referencePositionSource,
        epochsRover: tally.epochs,
        // The carrier kinds alongside the code ones (the union of kinds is widened here for the outputs).
        epochsByKind: { differential: 0, smoothed: 0, standalone: 0, none: tally.none, fixed: c.combined.fixed, float: c.combined.float },
        epochsWithoutCorrections: 0,
        // As the code engine's: reasons without their numbers, one count per satellite and epoch (or per epoch).
        satelliteRejections: c.satelliteRejections,
        epochRejections: tally.reasons.list(),
        systemsUsed: [...tally.systems],
        notes: [...c.notes, carrierSharesSentence(c)],
        firstGpsS: tally.firstGpsS, lastGpsS: tally.lastGpsS,
        // The carrier engine estimates no code offsets; it reads the inputs once (forward and backward passes run on its records).
        codeOffsets: [], passes: 1,
      };
    },
  };
}

/**
 * An ANTEX file read like the observation files: plain, gzip or Unix compress (openTextFile detects the
 * compression from the content).
 */
export async function readAntexFile(path: string, onWarning: WarningSink): Promise<AntexData> {
  const t = await openTextFile(path, onWarning);
  const parts: string[] = [];
  for await (const chunk of t.text) parts.push(chunk);
  return readAntex(path, parts.join(''));
}

/** What the code summary needs from a carrier run's epochs, counted as they pass. */
class CarrierEpochTally {
  epochs = 0;
  none = 0;
  firstGpsS = NaN;
  lastGpsS = NaN;
  /** Why epochs have no solution, counted without the numbers in brackets (as the code engine's). */
  readonly reasons = new ReasonCounter();
  readonly systems = new Set<GnssSystem>();

  add(s: CarrierEpochSolution): void {
    this.epochs++;
    if (Number.isNaN(this.firstGpsS)) this.firstGpsS = s.tagGpsS;
    this.lastGpsS = s.tagGpsS;
    if (s.kind === 'none') { this.none++; this.reasons.add(s.reason); }
    for (const x of s.satellites) if (x.used) this.systems.add(x.sat[0] as GnssSystem);
  }
}

/**
 * The run's epochs, counted. A module-level generator, not one made per run: the generator objects of
 * one function share their hidden class, so the consumer's optimised code serves every session of a
 * batch (each closure's generators have a class of their own, and the consumer would deoptimise).
 */
async function* tallied(epochs: AsyncIterable<CarrierEpochSolution>, tally: CarrierEpochTally): AsyncIterable<EpochSolution> {
  for await (const s of epochs) {
    tally.add(s);
    yield asEpochSolution(s);
  }
}

/** The carrier kinds are among the solution kinds: the epoch is handed on as it is (a copy by spread is slow in V8 and fills its old generation). */
function asEpochSolution(s: CarrierEpochSolution): EpochSolution {
  return s;
}

/** True for the carrier-phase solution kinds. */
export function isCarrierKind(kind: SolutionKind): boolean {
  return kind === 'fixed' || kind === 'float';
}

export function carrierSharesSentence(c: CarrierSummary): string {
  const pct = (x: number) => `${(100 * x / Math.max(c.epochsRover, 1)).toFixed(1)} %`;
  return `carrier phase: ${c.combined.fixed} epochs fixed (${pct(c.combined.fixed)}), ${c.combined.float} float; forward pass alone ${pct(c.forward.fixed)} fixed, backward alone ${pct(c.backward.fixed)}`;
}

/** The carrier-phase part of summary.json. */
export function carrierSummaryJson(c: CarrierSummary, options: CarrierOptions): Record<string, unknown> {
  const share = (p: { fixed: number; float: number; none: number }) => ({ fixed: p.fixed, float: p.float, none: p.none, fixed_share: c.epochsRover ? Math.round(1e4 * p.fixed / c.epochsRover) / 1e4 : null });
  return {
    passes: { forward: share(c.forward), backward: share(c.backward), combined: share(c.combined) },
    fixable_systems: c.fixableSystems,
    signals: c.signals,
    arcs_started: c.slips,
    baseline_length_median_m: Number.isFinite(c.baselineLengthM) ? Math.round(c.baselineLengthM * 1000) / 1000 : null,
    options: {
      ratio_threshold: options.ratioThreshold, min_success_rate: options.minSuccessRate, ambiguity_mask_deg: options.ambiguityMaskDeg,
      min_fixed_ambiguities: options.minFixedAmbiguities, dynamics: options.dynamics, glonass_fix: options.glonassFix, frequencies: options.frequencies,
    },
    record_bytes: c.recordBytes,
  };
}
