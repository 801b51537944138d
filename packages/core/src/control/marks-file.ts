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

/** A mark read from a points table, with the session its row came from (batch-points.csv's session column). */
interface TableMark {
  readonly mark: ControlMark;
  readonly session?: string;
}

/**
 * What to do about a name that a points table gives twice: a batch's batch-points.csv lists a mark
 * occupied in two sessions once per session, and only one row can be the mark.
 */
function pointsTableAdvice(name: string, first: TableMark, second: TableMark): string {
  const where = (t: TableMark) => `line ${t.mark.line}${t.session ? ` (session ${t.session})` : ''}`;
  const renamed = second.session ? `${second.session}/${name}` : `${name}-2`;
  return `the point '${name}' is in this points table twice, on ${where(first)} and ${where(second)}, and marks are matched by name: ` +
    `keep one row of '${name}' for the mark and delete the other, or give the other its own name, such as '${renamed}'`;
}

/**
 * Marks are matched to points by name (trimmed, case-insensitive: match-marks.ts), so a name given twice
 * would leave one of its rows unused without a word: it is an error naming both lines. A points table
 * given as a marks file (a batch occupies a mark in several sessions) is told what to keep.
 */
export function requireUniqueMarkNames(file: string, marks: readonly ControlMark[], sessions?: readonly (string | undefined)[]): void {
  const seen = new Map<string, number>();
  marks.forEach((m, i) => {
    const key = m.name.trim().toLowerCase();
    const j = seen.get(key);
    if (j !== undefined) {
      const first = marks[j]!;
      if (sessions) throw new InputError(file, m.line, pointsTableAdvice(m.name, { mark: first, session: sessions[j] }, { mark: m, session: sessions[i] }));
      const twice = first.name === m.name ? `the mark name '${m.name}' is given twice` : `the mark names '${first.name}' and '${m.name}' are one name (names are compared without case)`;
      throw new InputError(file, m.line, `${twice}, on lines ${first.line} and ${m.line}: marks are matched by name, give each mark one row with its own name`);
    }
    seen.set(key, i);
  });
}

export function parseMarksFile(file: string, text: string, onWarning?: WarningSink, lookup?: EpsgLookup): ControlMark[] {
  if (!isPointsTable(text)) {
    const marks = parseControlCsv(file, text, onWarning, lookup);
    requireUniqueMarkNames(file, marks);
    return marks;
  }
  const rows = parsePointsCsv(file, text);
  const marks = rows.map((p): ControlMark => ({
    name: p.name, position: p.position, file, line: p.line,
    ...(p.sigmaMeanHorizontalM !== undefined ? { accuracyHorizontalM: p.sigmaMeanHorizontalM } : {}),
    ...(p.sigmaMeanUpM !== undefined ? { accuracyVerticalM: p.sigmaMeanUpM } : {}),
  }));
  requireUniqueMarkNames(file, marks, rows.map((p) => p.session || undefined));
  return marks;
}
