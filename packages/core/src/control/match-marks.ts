/**
 * Pairs logged points with control marks: first by name (trimmed, case-insensitive), then the remaining
 * ones by horizontal proximity within a radius (default 5 m: our choice, above the ~1-2 m error of code
 * differential points (check-values.md "Accuracy facts") and below the usual spacing of survey marks,
 * tens of metres). Proximity pairs are taken closest first, each mark and point at most once.
 * Distances are horizontal (ENU at the mark), computed on the coordinates as given: frame differences
 * (up to ~1 m) are far below the radius; the frame rule is applied by compareToMark.
 */
import type { FramedEcef } from '../gnss/index.js';
import { ecefToEnu } from '../geodesy/index.js';
import type { ControlMark } from './control-csv.js';

export interface NamedPoint {
  readonly name: string;
  readonly position: FramedEcef;
}

export interface MarkMatch<P extends NamedPoint = NamedPoint> {
  readonly point: P;
  readonly mark: ControlMark;
  readonly by: 'name' | 'proximity';
  readonly horizontalDistanceM: number;
}

import { DEFAULT_MATCH_RADIUS_M } from './match-radius.js';
export { DEFAULT_MATCH_RADIUS_M };

const key = (s: string) => s.trim().toLowerCase();

function horizontalM(p: FramedEcef, m: ControlMark): number {
  const v = ecefToEnu(p.ecef, m.position.ecef);
  return Math.hypot(v.e, v.n);
}

export function matchPointsToMarks<P extends NamedPoint>(points: readonly P[], marks: readonly ControlMark[], radiusM = DEFAULT_MATCH_RADIUS_M): MarkMatch<P>[] {
  const out: MarkMatch<P>[] = [];
  const usedMarks = new Set<ControlMark>();
  const usedPoints = new Set<P>();
  const byName = new Map<string, ControlMark>();
  for (const m of marks) if (!byName.has(key(m.name))) byName.set(key(m.name), m);
  for (const p of points) {
    const m = byName.get(key(p.name));
    if (m && !usedMarks.has(m)) {
      out.push({ point: p, mark: m, by: 'name', horizontalDistanceM: horizontalM(p.position, m) });
      usedMarks.add(m);
      usedPoints.add(p);
    }
  }
  const candidates: Array<{ p: P; m: ControlMark; d: number }> = [];
  for (const p of points) {
    if (usedPoints.has(p)) continue;
    for (const m of marks) {
      if (usedMarks.has(m)) continue;
      const d = horizontalM(p.position, m);
      if (d <= radiusM) candidates.push({ p, m, d });
    }
  }
  candidates.sort((a, b) => a.d - b.d);
  for (const c of candidates) {
    if (usedPoints.has(c.p) || usedMarks.has(c.m)) continue;
    out.push({ point: c.p, mark: c.m, by: 'proximity', horizontalDistanceM: c.d });
    usedPoints.add(c.p);
    usedMarks.add(c.m);
  }
  return out;
}
