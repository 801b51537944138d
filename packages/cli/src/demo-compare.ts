/** Reading back the epoch CSV and comparing it with the demo's truth CSV (both of our own layout). */
import {
  ecefDeltaToEnu, ecefToGeodetic, horizontalVerticalStats, splitCsvLine,
  type EcefM, type EnuM, type HorizontalVerticalStats,
} from '@refdelta/core';

/** Rows of a CSV with '#' comment lines before the header, as objects keyed by column name. */
export function readCommentedCsv(text: string): Record<string, string>[] {
  const lines = text.split(/\r?\n/).filter((l) => l !== '' && !l.startsWith('#'));
  if (lines.length === 0) return [];
  const header = splitCsvLine(lines[0]);
  return lines.slice(1).map((l) => {
    const cells = splitCsvLine(l);
    return Object.fromEntries(header.map((h, i) => [h, cells[i] ?? '']));
  });
}

export interface TruthRow {
  readonly week: number;
  readonly towS: number;
  readonly ecef: EcefM;
  readonly point: string;
}

export function readTruth(text: string): TruthRow[] {
  return readCommentedCsv(text).map((r) => ({
    week: Number(r.gps_week), towS: Number(r.gps_tow_s),
    ecef: { x: Number(r.x_m ?? r.ecef_x_m), y: Number(r.y_m ?? r.ecef_y_m), z: Number(r.z_m ?? r.ecef_z_m) },
    point: r.point ?? '',
  }));
}

export interface DemoComparison {
  readonly all: HorizontalVerticalStats;
  readonly staticOnly: HorizontalVerticalStats;
  readonly matched: number;
}

/** Errors (solution minus truth, ENU at the truth point) of epochs with a differential/smoothed position, matched on the epoch tag. */
export function compareWithTruth(epochs: readonly Record<string, string>[], truth: readonly TruthRow[]): DemoComparison {
  const byKey = new Map<string, TruthRow>();
  for (const t of truth) byKey.set(`${t.week}:${Math.round(t.towS * 10)}`, t);
  const all: EnuM[] = [];
  const still: EnuM[] = [];
  for (const r of epochs) {
    if (r.solution !== 'differential' && r.solution !== 'smoothed') continue;
    if (r.ecef_x_m === '') continue;
    const t = byKey.get(`${r.gps_week}:${Math.round(Number(r.epoch_tag_tow_s) * 10)}`);
    if (!t) continue;
    const g = ecefToGeodetic(t.ecef);
    const d = ecefDeltaToEnu({ x: Number(r.ecef_x_m) - t.ecef.x, y: Number(r.ecef_y_m) - t.ecef.y, z: Number(r.ecef_z_m) - t.ecef.z }, g.latRad, g.lonRad);
    all.push(d);
    if (t.point !== 'moving' && t.point !== '') still.push(d);
  }
  return { all: horizontalVerticalStats(all), staticOnly: horizontalVerticalStats(still), matched: all.length };
}
