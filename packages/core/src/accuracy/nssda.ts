/**
 * Positional accuracy against independent check points by the National Standard for Spatial Data
 * Accuracy: FGDC-STD-007.3-1998, Part 3, section 3.2.2 and appendix 3-A.
 *
 * - RMSE_x (east), RMSE_y (north): sqrt(sum d^2 / n) (appendix 3-A); RMSE_r = sqrt(RMSE_x^2 + RMSE_y^2).
 * - Horizontal accuracy at 95 % (section 3.2.2 and appendix 3-A):
 *   when RMSE_min / RMSE_max is between 0.6 and 1.0: Accuracy_r = 1.7308 RMSE_r (method 'circular-1.7308');
 *   otherwise the standard's circular approximation does not hold: we compute the exact 95 % radius of
 *   the bivariate normal error (circular-error.ts; method 'bivariate-normal-exact', our choice) and warn.
 *   The appendix's alternative for unequal components, 2.4477 * 0.5 (RMSE_x + RMSE_y) (Greenwalt &
 *   Schultz 1968), is reported as an extra field (approximation2_4477M), not used for the result.
 * - Vertical: Accuracy_z = 1.9600 RMSE_z.
 * - The standard asks for at least 20 check points (section 3.2.1): fewer gives a warning.
 * Differences are (tested data - check point) in metres, east/north/up.
 */
import type { Warning } from '../errors.js';
import { circularErrorRadiusM } from './circular-error.js';

export interface CheckDifference {
  readonly dEastM: number;
  readonly dNorthM: number;
  /** Omit (or NaN) for horizontal-only checks. */
  readonly dUpM?: number;
}

/** 'approximation-2.4477' is no longer returned (kept in the type for readers of older results). */
export type HorizontalMethod = 'circular-1.7308' | 'approximation-2.4477' | 'bivariate-normal-exact';

export interface NssdaResult {
  readonly n: number;
  readonly rmseEastM: number;
  readonly rmseNorthM: number;
  readonly rmseHorizontalM: number;
  /** NaN when no vertical differences were given. */
  readonly rmseVerticalM: number;
  readonly horizontal95M: number;
  /** 2.4477 * 0.5 (RMSE_x + RMSE_y): appendix 3-A's approximation for unequal components, for information. */
  readonly approximation2_4477M: number;
  readonly vertical95M: number;
  readonly method: HorizontalMethod;
  /** RMSE_min / RMSE_max. */
  readonly ratio: number;
  readonly warnings: readonly Warning[];
}

/** NSSDA minimum number of check points (FGDC-STD-007.3-1998 section 3.2.1). */
export const NSSDA_MIN_CHECK_POINTS = 20;

export function nssdaAccuracy(diffs: readonly CheckDifference[]): NssdaResult {
  const n = diffs.length;
  if (n === 0) throw new RangeError('NSSDA accuracy needs at least one check point');
  let se = 0, sn = 0, su = 0, nu = 0;
  for (const d of diffs) {
    se += d.dEastM * d.dEastM;
    sn += d.dNorthM * d.dNorthM;
    if (d.dUpM !== undefined && Number.isFinite(d.dUpM)) {
      su += d.dUpM * d.dUpM;
      nu++;
    }
  }
  const warnings: Warning[] = [];
  // FGDC-STD-007.3-1998 appendix 3-A: RMSE = sqrt(sum of squared differences / n)
  const rmseE = Math.sqrt(se / n);
  const rmseN = Math.sqrt(sn / n);
  const rmseR = Math.hypot(rmseE, rmseN);
  const rmseZ = nu > 0 ? Math.sqrt(su / nu) : NaN;
  const ratio = Math.max(rmseE, rmseN) > 0 ? Math.min(rmseE, rmseN) / Math.max(rmseE, rmseN) : 1;
  let method: HorizontalMethod;
  let h95: number;
  if (ratio >= 0.6) {
    method = 'circular-1.7308';
    h95 = 1.7308 * rmseR; // FGDC-STD-007.3-1998 section 3.2.2: Accuracy_r = 1.7308 RMSE_r
  } else {
    method = 'bivariate-normal-exact';
    h95 = circularErrorRadiusM(0.95, rmseE, rmseN);
    warnings.push({
      code: 'nssda-elongated-errors',
      message: `RMSE_min/RMSE_max = ${ratio.toFixed(2)} is below 0.6: the NSSDA circular formula (1.7308 RMSE_r) does not apply; the 95 % radius is computed exactly for a bivariate normal error (circular-error approach)`,
    });
  }
  if (n < NSSDA_MIN_CHECK_POINTS) {
    warnings.push({
      code: 'nssda-few-check-points',
      message: `only ${n} check points: the NSSDA (FGDC-STD-007.3-1998, 3.2.1) asks for at least ${NSSDA_MIN_CHECK_POINTS}`,
    });
  }
  return {
    n,
    rmseEastM: rmseE,
    rmseNorthM: rmseN,
    rmseHorizontalM: rmseR,
    rmseVerticalM: rmseZ,
    horizontal95M: h95,
    approximation2_4477M: 2.4477 * 0.5 * (rmseE + rmseN), // appendix 3-A, Greenwalt & Schultz 1968
    vertical95M: 1.96 * rmseZ, // section 3.2.2: Accuracy_z = 1.9600 RMSE_z
    method,
    ratio,
    warnings,
  };
}
