/**
 * What a run says about its inputs and its completeness, on the real static run (data README,
 * cors-and-rover-2018-277): a reference coordinate far from the reference station, a run where most rover
 * epochs fall outside the reference's span, a truncated session in a batch, outputs beside inputs.
 */
import { copyFileSync, existsSync, readFileSync, writeFileSync } from 'node:fs';
import { join } from 'node:path';
import { beforeAll, expect, it } from 'vitest';
import { dataPath, describeShared } from './support/shared.js';
import { requireBuiltCli, runCli, tempDir } from './cli-support.js';

const D = 'cors-and-rover-2018-277';
const SR = `${D}/static-run`;
const NAV = ['--nav', dataPath(`${D}/reference/glw1277m.18n`), dataPath(`${D}/reference/glw1277m.18g`)];
// data README: the CORS coordinate; base.obs is about 196 m from the CORS.
const CORS_XYZ = '3774050.9626,-601852.6734,5089350.3688';
const FAST = ['--carrier-phase', 'off', '--outputs', 'summary'];

function summary(out: string): Record<string, any> {
  return JSON.parse(readFileSync(join(out, 'summary.json'), 'utf8'));
}

describeShared('reference coordinate against the reference station (real static run)', () => {
  beforeAll(() => requireBuiltCli());

  it('the CORS coordinate given for the base: a warning naming both distances, exit 0', () => {
    const out = tempDir('rd-refpos-');
    const r = runCli(['solve', '--rover', dataPath(`${SR}/rover.obs`), '--reference', dataPath(`${SR}/base.obs`), ...NAV,
      '--ref-coord', CORS_XYZ, '--ref-frame', 'ETRS89', '--ref-epoch', '2018.76', ...FAST, '--out', out]);
    expect(r.status, r.stderr).toBe(0);
    expect(r.stderr).toMatch(/base\.obs: the reference coordinate \(--ref-coord\) is 19\d m from the station observed in this file \(197 m from its APPROX POSITION XYZ; 19\d m from its own single-receiver position, the median of its first 20 fixes\), farther than the 100 m/);
    expect(summary(out).warnings.by_code['reference-coordinate-far']).toBe(1);
  });

  it('latitude and longitude swapped (8306 km away): exit 1 with one sentence, nothing written', () => {
    const out = tempDir('rd-refpos-swap-');
    const r = runCli(['solve', '--rover', dataPath(`${SR}/rover.obs`), '--reference', dataPath(`${SR}/base.obs`), ...NAV,
      '--ref-coord', '-9.0578,53.2804,65', '--ref-frame', 'ETRS89', '--ref-epoch', '2018.76', ...FAST, '--out', out]);
    expect(r.status).toBe(1);
    expect(r.stderr).toMatch(/refdelta: the reference coordinate \(--ref-coord\) is 8306 km from the station observed in .*base\.obs .*so it cannot be that station's coordinate/);
    expect(existsSync(join(out, 'summary.json'))).toBe(false);
  });

  it('the base\'s own coordinate: no such warning', () => {
    const out = tempDir('rd-refpos-ok-');
    const r = runCli(['solve', '--rover', dataPath(`${SR}/rover.obs`), '--reference', dataPath(`${SR}/base.obs`), ...NAV,
      '--ref-coord', '3774089.2120,-601661.6157,5089321.2474', '--ref-frame', 'WGS84', '--ref-epoch', '2018.76', ...FAST, '--out', out]);
    expect(r.status, r.stderr).toBe(0);
    expect(r.stderr).not.toMatch(/station observed/);
  });
});

describeShared('rover epochs without a solution are counted and explained (real static run)', () => {
  it('the CORS hour against the 20-minute rover file: 479 of 720 unsolved, most before the reference\'s first epoch, the reference covers a third', () => {
    requireBuiltCli();
    const out = tempDir('rd-unsolved-');
    const r = runCli(['solve', '--rover', dataPath(`${D}/reference/glw1277m.18o`), '--reference', dataPath(`${SR}/rover.obs`), ...NAV,
      '--ref-coord', 'header', '--outputs', 'summary', '--out', out]);
    expect(r.status, r.stderr).toBe(0);
    const line = /479 of 720 rover epochs \(66\.5 %\) have no solution, 458 because of "before the reference's first epoch"; the reference covers only 33 % of the rover's span/;
    expect(r.stderr.split('\n').filter((l) => line.test(l)).length).toBe(2); // the warning and the summary line
    const s = summary(out);
    expect(s.completeness).toMatchObject({ input_complete: true, unsolved_epochs: 479, unsolved_percent: 66.5, reference_covers_percent: 33.5 });
    expect(s.warnings.by_code['many-epochs-unsolved']).toBe(1);
  });
});

describeShared('a reference file cut off before its header\'s TIME OF LAST OBS (real static run)', () => {
  // base.obs cut at its epoch nearest 12:48 (header kept, as a file cut in transfer): 'a' ends there, 'b' is
  // the header and the epochs after it (the next file of the session).
  let a = '', b = '';
  beforeAll(() => {
    requireBuiltCli();
    const lines = readFileSync(dataPath(`${SR}/base.obs`), 'latin1').split('\n');
    const end = lines.findIndex((l) => l.includes('END OF HEADER'));
    const cut = lines.findIndex((l) => l.startsWith('> 2018 10 04 12 48'));
    expect(cut).toBeGreaterThan(end);
    const dir = tempDir('rd-refcut-');
    a = join(dir, 'base-a.obs');
    b = join(dir, 'base-b.obs');
    writeFileSync(a, lines.slice(0, cut).join('\n') + '\n', 'latin1');
    writeFileSync(b, [...lines.slice(0, end + 1), ...lines.slice(cut)].join('\n'), 'latin1');
  });

  it('alone: the reference gets the cut-off warning, the figures use its epochs read and the sentence asks for the rest', () => {
    requireBuiltCli();
    const out = tempDir('rd-refcut-a-');
    const r = runCli(['solve', '--rover', dataPath(`${SR}/rover.obs`), '--reference', a, ...NAV, '--ref-coord', 'header', ...FAST, '--out', out]);
    expect(r.status, r.stderr).toBe(0);
    expect(r.stderr).toMatch(/base-a\.obs: the reference file's epochs end at 2018-10-04 12:47:\d\d UTC, 1\d\.\d min before its header's TIME OF LAST OBS \(2018-10-04 12:58:22 UTC\): the file looks cut off/);
    expect(r.stderr).toContain('the reference epochs end before the rover\'s: give the reference file(s) covering the rest (e.g. the next hourly file)');
    const s = summary(out);
    expect(s.warnings.by_code['reference-ends-early']).toBe(1);
    expect(s.completeness.input_complete).toBe(false);
    // The rover runs 12:38:09-12:58:13 GPS: epochs to 12:48 are about half of it.
    expect(s.completeness.reference_covers_percent).toBeGreaterThan(40);
    expect(s.completeness.reference_covers_percent).toBeLessThan(60);
    expect(s.completeness.unsolved_percent).toBeGreaterThan(35);
  });

  it('with the rest given as a second file: no warning, the input complete, the rover covered', () => {
    requireBuiltCli();
    const out = tempDir('rd-refcut-ab-');
    const r = runCli(['solve', '--rover', dataPath(`${SR}/rover.obs`), '--reference', a, b, ...NAV, '--ref-coord', 'header', ...FAST, '--out', out]);
    expect(r.status, r.stderr).toBe(0);
    const s = summary(out);
    expect(s.warnings.by_code['reference-ends-early']).toBeUndefined();
    expect(s.completeness).toMatchObject({ input_complete: true, reference_covers_percent: 100 });
  });
});

describeShared('a truncated session in a batch (real static run)', () => {
  let sessions = '', out = '', stdout = '';
  beforeAll(() => {
    requireBuiltCli();
    sessions = tempDir('rd-trunc-sessions-');
    copyFileSync(dataPath(`${SR}/rover.obs`), join(sessions, 'rover.obs'));
    writeFileSync(join(sessions, 'broken.obs'), readFileSync(dataPath(`${SR}/rover.obs`)).subarray(0, 700_000));
    out = tempDir('rd-trunc-out-');
    const r = runCli(['batch', '--sessions', sessions, '--reference-dir', dataPath(`${D}/reference`), '--nav-dir', dataPath(`${D}/reference`),
      '--ref-coord', 'header', '--carrier-phase', 'off', '--outputs', 'epochs,residuals,summary,report', '--out', out]);
    expect(r.status, r.stderr).toBe(0);
    stdout = r.stdout;
  });

  it('the table, batch-summary.json and the batch report say incomplete-input for it, ok for the whole file', () => {
    expect(stdout).toMatch(/^broken .*incomplete-input: observations were lost while reading: .*broken\.obs:\d+: epoch announces 22 satellites but 2 observation records follow \(file ends\); epoch skipped \(2 such problems\)$/m);
    expect(stdout).toMatch(/^rover .* ok$/m);
    const b = JSON.parse(readFileSync(join(out, 'batch-summary.json'), 'utf8'));
    expect(b.sessions.map((x: { name: string; status: string }) => `${x.name}:${x.status}`)).toEqual(['broken:incomplete-input', 'rover:ok']);
    expect(b.counts).toMatchObject({ ok: 1, incomplete_input: 1, failed: 0 });
    const html = readFileSync(join(out, 'report.html'), 'utf8');
    expect(html).toContain('<span class="badge other">incomplete-input</span>');
    expect(html).toContain('1 with a status other than ok (listed first)');
  });

  it('the session\'s summary.json says its input is incomplete, and the cut-off against TIME OF LAST OBS', () => {
    const s = summary(join(out, 'broken'));
    expect(s.completeness.input_complete).toBe(false);
    expect(s.warnings.by_code['rover-ends-early']).toBe(1);
    expect(summary(join(out, 'rover')).completeness.input_complete).toBe(true);
  });
});

describeShared('outputs written into the inputs\' folder (real static run)', () => {
  it('a warning names the inputs there; nothing is overwritten', () => {
    requireBuiltCli();
    const dir = tempDir('rd-beside-run-');
    for (const f of ['rover.obs', 'base.obs']) copyFileSync(dataPath(`${SR}/${f}`), join(dir, f));
    const r = runCli(['solve', '--rover', join(dir, 'rover.obs'), '--reference', join(dir, 'base.obs'), ...NAV, '--ref-coord', 'header', ...FAST, '--out', dir]);
    expect(r.status, r.stderr).toBe(0);
    expect(r.stderr).toContain(`warning: the output folder ${dir} (--out) holds input files (rover.obs, base.obs): the outputs are written beside them (no input is overwritten)`);
    expect(summary(dir).warnings.by_code['outputs-beside-inputs']).toBe(1);
  });
});
