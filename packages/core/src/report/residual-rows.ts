/** Rows of the residual CSV, long form: one row per satellite per epoch. */
import { weekTowFromGpsS } from '../time/index.js';
import type { EpochSolution } from '../session/index.js';
import type { CsvTable } from './epoch-rows.js';
import { fixed } from './format.js';

export const RESIDUAL_COLUMNS: readonly string[] = [
  'gps_week', 'gps_tow_s', 'satellite', 'signal', 'elevation_deg', 'azimuth_deg',
  'residual_m', 'weight_per_m2', 'w_test', 'status', 'reason',
];

/** One epoch's satellites as rows aligned with RESIDUAL_COLUMNS. */
export function residualRowsOf(s: EpochSolution): string[][] {
  const t = weekTowFromGpsS(s.timeGpsS);
  const week = String(t.week);
  const tow = fixed(t.towS, 3);
  // Rows pushed, not made by Array.prototype.map: the builtin's result array and the one of map inlined in
  // optimised code differ in elements kind, which deoptimised the CSV writer's readers ("wrong map").
  const rows: string[][] = [];
  for (const r of s.satellites) {
    rows.push([
      week, tow, r.sat, r.signal,
      fixed(r.elevationDeg, 2), fixed(r.azimuthDeg, 2),
      fixed(r.residualM, 4), r.used ? fixed(r.weight, 4) : '', fixed(r.wTest, 3),
      r.used ? 'used' : 'rejected',
      r.reason,
    ]);
  }
  return rows;
}

export function residualRows(solutions: readonly EpochSolution[]): CsvTable {
  return { header: RESIDUAL_COLUMNS, rows: solutions.flatMap(residualRowsOf) };
}
