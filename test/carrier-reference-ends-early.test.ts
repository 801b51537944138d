/**
 * A reference file that ends before the rover's (the last hourly file left out): rover epochs past the
 * reference's last epoch get no reference values carried from it (the backward pass started on them and
 * held a fix 5 m off), and a float epoch's precision covers any disagreement of the passes. Simulated demo (fixtures/demo, self-consistency: truth from
 * the simulator), its reference cut at 09:45 while the rover runs to 09:56.
 */
import { readFileSync, writeFileSync } from 'node:fs';
import { join } from 'node:path';
import { beforeAll, describe, expect, it } from 'vitest';
import { fixturePath } from './support/shared.js';
import { parseCsv, requireBuiltCli, runCli, tempDir, type CliRun } from './cli-support.js';

const DEMO = (f: string) => fixturePath(`demo/${f}`);

/** The demo reference's text with every epoch from `cut` (an epoch record's time text) on removed. */
function referenceCutAt(cut: string): string {
  const text = readFileSync(DEMO('KFRD-reference-5s.obs'), 'latin1');
  const at = text.indexOf(`> ${cut}`);
  if (at < 0) throw new Error(`no epoch ${cut} in the demo reference`);
  return text.slice(0, at);
}

describe('simulator + carrier-phase engine (self-consistency): a reference file ending 11 minutes before the rover\'s', () => {
  let out = '';
  let run: CliRun;
  beforeAll(() => {
    requireBuiltCli();
    const dir = tempDir('rd-ref-early-');
    const ref = join(dir, 'KFRD-first-15-min.obs');
    writeFileSync(ref, referenceCutAt('2024 05 14 09 45 00.0000000'), 'latin1');
    out = join(dir, 'out');
    run = runCli(['solve', '--rover', DEMO('rover-1s.obs'), '--reference', ref, '--nav', DEMO('broadcast-mixed.nav'),
      '--ref-coord', 'KFRD', '--marks', DEMO('control-marks.csv'), '--at-antenna', '--out', out]);
  }, 120_000);

  it('the rover epochs the reference covers are fixed at the truth (none wrong); none after its last epoch is solved; no float epoch further from the truth than 3 times its stated 3-D sigma', () => {
    expect(run.status, run.stderr).toBe(0);
    const truth = new Map<string, number[]>();
    for (const r of parseCsv(readFileSync(DEMO('rover-truth.csv'), 'utf8')).rows) truth.set(Number(r.gps_tow_s).toFixed(1), [Number(r.x_m), Number(r.y_m), Number(r.z_m)]);
    const rows = parseCsv(readFileSync(join(out, 'epochs.csv'), 'utf8')).rows;
    const errorOf = (r: Record<string, string>) => {
      const t = truth.get(Number(r.gps_tow_s).toFixed(1))!;
      return Math.hypot(Number(r.ecef_x_m) - t[0], Number(r.ecef_y_m) - t[1], Number(r.ecef_z_m) - t[2]);
    };
    // The reference's last epoch: 2024-05-14 09:44:55 GPST, Tuesday: GPS time of week 2 * 86400 + 35095 s.
    const lastReferenceTowS = 2 * 86400 + 9 * 3600 + 44 * 60 + 55;
    const covered = rows.filter((r) => Number(r.gps_tow_s) <= lastReferenceTowS + 0.5);
    const fixed = covered.filter((r) => r.solution === 'fixed');
    expect(fixed.length).toBeGreaterThanOrEqual(0.95 * covered.length);
    expect(fixed.filter((r) => errorOf(r) > 0.05)).toEqual([]);
    // one logging interval (5 s) past it is still given the last epoch's values
    const after = rows.filter((r) => Number(r.gps_tow_s) > lastReferenceTowS + 5.5);
    expect(after.length).toBeGreaterThan(600);
    expect(after.every((r) => r.solution === 'none' && r.reason === "after the reference's last epoch")).toBe(true);
    for (const r of rows.filter((x) => x.solution === 'float')) {
      expect(errorOf(r), r.gps_tow_s).toBeLessThanOrEqual(3 * Math.hypot(Number(r.sigma_east_m), Number(r.sigma_north_m), Number(r.sigma_up_m)));
      if (r.reason === 'forward and backward fixes disagree') expect(r.ratio).toBe('');
    }
  });
});
