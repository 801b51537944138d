/**
 * Several --reference files are one station's consecutive files (hourly CORS files): they are joined into
 * one reference receiver, so files of two stations would mix two coordinates under one. Files that
 * cannot be of one station are refused before the run; a file given twice is read once.
 */
import { realpath } from 'node:fs/promises';
import type { ObsHeader, Warning } from '@refdelta/core';
import { distanceWords, usableHeaderPosition } from './reference-position.js';
import { UsageError } from './usage-error.js';

/**
 * Header positions of one station's files farther apart than this are of two stations. A network's
 * hourly files carry one header coordinate (written from the station's configuration: the six hourly
 * files of the real CORS data, cors-and-rover-2018-277/reference, carry the same digits); a receiver writing its own standalone
 * fix in each file differs by tens of metres at most (REFERENCE_HEADER_TOLERANCE_M, 100 m, is the margin
 * taken for one such header). 500 m lies beyond two such headers' disagreement with room to spare, and
 * below the spacing of permanent stations (tens of kilometres; a few kilometres in the densest
 * networks; common practice, from memory).
 */
export const ONE_STATION_HEADER_DISTANCE_M = 500;

export interface ReferenceFile {
  readonly path: string;
  readonly header: ObsHeader;
}

/** The reference paths with a file given twice (the same file, by whichever path) kept once, and a warning for each repeat. */
export async function distinctReferencePaths(paths: readonly string[], warn: (w: Warning) => void): Promise<string[]> {
  const seen = new Map<string, string>();
  const kept: string[] = [];
  for (const p of paths) {
    const real = await realpath(p).catch(() => p);
    const first = seen.get(real);
    if (first === undefined) {
      seen.set(real, p);
      kept.push(p);
      continue;
    }
    warn({
      file: p, line: 0, code: 'reference-file-repeated',
      message: `given twice with --reference (${first === p ? 'the same path' : `also as ${first}`}): read once; if another file was meant (the next hour's?), give that one`,
    });
  }
  return kept;
}

/** What makes two reference files two stations' files, in words; null when they may be one station's. */
export function stationDifference(a: ReferenceFile, b: ReferenceFile): string | null {
  const nameA = a.header.markerName.trim(), nameB = b.header.markerName.trim();
  // Compared by the four-character station id, without case: RINEX 2 files name a station 'GLW1' or
  // 'glw1', RINEX 3 ones 'GLW100USA' (the 9-character id begins with the 4-character one; RINEX 3.04 4.1).
  if (nameA && nameB && nameA.slice(0, 4).toUpperCase() !== nameB.slice(0, 4).toUpperCase()) return `MARKER NAME '${nameA}' and '${nameB}'`;
  const pa = usableHeaderPosition(a.header.approxPosition), pb = usableHeaderPosition(b.header.approxPosition);
  if (pa && pb) {
    const m = Math.hypot(pa.x - pb.x, pa.y - pb.y, pa.z - pb.z);
    if (m > ONE_STATION_HEADER_DISTANCE_M) return `APPROX POSITION XYZ ${distanceWords(m)} apart`;
  }
  return null;
}

/** Every reference file must be of the first file's station: a usage error naming both files and what differs. */
export function requireOneStation(files: readonly ReferenceFile[]): void {
  const first = files[0];
  if (!first) return;
  for (const f of files.slice(1)) {
    const d = stationDifference(first, f);
    if (d) {
      throw new UsageError(`the --reference files ${first.path} and ${f.path} are of two stations (${d}): several --reference files are joined as one station's consecutive files; give one station's files (another station is another run)`);
    }
  }
}
