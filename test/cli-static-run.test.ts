/**
 * The real static run (data README, cors-and-rover-2018-277/static-run): rover.obs against base.obs with
 * the base's header coordinate (frame WGS 84 at the epoch of observation, 2018.76, per the README), GPS
 * and GLONASS broadcast navigation of the CORS for 12:00-12:59. Compared with the truth rows of
 * fix_quality 4 (carrier-phase fixed, centimetre-level relative to the base coordinate).
 */
import { createHash } from 'node:crypto';
import { readFileSync } from 'node:fs';
import { join } from 'node:path';
import { beforeAll, expect, it } from 'vitest';
import { dataPath, describeShared } from './support/shared.js';
import { enuAt, median, nearestRank, parseCsv, requireBuiltCli, runCli, tempDir, type CliRun } from './cli-support.js';

const D = 'cors-and-rover-2018-277';

describeShared('refdelta solve on the real static run', () => {
  let out = '';
  let run: CliRun;
  beforeAll(() => {
    requireBuiltCli();
    out = tempDir('rd-static-');
    run = runCli([
      'solve', '--carrier-phase', 'off', '--rover', dataPath(`${D}/static-run/rover.obs`), '--reference', dataPath(`${D}/static-run/base.obs`),
      '--nav', dataPath(`${D}/reference/glw1277m.18n`), dataPath(`${D}/reference/glw1277m.18g`),
      // data README: base APPROX POSITION XYZ, frame WGS 84 at the epoch of observation.
      '--ref-coord', '3774089.2120,-601661.6157,5089321.2474', '--ref-frame', 'WGS84', '--ref-epoch', '2018.76',
      '--out', out,
    ]);
  });

  it('exits 0 and draws no progress bar when stderr is not a terminal', () => {
    expect(run.status, run.stderr).toBe(0);
    expect(run.stderr).not.toContain('\r');
  });

  it('median horizontal error against fix-quality-4 truth is below 1.5 m', () => {
    const truth = parseCsv(readFileSync(dataPath(`${D}/static-run/rover-truth.csv`), 'utf8')).rows.filter((r) => r.fix_quality === '4');
    const byTow = new Map(truth.map((r) => [Math.round(Number(r.gps_tow_s)), r]));
    const ep = parseCsv(readFileSync(join(out, 'epochs.csv'), 'utf8'));
    const meta = JSON.parse(readFileSync(join(out, 'epochs.csv.meta.json'), 'utf8'));
    expect([meta.frame, meta.frame_epoch, meta.point_reference]).toEqual(['WGS84', 2018.76, 'ground mark']);
    const h: number[] = [];
    for (const r of ep.rows) {
      if (r.solution !== 'differential' && r.solution !== 'smoothed') continue;
      // Receiver tags are a few ms off GPS time (data README): match on the rounded tag.
      const t = byTow.get(Math.round(Number(r.epoch_tag_tow_s)));
      if (!t) continue;
      const lat = (Number(r.latitude_deg) * Math.PI) / 180;
      const lon = (Number(r.longitude_deg) * Math.PI) / 180;
      const [e, n] = enuAt([Number(r.ecef_x_m) - Number(t.ecef_x_m), Number(r.ecef_y_m) - Number(t.ecef_y_m), Number(r.ecef_z_m) - Number(t.ecef_z_m)], lat, lon);
      h.push(Math.hypot(e, n));
    }
    expect(h.length).toBeGreaterThan(500);
    // The engine's accuracy targets for rover against base, code only (also test/differential-static.test.ts).
    expect(median(h)).toBeLessThanOrEqual(1.2);
    expect(nearestRank(h, 0.95)).toBeLessThanOrEqual(2.5);
  });

  it('summary lists the inputs with their SHA-256 and the outputs', () => {
    const s = JSON.parse(readFileSync(join(out, 'summary.json'), 'utf8'));
    for (const i of s.inputs) {
      const sha = createHash('sha256').update(readFileSync(i.path)).digest('hex');
      expect(i.sha256).toBe(sha);
    }
    expect(s.inputs.map((i: { kind: string }) => i.kind)).toEqual(['rover', 'reference', 'navigation', 'navigation']);
    expect(s.frame.name).toBe('WGS84');
    expect(s.outputs.map((o: { kind: string }) => o.kind).sort()).toEqual([
      'epochs', 'epochs-csvt', 'epochs-metadata', 'epochs-prj', 'geojson', 'residuals', 'residuals-csvt', 'residuals-metadata', 'summary',
    ]);
  });
});
