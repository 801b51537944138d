/**
 * Is a point-minus-mark difference larger than the stated uncertainties explain? A chi-square test of
 * the difference against its variance (common practice in checking a survey on control, and the
 * congruence test of deformation analysis), made beside the fixed tolerance of compare-to-mark.ts:
 *
 *   horizontal: T_h = dE^2 / s_E^2 + dN^2 / s_N^2, chi-square with 2 degrees of freedom
 *   vertical:   T_v = dU^2 / s_U^2,                  chi-square with 1 degree of freedom
 *
 * with s_E^2 = sigma_mean_east^2 + accuracy_h^2 / 2 (likewise north) and s_U^2 = sigma_mean_up^2 +
 * accuracy_v^2: point and mark independent, normal errors, east and north uncorrelated. The mark's
 * accuracy_h_m is its horizontal standard error sqrt(sd_e^2 + sd_n^2) (control-csv.ts), split equally
 * between east and north. The point's sigma is its precision relative to the reference (sigma_mean_*):
 * the reference coordinate's own uncertainty is left out, since it moves every point of a run alike
 * and, when the reference is a mark of the same network, is shared with the marks (an offset of the
 * reference shows as the same difference at every mark).
 *
 * Rejected at 95 % when T_h > 5.991 or T_v > 3.841: the chi-square upper 5 % critical values for 2 and
 * 1 degrees of freedom (NIST/SEMATECH e-Handbook of Statistical Methods, section 1.3.6.7.4, "Critical
 * Values of the Chi-Square Distribution"; the section number from memory; 5.991 = -2 ln 0.05 exactly for
 * 2 degrees of freedom, 3.841 = 1.960^2, both checked in control.test.ts). Each of the two tests has a 5 % false-alarm rate on its own.
 */

export const DIFFERENCE_TEST_LEVEL = 0.95;
/** chi-square(2) and chi-square(1) upper 5 % points (NIST/SEMATECH e-Handbook 1.3.6.7.4). */
export const CHI2_2_95 = 5.991;
export const CHI2_1_95 = 3.841;

export interface PointPrecision {
  readonly sigmaMeanEastM?: number;
  readonly sigmaMeanNorthM?: number;
  readonly sigmaMeanUpM?: number;
}

export interface MarkAccuracy {
  readonly accuracyHorizontalM?: number;
  readonly accuracyVerticalM?: number;
}

/** One component's test: the difference's 1-sigma (per axis) and the statistic; null when not testable. */
export interface DifferenceTest {
  /** 1-sigma of the difference east, north (NaN when the horizontal test was not made) and up (NaN likewise). */
  readonly sigmaEastM: number;
  readonly sigmaNorthM: number;
  readonly sigmaUpM: number;
  /** T_h and T_v (NaN when not made: an uncertainty missing). */
  readonly chi2Horizontal: number;
  readonly chi2Vertical: number;
  readonly rejectedHorizontal: boolean;
  readonly rejectedVertical: boolean;
}

const finite = (x: number | undefined): x is number => x !== undefined && Number.isFinite(x) && x >= 0;

export function testDifference(d: { readonly dE: number; readonly dN: number; readonly dU: number }, point: PointPrecision, mark: MarkAccuracy): DifferenceTest {
  const h = finite(point.sigmaMeanEastM) && finite(point.sigmaMeanNorthM) && finite(mark.accuracyHorizontalM);
  const v = finite(point.sigmaMeanUpM) && finite(mark.accuracyVerticalM);
  const markAxis2 = h ? mark.accuracyHorizontalM! ** 2 / 2 : NaN;
  const sE = h ? Math.sqrt(point.sigmaMeanEastM! ** 2 + markAxis2) : NaN;
  const sN = h ? Math.sqrt(point.sigmaMeanNorthM! ** 2 + markAxis2) : NaN;
  const sU = v ? Math.hypot(point.sigmaMeanUpM!, mark.accuracyVerticalM!) : NaN;
  // A zero sigma makes any non-zero difference infinitely significant: T is then Infinity (rejected), 0/0 accepted.
  const ratio2 = (x: number, s: number) => (x === 0 ? 0 : (x / s) ** 2);
  const th = h ? ratio2(d.dE, sE) + ratio2(d.dN, sN) : NaN;
  const tv = v ? ratio2(d.dU, sU) : NaN;
  return { sigmaEastM: sE, sigmaNorthM: sN, sigmaUpM: sU, chi2Horizontal: th, chi2Vertical: tv, rejectedHorizontal: th > CHI2_2_95, rejectedVertical: tv > CHI2_1_95 };
}

/** The test's word for a table cell: accepted | rejected-horizontal | rejected-vertical | rejected-horizontal-and-vertical | '' (not made). */
export function differenceTestWord(t: DifferenceTest): string {
  if (Number.isNaN(t.chi2Horizontal) && Number.isNaN(t.chi2Vertical)) return '';
  if (t.rejectedHorizontal && t.rejectedVertical) return 'rejected-horizontal-and-vertical';
  if (t.rejectedHorizontal) return 'rejected-horizontal';
  if (t.rejectedVertical) return 'rejected-vertical';
  return 'accepted';
}
