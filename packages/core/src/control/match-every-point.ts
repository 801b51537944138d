/**
 * Pairs every logged point with a control mark: a point whose name is a mark's name (trimmed,
 * case-insensitive) is compared with it, however many points share that name (each re-occupation of a
 * mark is a check of its own); a point with no such name is paired with the nearest mark within the
 * radius. Distances are horizontal, in ENU at the mark, computed after the point has been brought into
 * the mark's frame (frames/frame-rule.ts) when a transformation allows it; without one they are taken
 * on the coordinates as given (the comparison itself then refuses the pair).
 */
import type { FramedEcef } from '../gnss/index.js';
import { ecefToEnu } from '../geodesy/index.js';
import { bringToFrameOf, type HelmertParams } from '../frames/index.js';
import type { ControlMark } from './control-csv.js';
import { DEFAULT_MATCH_RADIUS_M, type MarkMatch, type NamedPoint } from './match-marks.js';

const key = (s: string) => s.trim().toLowerCase();

/** The point in the mark's frame when that is possible silently (same frame, or a configured transformation), else as given. */
function inFrameOfMark(p: FramedEcef, m: ControlMark, transformations: readonly HelmertParams[]): FramedEcef {
  try {
    return bringToFrameOf(p, m.position, { transformations });
  } catch {
    return p;
  }
}

function horizontalM(p: FramedEcef, m: ControlMark, transformations: readonly HelmertParams[]): number {
  const v = ecefToEnu(inFrameOfMark(p, m, transformations).ecef, m.position.ecef);
  return Math.hypot(v.e, v.n);
}

export function matchEveryPoint<P extends NamedPoint>(
  points: readonly P[], marks: readonly ControlMark[], radiusM = DEFAULT_MATCH_RADIUS_M, transformations: readonly HelmertParams[] = [],
): MarkMatch<P>[] {
  const byName = new Map<string, ControlMark>();
  for (const m of marks) if (!byName.has(key(m.name))) byName.set(key(m.name), m);
  const out: MarkMatch<P>[] = [];
  for (const p of points) {
    const named = byName.get(key(p.name));
    if (named) {
      out.push({ point: p, mark: named, by: 'name', horizontalDistanceM: horizontalM(p.position, named, transformations) });
      continue;
    }
    let best: { m: ControlMark; d: number } | null = null;
    for (const m of marks) {
      const d = horizontalM(p.position, m, transformations);
      if (d <= radiusM && (!best || d < best.d)) best = { m, d };
    }
    if (best) out.push({ point: p, mark: best.m, by: 'proximity', horizontalDistanceM: best.d });
  }
  return out;
}
