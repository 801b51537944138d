/**
 * Reads back a points.csv written by points-table.ts (for `refdelta check`): name, ecef_x_m, ecef_y_m,
 * ecef_z_m, frame, frame_epoch are required; other columns are ignored. '#' lines are skipped.
 * A bad row is an InputError naming the file, the 1-based line and the column.
 */
import type { FramedEcef } from '../gnss/index.js';
import { InputError } from '../errors.js';
import { csvRecords } from '../csv/index.js';

export interface LoggedPoint {
  readonly name: string;
  readonly position: FramedEcef;
  readonly line: number;
  /** The batch session of the row (batch-points.csv), when the table has a session column. */
  readonly session?: string;
  /** Precision of the mean, when the table gives it: sqrt(sigma_mean_east^2 + sigma_mean_north^2) and sigma_mean_up. */
  readonly sigmaMeanHorizontalM?: number;
  readonly sigmaMeanUpM?: number;
  /** sigma_mean_east and sigma_mean_north, when the table gives both. */
  readonly sigmaMeanEastM?: number;
  readonly sigmaMeanNorthM?: number;
}

const REQUIRED = ['name', 'ecef_x_m', 'ecef_y_m', 'ecef_z_m', 'frame', 'frame_epoch'];

export function parsePointsCsv(file: string, text: string): LoggedPoint[] {
  let header: string[] | undefined;
  const out: LoggedPoint[] = [];
  for (const { lineNo, fields: f } of csvRecords(text)) {
    if (!header) {
      header = f.map((h) => h.toLowerCase());
      const missing = REQUIRED.filter((c) => !header!.includes(c));
      if (missing.length) throw new InputError(file, lineNo, `expected a points table header (as written by refdelta points) with columns ${REQUIRED.join(', ')}; missing ${missing.join(', ')}`);
      continue;
    }
    if (f.length !== header.length) throw new InputError(file, lineNo, `expected ${header.length} columns as in the header, found ${f.length}`);
    const get = (c: string) => f[header!.indexOf(c)]!;
    const num = (c: string): number => {
      const v = Number(get(c));
      if (get(c) === '' || !Number.isFinite(v)) throw new InputError(file, lineNo, `column ${c}: expected a number in metres, found '${get(c)}'`);
      return v;
    };
    const name = get('name');
    if (name === '') throw new InputError(file, lineNo, 'column name: expected a point name');
    const ecef = { x: num('ecef_x_m'), y: num('ecef_y_m'), z: num('ecef_z_m') };
    const r = Math.hypot(ecef.x, ecef.y, ecef.z);
    if (r < 6.2e6 || r > 6.5e6) throw new InputError(file, lineNo, `columns ecef_x_m,ecef_y_m,ecef_z_m: expected a point near the Earth's surface (|X| = ${r.toFixed(0)} m)`);
    const epochText = get('frame_epoch');
    const epochYear = epochText === '' || epochText === 'unstated' ? NaN : Number(epochText);
    if (Number.isNaN(epochYear) && epochText !== '' && epochText !== 'unstated') throw new InputError(file, lineNo, `column frame_epoch: expected a decimal year or 'unstated', found '${epochText}'`);
    const opt = (c: string): number | undefined => {
      if (!header!.includes(c) || get(c) === '') return undefined;
      const v = Number(get(c));
      return Number.isFinite(v) ? v : undefined;
    };
    const se = opt('sigma_mean_east_m'), sn = opt('sigma_mean_north_m'), su = opt('sigma_mean_up_m');
    out.push({
      name, position: { ecef, frame: { name: get('frame') || 'unstated', epochYear } }, line: lineNo,
      ...(header.includes('session') ? { session: get('session') } : {}),
      ...(se !== undefined && sn !== undefined ? { sigmaMeanHorizontalM: Math.hypot(se, sn), sigmaMeanEastM: se, sigmaMeanNorthM: sn } : {}),
      ...(su !== undefined ? { sigmaMeanUpM: su } : {}),
    });
  }
  if (!header) throw new InputError(file, 0, 'expected a points table (as written by refdelta points): the file is empty');
  return out;
}
