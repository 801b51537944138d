/**
 * Why carrier-phase epochs are float or unsolved, and which satellites were left out, on the real static
 * run's rover against the CORS (data README, cors-and-rover-2018-277: static-run/rover.obs against
 * reference/glw1277m.18o, its header coordinate), checked against the run's own residuals.csv: every
 * float or unsolved row says why, the summary's rejected satellites are the residual rows left out, and an
 * unsolved epoch's satellite counts are those of its residual rows.
 */
import { readFileSync } from 'node:fs';
import { join } from 'node:path';
import { beforeAll, expect, it } from 'vitest';
import { dataPath, describeShared } from './support/shared.js';
import { parseCsv, requireBuiltCli, runCli, tempDir } from './cli-support.js';

const D = 'cors-and-rover-2018-277';

interface RunFiles {
  epochs: Record<string, string>[];
  residuals: Record<string, string>[];
  summary: {
    rejected_satellites: { reason: string; count: number }[];
    rejected_epochs: { reason: string; count: number }[];
    notes: string[];
    carrier_phase?: { options: { min_fixed_ambiguities: number; ratio_threshold: number } };
  };
}

function solveAgainstCors(extra: readonly string[]): RunFiles {
  const out = tempDir('rd-carrier-reasons-');
  const run = runCli([
    'solve', '--rover', dataPath(`${D}/static-run/rover.obs`), '--reference', dataPath(`${D}/reference/glw1277m.18o`),
    '--nav', dataPath(`${D}/reference/glw1277m.18n`), dataPath(`${D}/reference/glw1277m.18g`), '--ref-coord', 'header', ...extra, '--out', out, '--quiet',
  ]);
  expect(run.status, run.stderr).toBe(0);
  return {
    epochs: parseCsv(readFileSync(join(out, 'epochs.csv'), 'utf8')).rows,
    residuals: parseCsv(readFileSync(join(out, 'residuals.csv'), 'utf8')).rows,
    summary: JSON.parse(readFileSync(join(out, 'summary.json'), 'utf8')),
  };
}

/** The residual rows left out, per reason without its bracketed numbers (as the summary counts them; '' is a satellite of an unsolved epoch). */
function rejectedRowsByReason(rows: readonly Record<string, string>[]): Map<string, number> {
  const m = new Map<string, number>();
  for (const r of rows) {
    if (r.status !== 'rejected') continue;
    const key = r.reason.replace(/\s*\(.*\)\s*$/, '');
    m.set(key, (m.get(key) ?? 0) + 1);
  }
  return m;
}

describeShared('carrier phase on the real static run against the CORS: reasons of float and unsolved epochs, rejected satellites', () => {
  let mask10: RunFiles;
  let mask55: RunFiles;
  beforeAll(() => {
    requireBuiltCli();
    mask10 = solveAgainstCors([]);
    mask55 = solveAgainstCors(['--elevation-mask', '55']);
  }, 300_000);

  it('summary rejected_satellites: the mask rejections are the residual rows below the mask, and every rejected row is counted', () => {
    for (const run of [mask10, mask55]) {
      const rows = rejectedRowsByReason(run.residuals);
      const listed = new Map(run.summary.rejected_satellites.map((r) => [r.reason, r.count]));
      expect(rows.get('below elevation mask')).toBeGreaterThan(1000);
      expect(listed.get('below elevation mask')).toBe(rows.get('below elevation mask'));
      // Satellites of unsolved epochs ('no solution', as the code engine says): their rows carry an empty
      // reason, or the code-only one of a satellite without phase.
      const unsolved = (rows.get('') ?? 0) + (rows.get('no phase at both receivers') ?? 0);
      expect(listed.get('no solution') ?? 0).toBe(unsolved);
      const total = [...rows.values()].reduce((a, b) => a + b, 0);
      expect(run.summary.rejected_satellites.reduce((a, r) => a + r.count, 0)).toBe(total);
    }
  });

  it('summary rejected_satellites has the shape of a code-only run\'s (reason, count), most frequent first', () => {
    const list = mask55.summary.rejected_satellites;
    for (const r of list) expect(Object.keys(r).sort()).toEqual(['count', 'reason']);
    expect(list.map((r) => r.count)).toEqual([...list.map((r) => r.count)].sort((a, b) => b - a));
  });

  it('no float or unsolved row without a reason; fixed rows have none', () => {
    for (const run of [mask10, mask55]) {
      for (const r of run.epochs) {
        if (r.solution === 'fixed') expect(r.reason).toBe('');
        else expect(r.reason, `${r.gps_tow_s} ${r.solution}`).not.toBe('');
      }
    }
    expect(mask10.epochs.filter((r) => r.solution === 'float').length).toBeGreaterThan(0);
  });

  it('float rows name their cause with its numbers; the filter note counts each pass\'s disturbed epochs and the float ones of the result', () => {
    const min = mask55.summary.carrier_phase?.options.min_fixed_ambiguities ?? 5;
    for (const r of mask55.epochs.filter((x) => x.solution === 'float')) {
      const m = /too few ambiguities to fix in both passes \((\d+), need (\d+)\)/.exec(r.reason);
      expect(m, r.reason).not.toBeNull();
      expect(Number(m![1])).toBeLessThan(min);
      expect(Number(m![2])).toBe(min);
    }
    const note = mask10.summary.notes.find((n) => n.startsWith('filter:'))!;
    const m = /at (\d+) epochs of the forward pass and (\d+) of the backward pass; (\d+) epochs of the result are float where a pass was disturbed/.exec(note);
    expect(m, note).not.toBeNull();
    const disturbedFloat = mask10.epochs.filter((r) => r.solution === 'float' && r.reason.includes('tracking disturbed')).length;
    expect(Number(m![3])).toBe(disturbedFloat);
    expect(disturbedFloat).toBeLessThanOrEqual(mask10.epochs.filter((r) => r.solution === 'float').length);
    for (const r of mask10.epochs.filter((x) => x.reason.includes('tracking disturbed'))) {
      const t = /\((\d+) arc starts and ends, more than half of the (\d+) arcs\)/.exec(r.reason);
      expect(t, r.reason).not.toBeNull();
      expect(Number(t![1])).toBeGreaterThan(Number(t![2]) / 2);
    }
  });

  it('with a 55 deg mask, unsolved rows say the mask caused it, with the counts of their residual rows', () => {
    const bySecond = new Map<string, Record<string, string>[]>();
    for (const r of mask55.residuals) {
      const l = bySecond.get(r.gps_tow_s);
      if (l) l.push(r); else bySecond.set(r.gps_tow_s, [r]);
    }
    const none = mask55.epochs.filter((r) => r.solution === 'none');
    expect(none.length).toBeGreaterThan(1000);
    for (const r of none) {
      const m = /^too few satellites above the elevation mask \((\d+) usable above 55 deg, need (\d+); (\d+) below it\)$/.exec(r.reason);
      expect(m, r.reason).not.toBeNull();
      const [usable, needed, below] = [Number(m![1]), Number(m![2]), Number(m![3])];
      expect(usable).toBeLessThan(needed);
      // Needed: position, one clock per constellation, and one more (GPS and GLONASS: 6).
      expect(needed).toBeLessThanOrEqual(6);
      const rows = bySecond.get(r.gps_tow_s) ?? [];
      expect(new Set(rows.filter((x) => x.reason.startsWith('below elevation mask')).map((x) => x.satellite)).size).toBe(below);
      expect(usable).toBeLessThanOrEqual(new Set(rows.filter((x) => Number(x.elevation_deg) >= 54.995).map((x) => x.satellite)).size);
      expect(usable + below).toBeGreaterThanOrEqual(needed);
    }
    expect(mask55.summary.rejected_epochs).toEqual([{ reason: 'too few satellites above the elevation mask', count: none.length }]);
  });
});
