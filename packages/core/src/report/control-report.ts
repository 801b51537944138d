/** control-check.csv rows and control-check.json of a control-mark check (control-check.ts). */
import { fixed, jsonNumber } from './format.js';
import { frameEpochCell } from './epoch-table.js';
import type { FramedEcef } from '../gnss/index.js';
import { ecefToGeodetic, radToDeg } from '../geodesy/index.js';
import { ellipsoidForFrame } from '../control/index.js';
import type { ControlCheckResult } from './control-check.js';

export const CONTROL_CHECK_COLUMNS = [
  'session', 'point', 'mark', 'matched_by', 'match_distance_m', 'frame', 'frame_epoch',
  'latitude_deg', 'longitude_deg', 'height_m', 'mark_latitude_deg', 'mark_longitude_deg', 'mark_height_m',
  'd_east_m', 'd_north_m', 'd_up_m', 'horizontal_m', 'three_d_m', 'tolerance_h_m', 'tolerance_v_m', 'pass',
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
  ]);
}

/** What control-check.csv's metadata sidecar says about the table (table-metadata.ts). */
export function controlCheckNotes(r: ControlCheckResult): string[] {
  const lines = [
    'computed point minus published mark, east/north/up at the mark, in the mark\'s frame; every point is compared, so a mark occupied several times has a row per occupation',
    'latitude/longitude/height: the point in the frame of the comparison (after any transformation); mark_*: the mark; match_distance_m is measured after the transformation',
    `matching: by name (case-insensitive), else nearest within ${r.radiusM} m horizontally; pass = horizontal <= tolerance_h_m and |d_up| <= tolerance_v_m`,
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
      point: p.pointName, mark: p.markName, matched_by: p.by, match_distance_m: jsonNumber(p.matchDistanceM, 3), frame: p.comparison.frame,
      d_east_m: jsonNumber(p.comparison.dE, 4), d_north_m: jsonNumber(p.comparison.dN, 4), d_up_m: jsonNumber(p.comparison.dU, 4),
      horizontal_m: jsonNumber(p.comparison.horizontalM, 4), three_d_m: jsonNumber(p.comparison.threeDM, 4), pass: p.comparison.pass,
    })),
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
