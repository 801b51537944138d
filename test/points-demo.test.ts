/**
 * `refdelta points` on the simulated demo scenario (fixtures/demo, README): the rover file marks each
 * walk with an event flag 2 and each point with a flag 3 carrying MARKER NAME and the pole height, so the
 * occupations come from the events; with --windows they come from the windows file. Checked against the
 * simulator's truth (points.csv: true marks; occupations.csv: true occupation times). Simulated data:
 * this checks self-consistency of the simulator and the engine, not the real world.
 */
import { existsSync, readFileSync, writeFileSync } from 'node:fs';
import { join } from 'node:path';
import { beforeAll, describe, expect, it } from 'vitest';
import { fixturePath } from './support/shared.js';
import { enuAt, parseCsv, requireBuiltCli, runCli, tempDir, type CliRun } from './cli-support.js';

const DEMO = (f: string) => fixturePath(`demo/${f}`);
const HAVE = existsSync(DEMO('rover-1s.obs'));
if (!HAVE) console.warn('[skip] points on the demo: fixtures/demo/ not generated yet (node fixtures/demo/make-demo.mjs)');
const RUN = ['--rover', DEMO('rover-1s.obs'), '--reference', DEMO('KFRD-reference-5s.obs'), '--nav', DEMO('broadcast-mixed.nav'), '--ref-coord', 'KFRD', '--marks', DEMO('control-marks.csv'), '--outputs', 'summary'];
const NAMES = ['MILLSTONE', 'FERRYPOST', 'ELMCORNER', 'WELLHEAD'];

function truthMarks(): Map<string, { x: number; y: number; z: number; h: number }> {
  const rows = parseCsv(readFileSync(DEMO('points.csv'), 'utf8')).rows.filter((r) => r.role === 'rover');
  return new Map(rows.map((r) => [r.name, { x: Number(r.x_m), y: Number(r.y_m), z: Number(r.z_m), h: Number(r.antenna_height_m) }]));
}

/** Truth occupation windows: GPS time (README: "times GPS (GPST)"). */
function truthWindows(): { name: string; startText: string; endText: string; h: string }[] {
  return parseCsv(readFileSync(DEMO('occupations.csv'), 'utf8')).rows.map((r) => ({ name: r.name, startText: r.start, endText: r.end, h: r.antenna_height_m }));
}

function gpsTowOf(iso: string): number {
  // 2024-05-14 is a Tuesday: day 2 of GPS week 2314 (README: session in GPS week 2314)
  const [, hh, mm, ss] = /T(\d\d):(\d\d):(\d\d(?:\.\d+)?)/.exec(iso)!.map(Number);
  return 2 * 86400 + hh * 3600 + mm * 60 + ss;
}

function horizontalErrors(pointsCsv: string): Map<string, { h: number; u: number }> {
  const truth = truthMarks();
  const out = new Map<string, { h: number; u: number }>();
  for (const p of parseCsv(pointsCsv).rows) {
    const t = truth.get(p.name)!;
    const lat = (Number(p.latitude_deg) * Math.PI) / 180, lon = (Number(p.longitude_deg) * Math.PI) / 180;
    const [e, n, u] = enuAt([Number(p.ecef_x_m) - t.x, Number(p.ecef_y_m) - t.y, Number(p.ecef_z_m) - t.z], lat, lon);
    out.set(p.name, { h: Math.hypot(e, n), u });
  }
  return out;
}

describe.skipIf(!HAVE)('refdelta points on the demo scenario', () => {
  let out = '';
  let run: CliRun;
  beforeAll(() => {
    requireBuiltCli();
    out = tempDir('rd-points-demo-');
    run = runCli(['points', ...RUN, '--out', out]);
  });

  it('splits the occupations on the event flags (3 new point with MARKER NAME, 2 start moving)', () => {
    expect(run.status, run.stderr).toBe(0);
    const rows = parseCsv(readFileSync(join(out, 'points.csv'), 'utf8')).rows;
    expect(rows.map((r) => [r.name, r.source])).toEqual(NAMES.map((n) => [n, 'events']));
    const truth = truthWindows();
    for (const [i, r] of rows.entries()) {
      // the event epochs bracket the simulator's true occupation (within 2 s: 1 s epochs, tags a few ms off)
      expect(Math.abs(Number(r.start_gps_tow_s) - gpsTowOf(truth[i].startText))).toBeLessThan(2);
      expect(Math.abs(Number(r.end_gps_tow_s) - gpsTowOf(truth[i].endText))).toBeLessThan(2);
    }
  });

  it('each point within 1 m horizontally and 1.5 m vertically of its true mark (antenna heights from the events)', () => {
    const errs = horizontalErrors(readFileSync(join(out, 'points.csv'), 'utf8'));
    // eslint-disable-next-line no-console
    console.log('demo points (events) vs truth:', [...errs].map(([n, e]) => `${n} h ${e.h.toFixed(3)} u ${e.u.toFixed(3)}`).join('; '));
    expect(errs.size).toBe(4);
    // check-values.md "Accuracy facts": code differential about 1 m (1 sigma), averaged over minutes
    for (const e of errs.values()) { expect(e.h).toBeLessThan(1.0); expect(Math.abs(e.u)).toBeLessThan(1.5); }
    // Self-consistency (simulated truth): the stated horizontal precision of each mean covers its error
    // (3 sigma of the larger horizontal component), and the antenna heights of the event records are reported.
    const rows = parseCsv(readFileSync(join(out, 'points.csv'), 'utf8')).rows;
    const truth = truthMarks();
    for (const p of rows) {
      const sigmaH = Math.max(Number(p.sigma_mean_east_m), Number(p.sigma_mean_north_m));
      expect(errs.get(p.name)!.h).toBeLessThan(3 * Math.SQRT2 * sigmaH);
      expect(Number(p.antenna_height_m)).toBeCloseTo(truth.get(p.name)!.h, 4);
    }
  });

  it('--windows takes precedence; the windows file\'s antenna heights reduce to the same marks', () => {
    const o2 = tempDir('rd-points-demo-win-');
    // The bundled occupations.csv is in our windows format (GPS times marked GPST).
    const r = runCli(['points', ...RUN, '--windows', DEMO('occupations.csv'), '--out', o2]);
    expect(r.status, r.stderr).toBe(0);
    const text = readFileSync(join(o2, 'points.csv'), 'utf8');
    const rows = parseCsv(text).rows;
    expect(rows.map((x) => [x.name, x.source])).toEqual(NAMES.map((n) => [n, 'windows']));
    for (const [i, x] of rows.entries()) expect(x.antenna_height_m).toBe(Number(truthWindows()[i].h).toFixed(4));
    for (const e of horizontalErrors(text).values()) { expect(e.h).toBeLessThan(1.0); expect(Math.abs(e.u)).toBeLessThan(1.5); }
  });

  it('with --windows the epochs carry the name of the window holding them (a point renamed), and each point counts exactly those epochs', () => {
    const o = tempDir('rd-points-demo-win-names-');
    const win = join(o, 'windows.csv');
    writeFileSync(win, readFileSync(DEMO('occupations.csv'), 'utf8').replace(/^MILLSTONE,/m, 'W-ONE,'));
    const args = RUN.slice(0, RUN.indexOf('--outputs'));
    const r = runCli(['points', ...args, '--smooth', '100', '--windows', win, '--outputs', 'epochs,geojson,summary', '--out', join(o, 'out')]);
    expect(r.status, r.stderr).toBe(0);
    const epochs = parseCsv(readFileSync(join(o, 'out', 'epochs.csv'), 'utf8')).rows;
    const points = parseCsv(readFileSync(join(o, 'out', 'points.csv'), 'utf8')).rows;
    expect(points.map((p) => p.name)).toEqual(['W-ONE', ...NAMES.slice(1)]);
    expect(new Set(epochs.map((e) => e.point))).toEqual(new Set(['', 'W-ONE', ...NAMES.slice(1)]));
    for (const p of points) expect(epochs.filter((e) => e.point === p.name && e.solution !== 'none').length, p.name).toBe(Number(p.epochs));
    // Outside every window (the walks) the column is empty, never the rover's marker name.
    expect(epochs.some((e) => e.point === 'MILLSTONE')).toBe(false);
    const gj = JSON.parse(readFileSync(join(o, 'out', 'positions.geojson'), 'utf8'));
    expect(gj.features.filter((f: { properties: { point: string } }) => f.properties.point === 'W-ONE').length).toBe(Number(points[0]!.epochs));
    const meta = JSON.parse(readFileSync(join(o, 'out', 'epochs.csv.meta.json'), 'utf8'));
    expect(meta.notes.join('\n')).toContain(`point: the name of the occupation window of the windows file ${win}`);
  });

  it('overlapping windows: a warning naming both (file, lines, times as written) and the overlap, kept in summary.json; touching ones are not', () => {
    const o = tempDir('rd-points-demo-win-overlap-');
    const win = join(o, 'windows.csv');
    // FERRYPOST (line 6) made to start at 09:36:30, 30 s before MILLSTONE (line 5) ends.
    writeFileSync(win, readFileSync(DEMO('occupations.csv'), 'utf8').replace('FERRYPOST,2024-05-14T09:40:20.000 GPST', 'FERRYPOST,2024-05-14T09:36:30.000 GPST'));
    const r = runCli(['points', ...RUN, '--windows', win, '--out', join(o, 'out')]);
    expect(r.status, r.stderr).toBe(0);
    const lines = r.stderr.split('\n').filter((l) => /overlap from/.test(l));
    expect(lines).toEqual([`warning: ${win}:6: the windows MILLSTONE (line 5, 2024-05-14T09:33:00.000 GPST to 2024-05-14T09:37:00.000 GPST) and `
      + 'FERRYPOST (line 6, 2024-05-14T09:36:30.000 GPST to 2024-05-14T09:44:20.000 GPST) overlap from 2024-05-14T09:36:30.000 GPST to 2024-05-14T09:37:00.000 GPST (30 s), '
      + 'so the epochs of that time are counted in both points: end the first window before the second starts']);
    const s = JSON.parse(readFileSync(join(o, 'out', 'summary.json'), 'utf8'));
    expect(s.warnings.by_code['windows-overlap']).toBe(1);
    // Touching windows (FERRYPOST starting when MILLSTONE ends) share one instant only: no warning.
    writeFileSync(win, readFileSync(DEMO('occupations.csv'), 'utf8').replace('FERRYPOST,2024-05-14T09:40:20.000 GPST', 'FERRYPOST,2024-05-14T09:37:00.000 GPST'));
    const t = runCli(['points', ...RUN, '--windows', win, '--out', join(o, 'out2')]);
    expect(t.status, t.stderr).toBe(0);
    expect(t.stderr).not.toMatch(/overlap from/);
  });

  it('points --help: the times of --windows are UTC unless marked GPST, as the windows reader takes them', () => {
    const h = runCli(['points', '--help']).stdout.replace(/\s+/g, ' ');
    expect(h).toContain('times YYYY-MM-DDThh:mm:ss[.sss] (T or a space), in UTC unless followed by GPST (GPS time, no leap seconds); a UTC time may end in Z, UTC or an offset +hh:mm or -hh:mm (the colon optional)');
  });

  it('a geographic CRS is refused as --projection, with one sentence, before any run', () => {
    for (const spec of ['EPSG:4326', '+proj=longlat +ellps=GRS80 +no_defs']) {
      const o = tempDir('rd-points-demo-geog-');
      const r = runCli(['points', ...RUN, '--projection', spec, '--out', o]);
      expect(r.status).toBe(2);
      expect(r.stderr).toMatch(/is a geographic CRS, not a map projection \(latitude_deg and longitude_deg already hold geographic coordinates\): give a projected CRS/);
      expect(existsSync(join(o, 'points.csv'))).toBe(false);
    }
  });
});
