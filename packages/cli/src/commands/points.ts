/**
 * `refdelta points`: a solve run (same inputs, options and per-epoch outputs as `solve`) followed by the
 * per-point results: occupations from --windows, else the rover file's event flags (3 new occupation,
 * 2 start moving), else static spans detected from the Doppler speed (points/occupations.ts,
 * DEFAULT_STATIC_DETECTION); one robust mean per occupation with its precision; optional projection
 * and geoid heights; points.csv and points.geojson written atomically into --out.
 */
import { readFile } from 'node:fs/promises';
import { basename, join } from 'node:path';
import { csvText } from '../csv-text.js';
import {
  DEFAULT_POINT_TOLERANCE_H_M, DEFAULT_POINT_TOLERANCE_V_M, DEFAULT_STATIC_DETECTION, EGM96_NOT_A_DATUM_NOTE,
  InputError, loadEgm96, looksLikeIsg, looksLikeTiff, makeProjection, parseGeoTiffGeoid, parseIsgGrid, parseOccupationCsv, pointRow, pointsColumns, pointsGeoJson,
  crsOfFrame, csvtText, gridAreaWarning, gridCrsOf, type GridCrs, metadataFileName, pointsMetadata, POINTS_OUTPUT_FORMATS, radToDeg, resolveProjectionSpec, splitOccupations, summariseOccupations,
  type EpochMark, type EpochSolution, type FrameEpoch, type GeoidModel, type OccupationWindow, type OutputFileRecord, type PointEpoch,
  type PointReference, type PointResult, type Projection, ProcessingError, ecefToGeodetic, type GeodeticRad, sigmaRescaleFactor, WindowPointNames,
  pointsRunScatter, scatterJson, type Warning, withPointsRun,
} from '@refdelta/core';
import { requireFile } from '../node-io.js';
import { epsgLookup, epsgWkt } from '../epsg-lookup.js';
import { parseNumber } from '../parse-values.js';
import { Reporter } from '../reporter.js';
import { EXIT_OK, EXIT_PROCESSING } from '../exit-codes.js';
import { UsageError } from '../usage-error.js';
import { parseSlantGeometry, type SlantGeometry } from '../solve-options.js';
import { commitStagedSolve, outputNames, reportSolveCounts, stageSolve, type SolveArgs } from './solve.js';

export interface PointsArgs extends SolveArgs {
  readonly windows?: unknown;
  readonly toleranceH?: unknown;
  readonly toleranceV?: unknown;
  readonly projection?: unknown;
  readonly geoid?: unknown;
}

export const POINTS_FILE_NAMES = { csv: 'points.csv', geojson: 'points.geojson', prj: 'points.prj' } as const;

/** What a points run keeps of every epoch solution (the run's epoch sink). */
class Collected {
  readonly epochs: PointEpoch[] = [];
  readonly marks: EpochMark[] = [];
  frame: FrameEpoch | null = null;
  constructor(public pointReference: PointReference) {}

  add(s: EpochSolution): void {
    collect(this, s);
  }
}

function collect(c: Collected, s: EpochSolution): void {
  if (s.position && s.kind !== 'none') {
    const vf = sigmaRescaleFactor(s.kind, s.quality);
    c.epochs.push({ tagGpsS: s.tagGpsS, ecef: s.position.ecef, kind: s.kind, pdop: s.dops?.pdop ?? NaN, ...(s.baselineEcef ? { baselineM: Math.hypot(s.baselineEcef.x, s.baselineEcef.y, s.baselineEcef.z) } : {}), antennaHeightM: s.antennaHeightM, frame: s.position.frame, ...(s.sigmaEnuM ? { sigmaEnuM: s.sigmaEnuM } : {}), ...(vf !== undefined ? { varianceFactor: vf } : {}) });
    if (!c.frame && s.kind !== 'standalone') c.frame = s.position.frame;
  }
  c.pointReference = s.pointReference;
  c.marks.push({
    tGpsS: s.tagGpsS,
    ...(s.occupationEvent ? { event: { kind: s.occupationEvent, ...(s.occupationEvent === 'new-occupation' ? { markerName: s.pointName } : {}) } } : {}),
    speedMS: s.speedMS,
  });
}

/**
 * The session a run's detected points are named after: in a batch its session (the folder its outputs go
 * to is named so), else the rover file's name without compression and observation extensions, made as a
 * batch names its session folders.
 */
function sessionNameOf(rover: string, outDir: string, command: string): string {
  if (command === 'batch-session') return basename(outDir);
  return basename(rover).replace(/\.(gz|z)$/i, '').replace(/\.(obs|rnx|crx|\d\d[od])$/i, '').replace(/[^A-Za-z0-9._-]/g, '_');
}

/** One sentence, before the run, when a user geoid grid does not cover the reference point. */
function requireGeoidCovers(g: GeoidModel, spec: string, at: GeodeticRad): void {
  try {
    g.undulationM(radToDeg(at.latRad), radToDeg(at.lonRad));
  } catch (e) {
    if (e instanceof RangeError) throw new ProcessingError(`the geoid grid ${spec} does not cover the survey area (checked at the reference point): ${e.message}`);
    throw e;
  }
}

async function loadGeoid(spec: string): Promise<GeoidModel> {
  if (spec.toLowerCase() === 'egm96') return loadEgm96();
  await requireFile(spec);
  const bytes = await readFile(spec);
  if (looksLikeTiff(bytes)) {
    try { return await parseGeoTiffGeoid(spec, bytes); } catch (e) { throw new InputError(spec, 0, e instanceof Error ? e.message : String(e)); }
  }
  const text = bytes.toString('utf8');
  if (looksLikeIsg(text)) return parseIsgGrid(spec, text);
  throw new InputError(spec, 1, 'expected a geoid grid in the ISG format (a begin_of_head header) or a GeoTIFF grid as PROJ distributes them');
}

/** The options of `points` checked once before any run (a batch checks them once for all sessions). */
export interface PointsConfig {
  readonly toleranceHM: number;
  readonly toleranceVM: number;
  readonly projectionSpec?: string;
  readonly geoidSpec?: string;
  readonly slant?: SlantGeometry;
  readonly windowsFile?: string;
  readonly windows?: readonly OccupationWindow[];
  /** Warnings of the windows file (overlapping windows), said by each run that uses it. */
  readonly windowsWarnings?: readonly Warning[];
  /** The geoid model, loaded on first use and kept. */
  readonly geoid: () => Promise<GeoidModel | undefined>;
}

export async function parsePointsConfig(a: PointsArgs): Promise<PointsConfig> {
  const toleranceHM = a.toleranceH === undefined ? DEFAULT_POINT_TOLERANCE_H_M : parseNumber('tolerance-h', a.toleranceH, 0, 1000);
  const toleranceVM = a.toleranceV === undefined ? DEFAULT_POINT_TOLERANCE_V_M : parseNumber('tolerance-v', a.toleranceV, 0, 1000);
  const projectionSpec = a.projection === undefined ? undefined : String(a.projection);
  if (projectionSpec !== undefined) {
    let spec;
    try { spec = resolveProjectionSpec(projectionSpec, { latDeg: 0, lonDeg: 0 }, epsgLookup); } catch (e) { throw new UsageError(`--projection ${projectionSpec}: ${e instanceof Error ? e.message : String(e)}`); }
    // Latitude/longitude are already in every output: a geographic CRS would put degrees into easting_m.
    if (spec.units !== 'm') throw new UsageError(`--projection ${projectionSpec}: ${spec.name} is a geographic CRS, not a map projection (latitude_deg and longitude_deg already hold geographic coordinates): give a projected CRS, e.g. utm or the EPSG code of a grid`);
  }
  const geoidSpec = a.geoid === undefined ? undefined : String(a.geoid);
  if (geoidSpec !== undefined && geoidSpec.toLowerCase() !== 'egm96') await requireFile(geoidSpec);
  const slant = parseSlantGeometry(a);
  if (String(a.outputs ?? '').toLowerCase().split(',').map((x) => x.trim()).includes('dxf') && projectionSpec === undefined) {
    throw new UsageError('--outputs dxf holds grid coordinates: give --projection (an EPSG code or utm)');
  }
  let windows: OccupationWindow[] | undefined;
  let windowsFile: string | undefined;
  const windowsWarnings: Warning[] = [];
  if (a.windows !== undefined) {
    windowsFile = String(a.windows);
    await requireFile(windowsFile);
    windows = parseOccupationCsv(windowsFile, await readFile(windowsFile, 'utf8'), (w) => windowsWarnings.push(w));
    if (windows.length === 0) throw new UsageError(`--windows ${windowsFile} holds no occupation window`);
    if (windows.some((w) => w.heightKind === 'slant') && slant === undefined) throw new UsageError(`--windows ${windowsFile} has slant heights: give --antenna-radius M (and --slant-offset M when the ARP is not at the height of the measuring point)`);
  }
  let geoid: Promise<GeoidModel> | undefined;
  return {
    toleranceHM, toleranceVM, slant,
    ...(projectionSpec !== undefined ? { projectionSpec } : {}), ...(geoidSpec !== undefined ? { geoidSpec } : {}),
    ...(windows ? { windows, windowsFile, windowsWarnings } : {}),
    geoid: () => (geoidSpec === undefined ? Promise.resolve(undefined) : (geoid ??= loadGeoid(geoidSpec))),
  };
}

/** What one `points` run gave: the per-point rows (for a batch table) and the files committed. */
export interface PointsSessionOutcome {
  readonly outDir: string;
  readonly roverEpochs: number;
  readonly solvedEpochs: number;
  /** The sentence of a run that wrote nothing (no epoch solved, no point found), else null. */
  readonly failure: string | null;
  readonly points: readonly PointResult[];
  readonly columns: readonly string[];
  readonly rows: readonly (readonly string[])[];
  readonly outputs: readonly OutputFileRecord[];
  /** What points.csv.meta.json says of easting/northing (null without --projection), for a batch's combined table. */
  readonly projectionStatement: ProjectionStatement | null;
  /** The WKT of points.prj (null when none is written). */
  readonly prjWkt: string | null;
}

/** The metadata's statement of the grid coordinates' CRS (table-metadata.ts `projection`). */
export interface ProjectionStatement { readonly epsg: number | null; readonly name: string; readonly definition: string; readonly datum?: string }

/**
 * One `points` run: the solve run staged, occupations, per-point means, then the solve outputs, points.csv,
 * points.geojson and summary.json committed as one set. A run without a solved epoch or without a
 * point commits nothing (earlier outputs stay) and returns its sentence in `failure`; input problems
 * are thrown (InputError, ProcessingError) as by solve.
 */
export async function runPointsSession(a: PointsArgs, cfg: PointsConfig, rep: Reporter, command = 'points'): Promise<PointsSessionOutcome> {
  const c = new Collected(a.atAntenna === true ? 'antenna-reference-point' : 'ground-mark');
  const st = await stageSolve(a, rep, {
    command, epochSink: c, extraOutputNames: Object.values(POINTS_FILE_NAMES),
    beforeRun: async (refEcef) => {
      // The geoid grid is read, and must cover the survey area, before the run (not after it).
      const g = await cfg.geoid();
      if (g && cfg.geoidSpec) requireGeoidCovers(g, cfg.geoidSpec, ecefToGeodetic(refEcef));
    },
    extraInputs: [...(cfg.windowsFile ? [cfg.windowsFile] : []), ...(cfg.geoidSpec && cfg.geoidSpec.toLowerCase() !== 'egm96' ? [cfg.geoidSpec] : [])],
    // With windows, the per-epoch outputs name each epoch by the window holding it (not the rover's marker name).
    ...(cfg.windows ? { pointNames: new WindowPointNames(cfg.windows, `the windows file ${cfg.windowsFile}`) } : {}),
  });
  const failed = (failure: string): PointsSessionOutcome => ({
    outDir: st.outDir, roverEpochs: st.summary.epochsRover, solvedEpochs: st.solvedEpochs, failure, points: [], columns: [], rows: [], outputs: [], projectionStatement: null, prjWkt: null,
  });
  try {
    for (const w of cfg.windowsWarnings ?? []) rep.warn(w);
    reportSolveCounts(st, rep);
    if (st.failure) {
      await st.set.abort();
      return failed(st.failure);
    }

    // Occupations.
    const marks = c.marks;
    const hasEvents = marks.some((m) => m.event);
    if (!cfg.windows && !hasEvents) {
      const withSpeed = marks.filter((m) => Number.isFinite(m.speedMS)).length;
      rep.info(`static detection on the Doppler speed of ${withSpeed} of ${marks.length} epochs (a point starts below ${DEFAULT_STATIC_DETECTION.enterBelowMS} m/s and ends above ${DEFAULT_STATIC_DETECTION.leaveAboveMS} m/s)`);
    }
    const occupations = splitOccupations({
      epochs: marks, ...(cfg.windows ? { windows: cfg.windows } : {}), initialMarkerName: st.roverHeader.markerName,
      detectedNamePrefix: `${sessionNameOf(a.rover, st.outDir, command)}-`,
    }, { onWarning: rep.warn });
    if (occupations.length === 0) {
      const why = cfg.windows ? 'no window holds an epoch' : hasEvents ? 'the event flags mark no occupation' : 'no static span was found in the Doppler speed (or the rover file has no Doppler)';
      await st.set.abort();
      return failed(`no point found in ${a.rover}: ${why}; give the occupation times with --windows FILE`);
    }
    const frame = c.frame ?? { name: 'WGS84 (broadcast orbits)', epochYear: NaN };
    const outcome = summariseOccupations(c.epochs, occupations, {
      pointReference: c.pointReference, frame, horizontalToleranceM: cfg.toleranceHM, verticalToleranceM: cfg.toleranceVM,
      referenceSigma: st.referenceSigma,
      // core AntennaGeometry: the slant point's height above the ARP is minus --slant-offset.
      ...(cfg.slant ? { antenna: { radiusM: cfg.slant.radiusM, slantPointAboveArpM: -cfg.slant.arpAboveSlantPointM } } : {}),
    });
    for (const o of outcome.empty) rep.warn({ code: 'occupation-without-solution', message: `occupation ${o.name} (${o.source}) has no solved epoch: no point written` });
    if (outcome.points.length === 0) {
      await st.set.abort();
      return failed(`no point could be computed from ${a.rover}: none of the occupations has a solved epoch`);
    }

    // Projection and geoid.
    let projection: Projection | undefined;
    let grid: GridCrs | undefined;
    if (cfg.projectionSpec !== undefined) {
      const g = outcome.points[0].summary.meanGeodetic;
      projection = makeProjection(cfg.projectionSpec, { latDeg: radToDeg(g.latRad), lonDeg: radToDeg(g.lonRad) }, epsgLookup, frame.name);
      grid = gridCrsOf(projection, frame, (code) => epsgWkt(code));
      if (grid.warning) rep.warn({ code: grid.datum === 'unstated' ? 'projection-datum-unstated' : 'projection-datum', message: grid.warning });
      const outside = gridAreaWarning(projection, outcome.points.map((p) => ({ name: p.name, latDeg: radToDeg(p.summary.meanGeodetic.latRad), lonDeg: radToDeg(p.summary.meanGeodetic.lonRad) })));
      if (outside) rep.warn({ code: 'projection-area', message: outside });
    }
    // A PROJ string's own datum shift is not applied either.
    if (projection && grid?.datum === 'as-given' && /\+(towgs84=(?!0,0,0(,0,0,0,0)?\b)|nadgrids=)/.test(projection.projString)) {
      rep.warn({ code: 'projection-datum', message: `${projection.name} is on a datum other than the points' frame ${frame.name}: latitude/longitude are projected as they are, without a datum shift (transform the points into that datum first for true grid coordinates)` });
    }
    const geoid = await cfg.geoid();

    // The files, added to the solve run's set and committed with it (summary.json last).
    const table = {
      frame, horizontalToleranceM: cfg.toleranceHM, verticalToleranceM: cfg.toleranceVM,
      ...(projection ? { projection } : {}), ...(grid ? { grid } : {}), ...(geoid ? { geoid } : {}),
      notes: [`occupations from ${occupations[0].source === 'windows' ? `the windows file ${cfg.windowsFile}` : occupations[0].source === 'events' ? 'the RINEX event flags of the rover file' : 'static detection on the Doppler speed'}`],
    };
    const columns = pointsColumns(table);
    let rows: string[][];
    try {
      rows = outcome.points.map((p) => pointRow(p, table));
    } catch (e) {
      if (e instanceof RangeError && cfg.geoidSpec) throw new ProcessingError(`the geoid grid ${cfg.geoidSpec} does not cover every point: ${e.message}`);
      throw e;
    }
    await st.set.add('points', join(st.outDir, POINTS_FILE_NAMES.csv), [csvText([columns, ...rows])]);
    await st.set.add('points-csvt', join(st.outDir, 'points.csvt'), [csvtText(columns)]);
    const metadata = pointsMetadata(table);
    await st.set.add('points-metadata', join(st.outDir, metadataFileName(POINTS_FILE_NAMES.csv)), [JSON.stringify(metadata, null, 2) + '\n']);
    // The .prj states the CRS the grid coordinates are in (grid-crs.ts) with a projection, else the frame's
    // geographic CRS; none for an unstated frame without a projection (never WGS 84 by default).
    const frameCrs = crsOfFrame(frame.name);
    const prj = grid ? grid.wkt : frameCrs ? epsgWkt(frameCrs.geographic2d) : null;
    if (prj) await st.set.add('points-prj', join(st.outDir, POINTS_FILE_NAMES.prj), [prj + '\n']);
    else if (projection) rep.warn({ code: 'no-prj', message: `no .prj written for the projection ${projection.name}: its WKT is not known (give an EPSG code)` });
    await st.set.add('points-geojson', join(st.outDir, POINTS_FILE_NAMES.geojson), [JSON.stringify(pointsGeoJson(outcome.points, table), null, 1) + '\n']);
    for (const f of POINTS_OUTPUT_FORMATS) {
      if (!st.kinds.includes(f.kind)) continue;
      const why = f.refuse(table);
      if (why) throw new UsageError(`--outputs ${f.kind}: ${why}`);
      await st.set.add(`points-${f.kind}`, join(st.outDir, f.fileName), [f.build({ points: outcome.points, table, columns, rows })]);
    }
    st.extras = {
      points: {
        columns, rows,
        lonLatH: outcome.points.map((p) => [radToDeg(p.summary.meanGeodetic.lonRad), radToDeg(p.summary.meanGeodetic.latRad), p.summary.meanGeodetic.heightM] as const),
      },
    };
    // summary.json states the points stage's options, grid CRS and heights, and the scatter about each point's mean.
    const scatter = scatterJson(pointsRunScatter(c.epochs, outcome.points));
    const outputs = await commitStagedSolve({ ...st, summaryDoc: (outs) => withPointsRun(st.summaryDoc(outs), cfg, table, scatter) }, rep);

    if (geoid && /egm96/i.test(geoid.name)) rep.info(`note: ${EGM96_NOT_A_DATUM_NOTE}`);
    for (const p of outcome.points) {
      const g = p.summary.meanGeodetic;
      rep.info(`point ${p.name} (${p.source}): ${p.summary.epochs} epochs, ${radToDeg(g.latRad).toFixed(8)} ${radToDeg(g.lonRad).toFixed(8)} ${g.heightM.toFixed(3)} m, ` +
        `sigma mean E/N/U ${p.summary.sigmaMeanEastM.toFixed(3)}/${p.summary.sigmaMeanNorthM.toFixed(3)}/${p.summary.sigmaMeanUpM.toFixed(3)} m, ${p.tolerance}`);
    }
    rep.info(`${outcome.points.length} point(s); outputs in ${st.outDir}: ${outputNames(outputs)}`);
    const statement = (metadata as { projection?: ProjectionStatement & { applied?: string } }).projection;
    const projectionStatement = statement ? { epsg: statement.epsg, name: statement.name, definition: statement.definition, ...(statement.datum !== undefined ? { datum: statement.datum } : {}) } : null;
    return { outDir: st.outDir, roverEpochs: st.summary.epochsRover, solvedEpochs: st.solvedEpochs, failure: null, points: outcome.points, columns, rows, outputs, projectionStatement, prjWkt: prj };
  } catch (e) {
    await st.set.abort();
    throw e;
  }
}

/** `refdelta points`: one run; exit 1 with one sentence when it wrote nothing. */
export async function runPoints(a: PointsArgs, rep: Reporter): Promise<number> {
  const cfg = await parsePointsConfig(a);
  const r = await runPointsSession(a, cfg, rep);
  if (r.failure) {
    rep.failure(`${r.failure}; nothing was written to ${r.outDir}`, EXIT_PROCESSING);
    rep.event('done', { exit_code: EXIT_PROCESSING });
    return EXIT_PROCESSING;
  }
  rep.event('done', { exit_code: EXIT_OK, points: r.points.length });
  return EXIT_OK;
}
