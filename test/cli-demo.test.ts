/**
 * `refdelta solve` on the bundled demo scenario (fixtures/demo, described by its README): the outputs'
 * columns, the positions against the demo truth, GeoJSON structure (RFC 7946) and the summary's hashes.
 */
import { createHash } from 'node:crypto';
import { existsSync, readFileSync } from 'node:fs';
import { join } from 'node:path';
import { beforeAll, describe, expect, it } from 'vitest';
import { fixturePath } from './support/shared.js';
import { enuAt, median, nearestRank, parseCsv, requireBuiltCli, runCli, tempDir, type CliRun } from './cli-support.js';

const DEMO = (f: string) => fixturePath(`demo/${f}`);
const sha256 = (p: string) => createHash('sha256').update(readFileSync(p)).digest('hex');

describe('refdelta solve on the demo scenario', () => {
  let out = '';
  let run: CliRun;
  beforeAll(() => {
    requireBuiltCli();
    if (!existsSync(DEMO('rover-1s.obs'))) throw new Error('fixtures/demo/ is missing: the demo scenario files are part of the repository');
    out = tempDir('rd-demo-');
    run = runCli([
      'solve', '--carrier-phase', 'off', '--rover', DEMO('rover-1s.obs'), '--reference', DEMO('KFRD-reference-5s.obs'), '--nav', DEMO('broadcast-mixed.nav'),
      '--ref-coord', 'KFRD', '--marks', DEMO('control-marks.csv'), '--at-antenna', '--out', out, '--json-lines',
    ]);
  });

  it('exits 0; --json-lines gives one JSON object per line with start, output and done events', () => {
    expect(run.status, run.stderr).toBe(0);
    const events = run.stdout.split('\n').filter(Boolean).map((l) => JSON.parse(l));
    const kinds = events.map((e) => e.event);
    expect(kinds[0]).toBe('start');
    expect(kinds).toContain('output');
    expect(kinds[kinds.length - 1]).toBe('done');
  });

  it('epochs.csv: columns present, positions within bounds of the truth', () => {
    const ep = parseCsv(readFileSync(join(out, 'epochs.csv'), 'utf8'));
    for (const c of ['gps_week', 'gps_tow_s', 'utc_time', 'point', 'solution', 'latitude_deg', 'longitude_deg', 'height_m', 'ecef_x_m', 'ecef_y_m', 'ecef_z_m',
      'baseline_east_m', 'baseline_north_m', 'baseline_up_m', 'baseline_length_m', 'rel_clock_gps_m', 'satellites_used', 'pdop', 'hdop', 'vdop',
      'sigma_east_m', 'sigma_north_m', 'sigma_up_m', 'variance_factor', 'chi_square', 'chi_square_critical', 'correction_age_s', 'speed_m_s', 'antenna_height_m', 'reason']) {
      expect(ep.header).toContain(c);
    }
    // The demo truth is the antenna reference point (fixtures/demo/rover-truth.csv comment); --at-antenna reports the ARP.
    // The header is the first line; what the table is about is in its metadata sidecar.
    expect(ep.comments).toEqual([]);
    const meta = JSON.parse(readFileSync(join(out, 'epochs.csv.meta.json'), 'utf8'));
    expect(meta.point_reference).toBe('antenna reference point');
    expect(meta.columns.map((c: { name: string }) => c.name)).toEqual(ep.header);
    const truth = parseCsv(readFileSync(DEMO('rover-truth.csv'), 'utf8')).rows;
    const byTow = new Map(truth.map((r) => [`${r.gps_week}:${Math.round(Number(r.gps_tow_s))}`, r]));
    const h: number[] = [];
    const v: number[] = [];
    for (const r of ep.rows) {
      if (r.solution !== 'differential' && r.solution !== 'smoothed') continue;
      const t = byTow.get(`${r.gps_week}:${Math.round(Number(r.epoch_tag_tow_s))}`);
      if (!t) continue;
      const [e, n, u] = enuAt([Number(r.ecef_x_m) - Number(t.x_m), Number(r.ecef_y_m) - Number(t.y_m), Number(r.ecef_z_m) - Number(t.z_m)],
        (Number(r.latitude_deg) * Math.PI) / 180, (Number(r.longitude_deg) * Math.PI) / 180);
      h.push(Math.hypot(e, n));
      v.push(Math.abs(u));
    }
    expect(h.length).toBeGreaterThan(0.8 * ep.rows.length);
    // check-values.md "Code differential: about 1 m (1 sigma) within a few tens of km" (the demo baseline is ~1.5 km).
    expect(median(h)).toBeLessThan(1.0);
    expect(nearestRank(h, 0.95)).toBeLessThan(2.5);
    expect(median(v)).toBeLessThan(1.5);
  });

  it('residuals.csv: long form with status words', () => {
    const rs = parseCsv(readFileSync(join(out, 'residuals.csv'), 'utf8'));
    expect(rs.header).toEqual(['gps_week', 'gps_tow_s', 'satellite', 'signal', 'elevation_deg', 'azimuth_deg', 'residual_m', 'weight_per_m2', 'w_test', 'status', 'reason']);
    expect(rs.rows.length).toBeGreaterThan(0);
    expect(rs.rows.every((r) => r.status === 'used' || r.status === 'rejected')).toBe(true);
    expect(rs.rows.every((r) => r.status === 'used' || r.reason !== '')).toBe(true);
  });

  it('positions.geojson: RFC 7946 FeatureCollection of Points [lon, lat, h] with the frame stated', () => {
    const g = JSON.parse(readFileSync(join(out, 'positions.geojson'), 'utf8'));
    expect(g.type).toBe('FeatureCollection'); // RFC 7946 3.3
    expect(Array.isArray(g.features)).toBe(true);
    expect(g.features.length).toBeGreaterThan(0);
    for (const f of g.features) {
      expect(f.type).toBe('Feature'); // RFC 7946 3.2
      expect(f.geometry.type).toBe('Point'); // RFC 7946 3.1.2
      const [lon, lat, hM] = f.geometry.coordinates; // RFC 7946 3.1.1: longitude, latitude, altitude
      expect(lon).toBeGreaterThanOrEqual(-180);
      expect(lon).toBeLessThanOrEqual(180);
      expect(lat).toBeGreaterThanOrEqual(-90);
      expect(lat).toBeLessThanOrEqual(90);
      expect(Number.isFinite(hM)).toBe(true);
    }
    // fixtures/demo control-marks.csv: KFRD 47.123456 N, 8.765432 E; the points lie ~1.5 km away.
    expect(g.features[0].geometry.coordinates[0]).toBeCloseTo(8.78, 1);
    expect(g.features[0].geometry.coordinates[1]).toBeCloseTo(47.13, 1);
    expect(g.refdelta.frame).toBe('WGS84');
    expect(g.refdelta.note).toMatch(/RFC 7946 assumes WGS 84/);
  });

  it('summary.json: inputs and outputs with SHA-256, counts that add up, cautions', () => {
    const s = JSON.parse(readFileSync(join(out, 'summary.json'), 'utf8'));
    for (const i of s.inputs) expect(i.sha256).toBe(sha256(i.path)); // FIPS 180-4 via node:crypto
    expect(s.inputs.map((i: { kind: string }) => i.kind)).toEqual(['rover', 'reference', 'navigation', 'control']);
    for (const o of s.outputs.filter((o: { kind: string }) => o.kind !== 'summary')) expect(o.sha256).toBe(sha256(o.path));
    const k = s.counts.by_kind;
    expect(k.differential + k.smoothed + k.standalone + k.none).toBe(s.counts.rover_epochs);
    expect(s.frame.name).toBe('WGS84');
    expect(s.reference.source).toMatch(/KFRD/);
    expect(s.statistics.epochs).toBeGreaterThan(0);
    expect(s.cautions.join(' ')).toMatch(/mapping-grade/);
    expect(s.cautions.join(' ')).toMatch(/licensed surveyors/);
  });
});
