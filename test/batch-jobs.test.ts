/**
 * `refdelta batch --jobs N` on a folder of demo sessions (fixtures/demo, simulated; self-consistency):
 * sessions run on worker threads give the same files, byte for byte, and the same messages in the same
 * order as a serial run (--jobs 1); only the creation times in the summaries and the output folder
 * names differ. A broken session fails the same way in both.
 */
import { copyFileSync, readdirSync, readFileSync, statSync, writeFileSync } from 'node:fs';
import { join, relative } from 'node:path';
import { gzipSync } from 'node:zlib';
import { beforeAll, describe, expect, it } from 'vitest';
import { fixturePath } from './support/shared.js';
import { requireBuiltCli, runCli, tempDir, type CliRun } from './cli-support.js';

const DEMO = (f: string) => fixturePath(`demo/${f}`);

function filesOf(dir: string): string[] {
  return readdirSync(dir).flatMap((n) => (statSync(join(dir, n)).isDirectory() ? filesOf(join(dir, n)) : [join(dir, n)])).sort();
}

/** A file's text with the run's own folder and creation time taken out. */
function comparable(path: string, out: string): string {
  return readFileSync(path, 'utf8').replaceAll(out, 'OUT').replace(/"created_utc": "[^"]*"/g, '"created_utc": ""');
}

describe('refdelta batch --jobs: worker threads give the bytes and messages of a serial run', () => {
  let dir = '';
  const runs: { jobs: number; out: string; run: CliRun }[] = [];
  beforeAll(() => {
    requireBuiltCli();
    dir = tempDir('rd-jobs-in-');
    copyFileSync(DEMO('rover-1s.obs'), join(dir, 'walk-a.obs'));
    writeFileSync(join(dir, 'walk-b.obs.gz'), gzipSync(readFileSync(DEMO('rover-1s.obs'))));
    writeFileSync(join(dir, 'broken.24o'), 'this is not RINEX at all\n'.repeat(20));
    copyFileSync(DEMO('rover-1s.obs'), join(dir, 'walk-c.obs'));
    for (const jobs of [1, 2, 3]) {
      const out = tempDir(`rd-jobs-${jobs}-`);
      const run = runCli(['batch', '--sessions', dir, '--reference', DEMO('KFRD-reference-5s.obs'), '--nav', DEMO('broadcast-mixed.nav'),
        '--ref-coord', 'KFRD', '--marks', DEMO('control-marks.csv'), '--jobs', String(jobs), '--out', out]);
      runs.push({ jobs, out, run });
    }
  }, 300_000);

  it('same exit code, stdout and stderr (in the same order)', () => {
    const [serial, ...parallel] = runs;
    expect(serial.run.status, serial.run.stderr).toBe(4);
    for (const p of parallel) {
      expect(p.run.status, `--jobs ${p.jobs}`).toBe(serial.run.status);
      expect(p.run.stdout).toBe(serial.run.stdout);
      expect(p.run.stderr.replaceAll(p.out, 'OUT')).toBe(serial.run.stderr.replaceAll(serial.out, 'OUT'));
    }
  });

  it('the same files with the same bytes', () => {
    const [serial, ...parallel] = runs;
    const names = filesOf(serial.out).map((f) => relative(serial.out, f));
    expect(names).toContain('walk-c/epochs.csv');
    for (const p of parallel) {
      expect(filesOf(p.out).map((f) => relative(p.out, f))).toEqual(names);
      for (const n of names) {
        if (n.endsWith('.json')) expect(comparable(join(p.out, n), p.out), n).toBe(comparable(join(serial.out, n), serial.out));
        else expect(readFileSync(join(p.out, n)).equals(readFileSync(join(serial.out, n))), n).toBe(true);
      }
    }
  });

  it('--jobs 0 is a usage error', () => {
    const r = runCli(['batch', '--sessions', dir, '--reference', DEMO('KFRD-reference-5s.obs'), '--nav', DEMO('broadcast-mixed.nav'),
      '--ref-coord', 'KFRD', '--marks', DEMO('control-marks.csv'), '--jobs', '0', '--out', tempDir('rd-jobs-bad-')]);
    expect(r.status).toBe(2);
    expect(r.stderr).toMatch(/--jobs must be a whole number from 1 to 256, got '0'/);
  });
});
