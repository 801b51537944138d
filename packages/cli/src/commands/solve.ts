/** `refdelta solve`: a differential session from files to an output folder. */
import { join, resolve } from 'node:path';
import { stringify } from 'csv-stringify/sync';
import {
  GNSS_SYSTEMS, csvPreamble, epochColumns, epochRow, epochFeature, geojsonNote, jsonNumber, pointReferenceWords,
  positionScatter, residualRowsOf, RESIDUAL_COLUMNS, solveSession, summaryJson,
  type EcefM, type EpochSolution, type FrameEpoch, type GnssSystem, type InputFileRecord, type OutputFileRecord, type PointReference,
  type SessionOptions,
} from '@refdelta/core';
import { AtomicFile, openNav, openObs, requireFile, sha256File, writeFileAtomic, type OpenedObs } from '../node-io.js';
import { obsTimeSpan, requireNavigation, requireOverlap, type TimeSpan } from '../input-checks.js';
import { parseReferenceChoice, referenceFromHeader, type ReferenceArgs, type ResolvedReference } from '../reference-choice.js';
import { referenceFromMark } from '../reference-mark.js';
import {
  OUTPUT_FILE_NAMES, parseAntennaHeights, parseOutputs, parseSessionOptions, withHeight,
  type OutputKind, type SolveOptionArgs,
} from '../solve-options.js';
import { Reporter } from '../reporter.js';
import { EXIT_OK, EXIT_PROCESSING } from '../exit-codes.js';
import { UsageError } from '../usage-error.js';
import { SOFTWARE } from '../software.js';

export interface SolveArgs extends ReferenceArgs, SolveOptionArgs {
  readonly rover: string;
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

function csvText(rows: readonly (readonly string[])[]): string {
  return rows.length ? stringify(rows as string[][], { record_delimiter: 'unix' }) : '';
}

/** Writers of the streamed outputs; each is an AtomicFile committed at the end. */
class StreamedOutputs {
  private readonly files = new Map<OutputKind, AtomicFile>();
  private geoFeatures = 0;
  private epochBatch: string[][] = [];
  private residualBatch: string[][] = [];

  constructor(readonly dir: string, readonly kinds: readonly OutputKind[]) {}

  path(kind: OutputKind): string {
    return join(this.dir, OUTPUT_FILE_NAMES[kind]);
  }

  async open(frame: FrameEpoch, pointReference: PointReference, systems: readonly GnssSystem[], notes: readonly string[]): Promise<void> {
    for (const k of this.kinds) if (k !== 'summary') this.files.set(k, await AtomicFile.create(this.path(k)));
    const ep = this.files.get('epochs');
    if (ep) await ep.write(csvPreamble({ frame, pointReference, notes }).join('\n') + '\n' + csvText([epochColumns(systems)]));
    const rs = this.files.get('residuals');
    if (rs) await rs.write(csvText([[...RESIDUAL_COLUMNS]]));
    const gj = this.files.get('geojson');
    if (gj) {
      const head = {
        type: 'FeatureCollection',
        refdelta: { frame: frame.name, epoch: jsonNumber(frame.epochYear, 2), point_reference: pointReferenceWords(pointReference), note: geojsonNote(frame) },
      };
      // The features array is streamed: the collection is written as its members, then the array.
      await gj.write(JSON.stringify(head).slice(0, -1) + ',"features":[\n');
    }
  }

  async add(s: Parameters<typeof epochRow>[0], systems: readonly GnssSystem[]): Promise<void> {
    if (this.files.has('epochs')) {
      this.epochBatch.push(epochRow(s, systems));
      if (this.epochBatch.length >= 500) await this.flushEpochs();
    }
    if (this.files.has('residuals')) {
      this.residualBatch.push(...residualRowsOf(s));
      if (this.residualBatch.length >= 2000) await this.flushResiduals();
    }
    const gj = this.files.get('geojson');
    if (gj) {
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

  async commit(): Promise<OutputFileRecord[]> {
    await this.flushEpochs();
    await this.flushResiduals();
    const gj = this.files.get('geojson');
    if (gj) await gj.write('\n]}\n');
    const out: OutputFileRecord[] = [];
    for (const [kind, f] of this.files) {
      const w = await f.commit();
      out.push({ kind, path: w.path, bytes: w.bytes, sha256: w.sha256 });
    }
    this.files.clear();
    return out;
  }

  async abort(): Promise<void> {
    for (const f of this.files.values()) await f.abort();
    this.files.clear();
  }
}

/** Optional hooks for commands built on a solve run (e.g. `points`): every epoch solution is handed over. */
export interface SolveHooks {
  /** Command name for the 'start' event (default 'solve'). */
  readonly command?: string;
  readonly onEpoch?: (s: EpochSolution) => void;
}

export async function runSolve(a: SolveArgs, rep: Reporter, hooks: SolveHooks = {}): Promise<SolveResult> {
  // 1. The command line, before any file is touched.
  const choice = parseReferenceChoice(a);
  const base = parseSessionOptions(a);
  const heights = parseAntennaHeights(a);
  const kinds = parseOutputs(a.outputs);
  if (!a.reference?.length) throw new UsageError('give at least one reference observation file with --reference FILE');
  if (!a.nav?.length) throw new UsageError('give at least one navigation file with --nav FILE');
  const outDir = resolve(a.out);

  // 2. The files: present, of the right kind, overlapping in time, with navigation data.
  const allPaths = [a.rover, ...a.reference, ...a.nav];
  const sizes = new Map<string, number>();
  for (const p of allPaths) sizes.set(p, await requireFile(p));
  const roverProbe = await openObs(a.rover, () => {});
  const refProbes: OpenedObs[] = [];
  for (const p of a.reference) refProbes.push(await openObs(p, () => {}));
  const roverSpan = await obsTimeSpan(a.rover, roverProbe.header);
  if (!roverSpan) throw new UsageError(`${a.rover} holds no observation epochs`);
  const refSpans: { path: string; span: TimeSpan }[] = [];
  for (let i = 0; i < a.reference.length; i++) {
    const sp = await obsTimeSpan(a.reference[i], refProbes[i].header);
    if (sp) refSpans.push({ path: a.reference[i], span: sp });
  }
  if (!refSpans.length) throw new UsageError(`the reference files hold no observation epochs`);
  requireOverlap({ path: a.rover, span: roverSpan }, refSpans);

  rep.event('start', { command: hooks.command ?? 'solve', rover: a.rover, references: a.reference, nav: a.nav, out: outDir });
  const { nav, layers: navLayers } = await openNav(a.nav, rep.warn);
  requireNavigation(nav, a.nav, roverProbe.header, base.systems, roverSpan, rep.warn);

  // 3. The reference coordinate with its frame and epoch.
  let ref: ResolvedReference;
  if (choice.mode === 'xyz') {
    ref = { position: { ecef: choice.ecef, frame: choice.frame }, source: a.refXyz !== undefined ? '--ref-xyz' : '--ref-llh', note: 'given on the command line' };
  } else if (choice.mode === 'header') {
    ref = referenceFromHeader(choice, refProbes[0].header, a.reference[0], roverSpan.firstGpsS, rep.warn);
  } else {
    ref = await referenceFromMark(choice, roverSpan.firstGpsS, rep.warn);
  }
  const frame = ref.position.frame;
  const roverApprox = roverProbe.header.approxPosition;
  if (roverApprox) {
    const km = Math.hypot(roverApprox.x - ref.position.ecef.x, roverApprox.y - ref.position.ecef.y, roverApprox.z - ref.position.ecef.z) / 1000;
    // Code-differential errors grow about 1 m per 100-150 km of baseline (check-values.md, Navipedia "DGNSS Fundamentals").
    if (km > 300) rep.warn({ file: a.rover, line: 0, code: 'long-baseline', message: `the reference coordinate is ${km.toFixed(0)} km from the rover's header position: check the coordinate (and its sign) or expect metre-level degradation` });
  }

  // 4. The run. Streams are opened afresh (the probes only read headers).
  const rover = await openObs(a.rover, rep.warn);
  const references: OpenedObs[] = [];
  for (const p of a.reference) references.push(await openObs(p, rep.warn));
  const options: SessionOptions = {
    ...base,
    reference: { position: ref.position, antenna: withHeight(references[0].header.antennaOffset, heights.referenceHeightM) },
    roverAntenna: withHeight(rover.header.antennaOffset, heights.roverHeightM),
  };
  const run = await solveSession({ rover, references, nav, onWarning: rep.warn }, options);

  const pointReference: PointReference = options.reduceToMark ? 'ground-mark' : 'antenna-reference-point';
  const roverSystems = Object.keys(rover.header.obsCodes) as GnssSystem[];
  const clockSystems = GNSS_SYSTEMS.filter((s) => options.systems.includes(s) && roverSystems.includes(s));
  const outputs = new StreamedOutputs(outDir, kinds);
  const notes = [ref.note];
  await outputs.open(frame, pointReference, clockSystems, notes);
  const positions: EcefM[] = [];
  const standalone: EcefM[] = [];
  let n = 0;
  const spanS = Math.max(roverSpan.lastGpsS - roverSpan.firstGpsS, 1e-9);
  try {
    for await (const s of run.epochs) {
      n++;
      await outputs.add(s, clockSystems);
      hooks.onEpoch?.(s);
      if (s.position && (s.kind === 'differential' || s.kind === 'smoothed')) positions.push(s.position.ecef);
      else if (s.position && s.kind === 'standalone') standalone.push(s.position.ecef);
      rep.progress(n, (s.tagGpsS - roverSpan.firstGpsS) / spanS);
    }
  } catch (e) {
    await outputs.abort();
    throw e;
  }
  rep.clearBar();
  const written = await outputs.commit();

  // 5. The summary, written last: it lists the other outputs with their hashes.
  const summary = run.summary();
  const inputs: InputFileRecord[] = [];
  const kindOf = (p: string): InputFileRecord['kind'] => (p === a.rover ? 'rover' : a.reference.includes(p) ? 'reference' : 'navigation');
  const layersOf = (p: string): readonly string[] | undefined =>
    p === a.rover ? rover.layers : navLayers.get(p) ?? references[a.reference.indexOf(p)]?.layers;
  for (const p of allPaths) inputs.push({ path: resolve(p), sha256: await sha256File(p), kind: kindOf(p), bytes: sizes.get(p), layers: layersOf(p) });
  if (choice.mode === 'mark') inputs.push({ path: resolve(choice.marksFile), sha256: await sha256File(choice.marksFile), kind: 'control' });
  const scatter = positions.length
    ? { over: 'differential and smoothed epochs', stats: positionScatter(positions) }
    : standalone.length ? { over: 'standalone epochs (no differential epoch)', stats: positionScatter(standalone) } : undefined;
  const summaryPath = join(outDir, OUTPUT_FILE_NAMES.summary);
  const allOutputs: OutputFileRecord[] = [...written];
  if (kinds.includes('summary')) allOutputs.push({ kind: 'summary', path: summaryPath });
  const doc = summaryJson(summary, inputs, options, allOutputs, {
    scatter, software: SOFTWARE, createdUtc: new Date().toISOString(), warnings: rep.warnings, referenceNote: ref.note, referenceSource: ref.source,
  });
  if (kinds.includes('summary')) {
    const w = await writeFileAtomic(summaryPath, [JSON.stringify(doc, null, 2) + '\n']);
    // The file cannot list its own hash; the caller (and --json-lines) gets it.
    allOutputs[allOutputs.length - 1] = { kind: 'summary', path: w.path, bytes: w.bytes, sha256: w.sha256 };
  }
  for (const o of allOutputs) rep.event('output', { kind: o.kind, path: o.path, bytes: o.bytes ?? null, sha256: o.sha256 ?? null });

  const solved = summary.epochsByKind.differential + summary.epochsByKind.smoothed + summary.epochsByKind.standalone;
  rep.warningTail(kinds.includes('summary') ? summaryPath : 'the warnings above');
  rep.info(
    `${summary.epochsRover} rover epochs: ${summary.epochsByKind.differential} differential, ${summary.epochsByKind.smoothed} smoothed, ` +
    `${summary.epochsByKind.standalone} standalone, ${summary.epochsByKind.none} without a solution`,
  );
  rep.info(`frame: ${frame.name} epoch ${Number.isFinite(frame.epochYear) ? frame.epochYear.toFixed(2) : 'unstated'}; positions refer to the ${pointReferenceWords(pointReference)}`);
  rep.info(`outputs in ${outDir}: ${allOutputs.map((o) => OUTPUT_FILE_NAMES[o.kind as OutputKind] ?? o.path).join(', ')}`);
  if (solved === 0) {
    const top = summary.epochRejections[0]?.reason;
    rep.failure(`no rover epoch could be solved${top ? `: most epochs were rejected because of "${top}"` : ''}`, EXIT_PROCESSING);
    rep.event('done', { exit_code: EXIT_PROCESSING, summary: kinds.includes('summary') ? summaryPath : null });
    return { exitCode: EXIT_PROCESSING, outputs: allOutputs, summaryPath: kinds.includes('summary') ? summaryPath : null };
  }
  rep.event('done', { exit_code: EXIT_OK, summary: kinds.includes('summary') ? summaryPath : null, epochs: summary.epochsRover });
  return { exitCode: EXIT_OK, outputs: allOutputs, summaryPath: kinds.includes('summary') ? summaryPath : null };
}
