/**
 * Review findings 26-30 on the built CLI with the bundled demo scenario (fixtures/demo, simulated: these
 * are behaviour checks, not accuracy checks): data problems exit 1 (README exit codes), a failed run
 * leaves an earlier complete output set as it was, every output of a command is committed as one set,
 * epochs.csv and positions.geojson carry each row's frame, check's --json-lines output events carry
 * kind, bytes and SHA-256.
 */
import { createHash } from 'node:crypto';
import { readdirSync, readFileSync, writeFileSync } from 'node:fs';
import { join } from 'node:path';
import { beforeAll, describe, expect, it } from 'vitest';
import { fixturePath } from './support/shared.js';
import { expectOneSentence, parseCsv, requireBuiltCli, runCli, tempDir } from './cli-support.js';

const DEMO = (f: string) => fixturePath(`demo/${f}`);
const sha256 = (p: string) => createHash('sha256').update(readFileSync(p)).digest('hex');
const FILES = ['--reference', DEMO('KFRD-reference-5s.obs'), '--nav', DEMO('broadcast-mixed.nav')];
const MARK = ['--ref-coord', 'KFRD', '--marks', DEMO('control-marks.csv')];
const hashes = (d: string) => Object.fromEntries(readdirSync(d).sort().map((n) => [n, sha256(join(d, n))]));

beforeAll(requireBuiltCli);

describe('data problems are exit 1 with one sentence, not usage errors (finding 26)', () => {
  it('--ref-from-header on a reference file without APPROX POSITION XYZ', () => {
    const d = tempDir('rd-noapprox-');
    const ref = join(d, 'ref.obs');
    writeFileSync(ref, readFileSync(DEMO('KFRD-reference-5s.obs'), 'utf8').split('\n').filter((l) => !l.includes('APPROX POSITION XYZ')).join('\n'));
    const r = runCli(['solve', '--rover', DEMO('rover-1s.obs'), '--reference', ref, '--nav', DEMO('broadcast-mixed.nav'), '--ref-coord', 'header', '--out', join(d, 'out')]);
    expect(r.status).toBe(1);
    const s = expectOneSentence(r);
    expect(s).toMatch(/has no APPROX POSITION XYZ header record/);
    expect(s).not.toMatch(/see refdelta --help/);
  });

  it('a rover file that holds no observation epochs', () => {
    const d = tempDir('rd-noepochs-');
    const rover = join(d, 'rover.obs');
    const lines = readFileSync(DEMO('rover-1s.obs'), 'utf8').split('\n');
    const end = lines.findIndex((l) => l.includes('END OF HEADER'));
    // header only, without TIME OF LAST OBS so the span has to come from the (absent) epochs
    writeFileSync(rover, lines.slice(0, end + 1).filter((l) => !l.includes('TIME OF LAST OBS')).join('\n') + '\n');
    const r = runCli(['solve', '--rover', rover, ...FILES, ...MARK, '--out', join(d, 'out')]);
    expect(r.status).toBe(1);
    expect(expectOneSentence(r)).toMatch(/holds no readable observation epoch/);
  });
});

describe('a failed run never replaces an earlier complete output set (findings 27, 28)', () => {
  let out = '';
  let before: Record<string, string> = {};
  beforeAll(() => {
    out = tempDir('rd-keep-');
    const r = runCli(['points', '--rover', DEMO('rover-1s.obs'), ...FILES, ...MARK, '--out', out]);
    expect(r.status, r.stderr).toBe(0);
    before = hashes(out);
  });

  it('points writes solve outputs and points files as one set; summary.json lists them all with their hashes', () => {
    expect(Object.keys(before)).toEqual([
      'epochs.csv', 'epochs.csv.meta.json', 'epochs.csvt', 'epochs.prj', 'points.csv', 'points.csv.meta.json', 'points.csvt', 'points.geojson', 'points.prj',
      'positions.geojson', 'residuals.csv', 'residuals.csv.meta.json', 'residuals.csvt', 'summary.json',
    ]);
    const s = JSON.parse(readFileSync(join(out, 'summary.json'), 'utf8'));
    const listed = s.outputs.filter((o: { kind: string }) => o.kind !== 'summary');
    expect(listed.map((o: { kind: string }) => o.kind).sort()).toEqual([
      'epochs', 'epochs-csvt', 'epochs-metadata', 'epochs-prj', 'geojson', 'points', 'points-csvt', 'points-geojson', 'points-metadata', 'points-prj',
      'residuals', 'residuals-csvt', 'residuals-metadata',
    ]);
    for (const o of listed) expect(o.sha256).toBe(before[o.path.split('/').pop()]); // FIPS 180-4 via node:crypto
  });

  it('solve with no solvable epoch (90 deg mask is above every satellite) exits 1 and leaves the folder as it was', () => {
    const r = runCli(['solve', '--rover', DEMO('rover-1s.obs'), ...FILES, ...MARK, '--elevation-mask', '90', '--out', out]);
    expect(r.status).toBe(1);
    expect(r.stderr).toMatch(/refdelta: no rover epoch of .* could be solved.*nothing was written/);
    expect(hashes(out)).toEqual(before);
  });

  it('points whose window holds no epoch exits 1 and does not replace epochs.csv beside the older points.csv', () => {
    const win = join(tempDir('rd-win-'), 'w.csv');
    writeFileSync(win, 'name,start,end\nNOWHERE,2030-01-01T00:00:00Z,2030-01-01T00:10:00Z\n');
    const r = runCli(['points', '--rover', DEMO('rover-1s.obs'), ...FILES, ...MARK, '--windows', win, '--quiet', '--out', out]);
    expect(r.status).toBe(1);
    expect(expectOneSentence(r)).toMatch(/no point (found|could be computed)/);
    expect(hashes(out)).toEqual(before);
  });
});

describe('each row carries its frame (finding 29)', () => {
  it('with --fallback-standalone the standalone rows are in the broadcast frame, the differential ones in the reference frame', () => {
    const out = tempDir('rd-frames-');
    // --max-age 1 s: rover epochs between the 5 s reference epochs get no correction, hence standalone rows
    const r = runCli(['solve', '--rover', DEMO('rover-1s.obs'), ...FILES, ...MARK, '--max-age', '1', '--fallback-standalone', '--out', out]);
    expect(r.status, r.stderr).toBe(0);
    const ep = parseCsv(readFileSync(join(out, 'epochs.csv'), 'utf8'));
    const meta = JSON.parse(readFileSync(join(out, 'epochs.csv.meta.json'), 'utf8'));
    expect(meta.notes.join('\n')).toMatch(/rows of solution 'standalone' are in the frame of the broadcast orbits/);
    const kinds = new Set(ep.rows.map((x) => `${x.solution}|${x.frame}`));
    // the demo's control list gives KFRD in WGS84 at 2024.3672 (fixtures/demo/control-marks.csv)
    expect([...kinds].sort()).toEqual(['differential|WGS84', 'standalone|WGS84 (broadcast orbits)']);
    expect(ep.rows.filter((x) => x.solution === 'differential').every((x) => x.frame_epoch === '2024.3672')).toBe(true);
    const g = JSON.parse(readFileSync(join(out, 'positions.geojson'), 'utf8'));
    for (const f of g.features) expect(f.properties.frame).toBe(f.properties.solution === 'standalone' ? 'WGS84 (broadcast orbits)' : 'WGS84');
  });
});

describe('check: output events and the CSV/JSON pair (finding 30)', () => {
  it('--json-lines output events carry kind, bytes and SHA-256 of the written files', () => {
    const pts = tempDir('rd-chk-pts-');
    expect(runCli(['points', '--rover', DEMO('rover-1s.obs'), ...FILES, ...MARK, '--outputs', 'summary', '--out', pts]).status).toBe(0);
    const out = tempDir('rd-chk-');
    const r = runCli(['check', '--points', join(pts, 'points.csv'), '--marks', DEMO('control-marks.csv'), '--json-lines', '--out', out]);
    expect([0, 3]).toContain(r.status); // the demo's WELLHEAD is a deliberate blunder (control-marks.csv comment)
    const events = r.stdout.split('\n').filter(Boolean).map((l) => JSON.parse(l)).filter((e) => e.event === 'output');
    expect(events.map((e) => e.kind)).toEqual(['control-check', 'control-check-csvt', 'control-check-metadata', 'control-check-json']);
    for (const e of events) {
      expect(e.sha256).toBe(sha256(e.path)); // FIPS 180-4 via node:crypto
      expect(e.bytes).toBe(readFileSync(e.path).length);
    }
    expect(readdirSync(out).sort()).toEqual(['control-check.csv', 'control-check.csv.meta.json', 'control-check.csvt', 'control-check.json']);
  });
});
