/** Errors of solutions against a truth trajectory matched by time (for the demo and the real-data tests). */
import type { EcefM, EnuM } from '../gnss/index.js';
import type { EpochSolution } from '../session/index.js';
import { ecefToGeodetic, ecefDeltaToEnu } from '../geodesy/index.js';
import { horizontalVerticalStats, type HorizontalVerticalStats } from './statistics.js';

export interface TruthPoint {
  readonly gpsS: number;
  readonly ecef: EcefM;
}

/**
 * ENU errors (solution minus truth, rotated at the truth point) of every solution with a position whose
 * time is within `toleranceS` of a truth point. Times are matched on the epoch tag rounded to the
 * nearest truth time.
 */
export function errorsAgainstTruth(
  solutions: Iterable<EpochSolution>,
  truth: readonly TruthPoint[],
  toleranceS = 0.5,
  kinds: readonly string[] = ['differential', 'smoothed'],
): EnuM[] {
  const sorted = [...truth].sort((a, b) => a.gpsS - b.gpsS);
  const out: EnuM[] = [];
  for (const s of solutions) {
    if (!s.position || !kinds.includes(s.kind)) continue;
    const t = nearest(sorted, s.tagGpsS);
    if (!t || Math.abs(t.gpsS - s.tagGpsS) > toleranceS) continue;
    const g = ecefToGeodetic(t.ecef);
    const p = s.position.ecef;
    out.push(ecefDeltaToEnu({ x: p.x - t.ecef.x, y: p.y - t.ecef.y, z: p.z - t.ecef.z }, g.latRad, g.lonRad));
  }
  return out;
}

function nearest(sorted: readonly TruthPoint[], t: number): TruthPoint | null {
  let lo = 0;
  let hi = sorted.length - 1;
  if (hi < 0) return null;
  while (hi - lo > 1) {
    const mid = (lo + hi) >> 1;
    if (sorted[mid].gpsS <= t) lo = mid; else hi = mid;
  }
  return Math.abs(sorted[lo].gpsS - t) <= Math.abs(sorted[hi].gpsS - t) ? sorted[lo] : sorted[hi];
}

export function truthStatistics(errors: readonly EnuM[]): HorizontalVerticalStats {
  return horizontalVerticalStats(errors);
}
