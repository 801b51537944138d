/**
 * A marks file for `check` and for a reference mark: a control list (control-csv.ts) or a points table
 * written by `refdelta points` (report/points-csv.ts), recognised by its header. One schema for points
 * out and marks in: a point computed in one run (a base occupied against a CORS) is a mark for the next.
 * A point's precision (sigma_mean_*) becomes the mark's accuracy.
 */
import { InputError, type WarningSink } from '../errors.js';
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

/**
 * Marks are matched to points by name (trimmed, case-insensitive: match-marks.ts), so a name given twice
 * would leave one of its rows unused without a word: it is an error naming both lines.
 */
export function requireUniqueMarkNames(file: string, marks: readonly ControlMark[]): void {
  const seen = new Map<string, ControlMark>();
  for (const m of marks) {
    const key = m.name.trim().toLowerCase();
    const first = seen.get(key);
    if (first) {
      const twice = first.name === m.name ? `the mark name '${m.name}' is given twice` : `the mark names '${first.name}' and '${m.name}' are one name (names are compared without case)`;
      throw new InputError(file, m.line, `${twice}, on lines ${first.line} and ${m.line}: marks are matched by name, give each mark one row with its own name`);
    }
    seen.set(key, m);
  }
}

export function parseMarksFile(file: string, text: string, onWarning?: WarningSink, lookup?: EpsgLookup): ControlMark[] {
  const marks = readMarks(file, text, onWarning, lookup);
  requireUniqueMarkNames(file, marks);
  return marks;
}

function readMarks(file: string, text: string, onWarning?: WarningSink, lookup?: EpsgLookup): ControlMark[] {
  if (!isPointsTable(text)) return parseControlCsv(file, text, onWarning, lookup);
  return parsePointsCsv(file, text).map((p) => ({
    name: p.name, position: p.position, file, line: p.line,
    ...(p.sigmaMeanHorizontalM !== undefined ? { accuracyHorizontalM: p.sigmaMeanHorizontalM } : {}),
    ...(p.sigmaMeanUpM !== undefined ? { accuracyVerticalM: p.sigmaMeanUpM } : {}),
  }));
}
