/**
 * `refdelta batch`: every rover observation file of a folder processed as one `points` session
 * (solve outputs + points files in OUT/<session>/, one atomic set each) against the same reference and
 * navigation files, or against those of --reference-dir / --nav-dir whose time spans overlap the
 * session. A session that fails is reported with one sentence naming its file and skipped; the others
 * go on. At the end OUT/batch-points.csv (every point of every session) and OUT/batch-summary.json are
 * committed as one set (the summary last), and a table is printed on stdout.
 * Exit: 0 all sessions ok, 4 some failed (EXIT_BATCH_PARTIAL), 1 none could be processed, 2 usage.
 */
import { lstat, readdir, rm, stat } from 'node:fs/promises';
import { inputsInsideWarning, prepareOutputFolder } from '../output-folder.js';
import { noEpochSentence } from '../input-sanity.js';
import { basename, join, resolve } from 'node:path';
import { csvText } from '../csv-text.js';
import { InputError, ProcessingError, ephemerisTimeGpsS, csvtText, metadataFileName, tableMetadata, utmEpsgOfFrame, utmZoneFor, type Warning } from '@refdelta/core';
import { OutputSet, obsHeaderOf, openNav } from '../node-io.js';
import { NAV_WINDOW_S, obsTimeSpan, utcSecondText, type TimeSpan } from '../input-checks.js';
import { looksLikeObservationName, rinexKindOfFile, type RinexKind } from '../rinex-kind.js';
import { parseReferenceChoice } from '../reference-choice.js';
import { parseAntennaHeights, parseOutputs, parseSessionOptions } from '../solve-options.js';
import { batchIndexHtml, REPORT_FILE_NAME } from './report.js';
import { describeFailure } from '../failure-sentence.js';
import { Reporter } from '../reporter.js';
import { EXIT_BATCH_PARTIAL, EXIT_OK, EXIT_PROCESSING } from '../exit-codes.js';
import { UsageError } from '../usage-error.js';
import { SOFTWARE } from '../software.js';
import { parsePointsConfig, runPointsSession, type PointsArgs, type PointsConfig, type ProjectionStatement } from './points.js';
import { parseJobs, runBatchSessions } from '../batch-workers.js';
import { dataLost } from '../run-completeness.js';

export interface BatchArgs extends Omit<PointsArgs, 'rover' | 'reference' | 'nav'> {
  readonly sessions: unknown;
  readonly reference?: readonly string[];
  readonly referenceDir?: unknown;
  readonly nav?: readonly string[];
  readonly navDir?: unknown;
  /** Sessions run at once (worker threads); default: the cores. */
  readonly jobs?: unknown;
}

export const BATCH_FILE_NAMES = { summary: 'batch-summary.json', points: 'batch-points.csv' } as const;
/** The CRS of batch-points.csv when every session's points.prj is the same (combinedCrs). */
const BATCH_PRJ_FILE_NAME = 'batch-points.prj';

/** One session's line in the table and the summary. */
export interface SessionRecord {
  readonly name: string;
  readonly file: string;
  /** 'incomplete-input': processed, but observations of its inputs were lost while reading (the reason says which). */
  readonly status: 'ok' | 'incomplete-input' | 'failed';
  readonly reason: string | null;
  readonly roverEpochs: number | null;
  readonly solvedEpochs: number | null;
  readonly points: number;
  readonly out: string | null;
  readonly referenceFiles: readonly string[];
  readonly navFiles: readonly string[];
}

interface Candidate { readonly path: string; readonly kind: RinexKind }

/** Regular files of a folder, by name, with their kind by content. */
async function folderFiles(dir: string, option: string, skipped?: { file: string; reason: string }[]): Promise<Candidate[]> {
  let names: string[];
  try {
    const st = await stat(dir);
    if (!st.isDirectory()) throw new InputError(dir, 0, `${option} ${dir} is not a folder`);
    names = await readdir(dir);
  } catch (e) {
    if (e instanceof InputError) throw e;
    throw new InputError(dir, 0, `${option} ${dir}: no such folder`);
  }
  const out: Candidate[] = [];
  for (const n of names.sort()) {
    if (n.startsWith('.')) continue; // hidden files, our own temporary files among them
    const p = join(dir, n);
    const st = await stat(p).catch(() => null);
    if (!st?.isFile()) {
      if (skipped) {
        const link = await lstat(p).catch(() => null);
        const reason = !st && link?.isSymbolicLink() ? 'a link whose target does not exist'
          : st?.isDirectory() ? 'a folder, not a file (sessions are the files directly in --sessions)'
            : !st ? 'not readable' : 'not a regular file';
        skipped.push({ file: p, reason });
      }
      continue;
    }
    out.push({ path: p, kind: await rinexKindOfFile(p) });
  }
  return out;
}

/** Folder names for the sessions: the file name without compression and observation extensions; the whole file name where two would clash. */
export function sessionNames(paths: readonly string[]): string[] {
  const clean = (s: string) => s.replace(/[^A-Za-z0-9._-]/g, '_');
  const short = paths.map((p) => clean(basename(p).replace(/\.(gz|z)$/i, '').replace(/\.(obs|rnx|crx|\d\d[od])$/i, '')));
  const wanted = short.map((s, i) => (short.filter((x) => x === s).length > 1 ? clean(basename(paths[i])) : s));
  // Names that still clash ('site 1.obs' and 'site_1.obs'; case-insensitive file systems) get -2, -3...
  const used = new Set<string>();
  return wanted.map((w) => {
    let n = w;
    for (let k = 2; used.has(n.toLowerCase()); k++) n = `${w}-${k}`;
    used.add(n.toLowerCase());
    return n;
  });
}


/** Reference observation files of a folder with their spans and station names (read once). */
export interface ReferenceCandidate { readonly path: string; readonly span: TimeSpan; readonly marker: string }
/** Navigation files of a folder with the span of their ephemeris reference times. */
export interface NavCandidate { readonly path: string; readonly span: TimeSpan }

async function referenceCandidates(files: readonly Candidate[]): Promise<ReferenceCandidate[]> {
  const out: ReferenceCandidate[] = [];
  for (const f of files) {
    if (f.kind !== 'observation') continue;
    try {
      const header = await obsHeaderOf(f.path);
      const span = await obsTimeSpan(f.path, header);
      if (span) out.push({ path: f.path, span, marker: header.markerName.trim() });
    } catch {
      // an unreadable reference candidate is not picked; the session that needed it says so
    }
  }
  return out;
}

async function navCandidates(files: readonly Candidate[]): Promise<NavCandidate[]> {
  const out: NavCandidate[] = [];
  for (const f of files) {
    if (f.kind !== 'navigation') continue;
    try {
      const { nav } = await openNav([f.path], () => {});
      let first = Infinity, last = -Infinity;
      for (const e of nav.ephemerides) {
        const t = ephemerisTimeGpsS(e);
        if (!Number.isFinite(t)) continue;
        first = Math.min(first, t);
        last = Math.max(last, t);
      }
      if (Number.isFinite(first)) out.push({ path: f.path, span: { firstGpsS: first, lastGpsS: last } });
    } catch {
      // unreadable navigation candidates are not picked
    }
  }
  return out;
}

const overlaps = (a: TimeSpan, b: TimeSpan, marginS: number) => a.firstGpsS <= b.lastGpsS + marginS && a.lastGpsS >= b.firstGpsS - marginS;

/** The reference files of --reference-dir for one session: overlapping its span (widened by the correction age limit), of one station. */
function pickReferences(all: readonly ReferenceCandidate[], span: TimeSpan, maxAgeS: number, dir: string): string[] {
  const hit = all.filter((r) => overlaps(r.span, span, maxAgeS)).sort((x, y) => x.span.firstGpsS - y.span.firstGpsS);
  if (hit.length === 0) throw new ProcessingError(`no reference observation file in ${dir} overlaps the session's time span ${utcSecondText(span.firstGpsS)} to ${utcSecondText(span.lastGpsS)}`);
  const stations = [...new Set(hit.map((r) => r.marker))];
  if (stations.length > 1) throw new ProcessingError(`reference files of several stations (${stations.join(', ')}) in ${dir} overlap the session: keep one station per --reference-dir`);
  return hit.map((r) => r.path);
}

/** The navigation files of --nav-dir whose ephemerides are within the usable window of the session (input-checks.ts NAV_WINDOW_S). */
function pickNav(all: readonly NavCandidate[], span: TimeSpan, dir: string): string[] {
  const hit = all.filter((n) => overlaps(n.span, span, NAV_WINDOW_S));
  if (hit.length === 0) throw new ProcessingError(`no navigation file in ${dir} has ephemerides for the session's time span ${utcSecondText(span.firstGpsS)} to ${utcSecondText(span.lastGpsS)}`);
  return hit.map((n) => n.path);
}

function pad(s: string, n: number): string {
  return s.length >= n ? s : s + ' '.repeat(n - s.length);
}

/** The printed table: session, epochs, solved %, points, status (reason). */
export function batchTable(records: readonly SessionRecord[]): string {
  const rows = records.map((r) => [
    r.name, r.roverEpochs === null ? '-' : String(r.roverEpochs),
    r.roverEpochs ? ((100 * (r.solvedEpochs ?? 0)) / r.roverEpochs).toFixed(1) : '-',
    String(r.points), r.status === 'ok' ? 'ok' : `${r.status}: ${r.reason}`,
  ]);
  const head = ['session', 'epochs', 'solved %', 'points', 'status'];
  const w = head.map((h, i) => Math.max(h.length, ...rows.map((r) => (i < 4 ? r[i].length : 0))));
  return [head, ...rows].map((r) => r.map((c, i) => (i < 4 ? pad(c, w[i]) : c)).join('  ')).join('\n') + '\n';
}

/** Option values echoed into the summary (what was given, as given). */
const ECHOED_OPTIONS = [
  'outputs', 'refCoord', 'marks', 'refFrame', 'refEpoch', 'roverAntennaHeight', 'refAntennaHeight',
  'heightKind', 'antennaRadius', 'slantOffset', 'atAntenna', 'elevationMask', 'weights', 'sigmaA', 'sigmaB', 'smooth', 'systems', 'glonass',
  'maxAge', 'fallbackStandalone', 'windows', 'toleranceH', 'toleranceV', 'projection', 'geoid',
] as const;

/** One session of a batch, as plain data (it may be sent to a worker thread). */
export interface BatchSessionJob {
  readonly index: number;
  readonly name: string;
  readonly file: string;
}

/** What every session of a batch shares (plain data). */
export interface BatchSessionContext {
  readonly args: BatchArgs;
  readonly refDir: string | null;
  readonly navDir: string | null;
  readonly refCandidates: readonly ReferenceCandidate[];
  readonly navCandidates: readonly NavCandidate[];
  readonly maxCorrectionAgeS: number;
}

/** A session's outcome: its record, its rows of batch-points.csv, and the sentence of a failure. */
export interface BatchSessionResult {
  readonly record: SessionRecord;
  readonly columns: readonly string[];
  readonly rows: readonly { readonly session: string; readonly cells: Record<string, string> }[];
  /** 'session NAME failed and was skipped: ...' for a failed session, else null. */
  readonly problem: string | null;
  /** The session's statement of its easting/northing CRS and its points.prj (null: none). */
  readonly projectionStatement: ProjectionStatement | null;
  readonly prjWkt: string | null;
}

/** One session's share of batch-points.csv and the CRS of its coordinates. */
export interface SessionCoordinates {
  readonly session: string;
  readonly statement: ProjectionStatement | null;
  readonly prjWkt: string | null;
  /** Latitude, longitude (degrees) and frame of its rows, for the zone that would hold them all. */
  readonly places: readonly { readonly latDeg: number; readonly lonDeg: number; readonly frame: string }[];
}

/** What batch-points.csv states of its coordinates' CRS. */
export interface CombinedCrs {
  /** The grid_crs value of each session (empty without a projection); the column is written whenever a projection was given. */
  readonly gridCrsOf: ReadonlyMap<string, string>;
  readonly hasGrid: boolean;
  /** The one grid statement every row shares, else null. */
  readonly statement: ProjectionStatement | null;
  /** batch-points.prj: the .prj every session wrote, when they all wrote the same one. */
  readonly prjWkt: string | null;
  readonly notes: readonly string[];
  /** A warning sentence when the rows' easting/northing are in more than one CRS. */
  readonly warning: string | null;
}

/** 'EPSG:32629' for grid coordinates in an EPSG CRS, else the name the session's metadata gives ('unknown datum / UTM zone 29N'). */
function gridCrsValue(st: ProjectionStatement): string {
  return st.epsg !== null ? `EPSG:${st.epsg}` : st.name;
}

/**
 * The CRS of batch-points.csv. With --projection utm, sessions far apart fall in different zones (each
 * takes the zone of its first point), and rows of different grids in the same easting/northing columns
 * would be read as one grid by anyone: so a grid_crs column names each row's CRS (always, so the table's
 * columns do not depend on where the sessions were), the .prj is written only when every session's is
 * the same, and rows in several grids get a warning naming the sessions of each and the one projection
 * that would hold them all.
 */
export function combinedCrs(sessions: readonly SessionCoordinates[], projectionOption: string | undefined): CombinedCrs {
  const gridCrsOf = new Map<string, string>();
  const bySpace = new Map<string, { statement: ProjectionStatement; sessions: string[] }>();
  for (const s of sessions) {
    if (!s.statement) continue;
    const v = gridCrsValue(s.statement);
    gridCrsOf.set(s.session, v);
    const g = bySpace.get(v) ?? { statement: s.statement, sessions: [] };
    bySpace.set(v, g);
    g.sessions.push(s.session);
  }
  const prjs = new Set(sessions.map((s) => s.prjWkt));
  const prjWkt = prjs.size === 1 ? [...prjs][0] ?? null : null;
  const hasGrid = bySpace.size > 0;
  if (bySpace.size <= 1) {
    const one = [...bySpace.values()][0];
    return {
      gridCrsOf, hasGrid, statement: one?.statement ?? null, prjWkt, warning: null,
      notes: one ? [`easting/northing of every row are in ${one.statement.name} (grid_crs ${gridCrsValue(one.statement)})${prjWkt ? '; batch-points.prj states it' : ''}`] : [],
    };
  }
  const groups = [...bySpace.values()].map((g) => `${g.statement.name}: ${g.sessions.join(', ')}`);
  const warning = `batch-points.csv holds easting/northing in ${bySpace.size} different grids, named per row in its grid_crs column (${groups.join('; ')}): ` +
    `rows of different grids cannot be mapped or compared together, and no batch-points.prj is written. ${oneGridHint(sessions, projectionOption)}`;
  return {
    gridCrsOf, hasGrid, statement: null, prjWkt: null, warning,
    notes: [`easting/northing are in ${bySpace.size} different CRSs: the grid_crs column gives each row's (no batch-points.prj; each session's points.prj states its own)`],
  };
}

/**
 * How to get one grid: with 'utm' over several zones, the zone holding most rows (in the EPSG UTM CRS of
 * their frame); otherwise (one zone, or a fixed projection) the grids differ because the frames do.
 */
function oneGridHint(sessions: readonly SessionCoordinates[], projectionOption: string | undefined): string {
  const counts = new Map<string, number>();
  const zones = new Set<string>();
  for (const s of sessions) {
    for (const p of s.places) {
      let code: number;
      try {
        const z = utmZoneFor(p.latDeg, p.lonDeg);
        zones.add(`${z.zone}${z.south ? 'S' : 'N'}`);
        code = utmEpsgOfFrame(p.frame, z.zone, z.south) ?? (z.south ? 32700 : 32600) + z.zone;
      } catch {
        continue;
      }
      counts.set(`EPSG:${code}`, (counts.get(`EPSG:${code}`) ?? 0) + 1);
    }
  }
  if (projectionOption?.trim().toLowerCase() !== 'utm' || zones.size <= 1) {
    return 'The sessions are in different frames (frame column), and the grid follows each frame: bring the reference coordinates into one frame for one grid';
  }
  const best = [...counts].sort((a, b) => b[1] - a[1])[0];
  return `--projection utm takes each session's zone from its first point; for one grid, run again with --projection ${best ? best[0] : 'EPSG:<code>'}` +
    `${best ? ` (the zone of ${best[1]} of the ${[...counts.values()].reduce((a, b) => a + b, 0)} points)` : ''}, and points outside that zone are then warned of`;
}

/** One points run of a batch; a failure becomes a failed record (a UsageError is thrown: it would fail every session). */
export async function runBatchSession(job: BatchSessionJob, ctx: BatchSessionContext, cfg: PointsConfig, rep: Reporter): Promise<BatchSessionResult> {
  const { name, file } = job;
  const a = ctx.args;
  const srep = rep.child({ session: name }, `[${name}] `);
  let references: readonly string[] = a.reference ?? [];
  let navs: readonly string[] = a.nav ?? [];
  try {
    if (ctx.refDir || ctx.navDir) {
      const probeWarnings: Warning[] = [];
      const header = await obsHeaderOf(file, (w) => probeWarnings.push(w));
      const span = await obsTimeSpan(file, header, (w) => probeWarnings.push(w));
      if (!span) throw new InputError(file, 0, noEpochSentence(file, probeWarnings));
      if (ctx.refDir) references = pickReferences(ctx.refCandidates, span, ctx.maxCorrectionAgeS, ctx.refDir);
      if (ctx.navDir) navs = pickNav(ctx.navCandidates, span, ctx.navDir);
    }
    srep.info(`session ${name}: ${file} against ${references.map((p) => basename(p)).join(', ')}`);
    const r = await runPointsSession({ ...a, rover: file, reference: references, nav: navs, out: join(resolve(a.out), name) }, cfg, srep, 'batch-session');
    if (r.failure) throw new ProcessingError(r.failure);
    const rows = r.rows.map((row) => ({ session: name, cells: Object.fromEntries(r.columns.map((c, k) => [c, row[k] ?? ''])) }));
    // A session whose inputs lost observations in reading is processed, but says so in its status.
    const lost = dataLost(srep.warnings, srep.warningTally);
    const status = lost ? 'incomplete-input' : 'ok';
    srep.event('session', { status, file, epochs: r.roverEpochs, solved_epochs: r.solvedEpochs, points: r.points.length, out: r.outDir, ...(lost ? { reason: lost.sentence } : {}) });
    return {
      record: { name, file, status, reason: lost ? lost.sentence : null, roverEpochs: r.roverEpochs, solvedEpochs: r.solvedEpochs, points: r.points.length, out: r.outDir, referenceFiles: references, navFiles: navs },
      columns: r.columns, rows, problem: null, projectionStatement: r.projectionStatement, prjWkt: r.prjWkt,
    };
  } catch (e) {
    // The same wrong command line would fail every session: stop with exit 2.
    if (e instanceof UsageError) throw e;
    const sentence = describeFailure(e).sentence;
    const reason = sentence.includes(file) || sentence.includes(basename(file)) ? sentence : `${file}: ${sentence}`;
    srep.event('session', { status: 'failed', file, reason });
    return {
      record: { name, file, status: 'failed', reason, roverEpochs: null, solvedEpochs: null, points: 0, out: null, referenceFiles: references, navFiles: navs },
      columns: [], rows: [], problem: `session ${name} failed and was skipped: ${reason}`, projectionStatement: null, prjWkt: null,
    };
  }
}

export async function runBatch(a: BatchArgs, rep: Reporter): Promise<number> {
  // 1. The command line, checked once for all sessions.
  if (a.sessions === undefined || String(a.sessions).trim() === '') throw new UsageError('give the folder of rover sessions with --sessions DIR');
  const refFiles = a.reference ?? [];
  const navFiles = a.nav ?? [];
  if (refFiles.length && a.referenceDir !== undefined) throw new UsageError('give the reference files one way only: --reference FILE... or --reference-dir DIR');
  if (!refFiles.length && a.referenceDir === undefined) throw new UsageError('give the reference observation files with --reference FILE... or --reference-dir DIR');
  if (navFiles.length && a.navDir !== undefined) throw new UsageError('give the navigation files one way only: --nav FILE... or --nav-dir DIR');
  if (!navFiles.length && a.navDir === undefined) throw new UsageError('give the navigation files with --nav FILE... or --nav-dir DIR');
  parseReferenceChoice(a);
  const base = parseSessionOptions(a);
  parseAntennaHeights(a);
  const outputKinds = parseOutputs(a.outputs);
  parseJobs(a.jobs);
  const cfg: PointsConfig = await parsePointsConfig({ ...a, rover: '', reference: [], nav: [] });
  const sessionsDir = resolve(String(a.sessions));
  const outDir = resolve(a.out);

  // 2. The sessions, recognised by content; other files are skipped with a note.
  const skipped: { file: string; reason: string }[] = [];
  const files = await folderFiles(sessionsDir, '--sessions', skipped);
  const sessionFiles: string[] = [];
  for (const f of files) {
    if (f.kind === 'observation' || (f.kind === 'other' && looksLikeObservationName(basename(f.path)))) sessionFiles.push(f.path);
    else skipped.push({ file: f.path, reason: f.kind === 'navigation' ? 'a navigation file, not a rover observation file' : 'not a RINEX observation file' });
  }
  for (const s of skipped) rep.info(`note: skipping ${s.file}: ${s.reason}`);
  if (sessionFiles.length === 0) throw new ProcessingError(`no observation file in ${sessionsDir}: nothing to process`);
  rep.event('start', { command: 'batch', sessions: sessionsDir, count: sessionFiles.length, out: outDir });
  const refDir = a.referenceDir === undefined ? null : resolve(String(a.referenceDir));
  const navDir = a.navDir === undefined ? null : resolve(String(a.navDir));
  const refCandidates = refDir ? await referenceCandidates(await folderFiles(refDir, '--reference-dir')) : [];
  const navCands = navDir ? await navCandidates(await folderFiles(navDir, '--nav-dir')) : [];

  // 3. One points run per session, in parallel over --jobs worker threads; a failure is reported and
  // the next session goes on. Results come back in session order, as from a serial run.
  const names = sessionNames(sessionFiles);
  const renamed: { file: string; folder: string }[] = [];
  for (const [i, file] of sessionFiles.entries()) {
    const plain = sessionNames([file])[0];
    if (names[i] !== plain && names[i] !== basename(file).replace(/[^A-Za-z0-9._-]/g, '_')) {
      renamed.push({ file, folder: names[i] });
      rep.info(`note: the folder name of ${file} would clash with another session's: its outputs go to ${join(outDir, names[i])}`);
    }
  }
  const folder = await prepareOutputFolder({
    dir: outDir, inputs: [...sessionFiles, ...refFiles, ...navFiles],
    outputNames: [...Object.values(BATCH_FILE_NAMES), BATCH_PRJ_FILE_NAME, ...names.flatMap((n) => ['epochs.csv', 'residuals.csv', 'positions.geojson', 'summary.json', 'points.csv', 'points.geojson'].map((f) => join(n, f)))],
    estimatedBytes: 0,
  });
  const beside = inputsInsideWarning(outDir, folder.inputsInside);
  if (beside) rep.warn(beside);
  // The batch index describes the session folders of one run: it goes before the first of them changes,
  // and the new one is committed at the end.
  for (const f of [...Object.values(BATCH_FILE_NAMES), BATCH_PRJ_FILE_NAME, REPORT_FILE_NAME]) await rm(join(outDir, f), { force: true });
  const records: SessionRecord[] = [];
  const batchRows: { session: string; cells: Record<string, string> }[] = [];
  let columns: string[] | null = null;
  const coordinates: SessionCoordinates[] = [];
  const context: BatchSessionContext = { args: a, refDir, navDir, refCandidates, navCandidates: navCands, maxCorrectionAgeS: base.maxCorrectionAgeS };
  const jobs = sessionFiles.map((file, index) => ({ index, name: names[index], file }));
  await runBatchSessions(jobs, context, cfg, rep, parseJobs(a.jobs), (r) => {
    records.push(r.record);
    if (r.record.status !== 'failed') columns ??= [...r.columns];
    batchRows.push(...r.rows);
    if (r.record.status !== 'failed' && r.rows.length > 0) {
      coordinates.push({
        session: r.record.name, statement: r.projectionStatement, prjWkt: r.prjWkt,
        places: r.rows.map((x) => ({ latDeg: Number(x.cells.latitude_deg), lonDeg: Number(x.cells.longitude_deg), frame: x.cells.frame ?? '' })),
      });
    }
    if (r.problem) rep.problem(r.problem);
  });

  // 4. The table; the batch files as one set (summary last), unless no session could be processed.
  const processed = records.filter((r) => r.status !== 'failed');
  const incomplete = records.filter((r) => r.status === 'incomplete-input');
  const failed = records.filter((r) => r.status === 'failed');
  rep.result(batchTable(records));
  if (processed.length === 0) {
    rep.failure(`none of the ${records.length} session(s) in ${sessionsDir} could be processed; nothing was written to ${outDir}`, EXIT_PROCESSING);
    rep.event('done', { exit_code: EXIT_PROCESSING });
    return EXIT_PROCESSING;
  }
  const crs = combinedCrs(coordinates, a.projection === undefined ? undefined : String(a.projection));
  if (crs.warning) rep.warn({ code: 'batch-grids-differ', message: crs.warning });
  const sessionColumns = columns ?? [];
  // grid_crs follows northing_m: the CRS beside the coordinates it names.
  const cols = ['session', ...(crs.hasGrid ? sessionColumns.flatMap((c) => (c === 'northing_m' ? [c, 'grid_crs'] : [c])) : sessionColumns)];
  const cell = (r: { session: string; cells: Record<string, string> }, c: string) => (c === 'grid_crs' ? crs.gridCrsOf.get(r.session) ?? '' : r.cells[c] ?? '');
  const pointsCsv = csvText([cols, ...batchRows.map((r) => [r.session, ...cols.slice(1).map((c) => cell(r, c))])]);
  const set = new OutputSet();
  const pointsPath = join(outDir, BATCH_FILE_NAMES.points);
  const pointsFile = await set.add('batch-points', pointsPath, [pointsCsv]);
  const meta = tableMetadata({
    file: BATCH_FILE_NAMES.points, title: 'refdelta batch points: every point of every session of the batch, one row each', columns: cols, frame: null,
    ...(crs.statement ? { projection: crs.statement } : {}),
    notes: [
      `sessions from ${sessionsDir}; frame and frame_epoch are given per row (each session's own reference frame)`,
      ...crs.notes,
      "orthometric heights, when present, follow each session's geoid, and each session's own points.csv.meta.json says more: see OUT/<session>/points.csv.meta.json",
    ],
  });
  await set.add('batch-points-csvt', join(outDir, 'batch-points.csvt'), [csvtText(cols)]);
  if (crs.prjWkt) await set.add('batch-points-prj', join(outDir, BATCH_PRJ_FILE_NAME), [crs.prjWkt + '\n']);
  await set.add('batch-points-metadata', join(outDir, metadataFileName(BATCH_FILE_NAMES.points)), [JSON.stringify(meta, null, 2) + '\n']);
  const summaryPath = join(outDir, BATCH_FILE_NAMES.summary);
  try {
    const p = await pointsFile.seal();
    const index = outputKinds.includes('report')
      ? await (await set.add('batch-report', join(outDir, REPORT_FILE_NAME), [batchIndexHtml(outDir, basename(outDir), records, (r) => r.status !== 'failed')])).seal()
      : null;
    const given = Object.fromEntries(ECHOED_OPTIONS.filter((k) => (a as unknown as Record<string, unknown>)[k] !== undefined).map((k) => [k, (a as unknown as Record<string, unknown>)[k]]));
    const doc = {
      software: { ...SOFTWARE }, created_utc: new Date().toISOString(),
      sessions_folder: sessionsDir,
      reference: refDir ? { folder: refDir, picked: 'per session: the observation files whose time span overlaps it (widened by --max-age)' } : { files: refFiles.map((f) => resolve(f)) },
      navigation: navDir ? { folder: navDir, picked: 'per session: the navigation files with ephemerides within 4 h of its span' } : { files: navFiles.map((f) => resolve(f)) },
      options: given,
      counts: { sessions: records.length, ok: processed.length - incomplete.length, incomplete_input: incomplete.length, failed: failed.length, skipped_files: skipped.length, points: batchRows.length },
      sessions: records.map((r) => ({
        name: r.name, file: r.file, status: r.status, reason: r.reason, rover_epochs: r.roverEpochs, solved_epochs: r.solvedEpochs,
        solved_percent: r.roverEpochs ? Math.round((1000 * (r.solvedEpochs ?? 0)) / r.roverEpochs) / 10 : null, points: r.points,
        out: r.out, summary: r.out ? join(r.out, 'summary.json') : null, reference_files: r.referenceFiles.map((f) => resolve(f)), nav_files: r.navFiles.map((f) => resolve(f)),
      })),
      skipped_files: skipped,
      renamed_session_folders: renamed,
      outputs: [
        { kind: 'batch-points', path: p.path, bytes: p.bytes, sha256: p.sha256 },
        ...(index ? [{ kind: 'batch-report', path: index.path, bytes: index.bytes, sha256: index.sha256 }] : []),
        { kind: 'batch-summary', path: summaryPath, bytes: null, sha256: null },
      ],
    };
    await set.add('batch-summary', summaryPath, [JSON.stringify(doc, null, 2) + '\n']);
    for (const { kind, written } of await set.commit()) rep.event('output', { kind, path: written.path, bytes: written.bytes, sha256: written.sha256 });
  } catch (e) {
    await set.abort();
    throw e;
  }
  rep.info(`${processed.length} of ${records.length} session(s) processed; ${batchRows.length} point(s) in ${pointsPath}; summary in ${summaryPath}`);
  if (incomplete.length) rep.info(`${incomplete.length} session(s) with incomplete input (observations lost while reading; results cover only what was read): ${incomplete.map((r) => r.name).join(', ')}`);
  if (failed.length) {
    rep.failure(`${failed.length} of ${records.length} session(s) failed: ${failed.map((r) => r.name).join(', ')} (reasons above and in ${summaryPath})`, EXIT_BATCH_PARTIAL);
    rep.event('done', { exit_code: EXIT_BATCH_PARTIAL, summary: summaryPath });
    return EXIT_BATCH_PARTIAL;
  }
  rep.event('done', { exit_code: EXIT_OK, summary: summaryPath });
  return EXIT_OK;
}
