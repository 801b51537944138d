/**
 * `refdelta report DIR` reads output files by column name: without the '#' preamble, with columns in
 * another order, a few renamed and new ones appended, and with files missing. Hand-made files whose
 * expected values are written beside them; the local east/north/up of a point 100 m east of the
 * reference at latitude 0, longitude 0 is (0, 100, 0) ECEF -> (100, 0, 0) ENU (ENU rotation, any geodesy text).
 */
import { chmodSync, existsSync, mkdirSync, readdirSync, readFileSync, writeFileSync } from 'node:fs';
import { spawnSync } from 'node:child_process';
import { join } from 'node:path';
import { describe, expect, it } from 'vitest';
import { readSessionReportData, sourcesInFolder } from '../packages/cli/src/report-folder.js';
import { CLI_MAIN, expectOneSentence, parseCsv, requireBuiltCli, runCli, tempDir } from './cli-support.js';
import { fixturePath, REPO_ROOT } from './support/shared.js';

const A = 6378137; // WGS-84 semi-major axis (NIMA TR8350.2): a point on the equator at longitude 0 is (a, 0, 0)

describe('report data read by column name', () => {
  it('no preamble, reordered/renamed/appended columns, no residuals: what is there is read, what is missing is said', async () => {
    const dir = tempDir('rd-report-cols-');
    writeFileSync(join(dir, 'epochs.csv'), [
      'solution_kind,gps_tow_s,gps_week,ecef_x_m,ecef_y_m,ecef_z_m,satellites_used,pdop,point,new_column_at_the_end',
      `fixed,0,2000,${A},100,0,9,1.5,P1,x`,
      `float,1,2000,${A},101,0,9,1.6,P1,y`,
      'none,2,2000,,,,0,,,z',
    ].join('\n') + '\n');
    writeFileSync(join(dir, 'summary.json'), JSON.stringify({ reference: { position: { x_m: A, y_m: 0, z_m: 0 } }, frame: { name: 'ITRF2014', epoch_text: '2018.76' } }));
    const d = await readSessionReportData(sourcesInFolder(dir), 't');
    expect(d.frameText).toBe('ITRF2014 epoch 2018.76');
    expect(Array.from(d.epochs!.kind)).toEqual(['fixed', 'float', 'none']);
    expect(d.epochs!.timeGpsS[1] - d.epochs!.timeGpsS[0]).toBe(1);
    expect(d.epochs!.timeGpsS[0]).toBe(2000 * 604800);
    expect(d.epochs!.eastM[0]).toBeCloseTo(100, 6);
    expect(d.epochs!.eastM[1]).toBeCloseTo(101, 6);
    expect(d.epochs!.northM[0]).toBeCloseTo(0, 6);
    expect(Number.isNaN(d.epochs!.eastM[2])).toBe(true);
    expect(d.residuals).toBeNull();
    expect(d.missing.join(' ')).toMatch(/No residuals.csv/);
  });

  it("'#' preamble lines are skipped, quoted reasons are read, rejection reasons grouped by their words", async () => {
    const dir = tempDir('rd-report-res-');
    writeFileSync(join(dir, 'residuals.csv'), [
      '# a comment line', '# another',
      'gps_week,gps_tow_s,satellite,signal,elevation_deg,azimuth_deg,residual_m,weight_per_m2,w_test,status,reason',
      '2000,0,G01,C1C,45,90,0.5,1,0.1,used,',
      '2000,0,G02,C1C,7.7,10,,,,rejected,below elevation mask (7.7 deg)',
      '2000,1,G02,C1C,7.8,10,,,,rejected,below elevation mask (7.8 deg)',
      '2000,1,G03,C1C,30,200,,,,rejected,"rejected by data snooping (w = 35.2, critical 3.29)"',
    ].join('\n') + '\n');
    const d = await readSessionReportData(sourcesInFolder(dir), 't');
    expect(d.residuals!.satellites).toEqual(['G01', 'G02', 'G03']);
    expect(d.residuals!.reasons).toEqual(['below elevation mask', 'rejected by data snooping']);
    expect(Array.from(d.residuals!.rejection)).toEqual([0, 1, 1, 2]);
    expect(d.missing.join(' ')).toMatch(/No epochs.csv/);
  });

  it("an older points folder (whole-session spread in summary.json): the scatter shown is each point's epochs about its own mean, from epochs.csv", async () => {
    const dir = tempDir('rd-report-old-points-');
    // Two occupations 200 m apart (east), each fixed epoch 1 cm east or west of its point, a walk between them.
    // Each occupation also has 5 float epochs 0.5 m north: a point with 20 fixed of 25 carrier epochs is
    // averaged from its fixed epochs alone (chooseEpochs), and so is the scatter.
    const rows = ['gps_week,gps_tow_s,solution,ecef_x_m,ecef_y_m,ecef_z_m,point'];
    for (let t = 0; t < 20; t++) rows.push(`2000,${t},fixed,${A},${t % 2 ? 0.01 : -0.01},0,A`);
    for (let t = 0; t < 5; t++) rows.push(`2000,${t + 0.5},float,${A},0,0.5,A`);
    for (let t = 20; t < 30; t++) rows.push(`2000,${t},fixed,${A},${20 * (t - 20)},0,`);
    for (let t = 30; t < 50; t++) rows.push(`2000,${t},fixed,${A},${200 + (t % 2 ? 0.01 : -0.01)},0,B`);
    for (let t = 30; t < 35; t++) rows.push(`2000,${t + 0.5},float,${A},200,0.5,B`);
    writeFileSync(join(dir, 'epochs.csv'), rows.join('\n') + '\n');
    writeFileSync(join(dir, 'points.csv'), [
      'name,start_gps_week,start_gps_tow_s,end_gps_week,end_gps_tow_s,ecef_x_m,ecef_y_m,ecef_z_m',
      `A,2000,0,2000,19,${A},0,0`, `B,2000,30,2000,49,${A},200,0`,
    ].join('\n') + '\n');
    writeFileSync(join(dir, 'summary.json'), JSON.stringify({
      reference: { position: { x_m: A, y_m: 0, z_m: 0 } }, frame: { name: 'WGS84', epoch_text: '2024.37' },
      statistics: { over: 'fixed and float epochs', mean_ecef: { x_m: A, y_m: 100, z_m: 0 }, horizontal_median_m: 100, horizontal_95_m: 190, vertical_median_m: 0, vertical_95_m: 0 },
    }));
    const d = await readSessionReportData(sourcesInFolder(dir), 't');
    const fact = d.facts!.find(([k]) => /Scatter|Spread/.test(k))!;
    expect(fact[0]).toBe("Scatter about each point's mean");
    expect(fact[1]).toMatch(/^horizontal median 0\.010 m, 95 % 0\.010 m; .*the 40 epochs the 2 points are averaged from/);
  });

  it('a folder with none of the outputs: exit 1 and one sentence naming it', () => {
    requireBuiltCli();
    const dir = tempDir('rd-report-empty-');
    mkdirSync(join(dir, 'sub'));
    const r = runCli(['report', dir]);
    expect(r.status).toBe(1);
    expect(expectOneSentence(r)).toMatch(/holds none of the outputs/);
  });
});

const DEMO = (f: string) => fixturePath(`demo/${f}`);

/** The visible text of a page (tags dropped, the few entities the pages use decoded). */
function pageText(html: string): string {
  return html.replace(/<style>.*?<\/style>/s, '').replace(/<[^>]+>/g, ' ').replace(/&#39;/g, "'").replace(/&quot;/g, '"').replace(/&lt;/g, '<').replace(/&gt;/g, '>').replace(/&amp;/g, '&').replace(/\s+/g, ' ');
}

describe('report of the demo points run with --projection utm --geoid egm96, then of its control check alone (simulated data)', () => {
  let out = '';
  it('summary.json states the points options, the grid CRS and the heights; the page names EPSG:32632 and EGM96 with its caution', () => {
    requireBuiltCli();
    out = tempDir('rd-report-demo-utm-');
    const run = runCli(['points', '--rover', DEMO('rover-1s.obs'), '--reference', DEMO('KFRD-reference-5s.obs'), '--nav', DEMO('broadcast-mixed.nav'),
      '--ref-coord', 'KFRD', '--marks', DEMO('control-marks.csv'), '--projection', 'utm', '--geoid', 'egm96', '--outputs', 'epochs,residuals,summary,report', '--out', out, '--quiet']);
    expect(run.status, run.stderr).toBe(0);
    const s = JSON.parse(readFileSync(join(out, 'summary.json'), 'utf8'));
    expect(s.options).toMatchObject({ projection: 'utm', geoid: 'egm96', windows: null, tolerance_h_m: 1, tolerance_v_m: 2 });
    // UTM zone of 8.78 E: floor((8.78 + 180) / 6) + 1 = 32, northern hemisphere: EPSG:32632 (WGS 84 / UTM zone 32N).
    expect(s.grid_crs.epsg).toBe(32632);
    expect(s.grid_crs.label).toBe('WGS 84 / UTM zone 32N (EPSG:32632)');
    expect(s.heights.orthometric).toMatch(/EGM96/);
    expect(s.heights.caution).toMatch(/not a national vertical datum/);
    const text = pageText(readFileSync(join(out, 'report.html'), 'utf8'));
    expect(text).toContain('Easting, northing WGS 84 / UTM zone 32N (EPSG:32632)');
    expect(text).toMatch(/Heights ellipsoidal .* above EGM96 geoid/);
    expect(text).toContain('Height caution EGM96 is a global geoid model, not a national vertical datum');
    // The Options table shows what the points stage was given.
    expect(text).toMatch(/projection utm geoid egm96 windows none tolerance h \(m\) 1 tolerance v \(m\) 2/);
  });

  it("the scatter in summary.json and on the page is each point's epochs about its own mean, not the walk between the points", () => {
    const s = JSON.parse(readFileSync(join(out, 'summary.json'), 'utf8'));
    const points = parseCsv(readFileSync(join(out, 'points.csv'), 'utf8')).rows;
    // fixtures/demo/README: four points 4/4/3/3 min long; MILLSTONE to FERRYPOST alone is about 230 m (points.csv easting/northing).
    expect(points.length).toBe(4);
    expect(s.statistics.over).toMatch(/4 point\(s\), each about its own point's mean/);
    expect(s.statistics.kind).toBe('each-point-mean');
    expect(s.statistics.mean_ecef).toBeNull();
    expect(s.statistics.epochs).toBe(points.reduce((a, p) => a + Number(p.epochs), 0));
    // No more than the points' own per-epoch scatter (points.csv sd_*), far below the ~100 m of the walk.
    const sdH = Math.max(...points.map((p) => Math.hypot(Number(p.sd_east_m), Number(p.sd_north_m))));
    expect(s.statistics.horizontal_median_m).toBeLessThanOrEqual(sdH + 0.001);
    const text = pageText(readFileSync(join(out, 'report.html'), 'utf8'));
    expect(text).toContain("Scatter about each point's mean");
    expect(text).not.toContain('Scatter of the positions');
  });

  it("the same folder with an older summary.json (whole-session spread): the page shows the figures summary.json states for this run, from epochs.csv", async () => {
    const s = JSON.parse(readFileSync(join(out, 'summary.json'), 'utf8'));
    const older = tempDir('rd-report-demo-older-');
    for (const f of ['epochs.csv', 'points.csv']) writeFileSync(join(older, f), readFileSync(join(out, f)));
    writeFileSync(join(older, 'summary.json'), JSON.stringify({
      ...s, statistics: { over: 'differential and smoothed epochs', mean_ecef: { x_m: 4296336, y_m: 663672, z_m: 4651993 }, horizontal_median_m: 50, horizontal_95_m: 120, vertical_median_m: 1, vertical_95_m: 2 },
    }));
    const d = await readSessionReportData(sourcesInFolder(older), 't');
    const fact = d.facts!.find(([k]) => /Scatter|Spread/.test(k))!;
    expect(fact[0]).toBe("Scatter about each point's mean");
    // epochs.csv holds positions to 0.1 mm: the figures agree with summary.json's to the millimetre shown.
    const shown = [...fact[1].matchAll(/(\d+\.\d{3}) m/g)].map((m) => Number(m[1]));
    const stated = [s.statistics.horizontal_median_m, s.statistics.horizontal_95_m, s.statistics.vertical_median_m, s.statistics.vertical_95_m];
    shown.forEach((v, i) => expect(Math.abs(v - stated[i])).toBeLessThanOrEqual(0.0011));
    expect(fact[1]).toContain(`the ${s.statistics.epochs} epochs the 4 points are averaged from`);
  });

  it("report on the control check's folder alone: a control check page, the frame and epoch from the check, labelled NSSDA figures, no placeholder", () => {
    const dir = join(out, 'check');
    expect(runCli(['check', '--points', join(out, 'points.csv'), '--marks', DEMO('control-marks.csv'), '--out', dir, '--quiet']).status).toBe(0);
    const pairs = parseCsv(readFileSync(join(dir, 'control-check.csv'), 'utf8')).rows;
    const json = JSON.parse(readFileSync(join(dir, 'control-check.json'), 'utf8'));
    expect(json.pairs.map((p: { frame_epoch: number }) => p.frame_epoch)).toEqual(pairs.map((p) => Number(p.frame_epoch)));
    const r = runCli(['report', dir]);
    expect(r.status, r.stderr).toBe(0);
    const html = readFileSync(join(dir, 'report.html'), 'utf8');
    const text = pageText(html);
    expect(html).toContain('<h1>Control check report: ');
    // fixtures/demo/control-marks.csv: every mark in WGS84 at epoch 2024.3672.
    expect(pairs.every((p) => p.frame === 'WGS84' && p.frame_epoch === '2024.3672')).toBe(true);
    expect(text).toContain('Frame and epoch WGS84 epoch 2024.3672');
    expect(text).not.toMatch(/\? to \?|Observed|Rover epochs|not stated/);
    expect(text).not.toMatch(/rmse ratio min max|horizontal approximation 2 4477|rmse_ratio|_accuracy_95_m|check points \d/);
    expect(text).toContain('Horizontal accuracy at 95 %');
    // WELLHEAD is published 3 cm off (fixtures/demo/README): its row shows the tolerance and the difference test side by side.
    const well = /<tr><td class="t">WELLHEAD<\/td>.*?<\/tr>/.exec(html.slice(html.indexOf('<h2>Control check</h2>')))![0];
    const want = pairs.find((p) => p.point === 'WELLHEAD')!;
    expect(well).toContain(`>${want.pass}</span>`);
    expect(well).toContain(`>${want.difference_test}</span>`);
    expect(text).toContain('difference test (95 %)');
  });
});

describe('report into a folder without write permission', () => {
  // As root every folder is writable: the command runs as the unprivileged user 'nobody' (setpriv, util-linux).
  const asRoot = process.getuid?.() === 0;
  const canDrop = asRoot && existsSync('/usr/bin/setpriv');
  it.skipIf(asRoot && !canDrop)('one sentence naming the folder and what to do; no temporary file named or left', () => {
    requireBuiltCli();
    const dir = tempDir('rd-report-ro-');
    writeFileSync(join(dir, 'summary.json'), JSON.stringify({ frame: { name: 'WGS84', epoch_text: '2018.76' } }));
    chmodSync(dir, 0o555);
    const args = [CLI_MAIN, 'report', dir];
    const r = canDrop
      ? spawnSync('/usr/bin/setpriv', ['--reuid=nobody', '--regid=nogroup', '--clear-groups', process.execPath, ...args], { cwd: REPO_ROOT, encoding: 'utf8' })
      : spawnSync(process.execPath, args, { cwd: REPO_ROOT, encoding: 'utf8' });
    chmodSync(dir, 0o755);
    expect(r.status).toBe(1);
    const sentence = expectOneSentence({ status: r.status, stdout: r.stdout, stderr: r.stderr });
    expect(sentence).toBe(`refdelta: no permission to write report.html in the folder ${dir}: change the folder's permissions, or copy the folder somewhere writable and run refdelta report on the copy`);
    expect(sentence).not.toMatch(/\.tmp/);
    expect(readdirSync(dir)).toEqual(['summary.json']);
  });
});
