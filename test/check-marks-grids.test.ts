/**
 * `refdelta check` with marks given in grid coordinates: made here from the demo's computed points by
 * PROJ (cs2cs, the outside reference), so a right CRS gives differences of 0.1 mm (the rounding of the
 * grid values written) and a wrong one is recognised. The demo is simulated (fixtures/demo): this checks
 * the marks reading and the sentences, not the positions.
 */
import { spawnSync } from 'node:child_process';
import { existsSync, readFileSync, writeFileSync } from 'node:fs';
import { join } from 'node:path';
import { beforeAll, describe, expect, it } from 'vitest';
import { fixturePath } from './support/shared.js';
import { expectOneSentence, parseCsv, requireBuiltCli, runCli, tempDir } from './cli-support.js';

const DEMO = (f: string) => fixturePath(`demo/${f}`);
const HAVE = existsSync(DEMO('rover-1s.obs')) && spawnSync('cs2cs', [], { encoding: 'utf8' }).error === undefined;
if (!HAVE) console.warn('[skip] check with grid marks: fixtures/demo/ not generated, or PROJ cs2cs not installed (apt-get install proj-bin)');

const HEAD = 'name,easting_m,northing_m,h_m,projection,frame,epoch';

describe.skipIf(!HAVE)('refdelta check with marks in grid coordinates (demo points, marks made by cs2cs)', () => {
  let pts = '';
  let rows: Record<string, string>[] = [];
  /** The points as marks in WGS 84 / UTM zone 32N by PROJ: name, easting, northing, height. */
  let utm: [string, string, string, string][] = [];
  const marksFile = (name: string, lines: readonly string[]) => {
    const f = join(tempDir('rd-check-grid-'), name);
    writeFileSync(f, [HEAD, ...lines].join('\n') + '\n');
    return f;
  };
  beforeAll(() => {
    requireBuiltCli();
    const o = tempDir('rd-check-grid-pts-');
    const r = runCli(['points', '--rover', DEMO('rover-1s.obs'), '--reference', DEMO('KFRD-reference-5s.obs'), '--nav', DEMO('broadcast-mixed.nav'),
      '--ref-coord', 'KFRD', '--marks', DEMO('control-marks.csv'), '--outputs', 'summary', '--out', o]);
    expect(r.status, r.stderr).toBe(0);
    pts = join(o, 'points.csv');
    rows = parseCsv(readFileSync(pts, 'utf8')).rows;
    const input = rows.map((x) => `${x.longitude_deg} ${x.latitude_deg}`).join('\n') + '\n';
    const out = spawnSync('cs2cs', ['-f', '%.4f', 'EPSG:4326', 'EPSG:32632'], { input: rows.map((x) => `${x.latitude_deg} ${x.longitude_deg}`).join('\n') + '\n', encoding: 'utf8' });
    expect(out.status, out.stderr + input).toBe(0);
    utm = out.stdout.trim().split('\n').map((l, i) => {
      const [e, n] = l.trim().split(/\s+/);
      return [rows[i]!.name!, e!, n!, rows[i]!.height_m!];
    });
  }, 120_000);

  it('the right CRS: every mark within 1 mm horizontally, no warning about the grid', () => {
    const o = tempDir('rd-check-grid-ok-');
    const r = runCli(['check', '--points', pts, '--marks', marksFile('m.csv', utm.map(([n, e, no, h]) => `${n},${e},${no},${h},EPSG:32632,WGS84,2024.3672`)), '--out', o]);
    expect(r.status, r.stderr).toBe(0);
    expect(r.stderr).not.toMatch(/datum other than|more than 1 km|usable area/);
    for (const x of parseCsv(readFileSync(join(o, 'control-check.csv'), 'utf8')).rows) expect(Math.hypot(Number(x.d_east_m), Number(x.d_north_m))).toBeLessThan(1e-3);
  });

  it('UTM coordinates declared as EPSG:2056 (Swiss LV95, on CH1903+): the datum warning of points, and the far matches named with what to check', () => {
    const o = tempDir('rd-check-grid-bad-');
    const f = marksFile('bad.csv', utm.map(([n, e, no, h]) => `${n},${e},${no},${h},EPSG:2056,WGS84,2024.3672`));
    const r = runCli(['check', '--points', pts, '--marks', f, '--out', o]);
    expect(r.status).toBe(3);
    expect(r.stderr).toMatch(/warning: .*bad\.csv:2: marks in EPSG:2056 with frame WGS84 \(from MILLSTONE on\): CH1903\+ \/ LV95 \(EPSG:2056\) is on a datum other than the marks' stated frame WGS84 \(CH1903\+\): easting\/northing are turned into latitude\/longitude as they are, without a datum shift/);
    // Read as LV95 they land far outside Switzerland (EPSG dataset area of use of EPSG:2056: 45.82 N to 47.81 N, 5.96 E to 10.49 E).
    expect(r.stderr).toMatch(/warning: .*bad\.csv:2: 4 of 4 mark\(s\) given in CH1903\+ \/ LV95 \(EPSG:2056\) fall outside its usable area: MILLSTONE .*outside its area of use in the EPSG dataset, 45\.8200 N to 47\.8100 N, 5\.9600 E to 10\.4900 E.*check the projection column/);
    // The values are PROJ's UTM zone 32N ones: read so, each mark is within 1 mm of its point.
    // One sentence at the first far mark's line, each mark named with its line.
    const far = r.stderr.split('\n').find((l) => /more than 1 km/.test(l))!;
    expect(far).toMatch(/warning: .*bad\.csv:2: 4 point\(s\) matched by name lie more than 1 km from their mark, far more than a measurement, frame or datum difference explains: MILLSTONE is \d+ km from mark MILLSTONE on line 2 \(its values read as WGS 84 \/ UTM zone 32N \(EPSG:32632\) put it 0\.00[01] m from the point\); .* on line 3 .*; check the CRS of .*bad\.csv \(its projection code, UTM zone and hemisphere, and the order of its coordinates: easting before northing, latitude before longitude\) or whether the names pair different places$/);
    expect(far.replace(/^.*?bad\.csv:2: /, '')).not.toMatch(/[.!?]\s/);
    const j = JSON.parse(readFileSync(join(o, 'control-check.json'), 'utf8'));
    expect(j.warnings.map((w: { code: string }) => w.code)).toEqual(expect.arrayContaining(['marks-projection-datum', 'marks-outside-grid-area', 'marks-far-from-points']));
  });

  it('a mark name given twice: one sentence naming the file, both lines and the name, exit 1 as other marks-file errors', () => {
    const [a, b] = utm;
    const f = marksFile('dup.csv', [`${a![0]},${a![1]},${a![2]},${a![3]},EPSG:32632,WGS84,2024.3672`, `${b![0]},${b![1]},${b![2]},${b![3]},EPSG:32632,WGS84,2024.3672`, `${a![0]},${a![1]},${a![2]},${a![3]},EPSG:32632,WGS84,2024.3672`]);
    const r = runCli(['check', '--points', pts, '--marks', f, '--out', tempDir('rd-check-grid-dup-')]);
    expect(r.status).toBe(1);
    expect(expectOneSentence(r)).toMatch(new RegExp(`dup\\.csv:4: the mark name '${a![0]}' is given twice, on lines 2 and 4: marks are matched by name`));
  });
});
