/** `refdelta solve`: a differential session from files to an output folder. */
import { basename, join, resolve } from 'node:path';
import { csvText } from '../csv-text.js';
import {
  frameEpochText,
  GNSS_SYSTEMS, InputError, csvPreamble, epochFeature, geojsonNote, jsonNumber, pointReferenceWords,
  positionScatter, residualRowsOf, RESIDUAL_COLUMNS, solveSession, summaryJson,
  type EcefM, type EpochSolution, type FrameEpoch, type GnssSystem, type InputFileRecord, type ObsHeader, type OutputFileRecord,
  type PointReference, type SessionOptions, type SessionSummary, type Warning,
} from '@refdelta/core';
import { AtomicFile, OutputSet, openNav, openObs, requireFile, sha256File, type OpenedObs } from '../node-io.js';
import { prepareOutputFolder } from '../output-folder.js';
import { noEpochSentence, requireObservationTypes } from '../input-sanity.js';
import { obsTimeSpan, requireNavigation, requireOverlap, type TimeSpan } from '../input-checks.js';
import { parseReferenceChoice, referenceFromHeader, type ReferenceArgs, type ResolvedReference } from '../reference-choice.js';
import { referenceSigmaOf } from '../reference-sigma.js';
import { tieBaseToCors, tiedReference, tieJson, type BaseTie } from '../base-tie.js';
import type { ReferenceSigma } from '@refdelta/core';
import { referenceFromMark } from '../reference-mark.js';
import {
  OUTPUT_FILE_NAMES, parseAntennaHeights, parseOutputs, parseSessionOptions, withHeight,
  type OutputKind, type SolveOptionArgs,
} from '../solve-options.js';
import { Reporter } from '../reporter.js';
import { EXIT_OK, EXIT_PROCESSING } from '../exit-codes.js';
import { UsageError } from '../usage-error.js';
import { SOFTWARE } from '../software.js';
import { epochTableColumns, epochTableRow, standaloneFrameNote } from '../epoch-table.js';
import { warningsSummary } from '../warnings-summary.js';
import { carrierSharesSentence, carrierSummaryJson, isCarrierKind, parseCarrierChoice, runCarrierSession, type CarrierArgs } from '../carrier-run.js';
import { stagedReportHtml } from '../staged-report.js';

export interface SolveArgs extends ReferenceArgs, SolveOptionArgs, CarrierArgs {
  readonly rover: string;
  /** --ref-sigma H[,V] (reference-sigma.ts). */
  readonly refSigma?: unknown;
  /** --tie-to CORS files: the reference (base) is tied to them first (base-tie.ts). */
  readonly tieTo?: readonly unknown[];
  readonly reference: readonly string[];
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

/** Writers of the streamed outputs: members of the run's OutputSet, committed with the rest at the end. */
class StreamedOutputs {
  private readonly files = new Map<OutputKind, AtomicFile>();
  private geoFeatures = 0;
  private epochBatch: string[][] = [];
  private residualBatch: string[][] = [];

  constructor(readonly dir: string, readonly kinds: readonly OutputKind[], private readonly set: OutputSet) {}

  path(kind: OutputKind): string {
    return join(this.dir, OUTPUT_FILE_NAMES[kind]);
  }

  /** Opens the streamed members; on failure the set is aborted (OutputSet.create). */
  async open(frame: FrameEpoch, pointReference: PointReference, systems: readonly GnssSystem[], notes: readonly string[]): Promise<void> {
    for (const k of this.kinds) if (k !== 'summary' && k !== 'report') this.files.set(k, await this.set.create(k, this.path(k)));
    const ep = this.files.get('epochs');
    if (ep) await ep.write(csvPreamble({ frame, pointReference, notes }).join('\n') + '\n' + csvText([epochTableColumns(systems)]));
    const rs = this.files.get('residuals');
    if (rs) {
      await rs.write([
        '# refdelta per-satellite residuals, one row per satellite per rover epoch (long form)',
        `# positions of these epochs: ${frame.name} epoch ${frameEpochText(frame.epochYear)}, referring to the ${pointReferenceWords(pointReference)} (see epochs.csv)`,
        '# residual_m: post-fit residual of the single difference (rover minus reference) or, for standalone rows, of the code; status used | rejected with the reason in words',
      ].join('\n') + '\n' + csvText([[...RESIDUAL_COLUMNS]]));
    }
    const gj = this.files.get('geojson');
    if (gj) {
      const head = {
        type: 'FeatureCollection',
        refdelta: { frame: frame.name, epoch: jsonNumber(frame.epochYear, 4), point_reference: pointReferenceWords(pointReference), note: geojsonNote(frame) },
      };
      // The features array is streamed: the collection is written as its members, then the array.
      await gj.write(JSON.stringify(head).slice(0, -1) + ',"features":[\n');
    }
  }

  async add(s: EpochSolution, systems: readonly GnssSystem[]): Promise<void> {
    if (this.files.has('epochs')) {
      this.epochBatch.push(epochTableRow(s, systems));
      if (this.epochBatch.length >= 500) await this.flushEpochs();
    }
    if (this.files.has('residuals')) {
      this.residualBatch.push(...residualRowsOf(s));
      if (this.residualBatch.length >= 2000) await this.flushResiduals();
    }
    const gj = this.files.get('geojson');
    if (gj) {
      // Each feature carries its own row's frame (standalone rows: the broadcast orbits' frame).
      const f = epochFeature(s, s.position?.frame ?? { name: 'unstated', epochYear: NaN });
      if (f) await gj.write((this.geoFeatures++ ? ',\n' : '') + JSON.stringify(f));
    }
  }

  private async flushEpochs(): Promise<void> {
    const f = this.files.get('epochs');
    if (f && this.epochBatch.length) await f.write(csvText(this.epochBatch));
    this.epochBatch = [];
  }

  private async flushResiduals(): Promise<void> {
    const f = this.files.get('residuals');
    if (f && this.residualBatch.length) await f.write(csvText(this.residualBatch));
    this.residualBatch = [];
  }

  /** Writes what is buffered and closes the GeoJSON array; the files stay uncommitted members of the set. */
  async finish(): Promise<void> {
    await this.flushEpochs();
    await this.flushResiduals();
    const gj = this.files.get('geojson');
    if (gj) await gj.write('\n]}\n');
  }
}

/** Optional hooks for commands built on a solve run (e.g. `points`): every epoch solution is handed over. */
export interface SolveHooks {
  /** Command name for the 'start' event (default 'solve'). */
  readonly command?: string;
  readonly onEpoch?: (s: EpochSolution) => void;
  /** File names the caller adds to the output folder (checked against the inputs before the run). */
  readonly extraOutputNames?: readonly string[];
  /** Other input files the caller reads (never overwritten by an output). */
  readonly extraInputs?: readonly string[];
  /** Checks of the caller's own inputs at the reference point, made once it is known and before the run. */
  readonly beforeRun?: (referenceEcef: EcefM) => Promise<void>;
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
  /** Epochs with a position (differential, smoothed or standalone). */
  readonly solvedEpochs: number;
  /** The sentence of a run that solved no epoch, else null. */
  readonly failure: string | null;
  /** summary.json's document for the given list of outputs. */
  readonly summaryDoc: (outputs: readonly OutputFileRecord[]) => Record<string, unknown>;
  /** The reference coordinate's own uncertainty (reference-sigma.ts). */
  readonly referenceSigma: ReferenceSigma;
}

/** Steps 1-4 of a solve run: checks, reference coordinate, the run, the per-epoch outputs staged in an OutputSet. */
export async function stageSolve(a: SolveArgs, rep: Reporter, hooks: SolveHooks = {}): Promise<StagedSolve> {
  // 1. The command line, before any file is touched.
  const choice = parseReferenceChoice(a);
  let referenceSigma = referenceSigmaOf(choice.mode === 'header', a.refSigma);
  const tieFiles = (a.tieTo ?? []).map(String);
  const base = parseSessionOptions(a);
  const heights = parseAntennaHeights(a);
  const kinds = parseOutputs(a.outputs);
  if (!a.reference?.length) throw new UsageError('give at least one reference observation file with --reference FILE');
  if (!a.nav?.length) throw new UsageError('give at least one navigation file with --nav FILE');
  const outDir = resolve(a.out);

  // 2. The files: present, of the right kind, overlapping in time, with navigation data.
  const allPaths = [a.rover, ...a.reference, ...tieFiles, ...a.nav];
  const sizes = new Map<string, number>();
  for (const p of allPaths) sizes.set(p, await requireFile(p));
  await prepareOutputFolder({
    dir: outDir,
    inputs: [...allPaths, ...(choice.mode === 'mark' ? [choice.marksFile] : []), ...(hooks.extraInputs ?? [])],
    outputNames: [...Object.values(OUTPUT_FILE_NAMES), ...(hooks.extraOutputNames ?? [])],
    // Output size per byte of plain rover file, from the demo (1.8 MB): epochs.csv 0.23, residuals.csv 0.97,
    // positions.geojson 0.32; summary.json a few kB.
    estimatedBytes: (sizes.get(a.rover) ?? 0) * kinds.reduce((sum, k) => sum + ({ epochs: 0.23, residuals: 0.97, geojson: 0.32, summary: 0 } as Record<string, number>)[k]!, 0) + 65536,
  });
  // The probes' warnings are kept: a file with no readable epoch is reported with its first problem.
  const roverProbeWarnings: Warning[] = [];
  const roverProbe = await openObs(a.rover, (w) => roverProbeWarnings.push(w));
  const refProbes: OpenedObs[] = [];
  const refProbeWarnings: Warning[] = [];
  for (const p of a.reference) refProbes.push(await openObs(p, (w) => refProbeWarnings.push(w)));
  const roverSpan = await obsTimeSpan(a.rover, roverProbe.header, (w) => roverProbeWarnings.push(w));
  // A data problem, not a usage one: exit 1 with one sentence.
  if (!roverSpan) throw new InputError(a.rover, 0, noEpochSentence(a.rover, roverProbeWarnings));
  const refSpans: { path: string; span: TimeSpan }[] = [];
  for (let i = 0; i < a.reference.length; i++) {
    const sp = await obsTimeSpan(a.reference[i], refProbes[i].header, (w) => refProbeWarnings.push(w));
    if (sp) refSpans.push({ path: a.reference[i], span: sp });
  }
  if (!refSpans.length) {
    throw new InputError(a.reference[0], 0, noEpochSentence(`the reference file${a.reference.length > 1 ? 's' : ''} ${a.reference.join(', ')}`, refProbeWarnings, a.reference.length > 1));
  }
  requireObservationTypes(a.rover, roverProbe.header, base.systems);
  requireOverlap({ path: a.rover, span: roverSpan }, refSpans);

  rep.event('start', { command: hooks.command ?? 'solve', rover: a.rover, references: a.reference, nav: a.nav, out: outDir });
  const { nav, layers: navLayers } = await openNav(a.nav, rep.warn);
  requireNavigation(nav, a.nav, roverProbe.header, base.systems, roverSpan, rep.warn);

  // 3. The reference coordinate with its frame and epoch.
  let ref: ResolvedReference;
  if (choice.mode === 'xyz') {
    ref = { position: { ecef: choice.ecef, frame: choice.frame }, source: a.refXyz !== undefined ? '--ref-xyz' : '--ref-llh', note: 'given on the command line' };
  } else if (choice.mode === 'header') {
    // With a tie, the coordinate given is the CORS's: its header's.
    const from = tieFiles.length ? tieFiles[0] : a.reference[0];
    ref = referenceFromHeader(choice, tieFiles.length ? (await openObs(from, () => {})).header : refProbes[0].header, from, roverSpan.firstGpsS, rep.warn);
  } else {
    ref = await referenceFromMark(choice, roverSpan.firstGpsS, rep.warn);
  }
  let tie: BaseTie | null = null;
  if (tieFiles.length) {
    // A base on an unknown point: tied to the CORS first, then the reference of the rover run (base-tie.ts).
    tie = await tieBaseToCors(a.reference, tieFiles, nav, ref, base, a as unknown as Record<string, unknown>, rep);
    rep.info(tiedReference(tie, ref, a.reference[0]).note);
    ref = tiedReference(tie, ref, a.reference[0]);
    referenceSigma = { horizontalM: Math.hypot(referenceSigma.horizontalM, tie.sigma.horizontalM), verticalM: Math.hypot(referenceSigma.verticalM, tie.sigma.verticalM), source: `${referenceSigma.source}, with the tie to the CORS` };
  }
  const frame = ref.position.frame;
  const roverApprox = roverProbe.header.approxPosition;
  if (roverApprox) {
    const km = Math.hypot(roverApprox.x - ref.position.ecef.x, roverApprox.y - ref.position.ecef.y, roverApprox.z - ref.position.ecef.z) / 1000;
    // Code-differential errors grow about 1 m per 100-150 km of baseline (check-values.md, Navipedia "DGNSS Fundamentals").
    if (km > 300) rep.warn({ file: a.rover, line: 0, code: 'long-baseline', message: `the reference coordinate is ${km.toFixed(0)} km from the rover's header position: check the coordinate (and its sign) or expect metre-level degradation` });
  }

  await hooks.beforeRun?.(ref.position.ecef);

  // 4. The run. Streams are opened afresh (the probes only read headers).
  const rover = await openObs(a.rover, rep.warn);
  const references: OpenedObs[] = [];
  for (const p of a.reference) references.push(await openObs(p, rep.warn));
  const options: SessionOptions = {
    ...base,
    reference: { position: ref.position, source: ref.source, antenna: withHeight(references[0].header.antennaOffset, heights.referenceHeightM) },
    roverAntenna: withHeight(rover.header.antennaOffset, heights.roverHeightM),
  };
  // The session reads the files twice (whole-session estimates first): the second opening is silent, the
  // readers' warnings were given by the first.
  const reopen = async () => {
    const again: OpenedObs[] = [];
    for (const p of a.reference) again.push(await openObs(p, () => {}));
    return { rover: await openObs(a.rover, () => {}), references: again };
  };
  const carrier = parseCarrierChoice(a, hooks.command ?? 'solve', rover.header, references[0].header, options);
  const carrierRun = carrier.on ? await runCarrierSession({ rover, references, nav, onWarning: rep.warn }, options, carrier) : null;
  const run = carrierRun ?? await solveSession({ rover, references, nav, onWarning: rep.warn, reopen }, options);

  const pointReference: PointReference = options.reduceToMark ? 'ground-mark' : 'antenna-reference-point';
  const roverSystems = Object.keys(rover.header.obsCodes) as GnssSystem[];
  const clockSystems = GNSS_SYSTEMS.filter((s) => options.systems.includes(s) && roverSystems.includes(s));
  const set = new OutputSet();
  const outputs = new StreamedOutputs(outDir, kinds, set);
  const notes = [ref.note, ...(options.standaloneFallback ? [standaloneFrameNote()] : [])];
  const positions: EcefM[] = [];
  const standalone: EcefM[] = [];
  let n = 0;
  const spanS = Math.max(roverSpan.lastGpsS - roverSpan.firstGpsS, 1e-9);
  try {
    await outputs.open(frame, pointReference, clockSystems, notes);
    for await (const s of run.epochs) {
      n++;
      await outputs.add(s, clockSystems);
      hooks.onEpoch?.(s);
      if (s.position && (s.kind === 'differential' || s.kind === 'smoothed' || isCarrierKind(s.kind))) positions.push(s.position.ecef);
      else if (s.position && s.kind === 'standalone') standalone.push(s.position.ecef);
      rep.progress(n, (s.tagGpsS - roverSpan.firstGpsS) / spanS);
    }
    await outputs.finish();
  } catch (e) {
    await set.abort();
    throw e;
  }
  rep.clearBar();

  // 5. What the summary needs, computed once (input hashes) and assembled when the outputs are known.
  const summary = run.summary();
  try {
    const inputs: InputFileRecord[] = [];
    const kindOf = (p: string): InputFileRecord['kind'] => (p === a.rover ? 'rover' : a.reference.includes(p) ? 'reference' : tieFiles.includes(p) ? 'tie-station' : 'navigation');
    const layersOf = (p: string): readonly string[] | undefined =>
      p === a.rover ? rover.layers : navLayers.get(p) ?? references[a.reference.indexOf(p)]?.layers;
    for (const p of allPaths) inputs.push({ path: resolve(p), sha256: await sha256File(p), kind: kindOf(p), bytes: sizes.get(p), layers: layersOf(p) });
    if (choice.mode === 'mark') inputs.push({ path: resolve(choice.marksFile), sha256: await sha256File(choice.marksFile), kind: 'control' });
    const scatter = positions.length
      ? { over: 'differential and smoothed epochs', stats: positionScatter(positions) }
      : standalone.length ? { over: 'standalone epochs (no differential epoch)', stats: positionScatter(standalone) } : undefined;
    const solvedEpochs = summary.epochsRover - summary.epochsByKind.none;
    const top = summary.epochRejections[0]?.reason;
    const failure = summary.epochsRover === 0 ? noEpochSentence(a.rover, rep.warnings.filter((w) => w.file === a.rover))
      : solvedEpochs === 0 ? `no rover epoch of ${a.rover} could be solved${top ? `: most epochs were rejected because of "${top}"` : ''}` : null;
    const summaryDoc = (outs: readonly OutputFileRecord[]): Record<string, unknown> => {
      const doc = summaryJson(summary, inputs, options, outs, {
        scatter, software: SOFTWARE, createdUtc: new Date().toISOString(), warnings: rep.warnings, referenceNote: ref.note, referenceSource: ref.source,
      });
      return {
        ...doc, reference: { ...(doc.reference as object), sigma_horizontal_m: referenceSigma.horizontalM, sigma_vertical_m: referenceSigma.verticalM, sigma_source: referenceSigma.source, ...(tie ? { tie: tieJson(tie) } : {}) },
        ...(carrierRun ? { carrier_phase: carrierSummaryJson(carrierRun.carrierSummary(), carrier.options) } : {}), warnings: warningsSummary(rep),
      };
    };
    const carrierShares = carrierRun ? carrierSharesSentence(carrierRun.carrierSummary()) : null;
    return { outDir, set, kinds, summary, carrierShares, frame, pointReference, roverHeader: rover.header, solvedEpochs, failure, summaryDoc, referenceSigma };
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
