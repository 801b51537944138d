/**
 * A marks file for `check` and for a reference mark: a control list (control-csv.ts) or a points table
 * written by `refdelta points` (report/points-csv.ts), recognised by its header. One schema for points
 * out and marks in: a point computed in one run (a base occupied against a CORS) is a mark for the next.
 * A point's precision (sigma_mean_*) becomes the mark's accuracy.
 */
import type { WarningSink } from '../errors.js';
import { csvRecords } from '../csv/index.js';
import { parsePointsCsv } from '../report/points-csv.js';
import type { EpsgLookup } from '../projection/index.js';
import { parseControlCsv, type ControlMark } from './control-csv.js';

/** True when the first record of the text is a points-table header (ecef_x_m, frame_epoch...). */
export function isPointsTable(text: string): boolean {
  const first = csvRecords(text)[0];
  if (!first) return false;
  const h = first.fields.map((f) => f.toLowerCase());
  return ['name', 'ecef_x_m', 'ecef_y_m', 'ecef_z_m', 'frame', 'frame_epoch'].every((c) => h.includes(c));
}

export function parseMarksFile(file: string, text: string, onWarning?: WarningSink, lookup?: EpsgLookup): ControlMark[] {
  if (!isPointsTable(text)) return parseControlCsv(file, text, onWarning, lookup);
  return parsePointsCsv(file, text).map((p) => ({
    name: p.name, position: p.position, file, line: p.line,
    ...(p.sigmaMeanHorizontalM !== undefined ? { accuracyHorizontalM: p.sigmaMeanHorizontalM } : {}),
    ...(p.sigmaMeanUpM !== undefined ? { accuracyVerticalM: p.sigmaMeanUpM } : {}),
  }));
}
