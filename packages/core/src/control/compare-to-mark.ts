/**
 * Difference of a computed point from a control mark, in ENU at the mark (point - mark), after the
 * frame rule of frames/frame-rule.ts (different frames refused unless a transformation is configured;
 * epoch differences and unstated frames warned).
 *
 * pass = horizontal <= toleranceHorizontalM and |dU| <= toleranceVerticalM (defaults 1.0 m and 2.0 m:
 * our choice, about the 1-sigma code-differential level, check-values.md "Accuracy facts").
 * A mark whose own accuracy is not at least three times better than the tolerance gets a warning
 * (NSSDA, FGDC-STD-007.3-1998 section 3.2.1: check points at least three times more accurate).
 */
import type { FramedEcef } from '../gnss/index.js';
import type { WarningSink } from '../errors.js';
import { ecefDeltaToEnu, ecefToGeodetic } from '../geodesy/index.js';
import { bringToFrameOf, type FrameRuleOptions } from '../frames/index.js';
import { ellipsoidForFrame, type ControlMark } from './control-csv.js';

export interface CompareOptions extends FrameRuleOptions {
  readonly toleranceHorizontalM?: number;
  readonly toleranceVerticalM?: number;
  readonly onWarning?: WarningSink;
}

export interface MarkComparison {
  readonly dE: number;
  readonly dN: number;
  readonly dU: number;
  readonly horizontalM: number;
  readonly threeDM: number;
  readonly pass: boolean;
  /** Frame the comparison was made in (the mark's). */
  readonly frame: string;
}

export function compareToMark(point: FramedEcef, mark: ControlMark, opts: CompareOptions = {}): MarkComparison {
  const tolH = opts.toleranceHorizontalM ?? 1.0;
  const tolV = opts.toleranceVerticalM ?? 2.0;
  const p = bringToFrameOf(point, mark.position, { ...opts, context: opts.context ?? `mark ${mark.name}` });
  const m = mark.position.ecef;
  const g = ecefToGeodetic(m, ellipsoidForFrame(mark.position.frame.name));
  const v = ecefDeltaToEnu({ x: p.ecef.x - m.x, y: p.ecef.y - m.y, z: p.ecef.z - m.z }, g.latRad, g.lonRad);
  const horizontalM = Math.hypot(v.e, v.n);
  if ((mark.accuracyHorizontalM !== undefined && mark.accuracyHorizontalM * 3 > tolH) || (mark.accuracyVerticalM !== undefined && mark.accuracyVerticalM * 3 > tolV)) {
    opts.onWarning?.({
      file: mark.file,
      line: mark.line,
      code: 'control-not-accurate-enough',
      message: `mark ${mark.name}: its accuracy is not three times better than the tolerance (NSSDA 3.2.1)`,
    });
  }
  return {
    dE: v.e,
    dN: v.n,
    dU: v.u,
    horizontalM,
    threeDM: Math.hypot(horizontalM, v.u),
    pass: horizontalM <= tolH && Math.abs(v.u) <= tolV,
    frame: p.frame.name,
  };
}
