/**
 * `refdelta solve` with carrier phase (the default when both receivers recorded phase) on the real static
 * run (data README, cors-and-rover-2018-277/static-run), positions at the antenna; truth: rover-truth.csv
 * rows of fix_quality 4 (the rover's real-time carrier-phase fixed solution relative to the base header
 * coordinate). The engine's own acceptance figures are in carrier-static-run.test.ts; this checks the CLI's
 * outputs: solution kinds, the carrier columns at the end of epochs.csv, the pass shares in summary.json.
 */
import { readFileSync } from 'node:fs';
import { join } from 'node:path';
import { beforeAll, expect, it } from 'vitest';
import { dataPath, describeShared } from './support/shared.js';
import { enuAt, nearestRank, parseCsv, requireBuiltCli, runCli, tempDir, type CliRun } from './cli-support.js';

const D = 'cors-and-rover-2018-277';

describeShared('refdelta solve with carrier phase on the real static run', () => {
  let out = '';
  let run: CliRun;
  beforeAll(() => {
    requireBuiltCli();
    out = tempDir('rd-carrier-');
    run = runCli([
      'solve', '--rover', dataPath(`${D}/static-run/rover.obs`), '--reference', dataPath(`${D}/static-run/base.obs`),
      '--nav', dataPath(`${D}/reference/glw1277m.18n`), dataPath(`${D}/reference/glw1277m.18g`),
      '--ref-coord', '3774089.2120,-601661.6157,5089321.2474', '--ref-frame', 'WGS84', '--ref-epoch', '2018.76', '--at-antenna',
      '--out', out,
    ]);
  });

  it('exits 0 and says how many epochs were fixed in each pass', () => {
    expect(run.status, run.stderr).toBe(0);
    expect(run.stdout + run.stderr).toMatch(/carrier phase: \d+ epochs fixed .* forward pass alone/);
  });

  it('epochs.csv: ratio, fixed_ambiguities and ambiguities_held are the last columns; fixed rows within centimetres of the truth', () => {
    const ep = parseCsv(readFileSync(join(out, 'epochs.csv'), 'utf8'));
    expect(ep.header.slice(-3)).toEqual(['ratio', 'fixed_ambiguities', 'ambiguities_held']);
    const truth = parseCsv(readFileSync(dataPath(`${D}/static-run/rover-truth.csv`), 'utf8')).rows.filter((r) => r.fix_quality === '4');
    const byTow = new Map(truth.map((r) => [Math.round(Number(r.gps_tow_s)), r]));
    const h: number[] = [];
    let fixed = 0;
    for (const r of ep.rows) {
      if (r.solution !== 'fixed') continue;
      fixed++;
      expect(Number(r.fixed_ambiguities)).toBeGreaterThanOrEqual(5);
      const t = byTow.get(Math.round(Number(r.gps_tow_s)));
      if (!t) continue;
      const lat = (Number(r.latitude_deg) * Math.PI) / 180, lon = (Number(r.longitude_deg) * Math.PI) / 180;
      const [e, n] = enuAt([Number(r.ecef_x_m) - Number(t.ecef_x_m), Number(r.ecef_y_m) - Number(t.ecef_y_m), Number(r.ecef_z_m) - Number(t.ecef_z_m)], lat, lon);
      h.push(Math.hypot(e, n));
    }
    expect(fixed / ep.rows.length).toBeGreaterThanOrEqual(0.95);
    expect(nearestRank(h, 0.95)).toBeLessThanOrEqual(0.03);
  });

  it('epochs.csv: filtering on ratio >= 3 (the default threshold) keeps every fixed epoch; held fixes are 10000 and flagged', () => {
    const rows = parseCsv(readFileSync(join(out, 'epochs.csv'), 'utf8')).rows;
    const fixed = rows.filter((r) => r.solution === 'fixed');
    expect(fixed.filter((r) => r.ratio !== '' && Number(r.ratio) >= 3).length).toBe(fixed.length);
    const held = rows.filter((r) => r.ambiguities_held === '1');
    // Most epochs after the first fix rest on the held ambiguities (fix-and-hold).
    expect(held.length).toBeGreaterThan(fixed.length / 2);
    expect(held.every((r) => r.ratio === '10000.00')).toBe(true);
    // Held ambiguities describe fixed epochs only, and no float epoch passes a filter on the ratio.
    expect(held.every((r) => r.solution === 'fixed')).toBe(true);
    expect(rows.filter((r) => r.solution === 'float' && r.ratio !== '' && Number(r.ratio) >= 3)).toEqual([]);
    expect(rows.every((r) => r.ambiguities_held === '0' || r.ambiguities_held === '1')).toBe(true);
  });

  it('epochs.csv: every solved carrier row has the filter\'s innovation test (variance_factor, chi_square, chi_square_critical)', () => {
    const ep = parseCsv(readFileSync(join(out, 'epochs.csv'), 'utf8'));
    const factors: number[] = [];
    let failed = 0;
    for (const r of ep.rows) {
      if (r.solution === 'none') { expect(r.chi_square).toBe(''); continue; }
      const vf = Number(r.variance_factor), chi = Number(r.chi_square), crit = Number(r.chi_square_critical);
      expect(r.chi_square_critical, r.gps_tow_s).not.toBe('');
      expect(chi).toBeGreaterThanOrEqual(0);
      expect(crit).toBeGreaterThan(0);
      factors.push(vf);
      if (chi > crit) failed++;
    }
    // The phase variance of the filter (3 mm + 3 mm / sin el per receiver, options.ts) is larger than these
    // receivers' scatter at the epochs close to a reference epoch; the factor grows with the correction age
    // (the reference's phase carried to the rover's epoch over up to 12 s of the base's irregular epochs).
    console.log(`carrier innovation test: ${factors.length} epochs, variance factor median ${nearestRank(factors, 0.5).toFixed(3)}, 95 % ${nearestRank(factors, 0.95).toFixed(3)}; ${failed} beyond the critical value`);
    expect(factors.length).toBe(ep.rows.filter((r) => r.solution !== 'none').length);
    expect(nearestRank(factors, 0.5)).toBeGreaterThan(0.1);
    expect(nearestRank(factors, 0.5)).toBeLessThan(1);
    expect(failed).toBeLessThan(0.1 * factors.length);
  });

  it('summary.json gives the fix shares of the forward, backward and combined passes', () => {
    const s = JSON.parse(readFileSync(join(out, 'summary.json'), 'utf8'));
    const p = s.carrier_phase.passes;
    for (const k of ['forward', 'backward', 'combined']) expect(p[k].fixed + p[k].float + p[k].none).toBe(s.counts.rover_epochs);
    expect(p.combined.fixed_share).toBeGreaterThanOrEqual(0.95);
    expect(s.carrier_phase.options.ratio_threshold).toBe(3);
    expect(s.carrier_phase.options.frequencies).toBe('all');
  });

  it('residuals.csv covers the carrier epochs: per satellite the L1C phase residual at the solution (code C1C where no phase), millimetres on fixed epochs; the metadata says so', () => {
    const ep = parseCsv(readFileSync(join(out, 'epochs.csv'), 'utf8'));
    const kindAt = new Map(ep.rows.map((r) => [r.gps_tow_s, r.solution]));
    const res = parseCsv(readFileSync(join(out, 'residuals.csv'), 'utf8'));
    const phase: number[] = [];
    let code = 0, emptyUsed = 0;
    for (const r of res.rows) {
      if (kindAt.get(r.gps_tow_s) !== 'fixed' || r.status !== 'used') continue;
      if (r.residual_m === '') { emptyUsed++; continue; }
      if (r.signal === 'L1C') phase.push(Math.abs(Number(r.residual_m)));
      else if (r.signal === 'C1C') code++;
      expect(Number(r.weight_per_m2)).toBeGreaterThan(0);
    }
    // Per-receiver phase noise of the filter's model: 3 mm + 3 mm / sin(el) (options.ts, common practice);
    // a single difference at 30 deg: about 1 cm (1 sigma), so 95 % within 2.5 cm.
    console.log(`residuals.csv, fixed epochs: ${phase.length} L1C rows, |residual| median ${(1000 * nearestRank(phase, 0.5)).toFixed(1)} mm, 95 % ${(1000 * nearestRank(phase, 0.95)).toFixed(1)} mm; ${code} C1C rows; ${emptyUsed} used rows without a residual`);
    expect(phase.length).toBeGreaterThan(10_000);
    expect(emptyUsed).toBe(0);
    expect(nearestRank(phase, 0.5)).toBeLessThanOrEqual(0.006);
    expect(nearestRank(phase, 0.95)).toBeLessThanOrEqual(0.025);
    const meta = readFileSync(join(out, 'residuals.csv.meta.json'), 'utf8');
    expect(meta).toMatch(/carrier-phase epochs/);
  });
});
