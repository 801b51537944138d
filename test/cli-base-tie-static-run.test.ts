/**
 * A base on an unknown point tied to a CORS in the same run (real data: cors-and-rover-2018-277, data
 * README). rover.obs against base.obs with base.obs tied to the CORS hour glw1277m (coordinate from the
 * data README) must give the rover where rover.obs against the CORS directly puts it: the closure of the
 * triangle CORS -> base -> rover against CORS -> rover, within 0.02 m (carrier phase, fixed epochs).
 */
import { readFileSync } from 'node:fs';
import { join } from 'node:path';
import { beforeAll, expect, it } from 'vitest';
import { dataPath, describeShared } from './support/shared.js';
import { parseCsv, requireBuiltCli, runCli, tempDir } from './cli-support.js';

const D = 'cors-and-rover-2018-277';
const NAV = ['--nav', dataPath(`${D}/reference/glw1277m.18n`), dataPath(`${D}/reference/glw1277m.18g`)];
// data README: the CORS coordinate (APPROX POSITION XYZ, published by the network; frame not stated).
const CORS_XYZ = ['--ref-coord', '3774050.9626,-601852.6734,5089350.3688', '--ref-frame', 'unstated', '--ref-epoch', '2018.76'];

function meanOfFixed(out: string): { x: number; y: number; z: number; n: number } {
  const rows = parseCsv(readFileSync(join(out, 'epochs.csv'), 'utf8')).rows.filter((r) => r.solution === 'fixed');
  const m = { x: 0, y: 0, z: 0, n: rows.length };
  for (const r of rows) { m.x += Number(r.ecef_x_m) / rows.length; m.y += Number(r.ecef_y_m) / rows.length; m.z += Number(r.ecef_z_m) / rows.length; }
  return m;
}

describeShared('a base tied to a CORS in the same run (real static run)', () => {
  let tied = '', direct = '';
  beforeAll(() => {
    requireBuiltCli();
    tied = tempDir('rd-tie-');
    direct = tempDir('rd-tie-direct-');
    const a = runCli(['solve', '--rover', dataPath(`${D}/static-run/rover.obs`), '--reference', dataPath(`${D}/static-run/base.obs`),
      '--tie-to', dataPath(`${D}/reference/glw1277m.18o`), ...NAV, ...CORS_XYZ, '--at-antenna', '--out', tied]);
    expect(a.status, a.stderr).toBe(0);
    const b = runCli(['solve', '--rover', dataPath(`${D}/static-run/rover.obs`), '--reference', dataPath(`${D}/reference/glw1277m.18o`),
      ...NAV, ...CORS_XYZ, '--at-antenna', '--out', direct]);
    expect(b.status, b.stderr).toBe(0);
  });

  it('closure CORS -> base -> rover against CORS -> rover within 0.02 m', () => {
    const t = meanOfFixed(tied), d = meanOfFixed(direct);
    expect(t.n).toBeGreaterThan(1000);
    expect(d.n).toBeGreaterThan(1000);
    const closure = Math.hypot(t.x - d.x, t.y - d.y, t.z - d.z);
    // eslint-disable-next-line no-console
    console.log(`base tie closure: ${closure.toFixed(4)} m over ${t.n} and ${d.n} fixed epochs`);
    expect(closure).toBeLessThanOrEqual(0.02);
  });

  it('summary.json reports the tie baseline and its precision, and the CORS file as the tie station', () => {
    const s = JSON.parse(readFileSync(join(tied, 'summary.json'), 'utf8'));
    const tie = s.reference.tie;
    // The base is about 196 m from the CORS antenna (data README).
    expect(tie.baseline_length_m).toBeGreaterThan(190);
    expect(tie.baseline_length_m).toBeLessThan(200);
    expect(tie.basis).toBe('fixed');
    expect(tie.sigma_horizontal_m).toBeGreaterThan(0);
    expect(tie.sigma_horizontal_m).toBeLessThan(0.05);
    expect(s.inputs.some((i: { kind: string }) => i.kind === 'tie-station')).toBe(true);
    expect(s.reference.sigma_horizontal_m).toBeGreaterThanOrEqual(tie.sigma_horizontal_m);
  });

  it('a CORS hour not overlapping the base is named as the CORS, the base as the base', () => {
    // glw1277n is 13:00-13:59 GPS time; the base recorded 12:37-12:58 (data README).
    const cors = dataPath(`${D}/reference/glw1277n.18o`);
    const r = runCli(['solve', '--rover', dataPath(`${D}/static-run/rover.obs`), '--reference', dataPath(`${D}/static-run/base.obs`),
      '--tie-to', cors, ...NAV, ...CORS_XYZ, '--at-antenna', '--out', tempDir('rd-tie-apart-')]);
    expect(r.status).toBe(1);
    expect(r.stderr).toContain(`base ${dataPath(`${D}/static-run/base.obs`)} runs 2018-10-04 12:36:58 UTC`);
    expect(r.stderr).toContain(`CORS ${cors} (2018-10-04 12:59:42 UTC`);
    expect(r.stderr).not.toMatch(/ rover |reference observations/);
  });
});
