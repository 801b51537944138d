/**
 * Stated precision against the truth: the real static run (data README, cors-and-rover-2018-277/static-run,
 * rover.obs against base.obs, reference = the base's header coordinate in WGS 84 at 2018.76) cut into
 * 5-minute occupations starting every minute; each point's stated 95 % horizontal radius relative to the
 * reference (radius95_relative_m) must hold the mean of the truth rows of fix quality 4 in the same window
 * (carrier-phase fixed, centimetre-level relative to the base coordinate: data README) for at least 90 %
 * of the points. The reference's own uncertainty is left out: the truth is relative to the same coordinate.
 */
import { readFileSync, writeFileSync } from 'node:fs';
import { join } from 'node:path';
import { beforeAll, expect, it } from 'vitest';
import { dataPath, describeShared } from './support/shared.js';
import { enuAt, parseCsv, requireBuiltCli, runCli, tempDir } from './cli-support.js';

const D = 'cors-and-rover-2018-277';
const RUN = [
  '--rover', dataPath(`${D}/static-run/rover.obs`), '--reference', dataPath(`${D}/static-run/base.obs`),
  '--nav', dataPath(`${D}/reference/glw1277m.18n`), dataPath(`${D}/reference/glw1277m.18g`),
  '--ref-coord', '3774089.2120,-601661.6157,5089321.2474', '--ref-frame', 'WGS84', '--ref-epoch', '2018.76',
];
const T0 = Date.UTC(2018, 9, 4, 12, 38, 0) / 1000;

const iso = (s: number) => `${new Date(s * 1000).toISOString().slice(0, 19)} GPST`;

for (const mode of ['code', 'smoothed', 'carrier phase']) {
  const smooth = mode === 'smoothed' ? '100' : '0';
  const modeArgs = mode === 'carrier phase' ? [] : ['--carrier-phase', 'off', '--smooth', smooth];
  describeShared(`5-minute points of the real static run hold the truth within their stated 95 % radius (${mode})`, () => {
    let rows: Record<string, string>[] = [];
    const truth = parseCsv(readFileSync(dataPath(`${D}/static-run/rover-truth.csv`), 'utf8')).rows.filter((r) => r.fix_quality === '4');
    beforeAll(() => {
      requireBuiltCli();
      const out = tempDir('rd-points-5min-');
      const win = join(out, 'windows.csv');
      const lines = ['name,start,end'];
      // GPS time of day of the windows: 12:38:00 + k minutes, 5 minutes long, 15 windows within the run.
      for (let k = 0; k < 15; k++) lines.push(`W${k},${iso(T0 + 60 * k)},${iso(T0 + 60 * k + 299.5)}`);
      writeFileSync(win, lines.join('\n') + '\n');
      const r = runCli(['points', ...RUN, ...modeArgs, '--windows', win, '--outputs', 'summary', '--out', out]);
      expect(r.status, r.stderr).toBe(0);
      rows = parseCsv(readFileSync(join(out, 'points.csv'), 'utf8')).rows;
    });

    it('>= 90 % of the points within radius95_relative_m of the truth mean of their window', () => {
      expect(rows.length).toBe(15);
      let inside = 0;
      const report: string[] = [];
      for (const p of rows) {
        const a = Number(p.start_gps_tow_s), b = Number(p.end_gps_tow_s);
        const t = truth.filter((x) => Number(x.gps_tow_s) >= a - 0.5 && Number(x.gps_tow_s) <= b + 0.5);
        expect(t.length).toBeGreaterThan(100);
        const m = [0, 0, 0];
        for (const x of t) { m[0] += Number(x.ecef_x_m) / t.length; m[1] += Number(x.ecef_y_m) / t.length; m[2] += Number(x.ecef_z_m) / t.length; }
        const lat = (Number(p.latitude_deg) * Math.PI) / 180, lon = (Number(p.longitude_deg) * Math.PI) / 180;
        const [e, n] = enuAt([Number(p.ecef_x_m) - m[0], Number(p.ecef_y_m) - m[1], Number(p.ecef_z_m) - m[2]], lat, lon);
        const h = Math.hypot(e, n), r95 = Number(p.radius95_relative_m);
        if (h <= r95) inside++;
        report.push(`${p.name} ${h.toFixed(3)}/${r95.toFixed(3)}`);
      }
      // eslint-disable-next-line no-console
      console.log(`5-minute points (${mode}), error / stated 95 % radius (m): ${report.join(', ')}; ${inside} of ${rows.length} inside`);
      expect(inside / rows.length).toBeGreaterThanOrEqual(0.9);
    });

    it('the radius in the frame adds the reference coordinate\'s own uncertainty (default for a given coordinate: 0.02 m)', () => {
      for (const p of rows) {
        expect(Number(p.sigma_reference_horizontal_m)).toBe(0.02);
        expect(Number(p.radius95_m)).toBeGreaterThanOrEqual(Number(p.radius95_relative_m));
      }
    });
  });
}
