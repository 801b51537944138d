/**
 * The per-epoch table as written: the columns of epoch-rows.ts with the frame of each row's position
 * (`frame`, `frame_epoch`) put before the coordinates. Differential and smoothed rows are in the frame
 * of the reference coordinate; standalone rows are in the frame of the broadcast orbits ('WGS84
 * (broadcast orbits)', session/solve-session.ts), so one frame for the file cannot describe every row.
 * frame_epoch is a decimal-year number (empty when not stated).
 */
import type { GnssSystem } from '../gnss/index.js';
import type { EpochSolution } from '../session/solution-types.js';
import { epochColumns, epochRow } from './epoch-rows.js';
import { jsonNumber } from './format.js';

const BEFORE = 'latitude_deg';
/** Where the frame cells go: before latitude_deg, which comes before any clock column. */
const FRAME_CELLS_AT = epochColumns([]).indexOf(BEFORE);

/**
 * Carrier-phase columns, last: the ratio test statistic, the number of fixed ambiguities and whether the
 * fix rests on ambiguities held from earlier epochs (empty for code rows).
 */
const CARRIER_COLUMNS = ['ratio', 'fixed_ambiguities', 'ambiguities_held'];

/**
 * Ratios above this are written as this value (a number, so the column stays numeric in a GIS). An epoch
 * whose fixed ambiguities were all held from earlier epochs ran no integer search that could give a
 * ratio (its ratio is infinite, float-filter.ts fixAroundHeld): it is written as this value too, so
 * that filtering on ratio >= the threshold keeps every fixed epoch; ambiguities_held tells the two apart.
 */
export const RATIO_CAP = 10000;

export function epochTableColumns(systems: readonly GnssSystem[]): string[] {
  const c = epochColumns(systems);
  const i = c.indexOf(BEFORE);
  return [...c.slice(0, i), 'frame', 'frame_epoch', ...c.slice(i), ...CARRIER_COLUMNS];
}

function carrierCells(s: EpochSolution): string[] {
  const c = s as EpochSolution & { ratio?: number; fixedAmbiguities?: number };
  if (c.fixedAmbiguities === undefined) return ['', '', ''];
  // Held ambiguities describe a fixed epoch only: a float one whose pass held them but could not apply
  // the fix (or whose fix was not taken) has no ratio to show.
  const held = c.ratio === Infinity && s.kind === 'fixed';
  const ratio = c.ratio === Infinity && !held ? NaN : c.ratio ?? NaN;
  // NaN: no search ran and nothing was held (a float epoch with too few ambiguities), an empty cell.
  const ratioCell = Number.isNaN(ratio) ? '' : Math.min(ratio, RATIO_CAP).toFixed(2);
  return [ratioCell, String(c.fixedAmbiguities), held ? '1' : '0'];
}

/** A frame epoch as a CSV cell: the decimal year as a number, '' when not stated. */
export function frameEpochCell(epochYear: number): string {
  const v = jsonNumber(epochYear, 4);
  return v === null ? '' : String(v);
}

/** One row aligned with epochTableColumns(systems); frame cells are empty when the epoch has no position. */
export function epochTableRow(s: EpochSolution, systems: readonly GnssSystem[], pointName: string = s.pointName): string[] {
  const r = epochRow(s, systems, pointName);
  const f = s.position && s.kind !== 'none' ? s.position.frame : null;
  r.splice(FRAME_CELLS_AT, 0, f ? f.name : '', f ? frameEpochCell(f.epochYear) : '');
  r.push(...carrierCells(s));
  return r;
}

/** The metadata note that says which rows are in another frame (only when standalone rows can occur). */
export function standaloneFrameNote(): string {
  return "rows of solution 'standalone' are in the frame of the broadcast orbits (WGS84 (broadcast orbits), at the epoch of observation), not in the frame of the reference coordinate: see the frame and frame_epoch columns";
}
