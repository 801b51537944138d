/**
 * Reads a run's output files into the data of an HTML report. Tolerant by design: CSV columns are found
 * by name (with a few alternative names), leading '#' lines are skipped whether or not there are any,
 * and a missing file or column only removes the chart that needed it (said on the page).
 */
import { createReadStream, existsSync } from 'node:fs';
import { createInterface } from 'node:readline';
import { readFile } from 'node:fs/promises';
import { basename, dirname, join } from 'node:path';
import {
  ecefToEnu, gridCrsWords, InputError, leapSecondsAtUtc, pooledPointScatter, POOLED_POINT_SCATTER_KIND, splitCsvLine, SECONDS_PER_WEEK,
  type EcefM, type EpochSeries, type ReportControlCheck, type ReportInput, type ReportPoint, type ResidualSeries, type SessionReportData, type SkySeries,
} from '@refdelta/core';

/** The files a session report reads; each may be absent. */
export interface ReportSources {
  readonly epochs?: string;
  readonly residuals?: string;
  readonly points?: string;
  /** summary.json: a path, or the document itself (a run that has not written it yet). */
  readonly summary?: string | Record<string, unknown>;
  readonly check?: string;
  /** sky.csv: the reference receiver's satellite directions. */
  readonly sky?: string;
}

/** The report sources of an output folder of solve, points or check (control-check.json also in DIR/check/). */
export function sourcesInFolder(dir: string): ReportSources {
  const at = (name: string) => (existsSync(join(dir, name)) ? join(dir, name) : undefined);
  const check = at('control-check.json') ?? (existsSync(join(dir, 'check', 'control-check.json')) ? join(dir, 'check', 'control-check.json') : undefined);
  return { epochs: at('epochs.csv'), residuals: at('residuals.csv'), points: at('points.csv'), summary: at('summary.json'), check, sky: at('sky.csv') };
}

interface CsvTable {
  readonly path: string;
  readonly header: readonly string[];
  /** Data lines (after the header), each with its 1-based line number in the file. */
  readonly lines: readonly string[];
  readonly firstLineNo: number;
}

/** The header is the first line that is neither blank nor starts with '#'. */
async function readCsvTable(path: string): Promise<CsvTable> {
  const text = await readFile(path, 'utf8');
  const lines = text.split('\n');
  let h = 0;
  while (h < lines.length && (lines[h].trim() === '' || lines[h].startsWith('#'))) h++;
  if (h >= lines.length) throw new InputError(path, 0, `${path} has no header line (expected a CSV with a line of column names)`);
  const header = splitCsvLine(lines[h].replace(/\r$/, '')).map((c) => c.trim().toLowerCase());
  const data = lines.slice(h + 1);
  while (data.length && data[data.length - 1].trim() === '') data.pop();
  return { path, header, lines: data, firstLineNo: h + 2 };
}

/**
 * The header and the data lines of a CSV, streamed (a day of residuals is tens of MB): the header is
 * the first line that is neither blank nor starts with '#'.
 */
async function streamCsvTable(path: string): Promise<{ table: CsvTable; rows: AsyncIterable<string> }> {
  const rl = createInterface({ input: createReadStream(path), crlfDelay: Infinity });
  const it = rl[Symbol.asyncIterator]();
  let header: string[] | null = null;
  let lineNo = 0;
  for (let r = await it.next(); !r.done; r = await it.next()) {
    lineNo++;
    if (r.value.trim() === '' || r.value.startsWith('#')) continue;
    header = splitCsvLine(r.value).map((c) => c.trim().toLowerCase());
    break;
  }
  if (!header) { rl.close(); throw new InputError(path, 0, `${path} has no header line (expected a CSV with a line of column names)`); }
  const rows = { [Symbol.asyncIterator]: () => it };
  return { table: { path, header, lines: [], firstLineNo: lineNo + 1 }, rows };
}

/** Index of the first of `names` present in the header, -1 when none is. */
function col(t: CsvTable, ...names: string[]): number {
  for (const n of names) {
    const i = t.header.indexOf(n);
    if (i >= 0) return i;
  }
  return -1;
}

function cells(line: string): string[] {
  const l = line.endsWith('\r') ? line.slice(0, -1) : line;
  return l.includes('"') ? splitCsvLine(l) : l.split(',');
}

const numAt = (c: readonly string[], i: number): number => (i >= 0 && c[i] !== undefined && c[i].trim() !== '' ? Number(c[i]) : NaN);
const strAt = (c: readonly string[], i: number): string => (i >= 0 ? (c[i] ?? '').trim() : '');

/** GPS seconds of an ISO 8601 UTC time (leap table); NaN when it is not one. */
function isoToGpsS(iso: string): number {
  const ms = Date.parse(iso);
  if (!Number.isFinite(ms)) return NaN;
  const utcS = (ms - Date.UTC(1980, 0, 6)) / 1000;
  return utcS + leapSecondsAtUtc(utcS);
}

/** GPS seconds of a row: week + time of week, else an ISO UTC time (leap table), else NaN. */
function timeReader(t: CsvTable): (c: readonly string[]) => number {
  const w = col(t, 'gps_week', 'week'), tow = col(t, 'gps_tow_s', 'tow_s', 'gps_tow');
  if (w >= 0 && tow >= 0) return (c) => numAt(c, w) * SECONDS_PER_WEEK + numAt(c, tow);
  const u = col(t, 'utc_time', 'utc', 'time_utc');
  if (u >= 0) return (c) => isoToGpsS(strAt(c, u));
  return () => NaN;
}

function origin(summary: Record<string, unknown> | null): EcefM | null {
  const r = (summary?.reference as { position?: Record<string, number> } | undefined)?.position
    ?? (summary?.options as { reference_position?: Record<string, number> } | undefined)?.reference_position;
  return r && Number.isFinite(r.x_m) ? { x: r.x_m, y: r.y_m, z: r.z_m } : null;
}

/** An epoch of epochs.csv as the points stage took it: its tag, solution kind and position. */
type TaggedEpoch = Parameters<typeof pooledPointScatter>[0][number];

const SOLUTION_KINDS: ReadonlySet<string> = new Set(['differential', 'smoothed', 'fixed', 'float', 'standalone']);

/** GPS seconds of a row's epoch tag (gps_week + epoch_tag_tow_s), else its time. */
function tagReader(t: CsvTable, time: (c: readonly string[]) => number): (c: readonly string[]) => number {
  const w = col(t, 'gps_week', 'week'), tag = col(t, 'epoch_tag_tow_s');
  return w >= 0 && tag >= 0 ? (c) => numAt(c, w) * SECONDS_PER_WEEK + numAt(c, tag) : time;
}

async function readEpochs(path: string, ref: EcefM | null): Promise<{ series: EpochSeries; tagged: TaggedEpoch[]; origin: EcefM | null; note: string | null }> {
  const { table: t, rows } = await streamCsvTable(path);
  const time = timeReader(t);
  const tagOf = tagReader(t, time);
  const [x, y, z] = [col(t, 'ecef_x_m', 'x_m'), col(t, 'ecef_y_m', 'y_m'), col(t, 'ecef_z_m', 'z_m')];
  const [be, bn, bu] = [col(t, 'baseline_east_m', 'east_m'), col(t, 'baseline_north_m', 'north_m'), col(t, 'baseline_up_m', 'up_m')];
  const kindCol = col(t, 'solution', 'solution_kind', 'kind'), pointCol = col(t, 'point', 'point_name', 'occupation');
  const satCol = col(t, 'satellites_used', 'satellites', 'sats_used', 'num_satellites'), pdopCol = col(t, 'pdop');
  const s = { timeGpsS: [] as number[], eastM: [] as number[], northM: [] as number[], upM: [] as number[], satellitesUsed: [] as number[], pdop: [] as number[], kind: [] as string[], point: [] as string[] };
  const tagged: TaggedEpoch[] = [];
  let o = ref;
  let note: string | null = null;
  let i = 0;
  for await (const line of rows) {
    if (line.trim() === '') continue;
    const c = cells(line);
    s.timeGpsS[i] = time(c);
    s.kind[i] = strAt(c, kindCol) || (kindCol < 0 ? 'unknown' : 'none');
    s.point[i] = strAt(c, pointCol);
    s.satellitesUsed[i] = numAt(c, satCol);
    s.pdop[i] = numAt(c, pdopCol);
    const p = { x: numAt(c, x), y: numAt(c, y), z: numAt(c, z) };
    if (Number.isFinite(p.x) && Number.isFinite(p.y) && Number.isFinite(p.z)) {
      if (!o) { o = p; note = 'No reference coordinate in summary.json: east/north/up are drawn about the first epoch\'s position.'; }
      const enu = ecefToEnu(p, o);
      s.eastM[i] = enu.e; s.northM[i] = enu.n; s.upM[i] = enu.u;
      const tagGpsS = tagOf(c);
      if (SOLUTION_KINDS.has(s.kind[i]) && Number.isFinite(tagGpsS)) tagged.push({ tagGpsS, kind: s.kind[i] as TaggedEpoch['kind'], ecef: p });
    } else {
      s.eastM[i] = numAt(c, be); s.northM[i] = numAt(c, bn); s.upM[i] = numAt(c, bu);
    }
    if (!Number.isFinite(s.timeGpsS[i])) s.timeGpsS[i] = i;
    i++;
  }
  return { series: s, tagged, origin: o, note };
}

/** Reasons are grouped by their words: figures in parentheses or after '=' are left out. */
export function reasonCategory(reason: string): string {
  return reason.replace(/\s*\(.*$/s, '').replace(/\s*[:=].*$/s, '').trim() || 'no reason given';
}

async function readResiduals(path: string): Promise<ResidualSeries> {
  const { table: t, rows } = await streamCsvTable(path);
  const time = timeReader(t);
  const satCol = col(t, 'satellite', 'sat', 'prn'), elCol = col(t, 'elevation_deg', 'elevation'), azCol = col(t, 'azimuth_deg', 'azimuth');
  const resCol = col(t, 'residual_m', 'residual'), statusCol = col(t, 'status'), reasonCol = col(t, 'reason'), signalCol = col(t, 'signal');
  const satIndex = new Map<string, number>(), reasonIndex = new Map<string, number>();
  const s = { timeGpsS: [] as number[], satellite: [] as number[], elevationDeg: [] as number[], azimuthDeg: [] as number[], residualM: [] as number[], phase: [] as number[], rejection: [] as number[] };
  let i = 0;
  for await (const line of rows) {
    if (line.trim() === '') continue;
    const c = cells(line);
    s.timeGpsS[i] = time(c);
    const sat = strAt(c, satCol) || '?';
    let k = satIndex.get(sat);
    if (k === undefined) { k = satIndex.size; satIndex.set(sat, k); }
    s.satellite[i] = k;
    s.elevationDeg[i] = numAt(c, elCol);
    s.azimuthDeg[i] = numAt(c, azCol);
    s.residualM[i] = numAt(c, resCol);
    // RINEX 3 observation codes: L.. is carrier phase, C.. code (RINEX 3.05, section 5.1).
    s.phase[i] = strAt(c, signalCol).startsWith('L') ? 1 : 0;
    const status = strAt(c, statusCol).toLowerCase();
    if (status === 'used' || (statusCol < 0 && strAt(c, reasonCol) === '')) s.rejection[i] = 0;
    else {
      const r = reasonCategory(strAt(c, reasonCol) || status);
      let j = reasonIndex.get(r);
      if (j === undefined) { j = reasonIndex.size; reasonIndex.set(r, j); }
      s.rejection[i] = j + 1;
    }
    i++;
  }
  return {
    timeGpsS: Float64Array.from(s.timeGpsS), satellite: Uint16Array.from(s.satellite), elevationDeg: Float32Array.from(s.elevationDeg),
    azimuthDeg: Float32Array.from(s.azimuthDeg), residualM: Float32Array.from(s.residualM), phase: Uint8Array.from(s.phase), rejection: Uint16Array.from(s.rejection),
    satellites: [...satIndex.keys()], reasons: [...reasonIndex.keys()],
  };
}

/** Rows of sky.csv other than the rover's (the rover's directions are in residuals.csv). */
async function readSky(path: string): Promise<SkySeries> {
  const t = await readCsvTable(path);
  const time = timeReader(t);
  const recCol = col(t, 'receiver'), satCol = col(t, 'satellite', 'sat'), azCol = col(t, 'azimuth_deg', 'azimuth'), elCol = col(t, 'elevation_deg', 'elevation');
  const satIndex = new Map<string, number>();
  const s = { timeGpsS: [] as number[], satellite: [] as number[], azimuthDeg: [] as number[], elevationDeg: [] as number[] };
  for (const line of t.lines) {
    const c = cells(line);
    if (strAt(c, recCol) === 'rover') continue;
    const sat = strAt(c, satCol) || '?';
    let k = satIndex.get(sat);
    if (k === undefined) { k = satIndex.size; satIndex.set(sat, k); }
    s.timeGpsS.push(time(c)); s.satellite.push(k); s.azimuthDeg.push(numAt(c, azCol)); s.elevationDeg.push(numAt(c, elCol));
  }
  return { ...s, satellites: [...satIndex.keys()] };
}

interface PointsRead {
  readonly points: ReportPoint[];
  readonly note: string | null;
  /** Distinct 'frame epoch e' of the rows (frame and frame_epoch columns). */
  readonly frames: readonly string[];
  /** Distinct point_reference words of the rows. */
  readonly pointReferences: readonly string[];
}

async function readPoints(path: string, origin0: EcefM | null): Promise<PointsRead> {
  const t = await readCsvTable(path);
  const c = (...names: string[]) => col(t, ...names);
  const k = {
    name: c('name', 'point'), epochs: c('epochs', 'n_epochs'), dur: c('duration_s'), start: c('start_utc', 'start'),
    sw: c('start_gps_week'), stow: c('start_gps_tow_s'), ew: c('end_gps_week'), etow: c('end_gps_tow_s'), end: c('end_utc', 'end'), lat: c('latitude_deg'), lon: c('longitude_deg'), h: c('height_m'),
    easting: c('easting_m'), northing: c('northing_m'), ortho: c('orthometric_height_m'), x: c('ecef_x_m'), y: c('ecef_y_m'), z: c('ecef_z_m'),
    sdE: c('sd_east_m'), sdN: c('sd_north_m'), sdU: c('sd_up_m'), smE: c('sigma_mean_east_m'), smN: c('sigma_mean_north_m'), smU: c('sigma_mean_up_m'),
    tol: c('tolerance', 'status'), kinds: c('solution_kinds', 'solutions'), r95rel: c('radius95_relative_m'), r95: c('radius95_m'),
    frame: c('frame'), frameEpoch: c('frame_epoch'), pointRef: c('point_reference'),
  };
  const frames = new Set<string>(), pointReferences = new Set<string>();
  let o = origin0;
  let note: string | null = null;
  const points = t.lines.map((line) => {
    const r = cells(line);
    const p = { x: numAt(r, k.x), y: numAt(r, k.y), z: numAt(r, k.z) };
    if (!o && Number.isFinite(p.x)) { o = p; note = `No reference coordinate in this folder: east/north are drawn about the first point (${strAt(r, k.name)}).`; }
    const enu = o && Number.isFinite(p.x) ? ecefToEnu(p, o) : { e: NaN, n: NaN, u: NaN };
    if (strAt(r, k.frame)) frames.add(`${strAt(r, k.frame)} epoch ${strAt(r, k.frameEpoch) || 'not stated'}`);
    if (strAt(r, k.pointRef)) pointReferences.add(strAt(r, k.pointRef));
    return {
      name: strAt(r, k.name), epochs: numAt(r, k.epochs), durationS: numAt(r, k.dur), startUtc: strAt(r, k.start),
      startGpsS: k.sw >= 0 ? numAt(r, k.sw) * SECONDS_PER_WEEK + numAt(r, k.stow) : isoToGpsS(strAt(r, k.start)),
      endGpsS: k.ew >= 0 ? numAt(r, k.ew) * SECONDS_PER_WEEK + numAt(r, k.etow) : isoToGpsS(strAt(r, k.end)),
      eastM: enu.e, northM: enu.n, upM: enu.u, latitudeDeg: numAt(r, k.lat), longitudeDeg: numAt(r, k.lon), heightM: numAt(r, k.h),
      eastingM: numAt(r, k.easting), northingM: numAt(r, k.northing), orthometricHeightM: numAt(r, k.ortho),
      sdEastM: numAt(r, k.sdE), sdNorthM: numAt(r, k.sdN), sdUpM: numAt(r, k.sdU),
      sigmaMeanEastM: numAt(r, k.smE), sigmaMeanNorthM: numAt(r, k.smN), sigmaMeanUpM: numAt(r, k.smU),
      tolerance: strAt(r, k.tol), solutionKinds: strAt(r, k.kinds), radius95RelativeM: numAt(r, k.r95rel), radius95M: numAt(r, k.r95),
    };
  });
  return { points, note, frames: [...frames], pointReferences: [...pointReferences] };
}

async function readJson(path: string): Promise<Record<string, unknown>> {
  const text = await readFile(path, 'utf8');
  try {
    return JSON.parse(text) as Record<string, unknown>;
  } catch (e) {
    throw new InputError(path, 0, `${path} is not valid JSON (${e instanceof Error ? e.message : String(e)})`);
  }
}

type J = Record<string, unknown>;
const asObj = (v: unknown): J => (v && typeof v === 'object' && !Array.isArray(v) ? (v as J) : {});
const asArr = (v: unknown): unknown[] => (Array.isArray(v) ? v : []);
const text = (v: unknown): string => (v === null || v === undefined ? '' : typeof v === 'object' ? JSON.stringify(v) : String(v));

/** An option's key in words: underscores as spaces, a unit suffix in parentheses ('tolerance_h_m' -> 'tolerance h (m)'). */
function optionLabel(key: string): string {
  return key.replace(/_(m|deg|s)$/, (_, u: string) => ` (${u === 'deg' ? '°' : u})`).replace(/_(m|deg|s)\./g, (_, u: string) => ` (${u === 'deg' ? '°' : u}).`).replace(/_/g, ' ');
}

/** Nested options as flat "a.b" lines; null (an option not given) is 'none'. */
export function flatten(o: unknown, prefix = ''): [string, string][] {
  if (o && typeof o === 'object' && !Array.isArray(o)) return Object.entries(o as J).flatMap(([k, v]) => flatten(v, prefix ? `${prefix}.${k}` : k));
  return [[optionLabel(prefix), o === null ? 'none' : Array.isArray(o) ? o.map(text).join(', ') : text(o)]];
}

/** Human labels of control-check.json's NSSDA figures (FGDC-STD-007.3-1998 section 3.2.2, appendix 3-A); metres unless said. */
const NSSDA_LABELS: Readonly<Record<string, string>> = {
  standard: 'Standard',
  check_points: 'Check points',
  rmse_east_m: 'RMSE east',
  rmse_north_m: 'RMSE north',
  rmse_horizontal_m: 'RMSE horizontal (radial)',
  rmse_vertical_m: 'RMSE vertical',
  rmse_ratio_min_max: 'RMSE ratio, smaller / larger of east and north',
  horizontal_accuracy_95_m: 'Horizontal accuracy at 95 %',
  horizontal_method: 'Horizontal accuracy computed as',
  horizontal_approximation_2_4477_m: '2.4477 × mean of RMSE east and north (appendix 3-A, for information)',
  vertical_accuracy_95_m: 'Vertical accuracy at 95 % (1.9600 × RMSE vertical)',
};

const NSSDA_METHODS: Readonly<Record<string, string>> = {
  'circular-1.7308': '1.7308 × RMSE horizontal (section 3.2.2: RMSE east and north about equal)',
  'bivariate-normal-exact': 'the exact 95 % radius of a bivariate normal error (RMSE ratio below 0.6: the circular formula does not apply)',
  'approximation-2.4477': '2.4477 × mean of RMSE east and north (appendix 3-A)',
};

/** NSSDA figures as label/value lines: known keys in words with their unit, others with their key's words. */
export function nssdaLines(nssda: J): [string, string][] {
  return Object.entries(nssda).filter(([k, v]) => k !== 'warnings' && (typeof v !== 'object' || v === null)).map(([k, v]) => {
    const label = NSSDA_LABELS[k] ?? k.replace(/_m$/, '').replace(/_/g, ' ');
    const value = k === 'horizontal_method' ? NSSDA_METHODS[text(v)] ?? text(v)
      : typeof v === 'number' && k.endsWith('_m') ? `${v.toFixed(4)} m` : text(v);
    return [label, value];
  });
}

const finiteOr = (v: unknown): number => (typeof v === 'number' ? v : NaN);

function readCheck(doc: J, frameText: string): ReportControlCheck {
  const test = asObj(doc.difference_test);
  return {
    toleranceHM: Number(doc.tolerance_h_m), toleranceVM: Number(doc.tolerance_v_m),
    criticalHorizontal: finiteOr(test.critical_h), criticalVertical: finiteOr(test.critical_v),
    frameText, pointsFile: text(doc.points_file), marksFile: text(doc.marks_file), createdUtc: text(doc.created_utc), radiusM: finiteOr(doc.radius_m),
    pairs: asArr(doc.pairs).map((p0) => {
      const p = asObj(p0);
      return {
        point: text(p.point), mark: text(p.mark), matchedBy: text(p.matched_by), dEastM: Number(p.d_east_m), dNorthM: Number(p.d_north_m), dUpM: Number(p.d_up_m), horizontalM: Number(p.horizontal_m), pass: p.pass === true,
        ...('difference_test' in p ? { differenceTest: text(p.difference_test), chi2H: finiteOr(p.chi2_h), chi2V: finiteOr(p.chi2_v) } : {}),
      };
    }),
    unmatchedPoints: asArr(doc.unmatched_points).map(text), unmatchedMarks: asArr(doc.unmatched_marks).map(text),
    nssda: nssdaLines(asObj(doc.nssda)),
    warnings: asArr(doc.warnings).map((w) => text(asObj(w).message ?? w)),
  };
}

/**
 * The frame and epoch of a check's comparison: control-check.json's pairs (frame, frame_epoch), else
 * control-check.csv's columns beside it; '' when neither states them. Several are listed.
 */
async function checkFrameText(doc: J, checkPath: string): Promise<string> {
  const pairs = asArr(doc.pairs).map(asObj);
  let frames = pairs.filter((p) => p.frame).map((p) => `${text(p.frame)} epoch ${p.frame_epoch === undefined || p.frame_epoch === null ? '' : text(p.frame_epoch)}`);
  const csv = join(dirname(checkPath), 'control-check.csv');
  if (frames.some((f) => f.endsWith(' epoch ')) && existsSync(csv)) {
    const t = await readCsvTable(csv);
    const f = col(t, 'frame'), e = col(t, 'frame_epoch');
    const fromCsv = t.lines.map(cells).filter((c) => strAt(c, f)).map((c) => `${strAt(c, f)} epoch ${strAt(c, e)}`);
    if (fromCsv.length) frames = fromCsv;
  }
  return [...new Set(frames.map((f) => (f.endsWith(' epoch ') ? `${f}not stated` : f)))].join('; ');
}

/**
 * The scatter line of summary.json's statistics. A points run's is about each point's own mean (pooled:
 * a precision). A whole-session figure is about one overall mean: the precision of a still antenna, the
 * extent of the movement of one that moved (a session with several points, older points runs).
 */
function scatterFact(st: J, points: number, fromEpochs: PooledScatter | null): [string, string] | null {
  if (typeof st.horizontal_median_m !== 'number') return null;
  const m = (k: string) => (typeof st[k] === 'number' ? `${(st[k] as number).toFixed(3)} m` : 'not stated');
  const figures = `horizontal median ${m('horizontal_median_m')}, 95 % ${m('horizontal_95_m')}; vertical median ${m('vertical_median_m')}, 95 % ${m('vertical_95_m')}`;
  const over = text(st.over ?? 'epochs');
  // mean_ecef null with figures: a pooled scatter written before statistics.kind was.
  if (st.kind === POOLED_POINT_SCATTER_KIND || st.mean_ecef === null) return ["Scatter about each point's mean", `${figures} (${over}; precision, not accuracy)`];
  if (points > 1 && fromEpochs) {
    const f = (v: number) => `${v.toFixed(3)} m`;
    return ["Scatter about each point's mean", `horizontal median ${f(fromEpochs.horizontalMedianM)}, 95 % ${f(fromEpochs.horizontal95M)}; vertical median ${f(fromEpochs.verticalMedianM)}, 95 % ${f(fromEpochs.vertical95M)} ` +
      `(from epochs.csv: the ${fromEpochs.count} epochs the ${fromEpochs.points} points are averaged from, each about its own point's mean; precision, not accuracy)`];
  }
  if (points > 1) return ['Spread of all epochs (moving)', `${figures} (${over}, about one mean of the whole session: the rover moved between ${points} points, so this is the extent of its movement, neither an error nor a precision; each point's scatter is in the Points table)`];
  return ['Spread of the epoch positions', `${figures} (${over}, about their overall mean: the precision, not accuracy, when the antenna stayed still; when it moved, the extent of its movement, not an error)`];
}

type PooledScatter = ReturnType<typeof pooledPointScatter>;

/**
 * The points run's pooled scatter (the core's pooledPointScatter: each point's chosen epochs about their
 * mean) from epochs.csv and points.csv, for folders whose summary.json gives only the whole session's
 * spread; null when no point has an epoch. epochs.csv's positions are rounded to 0.1 mm.
 */
export function pooledScatterFromEpochs(tagged: readonly TaggedEpoch[], points: readonly ReportPoint[]): PooledScatter | null {
  const occupations = points.filter((p) => Number.isFinite(p.startGpsS) && Number.isFinite(p.endGpsS));
  const stats = pooledPointScatter(tagged, occupations);
  return stats.points > 0 ? stats : null;
}

/** Summary lines from summary.json: systems, the scatter of the epoch positions, rejected epochs. */
function summaryFacts(s: J, points: number, fromEpochs: PooledScatter | null): [string, string][] {
  const out: [string, string][] = [];
  const systems = asArr(s.systems_used).map(text);
  if (systems.length) out.push(['Systems used', systems.join(', ')]);
  const scatter = scatterFact(asObj(s.statistics), points, fromEpochs);
  if (scatter) out.push(scatter);
  const rej = asArr(s.rejected_epochs).map((r0) => asObj(r0)).filter((r) => typeof r.count === 'number');
  if (rej.length) out.push(['Epochs without a solution', rej.map((r) => `${text(r.count)} ${text(r.reason)}`).join('; ')]);
  return out;
}

/** The reference coordinate with its frame and epoch (every coordinate on the page carries them). */
function referencePositionText(p: J, ref: J): string {
  if (typeof p.x_m !== 'number') return '';
  const frame = ref.frame ? ` (${text(ref.frame)} epoch ${ref.epoch === null || ref.epoch === undefined ? 'not stated' : text(ref.epoch)})` : '';
  return `ECEF ${[p.x_m, p.y_m, p.z_m].map((v) => Number(v).toFixed(4)).join(', ')} m${frame}`;
}

/** The grid CRS and heights of the points: summary.json's statements, else points.csv.meta.json's. */
async function coordinateStatements(s: J, pointsPath: string | undefined): Promise<{ grid: string; gridDatum: string; heights: string; caution: string }> {
  const g = asObj(s.grid_crs), h = asObj(s.heights);
  if (s.heights !== undefined) {
    return { grid: text(g.label), gridDatum: text(g.datum), heights: text(h.label), caution: text(h.caution) };
  }
  const metaPath = pointsPath ? `${pointsPath}.meta.json` : undefined;
  if (!metaPath || !existsSync(metaPath)) return { grid: '', gridDatum: '', heights: '', caution: '' };
  const meta = await readJson(metaPath).catch(() => ({} as J));
  const p = asObj(meta.projection);
  const grid = typeof p.name === 'string' && typeof p.definition === 'string'
    ? gridCrsWords({ epsg: typeof p.epsg === 'number' ? p.epsg : null, name: p.name, definition: p.definition }) : '';
  const caution = asArr(meta.notes).map(text).find((n) => /not a national vertical datum/.test(n)) ?? '';
  return { grid, gridDatum: text(p.datum), heights: text(meta.heights), caution };
}

/** One line for a run whose input was incomplete (summary.json's completeness), '' when complete. */
function incompleteInputText(s: J): string {
  const c = asObj(s.completeness);
  return c.input_complete === false ? text(c.input_problem) || 'observations were lost while reading the inputs' : '';
}

/** The inputs and options of a check's page (control-check.json names the files, not their hashes). */
function checkInputsAndOptions(doc: J): { inputs: ReportInput[]; options: [string, string][] } {
  const inputs: ReportInput[] = [
    ...(doc.points_file ? [{ kind: 'points', path: text(doc.points_file), sha256: '', bytes: null }] : []),
    ...(doc.marks_file ? [{ kind: 'control', path: text(doc.marks_file), sha256: '', bytes: null }] : []),
  ];
  const test = asObj(doc.difference_test);
  const options: [string, string][] = [
    ...(typeof doc.radius_m === 'number' ? [['matching radius (m)', text(doc.radius_m)] as [string, string]] : []),
    ['tolerance horizontal (m)', text(doc.tolerance_h_m)], ['tolerance vertical (m)', text(doc.tolerance_v_m)],
    ...(typeof test.level === 'number' ? [['difference test level', `${(100 * test.level).toFixed(0)} %`] as [string, string]] : []),
    ...asArr(doc.transformations).map((t) => ['transformation', text(t)] as [string, string]),
  ];
  return { inputs, options };
}

/** Everything a session report shows, from the files that exist. */
export async function readSessionReportData(src: ReportSources, title: string): Promise<SessionReportData> {
  const missing: string[] = [];
  const summary = typeof src.summary === 'string' ? await readJson(src.summary) : src.summary ?? null;
  const checkDoc = src.check ? await readJson(src.check) : null;
  // A control check's outputs alone (no run in the folder): a page for what it is, without the run's placeholders.
  const checkOnly = !summary && !src.epochs && !src.residuals && !src.points && checkDoc !== null;
  if (!summary && !checkOnly) missing.push('No summary.json: inputs, options, frame and warnings are not shown.');
  let o = origin(summary);
  let epochs: EpochSeries | null = null;
  let tagged: TaggedEpoch[] = [];
  if (src.epochs) {
    const r = await readEpochs(src.epochs, o);
    epochs = r.series;
    tagged = r.tagged;
    o = r.origin;
    if (r.note) missing.push(r.note);
  } else if (!checkOnly) missing.push('No epochs.csv: no track, occupation scatter or time series.');
  const residuals = src.residuals ? await readResiduals(src.residuals) : null;
  if (!residuals && !checkOnly) missing.push('No residuals.csv: no sky plot or residual chart.');
  // Without a reference coordinate, east/north are about the first epoch's position, else the first point's.
  const planOrigin = o === null ? undefined : origin(summary) === null ? 'the first epoch' : undefined;
  let pointsPath = src.points;
  if (!pointsPath && checkDoc && typeof checkDoc.points_file === 'string' && existsSync(checkDoc.points_file)) pointsPath = checkDoc.points_file;
  const pr: PointsRead = pointsPath ? await readPoints(pointsPath, o) : { points: [], note: null, frames: [], pointReferences: [] };
  const planAbout = planOrigin ?? (pr.note && pr.points.length ? `the point ${pr.points[0].name}` : undefined);
  const points = pr.points;
  if (pr.note) missing.push(checkOnly ? `A control check's outputs only (no run in this folder): the plan view is drawn about the first point (${points[0]?.name ?? ''}), without the rover's track.` : pr.note);
  const s = asObj(summary);
  const frame = asObj(s.frame), opts = asObj(s.options), ref = asObj(s.reference), span = asObj(s.time_span), counts = asObj(s.counts), sw = asObj(s.software), warn = asObj(s.warnings);
  const inputs: ReportInput[] = asArr(s.inputs).map((i0) => {
    const i = asObj(i0);
    return { kind: text(i.kind), path: text(i.path), sha256: text(i.sha256), bytes: typeof i.bytes === 'number' ? i.bytes : null };
  });
  const checkFrame = checkDoc && src.check ? await checkFrameText(checkDoc, src.check) : '';
  const pointsFrame = pr.frames.join('; ');
  const frameText = frame.name ? `${text(frame.name)} epoch ${text(frame.epoch_text ?? frame.epoch)}` : checkOnly ? checkFrame || pointsFrame : '';
  const statements = points.length ? await coordinateStatements(s, pointsPath) : { grid: '', gridDatum: '', heights: '', caution: '' };
  const checkPage = checkOnly && checkDoc ? checkInputsAndOptions(checkDoc) : null;
  const checkWarnings = checkDoc ? asArr(checkDoc.warnings).map((w) => text(asObj(w).message ?? w)) : [];
  return {
    kind: checkOnly ? 'control-check' : 'session',
    title,
    software: sw.name ? `${text(sw.name)} ${text(sw.version)}` : 'refdelta',
    createdUtc: text(s.created_utc) || (checkOnly ? text(checkDoc?.created_utc) : '') || new Date().toISOString(),
    frameText,
    ...(pointsFrame && pointsFrame !== frameText ? { pointsFrameText: pointsFrame } : {}),
    gridCrsText: statements.grid, gridDatumNote: statements.gridDatum, heightsText: statements.heights, heightsCaution: statements.caution,
    incompleteInput: incompleteInputText(s),
    ...(planAbout ? { planOrigin: planAbout } : {}),
    pointReference: text(opts.position_refers_to) || pr.pointReferences.join('; '),
    referenceText: [text(ref.source ?? ref.note), referencePositionText(asObj(ref.position), ref)].filter(Boolean).join('; '),
    firstUtc: text(span.first_utc), lastUtc: text(span.last_utc),
    epochsByKind: Object.entries(asObj(counts.by_kind)).filter(([, v]) => typeof v === 'number' && v > 0).map(([k, v]) => [k, v as number] as const),
    facts: summaryFacts(s, points.length, tagged.length && points.length > 1 ? pooledScatterFromEpochs(tagged, points) : null),
    epochs, residuals, points,
    referenceSky: src.sky ? await readSky(src.sky) : null,
    check: checkDoc && src.check ? readCheck(checkDoc, checkFrame) : null,
    inputs: checkPage ? checkPage.inputs : inputs,
    options: checkPage ? checkPage.options : flatten(opts),
    warningsTotal: checkPage ? checkWarnings.length : typeof warn.total === 'number' ? warn.total : asArr(s.warnings).length,
    warnings: checkPage ? checkWarnings : asArr(warn.first ?? s.warnings).map((w0) => {
      const w = asObj(w0);
      const where = w.file ? `${basename(text(w.file))}${w.line ? `, line ${text(w.line)}` : ''}: ` : '';
      return `${where}${text(w.message ?? w0)}`;
    }),
    notes: asArr(s.notes).map(text),
    cautions: asArr(s.cautions).map(text),
    missing,
  };
}

/** A title for a folder: its name, with the parent's for generic names (out/demo/points -> demo/points). */
export function folderTitle(dir: string): string {
  const b = basename(dir);
  return ['points', 'check', 'out', 'solve'].includes(b) ? `${basename(dirname(dir))}/${b}` : b;
}
