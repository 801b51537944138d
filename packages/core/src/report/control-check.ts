/**
 * The control-mark check: logged points matched to published marks (control/match-marks.ts: by name,
 * else by horizontal proximity within the radius, default 5 m), each pair compared in ENU at the mark
 * under the frame rule (control/compare-to-mark.ts, frames/frame-rule.ts: different frames refused
 * unless a transformation is configured), and the NSSDA statistics over all pairs
 * (accuracy/nssda.ts, FGDC-STD-007.3-1998; a warning below 20 check points).
 */
import type { Warning, WarningSink } from '../errors.js';
import type { HelmertParams } from '../frames/index.js';
import { CHI2_1_95, CHI2_2_95, compareToMark, DEFAULT_MATCH_RADIUS_M, matchEveryPoint, testDifference, type ControlMark, type DifferenceTest, type MarkComparison, type NamedPoint, type PointPrecision } from '../control/index.js';
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
  /** The difference tested against the point's precision and the mark's accuracy (control/difference-test.ts). */
  readonly test: DifferenceTest;
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
  /** Pairs whose difference the test rejects at 95 %, and pairs tested (horizontal or vertical). */
  readonly rejected: number;
  readonly tested: number;
}

import { DEFAULT_CHECK_TOLERANCE_H_M, DEFAULT_CHECK_TOLERANCE_V_M } from './tolerances.js';
export { DEFAULT_CHECK_TOLERANCE_H_M, DEFAULT_CHECK_TOLERANCE_V_M };

export function checkAgainstControl(points: readonly (NamedPoint & PointPrecision & { readonly session?: string })[], marks: readonly ControlMark[], opts: ControlCheckOptions = {}): ControlCheckResult {
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
  const pairs: ControlCheckPair[] = matches.map((m) => withTest({
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
  }, m.point, m.mark));
  for (const p of pairs) {
    const t = p.test;
    if (!t.rejectedHorizontal && !t.rejectedVertical) continue;
    const what = [
      ...(t.rejectedHorizontal ? [`horizontal ${p.comparison.horizontalM.toFixed(3)} m, chi-square ${t.chi2Horizontal.toFixed(2)} > ${CHI2_2_95} (2 degrees of freedom; sigma east/north ${t.sigmaEastM.toFixed(3)}/${t.sigmaNorthM.toFixed(3)} m)`] : []),
      ...(t.rejectedVertical ? [`up ${p.comparison.dU.toFixed(3)} m, chi-square ${t.chi2Vertical.toFixed(2)} > ${CHI2_1_95} (1 degree of freedom; sigma up ${t.sigmaUpM.toFixed(3)} m)`] : []),
    ];
    opts.onWarning?.({
      code: 'control-difference-significant',
      message: `${p.session ? `${p.session}/` : ''}${p.pointName} vs mark ${p.markName}: the difference is larger than the point's precision and the mark's accuracy explain (rejected at 95 %): ${what.join('; ')}` +
        `${p.comparison.pass ? '; it is within the tolerance' : ''}: check the mark's published coordinate and the occupation`,
    });
  }
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
    rejected: pairs.filter((p) => p.test.rejectedHorizontal || p.test.rejectedVertical).length,
    tested: pairs.filter((p) => !Number.isNaN(p.test.chi2Horizontal) || !Number.isNaN(p.test.chi2Vertical)).length,
  };
}

function withTest(p: Omit<ControlCheckPair, 'test'>, point: PointPrecision, mark: ControlMark): ControlCheckPair {
  return { ...p, test: testDifference(p.comparison, point, mark) };
}
