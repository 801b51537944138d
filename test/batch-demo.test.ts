/**
 * `refdelta batch` on a folder made from the bundled demo (fixtures/demo, simulated): the demo rover as
 * plain RINEX, the same file gzipped (RFC 1952 via node:zlib), a garbage file named like an
 * observation file, and the navigation file. Two sessions must come out ok with the demo's four
 * points each (the rover file's event flags, fixtures/demo/README), the garbage one failed with a
 * sentence naming it, the navigation file skipped with a note; exit code 4 (README exit codes).
 */
import { createHash } from 'node:crypto';
import { copyFileSync, existsSync, mkdirSync, readdirSync, readFileSync, writeFileSync } from 'node:fs';
import { join } from 'node:path';
import { gzipSync } from 'node:zlib';
import { beforeAll, describe, expect, it } from 'vitest';
import { fixturePath } from './support/shared.js';
import { parseCsv, requireBuiltCli, runCli, tempDir, type CliRun } from './cli-support.js';

const DEMO = (f: string) => fixturePath(`demo/${f}`);
const sha256 = (p: string) => createHash('sha256').update(readFileSync(p)).digest('hex');
const NAMES = ['MILLSTONE', 'FERRYPOST', 'ELMCORNER', 'WELLHEAD'];

describe('refdelta batch on a folder of demo sessions', () => {
  let dir = '';
  let out = '';
  let run: CliRun;
  beforeAll(() => {
    requireBuiltCli();
    dir = tempDir('rd-batch-in-');
    copyFileSync(DEMO('rover-1s.obs'), join(dir, 'walk-a.obs'));
    writeFileSync(join(dir, 'walk-b.obs.gz'), gzipSync(readFileSync(DEMO('rover-1s.obs'))));
    writeFileSync(join(dir, 'broken.24o'), 'this is not RINEX at all\n'.repeat(20));
    copyFileSync(DEMO('broadcast-mixed.nav'), join(dir, 'broadcast-mixed.nav'));
    out = tempDir('rd-batch-out-');
    run = runCli(['batch', '--sessions', dir, '--reference', DEMO('KFRD-reference-5s.obs'), '--nav', DEMO('broadcast-mixed.nav'),
      '--ref-coord', 'KFRD', '--marks', DEMO('control-marks.csv'), '--outputs', 'epochs,summary', '--out', out]);
  });

  it('exit 4: two sessions ok, the garbage file failed with one sentence naming it, the nav file skipped with a note', () => {
    expect(run.status, run.stderr).toBe(4);
    const failures = run.stderr.split('\n').filter((l) => l.startsWith('refdelta: session'));
    expect(failures).toHaveLength(1);
    expect(failures[0]).toMatch(/session broken failed and was skipped: .*broken\.24o.*not a RINEX file/);
    expect(run.stderr).toMatch(/note: skipping .*broadcast-mixed\.nav: a navigation file/);
    expect(run.stderr).toMatch(/refdelta: 1 of 3 session\(s\) failed: broken/);
    // the table on stdout: session, epochs, solved %, points, status
    const table = run.stdout.trim().split('\n');
    expect(table[0]).toMatch(/^session\s+epochs\s+solved %\s+points\s+status$/);
    expect(table.slice(1).map((l) => l.split(/\s+/).slice(0, 5).join(' '))).toEqual([
      'broken - - 0 failed:', 'walk-a 1387 100.0 4 ok', 'walk-b 1387 100.0 4 ok',
    ]);
  });

  it('each ok session has its own complete output set; the failed one has none', () => {
    expect(readdirSync(out).sort()).toEqual(['batch-points.csv', 'batch-points.csv.meta.json', 'batch-points.csvt', 'batch-points.prj', 'batch-summary.json', 'walk-a', 'walk-b']);
    // Both sessions' points.prj are the same (their frame's geographic CRS): the batch table states it too.
    expect(readFileSync(join(out, 'batch-points.prj'), 'utf8')).toBe(readFileSync(join(out, 'walk-a', 'points.prj'), 'utf8'));
    for (const s of ['walk-a', 'walk-b']) {
      expect(readdirSync(join(out, s)).sort()).toEqual(['epochs.csv', 'epochs.csv.meta.json', 'epochs.csvt', 'epochs.prj', 'points.csv', 'points.csv.meta.json', 'points.csvt', 'points.geojson', 'points.prj', 'summary.json']);
      const sum = JSON.parse(readFileSync(join(out, s, 'summary.json'), 'utf8'));
      for (const o of sum.outputs.filter((x: { kind: string }) => x.kind !== 'summary')) expect(o.sha256).toBe(sha256(o.path));
    }
    // the plain and the gzipped copy hold the same data: the same points
    expect(readFileSync(join(out, 'walk-a', 'points.csv'), 'utf8')).toBe(readFileSync(join(out, 'walk-b', 'points.csv'), 'utf8'));
  });

  it('batch-points.csv holds the demo points twice, with the session name; batch-summary.json lists every session and the skipped file', () => {
    const t = parseCsv(readFileSync(join(out, 'batch-points.csv'), 'utf8'));
    expect(t.header[0]).toBe('session');
    expect(t.rows.map((r) => `${r.session}:${r.name}`)).toEqual([...NAMES.map((n) => `walk-a:${n}`), ...NAMES.map((n) => `walk-b:${n}`)]);
    expect(t.rows.every((r) => r.frame === 'WGS84')).toBe(true);
    const s = JSON.parse(readFileSync(join(out, 'batch-summary.json'), 'utf8'));
    expect(s.counts).toEqual({ sessions: 3, ok: 2, incomplete_input: 0, failed: 1, skipped_files: 1, points: 8 });
    expect(s.sessions.map((x: { name: string; status: string }) => `${x.name}:${x.status}`)).toEqual(['broken:failed', 'walk-a:ok', 'walk-b:ok']);
    expect(s.sessions[0].reason).toMatch(/broken\.24o/);
    expect(s.skipped_files[0].file).toMatch(/broadcast-mixed\.nav$/);
    expect(s.outputs[0].sha256).toBe(sha256(join(out, 'batch-points.csv')));
  });

  it('a batch where no session can be processed exits 1 and writes nothing', () => {
    const only = tempDir('rd-batch-bad-');
    writeFileSync(join(only, 'broken.obs'), 'garbage\n');
    const o = join(tempDir('rd-batch-bad-out-'), 'out');
    const r = runCli(['batch', '--sessions', only, '--reference', DEMO('KFRD-reference-5s.obs'), '--nav', DEMO('broadcast-mixed.nav'),
      '--ref-coord', 'KFRD', '--marks', DEMO('control-marks.csv'), '--out', o]);
    expect(r.status).toBe(1);
    expect(r.stderr).toMatch(/refdelta: none of the 1 session\(s\) .* could be processed; nothing was written/);
    expect(existsSync(join(o, 'batch-summary.json'))).toBe(false);
  });

  it('usage: --reference and --reference-dir together is exit 2', () => {
    mkdirSync(join(dir, 'refs'), { recursive: true });
    const r = runCli(['batch', '--sessions', dir, '--reference', DEMO('KFRD-reference-5s.obs'), '--reference-dir', join(dir, 'refs'),
      '--nav', DEMO('broadcast-mixed.nav'), '--ref-coord', 'header', '--out', out]);
    expect(r.status).toBe(2);
    expect(r.stderr).toMatch(/one way only/);
  });
});
