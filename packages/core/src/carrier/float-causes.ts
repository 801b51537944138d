/**
 * Why a pass left an epoch float or unsolved, as a numeric code with two numbers (EpochResult.cause,
 * causeA, causeB), recorded per epoch by the filter (float-filter.ts) and kept per pass (pass-results.ts);
 * the words are made only where an epoch is reported (SolutionWriter), from these functions.
 */

/** No cause recorded: the pass fixed the epoch (or the epoch had no pass). */
export const CAUSE_NONE = 0;
/** More than half of the arcs started or ended at this epoch: no fix tried. causeA arc starts and ends (a restarted arc counts twice), causeB arcs before or after (the larger). */
export const CAUSE_DISTURBED = 1;
/** Fewer fixable double-difference ambiguities than the minimum. causeA fixable, causeB the minimum. */
export const CAUSE_TOO_FEW_AMBIGUITIES = 2;
/** The integer search's best candidate failed the ratio test. causeA the best ratio over the subsets tried. */
export const CAUSE_RATIO = 3;
/** A subset passed the ratio test but its success rate was below the minimum. causeA the ratio. */
export const CAUSE_SUCCESS_RATE = 4;
/** The integer search gave no candidate (singular covariance of the ambiguities). */
export const CAUSE_SEARCH_FAILED = 5;
/** The fixed integers could not be applied to the position (singular covariance of the fixed subset). */
export const CAUSE_CONDITIONING_FAILED = 6;
/** No solution: too few satellites used. causeA satellites used, causeB needed (4 + one clock per constellation). */
export const CAUSE_TOO_FEW_SATELLITES = 7;

/** What the words of a cause need from the options. */
export interface CauseLimits {
  readonly ratioThreshold: number;
  readonly minSuccessRate: number;
}

/** A number in words: at most two decimals, no trailing zeros (3 -> '3', 2.5 -> '2.5', 2.963 -> '2.96'). */
function short(x: number): string {
  return String(Math.round(x * 100) / 100);
}

/**
 * One pass's cause for a float epoch, in words ('' for none); `where` goes after the cause's head, before
 * its numbers in brackets (' in both passes').
 */
export function floatCauseText(cause: number, a: number, b: number, limits: CauseLimits, where = ''): string {
  switch (cause) {
    case CAUSE_DISTURBED: return `tracking disturbed${where} (${a} arc starts and ends, more than half of the ${b} arcs): no fix tried`;
    case CAUSE_TOO_FEW_AMBIGUITIES: return `too few ambiguities to fix${where} (${a}, need ${b})`;
    case CAUSE_RATIO: return Number.isFinite(a) ? `ratio test below ${short(limits.ratioThreshold)}${where} (${a.toFixed(2)})` : `integer search found no candidate${where}`;
    case CAUSE_SUCCESS_RATE: return `fix success rate below ${short(100 * limits.minSuccessRate)} %${where} (ratio test passed: ${a.toFixed(2)})`;
    case CAUSE_SEARCH_FAILED: return `integer search found no candidate${where}`;
    case CAUSE_CONDITIONING_FAILED: return `fixed integers could not be applied${where} (singular covariance)`;
    default: return '';
  }
}

/** The passes' names. */
const PASS = ['forward', 'backward'] as const;

/**
 * Why a combined epoch is float, from the two passes' kinds (0 none, 1 float, 2 fixed) and causes
 * (combine-passes.ts decides the kind; this only says why).
 */
export function combinedFloatReason(
  kinds: readonly [number, number], causes: readonly [number, number], as: readonly [number, number], bs: readonly [number, number], limits: CauseLimits,
): string {
  const text = (p: 0 | 1, where = '') => floatCauseText(causes[p], as[p], bs[p], limits, where);
  if (kinds[0] === 2 && kinds[1] === 2) return 'forward and backward fixes disagree';
  if (kinds[0] === 2 || kinds[1] === 2) {
    const fixed: 0 | 1 = kinds[0] === 2 ? 0 : 1, other: 0 | 1 = fixed === 0 ? 1 : 0;
    const why = text(other);
    return `${PASS[fixed]} fix not confirmed by the ${PASS[other]} pass, whose float position differs beyond its precision${why ? ` (${PASS[other]} float: ${why})` : ''}`;
  }
  if (kinds[0] === 1 && kinds[1] === 1) {
    if (causes[0] === causes[1]) {
      if (causes[0] === CAUSE_RATIO && Number.isFinite(as[0]) && Number.isFinite(as[1])) return `ratio test below ${short(limits.ratioThreshold)} in both passes (forward ${as[0].toFixed(2)}, backward ${as[1].toFixed(2)})`;
      if (text(0) === text(1) && text(0) !== '') return text(0, ' in both passes');
    }
    return `forward: ${text(0) || 'no cause recorded'}; backward: ${text(1) || 'no cause recorded'}`;
  }
  // One pass only solved the epoch.
  const p: 0 | 1 = kinds[0] === 1 ? 0 : 1;
  return `only the ${PASS[p]} pass has a solution, float: ${text(p) || 'no cause recorded'}`;
}

/** Satellites of an unsolved epoch, counted from its records (SolutionWriter). */
export interface SatelliteShortfall {
  /** Satellites used (the better pass), and needed. */
  readonly used: number;
  readonly needed: number;
  /** Satellites both receivers have above the horizon, and of those below the elevation mask. */
  readonly common: number;
  readonly belowMask: number;
  readonly maskDeg: number;
}

/**
 * Why an epoch has no solution when it had satellites: how many were usable against how many are needed,
 * and the main cause (the elevation mask when the satellites it left out would have been enough).
 */
export function tooFewSatellitesReason(s: SatelliteShortfall): string {
  const mask = short(s.maskDeg);
  if (s.belowMask > 0 && s.used + s.belowMask >= s.needed) {
    return `too few satellites above the elevation mask (${s.used} usable above ${mask} deg, need ${s.needed}; ${s.belowMask} below it)`;
  }
  const below = s.belowMask > 0 ? `, ${s.belowMask} of them below the ${mask} deg elevation mask` : '';
  return `too few satellites (${s.used} usable, need ${s.needed}; ${s.common} common to rover and reference${below})`;
}
