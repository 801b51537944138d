/** `refdelta solve`: a differential session from files to an output folder. */
import { basename, join, resolve } from 'node:path';
import { csvText } from '../csv-text.js';
import {
  broadcastOrbitFrame, crsOfFrame, crsStatement, frameEpochText, solveStandaloneSession, SOLVE_OUTPUT_FORMATS,
  GNSS_SYSTEMS, InputError, pointReferenceWords,
  PositionSeries, seriesScatter, solveSession, summaryJson,
  type EpochOutputWriter, type RunExtras, type SolveOutputContext, type SolveOutputFormat, type SqliteDatabase,
  type EcefM, type EpochSolution, type FrameEpoch, type GnssSystem, type InputFileRecord, type ObsHeader, type OutputFileRecord,
  type PointReference, type SessionOptions, type SessionSummary, type Warning,
} from '@refdelta/core';
import { AtomicFile, OutputSet, openNav, openObs as openObsOfFile, requireFile, sha256File, type OpenedObs } from '../node-io.js';
import { inputsInsideWarning, prepareOutputFolder } from '../output-folder.js';
import { noEpochSentence, requireObservationTypes } from '../input-sanity.js';
import { BASE_CORS_ROLES, obsTimeSpan, requireNavigation, requireOverlap, systemsSeen, type TimeSpan } from '../input-checks.js';
import { parseReferenceChoice, referenceFromHeader, type ReferenceArgs, type ResolvedReference } from '../reference-choice.js';
import { referenceSigmaOf } from '../reference-sigma.js';
import { tieBaseToCors, tiedReference, tieJson, type BaseTie } from '../base-tie.js';
import type { ReferenceSigma, WindowPointNames } from '@refdelta/core';
import { referenceFromMark } from '../reference-mark.js';
import { checkReferencePosition } from '../reference-position.js';
import { distinctReferencePaths, requireOneStation } from '../reference-station.js';
import { completenessJson, dataLost, referenceCompleteness, roverEndsEarly, unsolvedEpochs, type DataLost, type Unsolved } from '../run-completeness.js';
import { EpochsRead, notingEpochs } from '../epochs-read.js';
import {
  OUTPUT_FILE_NAMES, parseAntennaHeights, parseOutputs, parseSessionOptions, withHeight,
  type OutputKind, type SolveOptionArgs,
} from '../solve-options.js';
import { Reporter } from '../reporter.js';
import { epsgWkt } from '../epsg-lookup.js';
import { EXIT_OK, EXIT_PROCESSING } from '../exit-codes.js';
import { UsageError } from '../usage-error.js';
import { SOFTWARE } from '../software.js';
import { warningsSummary } from '../warnings-summary.js';
import { carrierSharesSentence, carrierSummaryJson, isCarrierKind, parseCarrierChoice, runCarrierSession } from '../carrier-run.js';
import type { CarrierArgs } from '../carrier-option-definitions.js';
import { stagedReportHtml } from '../staged-report.js';

export interface SolveArgs extends ReferenceArgs, SolveOptionArgs, CarrierArgs {
  readonly rover: string;
  /** --ref-sigma H[,V] (reference-sigma.ts). */
  readonly refSigma?: unknown;
  /** --tie-to CORS files: the reference (base) is tied to them first (base-tie.ts). */
  readonly tieTo?: readonly unknown[];
  /** Empty or absent: a single-receiver (standalone) run. */
  readonly reference?: readonly string[];
  readonly nav: readonly string[];
  readonly out: string;
  readonly quiet?: boolean;
  readonly jsonLines?: boolean;
}

export interface SolveResult {
  readonly exitCode: number;
  readonly outputs: readonly OutputFileRecord[];
  readonly summaryPath: string | null;
}


/** The registered per-epoch outputs asked for, each a member of the run's OutputSet, committed with the rest at the end. */
class StreamedOutputs {
  private readonly open_: { format: SolveOutputFormat; writer: EpochOutputWriter; file: AtomicFile }[] = [];

  constructor(readonly dir: string, readonly kinds: readonly OutputKind[], private readonly set: OutputSet) {}

  /** Opens the streamed members; on failure the set is aborted (OutputSet.create). */
  async open(ctx: SolveOutputContext): Promise<void> {
    for (const format of SOLVE_OUTPUT_FORMATS) {
      if (!this.kinds.includes(format.kind)) continue;
      const file = await this.set.create(format.kind, join(this.dir, format.fileName));
      const writer = format.open(ctx);
      this.open_.push({ format, writer, file });
      await file.write(writer.start());
    }
  }

  async add(s: EpochSolution): Promise<void> {
    for (const o of this.open_) {
      const c = o.writer.epoch(s);
      if (c.length) await o.file.write(c);
    }
  }

  /** Writes what is buffered and each format's end, then its sidecars; the files stay uncommitted members of the set. */
  async finish(ctx: SolveOutputContext): Promise<void> {
    for (const o of this.open_) {
      if (o.format.endsAtCommit) continue;
      const c = o.writer.end();
      if (c.length) await o.file.write(c);
    }
    for (const o of this.open_) {
      for (const sc of o.format.sidecars(ctx)) await this.set.add(sc.kind, join(this.dir, sc.fileName), [sc.text]);
    }
  }

  /** Completes the formats that hold the whole run (GeoPackage) with what the command added. */
  async close(extras: RunExtras): Promise<void> {
    for (const o of this.open_) {
      if (!o.format.endsAtCommit) continue;
      const c = o.writer.end(extras);
      if (c.length) await o.file.write(c);
    }
  }
}

/** A new in-memory SQLite database (sql.js: SQLite compiled to WebAssembly), for the GeoPackage output. */
export async function sqliteFactory(): Promise<() => SqliteDatabase> {
  const initSqlJs = (await import('sql.js')).default;
  const SQL = await initSqlJs();
  return () => new SQL.Database();
}

/** Optional hooks for commands built on a solve run (e.g. `points`): every epoch solution is handed over. */
export interface SolveHooks {
  /** Command name for the 'start' event (default 'solve'). */
  readonly command?: string;
  /**
   * Every epoch solution is handed to its add(). An object with a method, not a callback closure: a
   * closure made per session is a new call target each time, and the epoch loop's optimised code would
   * be discarded at every session of a batch.
   */
  readonly epochSink?: { add(s: EpochSolution): void };
  /** File names the caller adds to the output folder (checked against the inputs before the run). */
  readonly extraOutputNames?: readonly string[];
  /** Other input files the caller reads (never overwritten by an output). */
  readonly extraInputs?: readonly string[];
  /** Checks of the caller's own inputs at the reference point, made once it is known and before the run. */
  readonly beforeRun?: (referenceEcef: EcefM) => Promise<void>;
  /** The per-epoch outputs' point names from occupation windows (points --windows). */
  readonly pointNames?: WindowPointNames;
}

/**
 * A solve run whose outputs are written but not committed: the caller decides success, may add its
 * own files to `set`, then commits everything with commitStagedSolve() or drops it with `set.abort()`.
 */
export interface StagedSolve {
  readonly outDir: string;
  readonly set: OutputSet;
  readonly kinds: readonly OutputKind[];
  readonly summary: SessionSummary;
  /** The fix shares of a carrier-phase run (a sentence), else null. */
  readonly carrierShares: string | null;
  readonly frame: FrameEpoch;
  readonly pointReference: PointReference;
  readonly roverHeader: ObsHeader;
  /** What the command adds to whole-run formats (the points layer of the GeoPackage) before commit. */
  extras: RunExtras;
  readonly outputs: StreamedOutputs;
  /** Epochs with a position (differential, smoothed or standalone). */
  readonly solvedEpochs: number;
  /** The sentence of a run that solved no epoch, else null. */
  readonly failure: string | null;
  /** summary.json's document for the given list of outputs. */
  readonly summaryDoc: (outputs: readonly OutputFileRecord[]) => Record<string, unknown>;
  /** The reference coordinate's own uncertainty (reference-sigma.ts). */
  readonly referenceSigma: ReferenceSigma;
  /** Observations lost while reading the inputs (run-completeness.ts), else null. */
  readonly dataLost: DataLost | null;
  /** Rover epochs without a solution and why. */
  readonly unsolved: Unsolved;
}

/**
 * Every epoch of a run to the outputs, the hook and the progress bar; the positions kept for the scatter.
 * A function of its own: V8 optimises this loop, not the whole of stageSolve around it (whose code after
 * the loop, run once per session, would discard the optimised code and have it compiled again for the
 * next session of a batch).
 */
async function writeEpochs(
  epochs: AsyncIterable<EpochSolution>, outputs: StreamedOutputs, hooks: SolveHooks, rep: Reporter, roverSpan: TimeSpan,
  positions: PositionSeries, standalone: PositionSeries,
): Promise<void> {
  let n = 0;
  const spanS = Math.max(roverSpan.lastGpsS - roverSpan.firstGpsS, 1e-9);
  for await (const s of epochs) {
    n++;
    await outputs.add(s);
    hooks.epochSink?.add(s);
    if (s.position && (s.kind === 'differential' || s.kind === 'smoothed' || isCarrierKind(s.kind))) positions.push(s.position.ecef);
    else if (s.position && s.kind === 'standalone') standalone.push(s.position.ecef);
    rep.progress(n, (s.tagGpsS - roverSpan.firstGpsS) / spanS);
  }
}

/** Steps 1-4 of a solve run: checks, reference coordinate, the run, the per-epoch outputs staged in an OutputSet. */
export async function stageSolve(a: SolveArgs, rep: Reporter, hooks: SolveHooks = {}): Promise<StagedSolve> {
  // Every observation stream the run opens is closed when it ends, however it ends: the probes read
  // only headers, and a run that fails leaves its streams unread (a batch runs many sessions in one process).
  const opened: OpenedObs[] = [];
  try {
    return await stageSolveWith(a, rep, hooks, async (path, onWarning, systems) => {
      const s = await openObsOfFile(path, onWarning, systems);
      opened.push(s);
      return s;
    });
  } finally {
    // allSettled: a file that fails to close must not hide the run's own error.
    await Promise.allSettled(opened.map((s) => s.close?.()));
  }
}

async function stageSolveWith(a: SolveArgs, rep: Reporter, hooks: SolveHooks, openObs: typeof openObsOfFile): Promise<StagedSolve> {
  // 1. The command line, before any file is touched.
  // Without --reference the run is single-receiver (standalone): no reference coordinate is asked for.
  const singleReceiver = !a.reference?.length;
  if (singleReceiver && a.refCoord !== undefined) throw new UsageError('--ref-coord gives the coordinate of a reference receiver: give its observations with --reference FILE (without --reference, solve gives single-receiver positions)');
  const tieFiles = (a.tieTo ?? []).map(String);
  if (singleReceiver && tieFiles.length) throw new UsageError('--tie-to ties a reference receiver to a CORS: give the reference observations with --reference FILE');
  const choice = singleReceiver ? null : parseReferenceChoice(a);
  // A standalone position has no reference coordinate whose error it shares.
  let referenceSigma = singleReceiver
    ? { horizontalM: 0, verticalM: 0, source: 'none: single-receiver (standalone) positions have no reference coordinate' }
    : referenceSigmaOf(choice!.mode === 'header', a.refSigma);
  const base = parseSessionOptions(a);
  const heights = parseAntennaHeights(a);
  const kinds = parseOutputs(a.outputs);
  if (kinds.includes('dxf') && (hooks.command ?? 'solve') === 'solve') throw new UsageError('--outputs dxf holds per-point grid coordinates: use refdelta points with --projection');
  // A file given twice is read once (its epochs would be taken once anyway); the warnings wait for the run's start.
  const repeatWarnings: Warning[] = [];
  const referencePaths: readonly string[] = await distinctReferencePaths(a.reference ?? [], (w) => repeatWarnings.push(w));
  if (!a.nav?.length) throw new UsageError('give at least one navigation file with --nav FILE');
  const outDir = resolve(a.out);

  // 2. The files: present, of the right kind, overlapping in time, with navigation data.
  const allPaths = [a.rover, ...referencePaths, ...tieFiles, ...a.nav];
  const sizes = new Map<string, number>();
  for (const p of allPaths) sizes.set(p, await requireFile(p));
  const folder = await prepareOutputFolder({
    dir: outDir,
    inputs: [...allPaths, ...(choice?.mode === 'mark' ? [choice.marksFile] : []), ...(hooks.extraInputs ?? [])],
    outputNames: [...Object.values(OUTPUT_FILE_NAMES), ...SOLVE_OUTPUT_FORMATS.map((f) => f.fileName), ...(hooks.extraOutputNames ?? [])],
    // Output size per byte of plain rover file, from the demo (1.8 MB): epochs.csv 0.23, residuals.csv 0.97,
    // positions.geojson 0.32; summary.json a few kB.
    estimatedBytes: (sizes.get(a.rover) ?? 0) * kinds.reduce((sum, k) => sum + (({ epochs: 0.23, residuals: 0.97, geojson: 0.32, summary: 0 } as Partial<Record<string, number>>)[k] ?? 0.3), 0) + 65536,
  });
  // The probes' warnings are kept: a file with no readable epoch is reported with its first problem.
  const roverProbeWarnings: Warning[] = [];
  // Kept only until the rover's time span is known: the probe's stream is read further (systemsSeen),
  // and the solve reports the epochs' problems itself.
  let keepRoverProbeWarnings = true;
  const roverProbe = await openObs(a.rover, (w) => { if (keepRoverProbeWarnings) roverProbeWarnings.push(w); });
  const refProbes: OpenedObs[] = [];
  const refProbeWarnings: Warning[] = [];
  for (const p of referencePaths) refProbes.push(await openObs(p, (w) => refProbeWarnings.push(w)));
  requireOneStation(refProbes.map((s, i) => ({ path: referencePaths[i]!, header: s.header })));
  const roverSpan = await obsTimeSpan(a.rover, roverProbe.header, (w) => roverProbeWarnings.push(w));
  // A data problem, not a usage one: exit 1 with one sentence.
  if (!roverSpan) throw new InputError(a.rover, 0, noEpochSentence(a.rover, roverProbeWarnings));
  keepRoverProbeWarnings = false;
  roverProbeWarnings.length = 0;
  const refSpans: { path: string; span: TimeSpan }[] = [];
  for (let i = 0; i < referencePaths.length; i++) {
    const sp = await obsTimeSpan(referencePaths[i]!, refProbes[i]!.header, (w) => refProbeWarnings.push(w));
    if (sp) refSpans.push({ path: referencePaths[i]!, span: sp });
  }
  requireObservationTypes(a.rover, roverProbe.header, base.systems);
  if (!singleReceiver) {
    if (!refSpans.length) {
      throw new InputError(referencePaths[0]!, 0, noEpochSentence(`the reference file${referencePaths.length > 1 ? 's' : ''} ${referencePaths.join(', ')}`, refProbeWarnings, referencePaths.length > 1));
    }
    requireOverlap({ path: a.rover, span: roverSpan }, refSpans);
  }
  if (tieFiles.length && refSpans.length) {
    // The base is tied to the CORS over their common time: the CORS files must overlap the base's file.
    const corsSpans: { path: string; span: TimeSpan }[] = [];
    for (const p of tieFiles) {
      const sp = await obsTimeSpan(p, (await openObs(p, () => {})).header);
      if (sp) corsSpans.push({ path: p, span: sp });
    }
    if (corsSpans.length) requireOverlap({ path: refSpans[0]!.path, span: refSpans[0]!.span }, corsSpans, BASE_CORS_ROLES);
  }

  rep.event('start', { command: hooks.command ?? 'solve', rover: a.rover, references: referencePaths, nav: a.nav, out: outDir, mode: singleReceiver ? 'standalone' : 'differential' });
  for (const w of repeatWarnings) rep.warn(w);
  const beside = inputsInsideWarning(outDir, folder.inputsInside);
  if (beside) rep.warn(beside);
  const { nav, layers: navLayers } = await openNav(a.nav, rep.warn);
  // Which of the systems listed and allowed have satellites in the rover's epochs (none seen: the no-epoch
  // sentence comes later).
  const listed = (Object.keys(roverProbe.header.obsCodes) as GnssSystem[]).filter((s) => base.systems.includes(s) && (roverProbe.header.obsCodes[s]?.length ?? 0) > 0);
  // The probe's epochs are still unread: its stream is read, not the file opened again.
  const seen = await systemsSeen(roverProbe, listed);
  const usableSystems = requireNavigation(nav, a.nav, roverProbe.header, base.systems, roverSpan, rep.warn, seen.size ? seen : undefined);

  // 3. The reference coordinate with its frame and epoch.
  let ref: ResolvedReference;
  if (!choice) {
    const frame = broadcastOrbitFrame((roverSpan.firstGpsS + roverSpan.lastGpsS) / 2);
    ref = {
      position: { ecef: roverProbe.header.approxPosition ?? { x: 0, y: 0, z: 0 }, frame },
      source: 'none: single-receiver (standalone) run',
      note: 'no reference receiver: single-receiver (standalone) positions from the broadcast orbits and clocks, in the frame of the broadcast orbits (WGS 84 at the epoch of observation); metre-level accuracy',
    };
    rep.info(`no --reference: single-receiver (standalone) positions in the frame of the broadcast orbits (${frame.name} epoch ${frameEpochText(frame.epochYear)}); expect metres, not the decimetres of differential positions`);
  } else if (choice.mode === 'xyz') {
    ref = { position: { ecef: choice.ecef, frame: choice.frame }, source: `--ref-coord (${choice.form === 'ecef' ? 'ECEF metres' : 'latitude, longitude, ellipsoidal height'})`, note: 'given on the command line' };
  } else if (choice.mode === 'header') {
    // With a tie, the coordinate given is the CORS's: its header's.
    const from = tieFiles.length ? tieFiles[0]! : referencePaths[0]!;
    ref = referenceFromHeader(choice, tieFiles.length ? (await openObs(from, () => {})).header : refProbes[0].header, from, roverSpan.firstGpsS, rep.warn);
  } else {
    ref = await referenceFromMark(choice, roverSpan.firstGpsS, rep.warn, a.allowUnknownFrame === true);
  }
  if (choice && choice.mode !== 'header') {
    // A coordinate given is compared with where the station says it is (with a tie, the CORS's file).
    const station = tieFiles.length ? tieFiles[0]! : referencePaths[0]!;
    await checkReferencePosition({
      file: station, header: tieFiles.length ? (await openObs(station, () => {})).header : refProbes[0]!.header, given: ref.position.ecef,
      givenWords: choice.mode === 'mark' ? `mark ${choice.markName} of ${choice.marksFile}` : '--ref-coord', nav, options: base, warn: rep.warn,
    });
  }
  let tie: BaseTie | null = null;
  if (tieFiles.length) {
    // A base on an unknown point: tied to the CORS first, then the reference of the rover run (base-tie.ts).
    tie = await tieBaseToCors(referencePaths, tieFiles, nav, ref, base, a as unknown as Record<string, unknown>, rep, openObs);
    rep.info(tiedReference(tie, ref, referencePaths[0]!).note);
    ref = tiedReference(tie, ref, referencePaths[0]!);
    referenceSigma = { horizontalM: Math.hypot(referenceSigma.horizontalM, tie.sigma.horizontalM), verticalM: Math.hypot(referenceSigma.verticalM, tie.sigma.verticalM), source: `${referenceSigma.source}, with the tie to the CORS` };
  }
  const frame = ref.position.frame;
  if (!crsOfFrame(frame.name)) {
    rep.warn({ code: 'frame-without-crs', message: `the reference frame '${frame.name}' has no known EPSG CRS: outputs state no CRS for the positions (a GIS may take them as WGS 84; they are not)` });
  }
  const roverApprox = roverProbe.header.approxPosition;
  if (roverApprox && !singleReceiver) {
    const km = Math.hypot(roverApprox.x - ref.position.ecef.x, roverApprox.y - ref.position.ecef.y, roverApprox.z - ref.position.ecef.z) / 1000;
    // Code-differential errors grow about 1 m per 100-150 km of baseline (check-values.md, Navipedia "DGNSS Fundamentals").
    if (km > 300) rep.warn({ file: a.rover, line: 0, code: 'long-baseline', message: `the reference coordinate is ${km.toFixed(0)} km from the rover's header position: check the coordinate (and its sign) or expect metre-level degradation` });
  }

  await hooks.beforeRun?.(ref.position.ecef);

  // 4. The run. Streams are opened afresh (the probes only read headers). Only the values of the
  // constellations asked for are read: the session gives the others' satellites a reason and no more.
  const rover = await openObs(a.rover, rep.warn, base.systems);
  // What the run reads of each reference file is noted (epochs-read.ts): its completeness is judged from that.
  const referenceReads = referencePaths.map(() => new EpochsRead());
  const references: OpenedObs[] = [];
  for (let i = 0; i < referencePaths.length; i++) references.push(notingEpochs(await openObs(referencePaths[i]!, rep.warn, base.systems), referenceReads[i]!));
  const options: SessionOptions = {
    ...base,
    reference: singleReceiver
      ? { position: null }
      : { position: ref.position, source: ref.source, antenna: withHeight(references[0]!.header.antennaOffset, heights.referenceHeightM) },
    roverAntenna: withHeight(rover.header.antennaOffset, heights.roverHeightM),
  };
  // The session reads the files twice (whole-session estimates first): the second opening is silent, the
  // readers' warnings were given by the first.
  const reopen = async () => {
    const again: OpenedObs[] = [];
    for (let i = 0; i < referencePaths.length; i++) again.push(notingEpochs(await openObs(referencePaths[i]!, () => {}, base.systems), referenceReads[i]!));
    return { rover: await openObs(a.rover, () => {}, base.systems), references: again };
  };
  const carrier = singleReceiver ? null : parseCarrierChoice(a, hooks.command ?? 'solve', rover.header, references[0]!.header, options);
  if (singleReceiver && a.carrierPhase === 'on') throw new UsageError('--carrier-phase on needs a reference receiver (--reference FILE)');
  const carrierRun = carrier?.on ? await runCarrierSession({ rover, references, nav, onWarning: rep.warn }, options, carrier) : null;
  const run = singleReceiver
    ? solveStandaloneSession({ rover, nav, onWarning: rep.warn }, options)
    : carrierRun ?? await solveSession({ rover, references, nav, onWarning: rep.warn, reopen }, options);

  const pointReference: PointReference = options.reduceToMark ? 'ground-mark' : 'antenna-reference-point';
  // One clock column per system that can have a clock: observed by the rover, with navigation data (no always-empty column).
  const clockSystems = GNSS_SYSTEMS.filter((s) => options.systems.includes(s) && usableSystems.includes(s));
  const set = new OutputSet();
  const outputs = new StreamedOutputs(outDir, kinds, set);
  const outputCtx: SolveOutputContext = {
    frame, pointReference, systems: clockSystems, notes: [`reference coordinate: ${ref.note}`], standaloneRows: options.standaloneFallback && !singleReceiver, csv: csvText,
    wkt: (code) => epsgWkt(code), ...(kinds.includes('gpkg') ? { openDatabase: await sqliteFactory() } : {}),
    ...(hooks.pointNames ? { pointNames: hooks.pointNames } : {}),
  };
  const positions = new PositionSeries();
  const standalone = new PositionSeries();
  try {
    await outputs.open(outputCtx);
    await writeEpochs(run.epochs, outputs, hooks, rep, roverSpan, positions, standalone);
    await outputs.finish(outputCtx);
  } catch (e) {
    await set.abort();
    throw e;
  }
  rep.clearBar();

  // 5. What the summary needs, computed once (input hashes) and assembled when the outputs are known.
  const summary = run.summary();
  const endsEarly = roverEndsEarly(a.rover, rover.header.lastObsGpsS, rover.header.intervalS, summary.lastGpsS);
  if (endsEarly) rep.warn(endsEarly);
  const referenceSpans = referenceCompleteness(referencePaths, references.map((r) => r.header), refSpans, referenceReads, options.maxCorrectionAgeS, rep.warn);
  const unsolved = unsolvedEpochs(summary, roverSpan, singleReceiver ? null : referenceSpans);
  if (unsolved.large && summary.epochsByKind.none < summary.epochsRover) rep.warn({ file: a.rover, line: 0, code: 'many-epochs-unsolved', message: unsolved.sentence });
  const lost = dataLost(rep.warnings, rep.warningTally);
  try {
    const inputs: InputFileRecord[] = [];
    const kindOf = (p: string): InputFileRecord['kind'] => (p === a.rover ? 'rover' : referencePaths.includes(p) ? 'reference' : tieFiles.includes(p) ? 'tie-station' : 'navigation');
    const layersOf = (p: string): readonly string[] | undefined =>
      p === a.rover ? rover.layers : navLayers.get(p) ?? references[referencePaths.indexOf(p)]?.layers;
    for (const p of allPaths) inputs.push({ path: resolve(p), sha256: await sha256File(p), kind: kindOf(p), bytes: sizes.get(p), layers: layersOf(p) });
    if (choice?.mode === 'mark') inputs.push({ path: resolve(choice.marksFile), sha256: await sha256File(choice.marksFile), kind: 'control' });
    const scatter = positions.length
      ? { over: summary.epochsByKind.fixed + summary.epochsByKind.float > 0 ? 'fixed and float epochs' : 'differential and smoothed epochs', stats: seriesScatter(positions) }
      : standalone.length ? { over: 'standalone epochs (no differential epoch)', stats: seriesScatter(standalone) } : undefined;
    const solvedEpochs = summary.epochsRover - summary.epochsByKind.none;
    const top = summary.epochRejections[0]?.reason;
    const failure = summary.epochsRover === 0 ? noEpochSentence(a.rover, rep.warnings.filter((w) => w.file === a.rover))
      : solvedEpochs === 0 ? `no rover epoch of ${a.rover} could be solved${top ? `: most epochs were rejected because of "${top}"` : ''}` : null;
    const summaryDoc = (outs: readonly OutputFileRecord[]): Record<string, unknown> => {
      const doc = summaryJson(summary, inputs, options, outs, {
        scatter, software: SOFTWARE, createdUtc: new Date().toISOString(), warnings: rep.warnings, referenceNote: ref.note, referenceSource: ref.source,
      });
      const mode = singleReceiver
        ? { mode: 'standalone (single receiver): no reference receiver; positions in the frame of the broadcast orbits', reference: null }
        : {
          mode: carrierRun ? 'differential, carrier phase' : 'differential',
          reference: { ...(doc.reference as object), sigma_horizontal_m: referenceSigma.horizontalM, sigma_vertical_m: referenceSigma.verticalM, sigma_source: referenceSigma.source, ...(tie ? { tie: tieJson(tie) } : {}) },
        };
      return {
        ...doc, ...mode, crs: crsStatement(frame), point_reference: pointReferenceWords(pointReference),
        ...(carrierRun && carrier ? { carrier_phase: carrierSummaryJson(carrierRun.carrierSummary(), carrier.options) } : {}),
        completeness: completenessJson(lost, unsolved), warnings: warningsSummary(rep),
      };
    };
    const carrierShares = carrierRun ? carrierSharesSentence(carrierRun.carrierSummary()) : null;
    return { outDir, set, kinds, summary, carrierShares, frame, pointReference, roverHeader: rover.header, solvedEpochs, failure, summaryDoc, referenceSigma, dataLost: lost, unsolved, extras: {}, outputs };
  } catch (e) {
    await set.abort();
    throw e;
  }
}

/**
 * Commits a staged run with every file the caller added to its set: phase 1 seals them all (their
 * hashes are then known), summary.json (when asked for) is written listing them and added last, then
 * all are renamed into place, summary.json last (OutputSet.commit). 'output' events follow.
 */
export async function commitStagedSolve(st: StagedSolve, rep: Reporter): Promise<OutputFileRecord[]> {
  let done;
  try {
    await st.outputs.close(st.extras);
    let sealed = await st.set.seal();
    if (st.kinds.includes('report')) {
      // report.html is built from the sealed members (and the summary's document), then sealed with them.
      const reportPath = join(st.outDir, OUTPUT_FILE_NAMES.report);
      const listed = sealed.map(({ kind, written }) => ({ kind, path: written.path, bytes: written.bytes, sha256: written.sha256 }));
      const doc = st.summaryDoc([...listed, { kind: 'report', path: reportPath }]);
      await st.set.add('report', reportPath, [await stagedReportHtml(st.set, doc, st.outDir, basename(st.outDir))]);
      sealed = await st.set.seal();
    }
    const records: OutputFileRecord[] = sealed.map(({ kind, written }) => ({ kind, path: written.path, bytes: written.bytes, sha256: written.sha256 }));
    if (st.kinds.includes('summary')) {
      const summaryPath = join(st.outDir, OUTPUT_FILE_NAMES.summary);
      // The file cannot list its own hash; the caller (and --json-lines) gets it.
      const doc = st.summaryDoc([...records, { kind: 'summary', path: summaryPath }]);
      await st.set.add('summary', summaryPath, [JSON.stringify(doc, null, 2) + '\n']);
    }
    done = await st.set.commit();
  } catch (e) {
    await st.set.abort();
    throw e;
  }
  const out = done.map(({ kind, written }) => ({ kind, path: written.path, bytes: written.bytes, sha256: written.sha256 }));
  for (const o of out) rep.event('output', { kind: o.kind, path: o.path, bytes: o.bytes, sha256: o.sha256 });
  return out;
}

/** The counts and frame lines printed after a run. */
export function reportSolveCounts(st: StagedSolve, rep: Reporter): void {
  const k = st.summary.epochsByKind;
  rep.warningTail(st.kinds.includes('summary') ? join(st.outDir, OUTPUT_FILE_NAMES.summary) : 'the warnings above');
  if (st.carrierShares) rep.info(`${st.summary.epochsRover} rover epochs: ${st.carrierShares}; ${k.none} without a solution`);
  else rep.info(`${st.summary.epochsRover} rover epochs: ${k.differential} differential, ${k.smoothed} smoothed, ${k.standalone} standalone, ${k.none} without a solution`);
  if (st.unsolved.sentence) rep.info(st.unsolved.sentence);
  if (st.dataLost) rep.info(`incomplete input: ${st.dataLost.sentence}; the results cover only the observations read`);
  rep.info(`frame: ${st.frame.name} epoch ${frameEpochText(st.frame.epochYear)}; positions refer to the ${pointReferenceWords(st.pointReference)}`);
}

/** Words for the output list line. */
export function outputNames(outs: readonly OutputFileRecord[]): string {
  return outs.map((o) => basename(o.path)).join(', ');
}

/**
 * `refdelta solve`. Success is decided before anything is committed: a run that solves no epoch
 * writes nothing (an earlier complete output set in --out stays as it was) and exits 1.
 */
export async function runSolve(a: SolveArgs, rep: Reporter, hooks: SolveHooks = {}): Promise<SolveResult> {
  const st = await stageSolve(a, rep, hooks);
  reportSolveCounts(st, rep);
  if (st.failure) {
    await st.set.abort();
    rep.failure(`${st.failure}; nothing was written to ${st.outDir}`, EXIT_PROCESSING);
    rep.event('done', { exit_code: EXIT_PROCESSING, summary: null });
    return { exitCode: EXIT_PROCESSING, outputs: [], summaryPath: null };
  }
  const outs = await commitStagedSolve(st, rep);
  rep.info(`outputs in ${st.outDir}: ${outputNames(outs)}`);
  const summaryPath = st.kinds.includes('summary') ? join(st.outDir, OUTPUT_FILE_NAMES.summary) : null;
  rep.event('done', { exit_code: EXIT_OK, summary: summaryPath, epochs: st.summary.epochsRover });
  return { exitCode: EXIT_OK, outputs: outs, summaryPath };
}
