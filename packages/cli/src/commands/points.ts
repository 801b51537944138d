/**
 * `refdelta points`: a solve run (same inputs, options and per-epoch outputs as `solve`) followed by the
 * per-point results: occupations from --windows, else the rover file's event flags (3 new occupation,
 * 2 start moving), else static spans detected from the Doppler speed (points/occupations.ts,
 * DEFAULT_STATIC_DETECTION); one robust mean per occupation with its precision; optional projection
 * and geoid heights; points.csv and points.geojson written atomically into --out.
 */
import { readFile } from 'node:fs/promises';
import { join, resolve } from 'node:path';
import { stringify } from 'csv-stringify/sync';
import {
  DEFAULT_POINT_TOLERANCE_H_M, DEFAULT_POINT_TOLERANCE_V_M, DEFAULT_STATIC_DETECTION, EGM96_NOT_A_DATUM_NOTE,
  loadEgm96, makeProjection, parseGeoidGrid, parseOccupationCsv, pointRow, pointsColumns, pointsGeoJson,
  pointsPreamble, radToDeg, resolveProjectionSpec, splitOccupations, summariseOccupations,
  type EcefM, type EpochMark, type EpochSolution, type FrameEpoch, type GeoidModel, type OccupationWindow, type PointEpoch,
  type PointReference, type Projection,
} from '@refdelta/core';
import { openObs, requireFile, writeFileAtomic } from '../node-io.js';
import { parseNumber } from '../parse-values.js';
import { Reporter } from '../reporter.js';
import { EXIT_OK, EXIT_PROCESSING } from '../exit-codes.js';
import { UsageError } from '../usage-error.js';
import { runSolve, type SolveArgs } from './solve.js';

export interface PointsArgs extends SolveArgs {
  readonly windows?: unknown;
  readonly toleranceH?: unknown;
  readonly toleranceV?: unknown;
  readonly projection?: unknown;
  readonly geoid?: unknown;
}

export const POINTS_FILE_NAMES = { csv: 'points.csv', geojson: 'points.geojson' } as const;

interface Collected {
  readonly epochs: PointEpoch[];
  readonly marks: EpochMark[];
  /** tag -> position of epochs with a position (for the Doppler pass). */
  frame: FrameEpoch | null;
  pointReference: PointReference;
}

function collect(c: Collected, s: EpochSolution): void {
  if (s.position && s.kind !== 'none') {
    c.epochs.push({ tagGpsS: s.tagGpsS, ecef: s.position.ecef, kind: s.kind, pdop: s.dops?.pdop ?? NaN, antennaHeightM: s.antennaHeightM });
    if (!c.frame && s.kind !== 'standalone') c.frame = s.position.frame;
  }
  c.pointReference = s.pointReference;
  c.marks.push({
    tGpsS: s.tagGpsS,
    ...(s.occupationEvent ? { event: { kind: s.occupationEvent, ...(s.occupationEvent === 'new-occupation' ? { markerName: s.pointName } : {}) } } : {}),
    speedMS: s.speedMS,
  });
}

async function loadGeoid(spec: string): Promise<GeoidModel> {
  if (spec.toLowerCase() === 'egm96') return loadEgm96();
  await requireFile(spec);
  return parseGeoidGrid(spec, await readFile(spec, 'utf8'));
}

export async function runPoints(a: PointsArgs, rep: Reporter): Promise<number> {
  // 1. Own options, checked before the run.
  const tolH = a.toleranceH === undefined ? DEFAULT_POINT_TOLERANCE_H_M : parseNumber('tolerance-h', a.toleranceH, 0, 1000);
  const tolV = a.toleranceV === undefined ? DEFAULT_POINT_TOLERANCE_V_M : parseNumber('tolerance-v', a.toleranceV, 0, 1000);
  const projSpec = a.projection === undefined ? undefined : String(a.projection);
  if (projSpec !== undefined) {
    try { resolveProjectionSpec(projSpec, { latDeg: 0, lonDeg: 0 }); } catch (e) { throw new UsageError(`--projection ${projSpec}: ${e instanceof Error ? e.message : String(e)}`); }
  }
  const geoidSpec = a.geoid === undefined ? undefined : String(a.geoid);
  if (geoidSpec !== undefined && geoidSpec.toLowerCase() !== 'egm96') await requireFile(geoidSpec);
  const radiusM = a.antennaRadius === undefined ? undefined : parseNumber('antenna-radius', a.antennaRadius, 0, 1);
  let windows: OccupationWindow[] | undefined;
  if (a.windows !== undefined) {
    const wf = String(a.windows);
    await requireFile(wf);
    windows = parseOccupationCsv(wf, await readFile(wf, 'utf8'));
    if (windows.length === 0) throw new UsageError(`--windows ${wf} holds no occupation window`);
    if (windows.some((w) => w.heightKind === 'slant') && radiusM === undefined) throw new UsageError(`--windows ${wf} has slant heights: give --antenna-radius M`);
  }

  // 2. The solve run, with its per-epoch outputs.
  const c: Collected = { epochs: [], marks: [], frame: null, pointReference: a.atAntenna === true ? 'antenna-reference-point' : 'ground-mark' };
  const solved = await runSolve(a, rep, { command: 'points', onEpoch: (s) => collect(c, s) });
  if (solved.exitCode !== EXIT_OK) return solved.exitCode;

  // 3. Occupations.
  const roverHeader = (await openObs(a.rover, () => {})).header;
  const marks = c.marks;
  const hasEvents = marks.some((m) => m.event);
  if (!windows && !hasEvents) {
    const withSpeed = marks.filter((m) => Number.isFinite(m.speedMS)).length;
    rep.info(`static detection on the Doppler speed of ${withSpeed} of ${marks.length} epochs (a point starts below ${DEFAULT_STATIC_DETECTION.enterBelowMS} m/s and ends above ${DEFAULT_STATIC_DETECTION.leaveAboveMS} m/s)`);
  }
  const occupations = splitOccupations({ epochs: marks, ...(windows ? { windows } : {}), initialMarkerName: roverHeader.markerName }, { onWarning: rep.warn });
  if (occupations.length === 0) {
    const why = windows ? 'no window holds an epoch' : hasEvents ? 'the event flags mark no occupation' : 'no static span was found in the Doppler speed (or the rover file has no Doppler)';
    rep.failure(`no point found: ${why}; give the occupation times with --windows FILE`, EXIT_PROCESSING);
    return EXIT_PROCESSING;
  }
  const frame = c.frame ?? { name: 'WGS84 (broadcast orbits)', epochYear: NaN };
  const outcome = summariseOccupations(c.epochs, occupations, {
    pointReference: c.pointReference, frame, horizontalToleranceM: tolH, verticalToleranceM: tolV,
    ...(radiusM !== undefined ? { antenna: { radiusM } } : {}),
  });
  for (const o of outcome.empty) rep.warn({ code: 'occupation-without-solution', message: `occupation ${o.name} (${o.source}) has no solved epoch: no point written` });
  if (outcome.points.length === 0) {
    rep.failure('no point could be computed: none of the occupations has a solved epoch', EXIT_PROCESSING);
    return EXIT_PROCESSING;
  }

  // 4. Projection and geoid.
  let projection: Projection | undefined;
  if (projSpec !== undefined) {
    const g = outcome.points[0].summary.meanGeodetic;
    projection = makeProjection(projSpec, { latDeg: radToDeg(g.latRad), lonDeg: radToDeg(g.lonRad) });
  }
  const geoid = geoidSpec !== undefined ? await loadGeoid(geoidSpec) : undefined;

  // 5. The files.
  const table = {
    frame, horizontalToleranceM: tolH, verticalToleranceM: tolV,
    ...(projection ? { projection } : {}), ...(geoid ? { geoid } : {}),
    notes: [`occupations from ${occupations[0].source === 'windows' ? `the windows file ${String(a.windows)}` : occupations[0].source === 'events' ? 'the RINEX event flags of the rover file' : 'static detection on the Doppler speed'}`],
  };
  const outDir = resolve(a.out);
  const csvPath = join(outDir, POINTS_FILE_NAMES.csv);
  const gjPath = join(outDir, POINTS_FILE_NAMES.geojson);
  const rows = outcome.points.map((p) => pointRow(p, table));
  const csv = pointsPreamble(table).join('\n') + '\n' + stringify([pointsColumns(table), ...rows], { record_delimiter: 'unix' });
  const w1 = await writeFileAtomic(csvPath, [csv]);
  const w2 = await writeFileAtomic(gjPath, [JSON.stringify(pointsGeoJson(outcome.points, table), null, 1) + '\n']);
  for (const w of [w1, w2]) rep.event('output', { kind: w.path === csvPath ? 'points' : 'points-geojson', path: w.path, bytes: w.bytes, sha256: w.sha256 });
  if (geoid && /egm96/i.test(geoid.name)) rep.info(`note: ${EGM96_NOT_A_DATUM_NOTE}`);
  for (const p of outcome.points) {
    const g = p.summary.meanGeodetic;
    rep.info(`point ${p.name} (${p.source}): ${p.summary.epochs} epochs, ${radToDeg(g.latRad).toFixed(8)} ${radToDeg(g.lonRad).toFixed(8)} ${g.heightM.toFixed(3)} m, ` +
      `sigma mean E/N/U ${p.summary.sigmaMeanEastM.toFixed(3)}/${p.summary.sigmaMeanNorthM.toFixed(3)}/${p.summary.sigmaMeanUpM.toFixed(3)} m, ${p.tolerance}`);
  }
  rep.info(`${outcome.points.length} point(s) written to ${csvPath} and ${gjPath}`);
  rep.event('done', { exit_code: EXIT_OK, points: outcome.points.length });
  return EXIT_OK;
}
