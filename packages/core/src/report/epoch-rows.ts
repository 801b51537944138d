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

/** One epoch as CSV cells aligned with epochColumns(systems). */
export function epochRow(s: EpochSolution, systems: readonly GnssSystem[]): string[] {
  const t = weekTowFromGpsS(s.timeGpsS);
  const tag = weekTowFromGpsS(s.tagGpsS);
  const g = s.geodetic;
  const p = s.position?.ecef ?? null;
  const b = s.baselineEcef;
  const e = s.baselineEnu;
  const q = s.quality;
  const ordered = GNSS_SYSTEMS.filter((x) => systems.includes(x));
  return [
    String(t.week),
    fixed(t.towS, 3),
    isoFromSeconds(gpsToUtcS(s.timeGpsS), 'Z'),
    fixed(tag.towS, 3),
    s.pointName,
    s.kind,
    // 1e-9 deg is 0.1 mm: more than the data hold, so the CSV never limits precision.
    g ? fixed(radToDeg(g.latRad), 9) : '',
    g ? fixed(radToDeg(g.lonRad), 9) : '',
    g ? fixed(g.heightM, 4) : '',
    p ? fixed(p.x, 4) : '', p ? fixed(p.y, 4) : '', p ? fixed(p.z, 4) : '',
    e ? fixed(e.e, 4) : '', e ? fixed(e.n, 4) : '', e ? fixed(e.u, 4) : '',
    b ? fixed(Math.hypot(b.x, b.y, b.z), 4) : '',
    ...ordered.map((x) => fixed(s.relativeClockM[x], 4)),
    String(s.satellitesUsed),
    fixed(s.dops?.pdop, 2), fixed(s.dops?.hdop, 2), fixed(s.dops?.vdop, 2),
    fixed(s.sigmaEnuM?.e, 4), fixed(s.sigmaEnuM?.n, 4), fixed(s.sigmaEnuM?.u, 4),
    fixed(q?.varianceFactor, 4), fixed(q?.chiSquare, 4), fixed(q?.critical, 4),
    fixed(s.correctionAgeS, 3),
    fixed(s.speedMS, 3),
    fixed(s.antennaHeightM, 4),
    s.reason,
  ];
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
