/**
 * `refdelta points` and `refdelta check` on the real static run (data README, cors-and-rover-2018-277/
 * static-run: both receivers still, rover.obs against base.obs, reference = base header coordinate, frame
 * WGS 84 at the epoch of observation 2018.76). The whole run is one point (static detection on the
 * Doppler speed); its averaged coordinate is compared with the mean of the truth rows of fix quality 4
 * (carrier-phase fixed, centimetre-level relative to the base coordinate: data README).
 */
import { readFileSync, writeFileSync } from 'node:fs';
import { join } from 'node:path';
import { beforeAll, expect, it } from 'vitest';
import { dataPath, describeShared } from './support/shared.js';
import { enuAt, expectOneSentence, parseCsv, requireBuiltCli, runCli, tempDir, type CliRun } from './cli-support.js';

const D = 'cors-and-rover-2018-277';
const RUN = [
  '--rover', dataPath(`${D}/static-run/rover.obs`), '--reference', dataPath(`${D}/static-run/base.obs`),
  '--nav', dataPath(`${D}/reference/glw1277m.18n`), dataPath(`${D}/reference/glw1277m.18g`),
  // data README: base APPROX POSITION XYZ, frame WGS 84 at the epoch of observation.
  '--ref-coord', '3774089.2120,-601661.6157,5089321.2474', '--ref-frame', 'WGS84', '--ref-epoch', '2018.76',
];

function truthMean(): [number, number, number] {
  const rows = parseCsv(readFileSync(dataPath(`${D}/static-run/rover-truth.csv`), 'utf8')).rows.filter((r) => r.fix_quality === '4');
  const m = [0, 0, 0];
  for (const r of rows) { m[0] += Number(r.ecef_x_m); m[1] += Number(r.ecef_y_m); m[2] += Number(r.ecef_z_m); }
  expect(rows.length).toBeGreaterThan(100);
  return [m[0] / rows.length, m[1] / rows.length, m[2] / rows.length];
}

describeShared('refdelta points on the real static run', () => {
  let out = '';
  let run: CliRun;
  let truth: [number, number, number];
  beforeAll(() => {
    requireBuiltCli();
    truth = truthMean();
    out = tempDir('rd-points-static-');
    run = runCli(['points', ...RUN, '--projection', 'utm', '--geoid', 'egm96', '--out', out]);
  });

  it('exits 0 and writes the per-epoch outputs of solve too', () => {
    expect(run.status, run.stderr).toBe(0);
    for (const f of ['epochs.csv', 'residuals.csv', 'positions.geojson', 'summary.json', 'points.csv', 'points.geojson']) {
      expect(readFileSync(join(out, f)).length).toBeGreaterThan(0);
    }
  });

  it('one point from Doppler static detection, within 1 m horizontally of the fix-quality-4 truth mean', () => {
    const t = parseCsv(readFileSync(join(out, 'points.csv'), 'utf8'));
    expect(t.rows.length).toBe(1);
    const p = t.rows[0];
    expect(p.source).toBe('doppler');
    expect(Number(p.epochs)).toBeGreaterThan(1000);
    const lat = (Number(p.latitude_deg) * Math.PI) / 180, lon = (Number(p.longitude_deg) * Math.PI) / 180;
    const [e, n, u] = enuAt([Number(p.ecef_x_m) - truth[0], Number(p.ecef_y_m) - truth[1], Number(p.ecef_z_m) - truth[2]], lat, lon);
    // eslint-disable-next-line no-console
    console.log(`static-run point vs truth mean: dE ${e.toFixed(3)} dN ${n.toFixed(3)} dU ${u.toFixed(3)} m, horizontal ${Math.hypot(e, n).toFixed(3)} m; sigma_mean E/N/U ${p.sigma_mean_east_m}/${p.sigma_mean_north_m}/${p.sigma_mean_up_m}`);
    // check-values.md "Accuracy facts": code differential about 1 m (1 sigma); an average of 20 min does better
    expect(Math.hypot(e, n)).toBeLessThan(1.0);
    expect(Math.abs(u)).toBeLessThan(2.0);
    // The stated precision of the mean must cover the true error (within 3 sigma per component), i.e. it
    // accounts for errors that stay correlated over the occupation.
    expect(Math.abs(e)).toBeLessThan(3 * Number(p.sigma_mean_east_m));
    expect(Math.abs(n)).toBeLessThan(3 * Number(p.sigma_mean_north_m));
    expect(Math.abs(u)).toBeLessThan(3 * Number(p.sigma_mean_up_m));
    // The antenna height in force (header: 0 m) is reported.
    expect(Number(p.antenna_height_m)).toBe(0);
    // the file states frame, epoch, projection and height reference
    const meta = JSON.parse(readFileSync(join(out, 'points.csv.meta.json'), 'utf8'));
    expect([meta.frame, meta.frame_epoch]).toEqual(['WGS84', 2018.76]);
    expect(meta.projection.name).toMatch(/WGS 84 \/ UTM zone 29N \(EPSG:32629\)/);
    expect(meta.notes.join('\n')).toMatch(/EGM96 is a global geoid model, not a national vertical datum/);
    // orthometric = ellipsoidal - N (geoid-model.ts); N here ~ 57 m (EGM96 in western Ireland, from memory: loose bound)
    const N = Number(p.height_m) - Number(p.orthometric_height_m);
    expect(N).toBeGreaterThan(50);
    expect(N).toBeLessThan(65);
    const gj = JSON.parse(readFileSync(join(out, 'points.geojson'), 'utf8'));
    expect(gj.type).toBe('FeatureCollection');
    expect(gj.refdelta.frame).toBe('WGS84');
    expect(gj.refdelta.projection).toMatch(/EPSG:32629/);
    expect(gj.features[0].geometry.coordinates[0]).toBeCloseTo(Number(p.longitude_deg), 8);
  });

  it('an occupation window with its own antenna height: 300 epochs, the mark 1.5 m below the antenna', () => {
    const o2 = tempDir('rd-points-win-');
    const win = join(o2, 'windows.csv');
    writeFileSync(win, 'name,start,end,antenna_height_m,height_kind\nPOLE,2018-10-04 12:40:00 GPST,2018-10-04 12:44:59.5 GPST,1.5,vertical\n');
    // Code processing: every epoch of the window counts (with carrier phase a point takes its fixed epochs only).
    const r = runCli(['points', ...RUN, '--carrier-phase', 'off', '--windows', win, '--outputs', 'epochs,summary', '--out', o2]);
    expect(r.status, r.stderr).toBe(0);
    const p = parseCsv(readFileSync(join(o2, 'points.csv'), 'utf8')).rows;
    expect(p.map((x) => [x.name, x.source])).toEqual([['POLE', 'windows']]);
    // 1 s rover epochs tagged at .991 s (receiver time): 12:40:00.991 .. 12:44:59.991 -> 300 (data README)
    expect(Number(p[0].epochs)).toBe(300);
    // epochs.csv names those 300 epochs by the window, not by the rover's marker name; the others belong to no point.
    const ep = parseCsv(readFileSync(join(o2, 'epochs.csv'), 'utf8')).rows;
    expect(ep.filter((e) => e.point === 'POLE').length).toBe(300);
    expect(ep.filter((e) => e.point !== 'POLE').every((e) => e.point === '')).toBe(true);
    expect(p[0].antenna_height_m).toBe('1.5000');
    const whole = parseCsv(readFileSync(join(out, 'points.csv'), 'utf8')).rows[0];
    // self-consistency: 1.5 m lower than the (antenna height 0) whole-run mean, to the scatter of a 5 min sub-mean
    expect(Number(whole.height_m) - Number(p[0].height_m)).toBeGreaterThan(1.5 - 1.0);
    expect(Number(whole.height_m) - Number(p[0].height_m)).toBeLessThan(1.5 + 1.0);
  });

  it('refdelta check against a control CSV made from the truth mean: pass, NSSDA with the few-points warning; exit 3 on a tight tolerance', () => {
    const o3 = tempDir('rd-check-static-');
    const marks = join(o3, 'control.csv');
    writeFileSync(marks, `name,x_m,y_m,z_m,frame,epoch\nROVER-TRUTH,${truth.map((v) => v.toFixed(4)).join(',')},WGS84,2018.76\n`);
    const r = runCli(['check', '--points', join(out, 'points.csv'), '--marks', marks, '--out', o3]);
    expect(r.status, r.stderr).toBe(0);
    const c = parseCsv(readFileSync(join(o3, 'control-check.csv'), 'utf8'));
    // the point is named rover-S1 (the rover file's name, then the span's number), the mark ROVER-TRUTH: matched by proximity within the default 5 m
    expect(c.rows.map((x) => [x.point, x.mark, x.matched_by, x.pass])).toEqual([['rover-S1', 'ROVER-TRUTH', 'proximity', 'pass']]);
    const j = JSON.parse(readFileSync(join(o3, 'control-check.json'), 'utf8'));
    expect(j.nssda.check_points).toBe(1);
    // FGDC-STD-007.3-1998 3.2.1: at least 20 check points
    expect(j.nssda.warnings.join(' ')).toMatch(/at least 20/);
    const tight = runCli(['check', '--points', join(out, 'points.csv'), '--marks', marks, '--tolerance-h', '0.001', '--out', o3, '--quiet']);
    expect(tight.status).toBe(3);
    expect(expectOneSentence(tight)).toMatch(/1 of 1 comparison\(s\) with control marks failed the tolerance/);
    // the frame rule: a mark in another frame without a transformation is refused (exit 1, one sentence)
    writeFileSync(marks, `name,x_m,y_m,z_m,frame,epoch\nROVER-TRUTH,${truth.map((v) => v.toFixed(4)).join(',')},ITRF2014,2018.76\n`);
    const refused = runCli(['check', '--points', join(out, 'points.csv'), '--marks', marks, '--out', o3, '--quiet']);
    expect(refused.status).toBe(1);
    expect(expectOneSentence(refused)).toMatch(/refusing to compare a coordinate in WGS84 with one in ITRF2014/);
  });
});
