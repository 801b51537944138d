/**
 * Rows of the per-epoch CSV: one row per rover epoch, column names of our own with the unit as suffix
 * (_m metres, _deg degrees, _s seconds; no suffix: a count, a ratio or a word).
 */
import { GNSS_SYSTEMS, SYSTEM_NAMES, type FrameEpoch, type GnssSystem } from '../gnss/index.js';
import { gpsToUtcS, isoFromSeconds, weekTowFromGpsS } from '../time/index.js';
import { radToDeg } from '../geodesy/index.js';
import type { EpochSolution, PointReference } from '../session/index.js';
import { fixed } from './format.js';
import { frameWords, pointReferenceWords } from './point-reference.js';

/** A table: column names and rows of cells (text; '' = no value). */
export interface CsvTable {
  readonly header: readonly string[];
  readonly rows: readonly (readonly string[])[];
}

/** Column name of one system's relative clock: rel_clock_gps_m, rel_clock_glonass_m... */
export function relativeClockColumn(sys: GnssSystem): string {
  return `rel_clock_${SYSTEM_NAMES[sys].toLowerCase()}_m`;
}

const LEADING_COLUMNS = [
  'gps_week', 'gps_tow_s', 'utc_time', 'epoch_tag_tow_s', 'point', 'solution',
  'latitude_deg', 'longitude_deg', 'height_m', 'ecef_x_m', 'ecef_y_m', 'ecef_z_m',
  'baseline_east_m', 'baseline_north_m', 'baseline_up_m', 'baseline_length_m',
] as const;

const TRAILING_COLUMNS = [
  'satellites_used', 'pdop', 'hdop', 'vdop', 'sigma_east_m', 'sigma_north_m', 'sigma_up_m',
  'variance_factor', 'chi_square', 'chi_square_critical', 'correction_age_s', 'speed_m_s', 'antenna_height_m', 'reason',
] as const;

/** The epoch CSV columns for the systems whose relative clocks are reported (in RINEX system order). */
export function epochColumns(systems: readonly GnssSystem[]): string[] {
  const ordered = GNSS_SYSTEMS.filter((s) => systems.includes(s));
  return [...LEADING_COLUMNS, ...ordered.map(relativeClockColumn), ...TRAILING_COLUMNS];
}

/*
 * The numeric cells are written by one loop calling fixed() from one place: the row was a list of two
 * dozen fixed() calls, each inlined by V8's optimising compiler, which made the function slow to compile
 * (and it is compiled again whenever it deoptimises). The values go through a scratch array of doubles.
 */

/** Decimals of the position cells: latitude, longitude (1e-9 deg is 0.1 mm: more than the data hold, so
 * the CSV never limits precision), height, ECEF x y z, baseline east north up, baseline length. */
const POSITION_DECIMALS = [9, 9, 4, 4, 4, 4, 4, 4, 4, 4] as const;
/** Decimals of the cells after satellites_used: pdop hdop vdop, sigma e n u, variance factor, chi-square
 * and its critical value, correction age, speed, antenna height. */
const QUALITY_DECIMALS = [2, 2, 2, 4, 4, 4, 4, 4, 4, 3, 3, 4] as const;
const cellValues = new Float64Array(Math.max(POSITION_DECIMALS.length, QUALITY_DECIMALS.length));

/** Appends fixed(cellValues[i], decimals[i]) for every i of `decimals`. */
function pushFixedCells(row: string[], decimals: readonly number[]): void {
  for (let i = 0; i < decimals.length; i++) row.push(fixed(cellValues[i], decimals[i]!));
}

/**
 * One epoch as CSV cells aligned with epochColumns(systems). `pointName` is the point column: the
 * session's own name of the occupation (marker name and event flags) unless the caller names the epochs
 * otherwise (occupation windows, points/window-names.ts).
 */
export function epochRow(s: EpochSolution, systems: readonly GnssSystem[], pointName: string = s.pointName): string[] {
  const t = weekTowFromGpsS(s.timeGpsS);
  const tag = weekTowFromGpsS(s.tagGpsS);
  const row: string[] = [String(t.week), fixed(t.towS, 3), isoFromSeconds(gpsToUtcS(s.timeGpsS), 'Z'), fixed(tag.towS, 3), pointName, s.kind];
  // A missing value (null, undefined) is NaN here: fixed() writes the same empty cell for both.
  const v = cellValues;
  const g = s.geodetic;
  const p = s.position?.ecef ?? null;
  const b = s.baselineEcef;
  const e = s.baselineEnu;
  v[0] = g ? radToDeg(g.latRad) : NaN; v[1] = g ? radToDeg(g.lonRad) : NaN; v[2] = g?.heightM ?? NaN;
  v[3] = p?.x ?? NaN; v[4] = p?.y ?? NaN; v[5] = p?.z ?? NaN;
  v[6] = e?.e ?? NaN; v[7] = e?.n ?? NaN; v[8] = e?.u ?? NaN;
  v[9] = b ? Math.hypot(b.x, b.y, b.z) : NaN;
  pushFixedCells(row, POSITION_DECIMALS);
  for (const x of GNSS_SYSTEMS) if (systems.includes(x)) row.push(fixed(s.relativeClockM[x], 4));
  row.push(String(s.satellitesUsed));
  const d = s.dops, se = s.sigmaEnuM, q = s.quality;
  v[0] = d?.pdop ?? NaN; v[1] = d?.hdop ?? NaN; v[2] = d?.vdop ?? NaN;
  v[3] = se?.e ?? NaN; v[4] = se?.n ?? NaN; v[5] = se?.u ?? NaN;
  v[6] = q?.varianceFactor ?? NaN; v[7] = q?.chiSquare ?? NaN; v[8] = q?.critical ?? NaN;
  v[9] = s.correctionAgeS ?? NaN; v[10] = s.speedMS ?? NaN; v[11] = s.antennaHeightM ?? NaN;
  pushFixedCells(row, QUALITY_DECIMALS);
  row.push(s.reason);
  return row;
}

/** Systems that carry a relative clock in any of the solutions. */
export function systemsWithClocks(solutions: Iterable<EpochSolution>): GnssSystem[] {
  const seen = new Set<GnssSystem>();
  for (const s of solutions) for (const k of Object.keys(s.relativeClockM) as GnssSystem[]) seen.add(k);
  return GNSS_SYSTEMS.filter((x) => seen.has(x));
}

/** The whole epoch table. `systems` defaults to those that carry a relative clock in the solutions. */
export function epochRows(solutions: readonly EpochSolution[], systems?: readonly GnssSystem[]): CsvTable {
  const sys = systems ?? systemsWithClocks(solutions);
  return { header: epochColumns(sys), rows: solutions.map((s) => epochRow(s, sys)) };
}

export interface CsvPreambleInput {
  readonly frame: FrameEpoch;
  readonly pointReference: PointReference;
  /** Further free-text lines (each becomes one '# ' line). */
  readonly notes?: readonly string[];
}

/**
 * The '#' comment lines written above the column names. A reader skips lines starting with '#'
 * before the header (pandas comment='#', R read.csv comment.char='#'; common practice).
 */
export function csvPreamble(meta: CsvPreambleInput): string[] {
  const lines = [
    `# refdelta per-epoch positions`,
    `# frame: ${frameWords(meta.frame)}; position refers to: ${pointReferenceWords(meta.pointReference)}`,
    `# heights are ellipsoidal (GRS80/WGS-84 ellipsoid); times: gps_tow_s is estimated GPS time, epoch_tag_tow_s the receiver's tag`,
  ];
  for (const n of meta.notes ?? []) lines.push(`# ${n.replace(/[\r\n]+/g, ' ')}`);
  return lines;
}
