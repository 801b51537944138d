/**
 * The control-mark check: logged points matched to published marks (control/match-marks.ts: by name,
 * else by horizontal proximity within the radius, default 5 m), each pair compared in ENU at the mark
 * under the frame rule (control/compare-to-mark.ts, frames/frame-rule.ts: different frames refused
 * unless a transformation is configured), and the NSSDA statistics over all pairs
 * (accuracy/nssda.ts, FGDC-STD-007.3-1998; a warning below 20 check points).
 */
import type { Warning, WarningSink } from '../errors.js';
import type { HelmertParams } from '../frames/index.js';
import { compareToMark, DEFAULT_MATCH_RADIUS_M, matchEveryPoint, type ControlMark, type MarkComparison, type NamedPoint } from '../control/index.js';
import { bringToFrameOf } from '../frames/index.js';
import type { FramedEcef } from '../gnss/index.js';
import { nssdaAccuracy, type NssdaResult } from '../accuracy/index.js';

export interface ControlCheckOptions {
  readonly radiusM?: number;
  readonly toleranceHorizontalM?: number;
  readonly toleranceVerticalM?: number;
  readonly transformations?: readonly HelmertParams[];
  readonly onWarning?: WarningSink;
}

export interface ControlCheckPair {
  /** The batch session of the point, '' when none. */
  readonly session: string;
  readonly pointName: string;
  /** The point in the frame of the comparison (the mark's, after any transformation) and the mark. */
  readonly pointPosition: FramedEcef;
  readonly markPosition: FramedEcef;
  readonly markName: string;
  readonly by: 'name' | 'proximity';
  readonly matchDistanceM: number;
  readonly comparison: MarkComparison;
}

export interface ControlCheckResult {
  readonly pairs: readonly ControlCheckPair[];
  readonly unmatchedPoints: readonly string[];
  readonly unmatchedMarks: readonly string[];
  /** Null when no pair. */
  readonly nssda: NssdaResult | null;
  readonly radiusM: number;
  readonly toleranceHorizontalM: number;
  readonly toleranceVerticalM: number;
  readonly allPass: boolean;
}

import { DEFAULT_CHECK_TOLERANCE_H_M, DEFAULT_CHECK_TOLERANCE_V_M } from './tolerances.js';
export { DEFAULT_CHECK_TOLERANCE_H_M, DEFAULT_CHECK_TOLERANCE_V_M };

export function checkAgainstControl(points: readonly (NamedPoint & { readonly session?: string })[], marks: readonly ControlMark[], opts: ControlCheckOptions = {}): ControlCheckResult {
  const radiusM = opts.radiusM ?? DEFAULT_MATCH_RADIUS_M;
  const tolH = opts.toleranceHorizontalM ?? DEFAULT_CHECK_TOLERANCE_H_M;
  const tolV = opts.toleranceVerticalM ?? DEFAULT_CHECK_TOLERANCE_V_M;
  // Every point is compared (re-occupations of a mark each count); rows grouped by session, in file order within one.
  const matches = matchEveryPoint(points, marks, radiusM, opts.transformations ?? []);
  const sessionOrder = new Map<string, number>();
  for (const p of points) if (!sessionOrder.has(p.session ?? '')) sessionOrder.set(p.session ?? '', sessionOrder.size);
  const order = new Map(points.map((p, i) => [p, i]));
  matches.sort((a, b) => sessionOrder.get(a.point.session ?? '')! - sessionOrder.get(b.point.session ?? '')! || order.get(a.point)! - order.get(b.point)!);
  const inMarkFrame = (p: FramedEcef, m: ControlMark): FramedEcef => {
    try { return bringToFrameOf(p, m.position, { transformations: opts.transformations ?? [] }); } catch { return p; }
  };
  const pairs: ControlCheckPair[] = matches.map((m) => ({
    session: m.point.session ?? '',
    pointName: m.point.name,
    pointPosition: inMarkFrame(m.point.position, m.mark),
    markPosition: m.mark.position,
    markName: m.mark.name,
    by: m.by,
    matchDistanceM: m.horizontalDistanceM,
    comparison: compareToMark(m.point.position, m.mark, {
      toleranceHorizontalM: tolH, toleranceVerticalM: tolV,
      ...(opts.transformations ? { transformations: opts.transformations } : {}),
      ...(opts.onWarning ? { onWarning: opts.onWarning } : {}),
      context: `point ${m.point.name} vs mark ${m.mark.name}`,
    }),
  }));
  const matchedP = new Set(matches.map((m) => m.point));
  const matchedM = new Set(matches.map((m) => m.mark));
  let nssda: NssdaResult | null = null;
  if (pairs.length > 0) {
    nssda = nssdaAccuracy(pairs.map((p) => ({ dEastM: p.comparison.dE, dNorthM: p.comparison.dN, dUpM: p.comparison.dU })));
    for (const w of nssda.warnings) opts.onWarning?.(w as Warning);
  }
  return {
    pairs,
    unmatchedPoints: points.filter((p) => !matchedP.has(p)).map((p) => p.name),
    unmatchedMarks: marks.filter((m) => !matchedM.has(m)).map((m) => m.name),
    nssda, radiusM, toleranceHorizontalM: tolH, toleranceVerticalM: tolV,
    allPass: pairs.every((p) => p.comparison.pass),
  };
}
