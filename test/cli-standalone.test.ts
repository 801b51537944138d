/**
 * `refdelta solve` without --reference: single-receiver (standalone) positions, labelled as such and in
 * the frame of the broadcast orbits. On the simulated demo scenario (self-consistency: the simulator
 * shares the orbit model), against its truth file with the SPS bounds of check-values.md ("Standalone
 * GPS (SPS Performance Standard): <= 9 m horizontal, <= 15 m vertical, 95 %").
 */
import { readFileSync } from 'node:fs';
import { join } from 'node:path';
import { beforeAll, describe, expect, it } from 'vitest';
import { fixturePath } from './support/shared.js';
import { enuAt, parseCsv, requireBuiltCli, runCli, tempDir, type CliRun } from './cli-support.js';

const DEMO = (f: string) => fixturePath(`demo/${f}`);

describe('solve without --reference: standalone positions (demo scenario, simulated: self-consistency)', () => {
  let out = '';
  let run: CliRun;
  beforeAll(() => {
    requireBuiltCli();
    out = tempDir('rd-alone-');
    run = runCli(['solve', '--rover', DEMO('rover-1s.obs'), '--nav', DEMO('broadcast-mixed.nav'), '--at-antenna', '--out', out]);
  }, 120_000);

  it('exits 0 and says on the console that the positions are single-receiver, in the broadcast orbits\' frame', () => {
    expect(run.status, run.stderr).toBe(0);
    expect(run.stderr + run.stdout).toMatch(/no --reference: single-receiver \(standalone\) positions in the frame of the broadcast orbits/);
  });

  it('every row is standalone (or none) in WGS84 (broadcast orbits); the summary names the mode; positions within the SPS bounds', () => {
    const ep = parseCsv(readFileSync(join(out, 'epochs.csv'), 'utf8'));
    expect(new Set(ep.rows.map((r) => r.solution))).toEqual(new Set(['standalone']));
    expect(new Set(ep.rows.map((r) => r.frame))).toEqual(new Set(['WGS84 (broadcast orbits)']));
    const s = JSON.parse(readFileSync(join(out, 'summary.json'), 'utf8'));
    expect(s.mode).toMatch(/^standalone \(single receiver\)/);
    expect(s.reference).toBeNull();
    // No always-empty clock column: the demo rover tracks GPS and Galileo only.
    expect(ep.header.filter((c) => c.startsWith('rel_clock_'))).toEqual(['rel_clock_gps_m', 'rel_clock_galileo_m']);
    const truth = parseCsv(readFileSync(DEMO('rover-truth.csv'), 'utf8')).rows;
    const byTow = new Map(truth.map((r) => [`${r.gps_week}:${Math.round(Number(r.gps_tow_s))}`, r]));
    const h: number[] = [], v: number[] = [];
    for (const r of ep.rows) {
      const t = byTow.get(`${r.gps_week}:${Math.round(Number(r.epoch_tag_tow_s))}`);
      if (!t) continue;
      const d: [number, number, number] = [Number(r.ecef_x_m) - Number(t.x_m), Number(r.ecef_y_m) - Number(t.y_m), Number(r.ecef_z_m) - Number(t.z_m)];
      const [e, n, u] = enuAt(d, (Number(r.latitude_deg) * Math.PI) / 180, (Number(r.longitude_deg) * Math.PI) / 180);
      h.push(Math.hypot(e, n));
      v.push(Math.abs(u));
    }
    h.sort((a, b) => a - b); v.sort((a, b) => a - b);
    expect(h.length).toBeGreaterThan(1000);
    expect(h[Math.floor(0.95 * h.length)]).toBeLessThan(9);
    expect(v[Math.floor(0.95 * v.length)]).toBeLessThan(15);
  });

  it('--ref-coord without --reference is a usage error', () => {
    const r = runCli(['solve', '--rover', DEMO('rover-1s.obs'), '--nav', DEMO('broadcast-mixed.nav'), '--ref-coord', 'header', '--out', tempDir('rd-alone2-')]);
    expect(r.status).toBe(2);
    expect(r.stderr).toMatch(/--ref-coord gives the coordinate of a reference receiver/);
  });
});
