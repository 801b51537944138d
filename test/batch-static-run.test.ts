/**
 * `refdelta batch` on the real static run (data README, cors-and-rover-2018-277/static-run, 12:37-12:58
 * GPS time): base.obs and rover.obs as two sessions against the CORS (reference coordinate = the CORS
 * header's APPROX POSITION XYZ, published by the operator: data README), with --reference-dir and
 * --nav-dir picking the hourly files. Never reads walking-run/ (reserved).
 */
import { readFileSync } from 'node:fs';
import { join } from 'node:path';
import { beforeAll, expect, it } from 'vitest';
import { dataPath, describeShared } from './support/shared.js';
import { enuAt, parseCsv, requireBuiltCli, runCli, tempDir, type CliRun } from './cli-support.js';

const D = 'cors-and-rover-2018-277';
// data README: the base's own coordinate (APPROX POSITION XYZ of base.obs); the rover truth is relative to it
const BASE_XYZ = [3774089.212, -601661.6157, 5089321.2474];

describeShared('refdelta batch on the real static run', () => {
  let out = '';
  let run: CliRun;
  beforeAll(() => {
    requireBuiltCli();
    out = tempDir('rd-batch-static-');
    run = runCli(['batch', '--sessions', dataPath(`${D}/static-run`), '--reference-dir', dataPath(`${D}/reference`), '--nav-dir', dataPath(`${D}/reference`),
      '--ref-coord', 'header', '--outputs', 'summary', '--out', out]);
  });

  it('exit 0: both receivers are sessions, the truth CSV is skipped with a note, the CORS hour m is picked', () => {
    expect(run.status, run.stderr).toBe(0);
    expect(run.stderr).toMatch(/note: skipping .*rover-truth\.csv: not a RINEX observation file/);
    const s = JSON.parse(readFileSync(join(out, 'batch-summary.json'), 'utf8'));
    expect(s.sessions.map((x: { name: string; status: string }) => `${x.name}:${x.status}`)).toEqual(['base:ok', 'rover:ok']);
    // data README: the CORS hourly files run 12:00-17:59; the static run is 12:37-12:58, inside hour m only
    for (const x of s.sessions) expect(x.reference_files.map((f: string) => f.split('/').pop())).toEqual(['glw1277m.18o']);
    for (const x of s.sessions) expect(x.nav_files.map((f: string) => f.split('/').pop())).toEqual(expect.arrayContaining(['glw1277m.18n', 'glw1277m.18g']));
  });

  it('one point per receiver; the base-to-rover vector agrees with the truth within 1 m horizontally', () => {
    const t = parseCsv(readFileSync(join(out, 'batch-points.csv'), 'utf8')).rows;
    expect(t.map((r) => r.session)).toEqual(['base', 'rover']);
    // Both points are static spans found from the Doppler speed: named after their session, never S1 twice.
    expect(t.map((r) => `${r.name}:${r.source}`)).toEqual(['base-S1:doppler', 'rover-S1:doppler']);
    const truth = parseCsv(readFileSync(dataPath(`${D}/static-run/rover-truth.csv`), 'utf8')).rows.filter((r) => r.fix_quality === '4');
    expect(truth.length).toBeGreaterThan(100);
    const tm = [0, 0, 0];
    for (const r of truth) { tm[0] += Number(r.ecef_x_m) / truth.length; tm[1] += Number(r.ecef_y_m) / truth.length; tm[2] += Number(r.ecef_z_m) / truth.length; }
    const [b, r] = t;
    const got = [Number(r.ecef_x_m) - Number(b.ecef_x_m), Number(r.ecef_y_m) - Number(b.ecef_y_m), Number(r.ecef_z_m) - Number(b.ecef_z_m)] as [number, number, number];
    const want = [tm[0] - BASE_XYZ[0], tm[1] - BASE_XYZ[1], tm[2] - BASE_XYZ[2]] as [number, number, number];
    const lat = (Number(b.latitude_deg) * Math.PI) / 180, lon = (Number(b.longitude_deg) * Math.PI) / 180;
    const [e, n] = enuAt([got[0] - want[0], got[1] - want[1], got[2] - want[2]], lat, lon);
    const [we, wn] = enuAt(want, lat, lon);
    // eslint-disable-next-line no-console
    console.log(`batch static run: base->rover truth ${Math.hypot(we, wn).toFixed(3)} m horizontal; difference dE ${e.toFixed(3)} dN ${n.toFixed(3)} m`);
    // data README: the receivers stand about 0.33 m apart
    expect(Math.hypot(we, wn)).toBeLessThan(1);
    // check-values.md "Accuracy facts": code differential about 1 m (1 sigma); 20 min means do better
    expect(Math.hypot(e, n)).toBeLessThan(1.0);
    // the CORS header states no frame (data README): the rows say so
    expect(t.every((x) => x.frame === 'unstated' && x.frame_epoch === '2018.76')).toBe(true);
  });

  it('a reference hour that does not overlap: every session fails with its sentence, exit 1', () => {
    const o = tempDir('rd-batch-static-none-');
    const r = runCli(['batch', '--sessions', dataPath(`${D}/static-run`), '--reference', dataPath(`${D}/reference/glw1277o.18o`),
      '--nav', dataPath(`${D}/reference/glw1277m.18n`), '--ref-coord', 'header', '--out', o]);
    expect(r.status).toBe(1);
    const lines = r.stderr.split('\n').filter((l) => l.startsWith('refdelta: session'));
    expect(lines).toHaveLength(2);
    for (const l of lines) expect(l).toMatch(/do not overlap in time/);
  });
});
