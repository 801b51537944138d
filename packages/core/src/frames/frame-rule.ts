/**
 * The rule for comparing two coordinates (a computed point and a control mark, a reference station and
 * a result...):
 *
 * 1. Either frame 'unstated': the comparison goes ahead with a warning ('frame-unstated'): nothing can be
 *    transformed, and frames differ by up to about a metre (e.g. ETRF2000 vs ITRF2014 in Europe, 2018).
 * 2. Same frame (normalised names): fine.
 * 3. Different frames: refused with a ProcessingError naming both frames, unless the configured
 *    parameter sets give a path (one or two hops, frame-path.ts); then the point is transformed at its
 *    own epoch into the reference's frame.
 * 4. Same frame, different epochs: a warning ('frame-epoch-differs') unless velocities were given:
 *    stations move a few cm per year in ITRF/WGS 84 (plate motion), about 1 mm per year or less in a
 *    plate-fixed frame (ETRF, NAD83): sizes are common practice figures used only in the message.
 */
import type { EcefM, FramedEcef } from '../gnss/index.js';
import { ProcessingError, type WarningSink } from '../errors.js';
import type { HelmertParams } from './helmert.js';
import { isPlateFixedFrame, normaliseFrameName, UNSTATED_FRAME } from './frame-names.js';
import { findTransformPath, transformToFrame } from './frame-path.js';

export interface FrameRuleOptions {
  /** Configured parameter sets; none by default (different frames are then refused). */
  readonly transformations?: readonly HelmertParams[];
  /** True when station velocities were applied, so epoch differences are accounted for. */
  readonly velocitiesGiven?: boolean;
  /** Epoch differences up to this many years are not reported (default 0.01 yr, about 4 days). */
  readonly epochToleranceYear?: number;
  readonly onWarning?: WarningSink;
  /** Label for messages, e.g. 'point P7 vs mark CM-North'. */
  readonly context?: string;
}

/** Typical horizontal station speed (m/yr) used to size the epoch warning: common practice figures. */
function typicalSpeedMPerYr(frameName: string): number {
  return isPlateFixedFrame(frameName) ? 0.001 : 0.03;
}

/**
 * Expresses `point` in the frame of `reference` following the rule above; returns it (transformed or
 * not). Throws ProcessingError when the frames differ and no transformation is configured.
 */
export function bringToFrameOf(point: FramedEcef, reference: FramedEcef, opts: FrameRuleOptions = {}): FramedEcef {
  const a = normaliseFrameName(point.frame.name);
  const b = normaliseFrameName(reference.frame.name);
  const ctx = opts.context ? `${opts.context}: ` : '';
  if (a === UNSTATED_FRAME || b === UNSTATED_FRAME) {
    opts.onWarning?.({
      code: 'frame-unstated',
      message: `${ctx}a coordinate's frame is not stated (${a} vs ${b}): compared as given; frames can differ by up to about a metre`,
    });
    return point;
  }
  let out = point;
  if (a !== b) {
    const sets = opts.transformations ?? [];
    if (!findTransformPath(a, b, sets)) {
      throw new ProcessingError(
        `${ctx}refusing to compare a coordinate in ${a} with one in ${b}: the frames differ (by up to about a metre). ` +
          `Configure a transformation from ${a} to ${b} (a Helmert parameter set, JSON with from, to, epoch, t_mm, d_ppb, r_mas and rates, ` +
          'directly or via one shared frame), or give both coordinates in the same frame',
      );
    }
    out = transformToFrame(point, b, sets);
  }
  const dtYear = Math.abs(point.frame.epochYear - reference.frame.epochYear);
  if (!opts.velocitiesGiven && dtYear > (opts.epochToleranceYear ?? 0.01)) {
    const motionCm = typicalSpeedMPerYr(b) * dtYear * 100;
    opts.onWarning?.({
      code: 'frame-epoch-differs',
      message:
        `${ctx}epochs differ by ${dtYear.toFixed(2)} years (${point.frame.epochYear.toFixed(2)} vs ${reference.frame.epochYear.toFixed(2)}) in ${b}: ` +
        `stations move, up to about ${motionCm.toFixed(1)} cm over that time in this frame; the coordinates are compared as given (no station velocities are applied)`,
    });
  }
  return out;
}

/** Moves a coordinate along a constant ECEF velocity (m/yr) to another epoch (linear station motion). */
export function propagateToEpoch(p: FramedEcef, velocityMPerYr: EcefM, toEpochYear: number): FramedEcef {
  const dt = toEpochYear - p.frame.epochYear;
  return {
    ecef: { x: p.ecef.x + velocityMPerYr.x * dt, y: p.ecef.y + velocityMPerYr.y * dt, z: p.ecef.z + velocityMPerYr.z * dt },
    frame: { name: p.frame.name, epochYear: toEpochYear },
  };
}
