/**
 * The per-epoch CSV as the CLI writes it: the core's columns (report/epoch-rows.ts) with the frame of
 * each row's position (`frame`, `frame_epoch`) put before the coordinates. Differential and smoothed
 * rows are in the frame of the reference coordinate; standalone rows (--fallback-standalone) are in the
 * frame of the broadcast orbits ('WGS84 (broadcast orbits)', session/solve-session.ts), so one frame
 * line in the preamble cannot describe every row.
 */
import { epochColumns, epochRow, frameEpochText, type EpochSolution, type GnssSystem } from '@refdelta/core';

const BEFORE = 'latitude_deg';

/** Carrier-phase columns, last: the ratio test statistic and the number of fixed ambiguities (empty for code rows). */
const CARRIER_COLUMNS = ['ratio', 'fixed_ambiguities'];

export function epochTableColumns(systems: readonly GnssSystem[]): string[] {
  const c = epochColumns(systems);
  const i = c.indexOf(BEFORE);
  return [...c.slice(0, i), 'frame', 'frame_epoch', ...c.slice(i), ...CARRIER_COLUMNS];
}

function carrierCells(s: EpochSolution): string[] {
  const c = s as EpochSolution & { ratio?: number; fixedAmbiguities?: number };
  if (c.fixedAmbiguities === undefined) return ['', ''];
  return [Number.isFinite(c.ratio) ? (c.ratio! >= 1e4 ? '>10000' : c.ratio!.toFixed(2)) : '', String(c.fixedAmbiguities)];
}

/** One row aligned with epochTableColumns(systems); frame cells are empty when the epoch has no position. */
export function epochTableRow(s: EpochSolution, systems: readonly GnssSystem[]): string[] {
  const r = epochRow(s, systems);
  const i = epochColumns(systems).indexOf(BEFORE);
  const f = s.position && s.kind !== 'none' ? s.position.frame : null;
  return [...r.slice(0, i), f ? f.name : '', f ? frameEpochText(f.epochYear) : '', ...r.slice(i), ...carrierCells(s)];
}

/** The preamble line that says which rows are in another frame (only when standalone rows can occur). */
export function standaloneFrameNote(): string {
  return "rows of solution 'standalone' are in the frame of the broadcast orbits (WGS84 (broadcast orbits), at the epoch of observation), not in the frame above: see the frame and frame_epoch columns";
}
