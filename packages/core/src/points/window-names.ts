/**
 * The point name of each epoch when the occupations come from windows (occupation-csv.ts): the name of
 * the window holding the epoch's tag time, as the per-point means count it (start and end included, with
 * the same tolerance). Outside every window an epoch belongs to no point (''); an epoch inside several
 * overlapping windows is counted in each of their points, so it carries every name, joined by ' + '.
 */
import type { OccupationWindow } from './occupation-csv.js';

/**
 * How far outside its window an epoch's tag may be and still belong to it: receivers tag epochs up to a
 * few milliseconds off the whole second their windows are written at (common practice).
 */
export const WINDOW_TAG_TOLERANCE_S = 0.01;

/** What joins the names of overlapping windows in one cell. */
export const OVERLAPPING_WINDOWS_JOINER = ' + ';

export class WindowPointNames {
  private readonly names: string[] = [];
  private readonly startGpsS: Float64Array;
  private readonly endGpsS: Float64Array;

  /** `source` names where the windows come from (a file name), for the outputs' metadata. */
  constructor(windows: readonly OccupationWindow[], readonly source: string) {
    const sorted = [...windows].sort((a, b) => a.startGpsS - b.startGpsS);
    this.startGpsS = new Float64Array(sorted.length);
    this.endGpsS = new Float64Array(sorted.length);
    sorted.forEach((w, i) => {
      this.names.push(w.name);
      this.startGpsS[i] = w.startGpsS;
      this.endGpsS[i] = w.endGpsS;
    });
  }

  /** The name of the window(s) holding the instant (GPS seconds), '' when none does. */
  nameAt(tGpsS: number): string {
    let found = '';
    // Windows are few (tens): a scan, stopped at the first window starting after the instant.
    for (let i = 0; i < this.names.length && this.startGpsS[i] - WINDOW_TAG_TOLERANCE_S <= tGpsS; i++) {
      if (tGpsS > this.endGpsS[i] + WINDOW_TAG_TOLERANCE_S) continue;
      found = found === '' ? this.names[i]! : found + OVERLAPPING_WINDOWS_JOINER + this.names[i]!;
    }
    return found;
  }

  /** The metadata sentence saying what the point column holds. */
  note(): string {
    return `point: the name of the occupation window of ${this.source} holding the epoch's time tag (start and end included, within 0.01 s), as the per-point results count it; empty outside every window; an epoch inside overlapping windows carries each of their names joined by '${OVERLAPPING_WINDOWS_JOINER}'`;
  }
}
