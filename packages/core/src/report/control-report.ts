/** control-check.csv rows and control-check.json of a control-mark check (control-check.ts). */
import { fixed, jsonNumber } from './format.js';
import { frameEpochCell } from './epoch-table.js';
import type { FramedEcef } from '../gnss/index.js';
import { ecefToGeodetic, radToDeg } from '../geodesy/index.js';
import { ellipsoidForFrame } from '../control/index.js';
import type { ControlCheckResult } from './control-check.js';
import { CHI2_1_95, CHI2_2_95, DIFFERENCE_TEST_LEVEL, differenceTestWord } from '../control/index.js';

export const CONTROL_CHECK_COLUMNS = [
  'session', 'point', 'mark', 'matched_by', 'match_distance_m', 'frame', 'frame_epoch',
  'latitude_deg', 'longitude_deg', 'height_m', 'mark_latitude_deg', 'mark_longitude_deg', 'mark_height_m',
  'd_east_m', 'd_north_m', 'd_up_m', 'horizontal_m', 'three_d_m', 'tolerance_h_m', 'tolerance_v_m', 'pass',
  'sigma_d_east_m', 'sigma_d_north_m', 'sigma_d_up_m', 'chi2_h', 'chi2_v', 'difference_test',
] as const;

/** Geodetic latitude, longitude (deg) and ellipsoidal height of a framed point, on the frame's ellipsoid. */
function llh(p: FramedEcef): [string, string, string] {
  const g = ecefToGeodetic(p.ecef, ellipsoidForFrame(p.frame.name));
  return [fixed(radToDeg(g.latRad), 9), fixed(radToDeg(g.lonRad), 9), fixed(g.heightM, 4)];
}

export function controlCheckRows(r: ControlCheckResult): string[][] {
  return r.pairs.map((p) => [
    p.session, p.pointName, p.markName, p.by, fixed(p.matchDistanceM, 3), p.comparison.frame, frameEpochCell(p.markPosition.frame.epochYear),
    ...llh(p.pointPosition), ...llh(p.markPosition),
    fixed(p.comparison.dE, 4), fixed(p.comparison.dN, 4), fixed(p.comparison.dU, 4),
    fixed(p.comparison.horizontalM, 4), fixed(p.comparison.threeDM, 4),
    fixed(r.toleranceHorizontalM, 3), fixed(r.toleranceVerticalM, 3), p.comparison.pass ? 'pass' : 'fail',
    fixed(p.test.sigmaEastM, 4), fixed(p.test.sigmaNorthM, 4), fixed(p.test.sigmaUpM, 4), fixed(p.test.chi2Horizontal, 2), fixed(p.test.chi2Vertical, 2), differenceTestWord(p.test),
  ]);
}

/** What control-check.csv's metadata sidecar says about the table (table-metadata.ts). */
export function controlCheckNotes(r: ControlCheckResult): string[] {
  const lines = [
    'computed point minus published mark, east/north/up at the mark, in the mark\'s frame; every point is compared, so a mark occupied several times has a row per occupation',
    'latitude/longitude/height: the point in the frame of the comparison (after any transformation); mark_*: the mark; match_distance_m is measured after the transformation',
    `matching: by name (case-insensitive), else nearest within ${r.radiusM} m horizontally; pass = horizontal <= tolerance_h_m and |d_up| <= tolerance_v_m`,
    `difference_test (beside pass, which it does not change): each difference against its 1-sigma sigma_d_* = sqrt(point sigma_mean_*^2 + mark accuracy^2), the mark's accuracy_h_m split equally between east and north; ` +
      `chi2_h = (d_east/sigma_d_east)^2 + (d_north/sigma_d_north)^2 against ${CHI2_2_95} (chi-square, 2 degrees of freedom), chi2_v = (d_up/sigma_d_up)^2 against ${CHI2_1_95} (1 degree of freedom), ` +
      `both at ${DIFFERENCE_TEST_LEVEL * 100} % (NIST/SEMATECH e-Handbook of Statistical Methods, chi-square critical values); empty where the point's sigma or the mark's accuracy is not given; ` +
      "the reference coordinate's own uncertainty is left out (it shifts every point of the run alike)",
    `difference test: ${r.rejected} of ${r.tested} tested comparison(s) rejected at ${DIFFERENCE_TEST_LEVEL * 100} %`,
  ];
  if (r.nssda) {
    const n = r.nssda;
    lines.push(
      `NSSDA (FGDC-STD-007.3-1998) over ${n.n} check point(s): RMSE east ${fixed(n.rmseEastM, 4)} m, north ${fixed(n.rmseNorthM, 4)} m, horizontal ${fixed(n.rmseHorizontalM, 4)} m, vertical ${fixed(n.rmseVerticalM, 4)} m`,
      `horizontal accuracy (95 %) ${fixed(n.horizontal95M, 4)} m (${n.method}); vertical accuracy (95 %) ${fixed(n.vertical95M, 4)} m (1.9600 RMSE_z)`,
    );
    for (const w of n.warnings) lines.push(`warning: ${w.message}`);
  }
  return lines;
}

export function controlCheckJson(r: ControlCheckResult, extras: { readonly pointsFile: string; readonly marksFile: string; readonly createdUtc: string; readonly warnings: readonly { code: string; message: string }[] }): Record<string, unknown> {
  const n = r.nssda;
  return {
    points_file: extras.pointsFile,
    marks_file: extras.marksFile,
    created_utc: extras.createdUtc,
    radius_m: r.radiusM,
    tolerance_h_m: r.toleranceHorizontalM,
    tolerance_v_m: r.toleranceVerticalM,
    all_pass: r.allPass,
    pairs: r.pairs.map((p) => ({
      session: p.session || null,
      point: p.pointName, mark: p.markName, matched_by: p.by, match_distance_m: jsonNumber(p.matchDistanceM, 3), frame: p.comparison.frame, frame_epoch: jsonNumber(p.markPosition.frame.epochYear, 4),
      d_east_m: jsonNumber(p.comparison.dE, 4), d_north_m: jsonNumber(p.comparison.dN, 4), d_up_m: jsonNumber(p.comparison.dU, 4),
      horizontal_m: jsonNumber(p.comparison.horizontalM, 4), three_d_m: jsonNumber(p.comparison.threeDM, 4), pass: p.comparison.pass,
      sigma_d_east_m: jsonNumber(p.test.sigmaEastM, 4), sigma_d_north_m: jsonNumber(p.test.sigmaNorthM, 4), sigma_d_up_m: jsonNumber(p.test.sigmaUpM, 4),
      chi2_h: jsonNumber(p.test.chi2Horizontal, 2), chi2_v: jsonNumber(p.test.chi2Vertical, 2), difference_test: differenceTestWord(p.test) || null,
    })),
    difference_test: {
      method: "chi-square test of each difference against sqrt(point sigma_mean^2 + mark accuracy^2); the mark's accuracy_h_m split equally between east and north; the reference coordinate's uncertainty left out",
      level: DIFFERENCE_TEST_LEVEL,
      critical_h: CHI2_2_95, degrees_of_freedom_h: 2, critical_v: CHI2_1_95, degrees_of_freedom_v: 1,
      source: 'NIST/SEMATECH e-Handbook of Statistical Methods, critical values of the chi-square distribution',
      tested: r.tested, rejected: r.rejected,
      decides_pass: false,
    },
    unmatched_points: r.unmatchedPoints,
    unmatched_marks: r.unmatchedMarks,
    nssda: n ? {
      standard: 'FGDC-STD-007.3-1998 (NSSDA), section 3.2.2',
      check_points: n.n,
      rmse_east_m: jsonNumber(n.rmseEastM, 4), rmse_north_m: jsonNumber(n.rmseNorthM, 4),
      rmse_horizontal_m: jsonNumber(n.rmseHorizontalM, 4), rmse_vertical_m: jsonNumber(n.rmseVerticalM, 4),
      rmse_ratio_min_max: jsonNumber(n.ratio, 4),
      horizontal_accuracy_95_m: jsonNumber(n.horizontal95M, 4), horizontal_method: n.method,
      horizontal_approximation_2_4477_m: jsonNumber(n.approximation2_4477M, 4),
      vertical_accuracy_95_m: jsonNumber(n.vertical95M, 4),
      warnings: n.warnings.map((w) => w.message),
    } : null,
    warnings: extras.warnings.map((w) => ({ code: w.code, message: w.message })),
  };
}
