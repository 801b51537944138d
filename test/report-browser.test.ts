/**
 * The HTML report opened in a real browser (Debian's chromium, headless, through playwright-core): the
 * demo scenario (simulated: a self-consistency check of the report against the run's own output files)
 * and the real static run. Checked: no console or page errors, no request leaving the file, no script,
 * and each chart holds the marks the output files call for (points, control marks, epochs after the
 * documented decimation, satellites, used residuals), counted in the DOM as the browser parsed it.
 * A full-page PNG of each report is saved under test-artifacts/ (git-ignored).
 */
import { createHash } from 'node:crypto';
import { copyFileSync, existsSync, mkdirSync, readFileSync, statSync, writeFileSync } from 'node:fs';
import { join } from 'node:path';
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { OCCUPATION_MAX_EPOCHS, OCCUPATION_WINDOW_SLACK_S, RESIDUALS_MAX_USED, TIME_SERIES_MAX_EPOCHS, PLAN_MAX_EPOCHS } from '../packages/core/src/report-html/index.js';
import { CHROMIUM_SKIP_REASON, HAS_CHROMIUM, openFile, type OpenedPage } from './support/browser.js';
import { dataPath, describeShared, fixturePath, REPO_ROOT } from './support/shared.js';
import { parseCsv, requireBuiltCli, runCli, tempDir } from './cli-support.js';

const ARTIFACTS = join(REPO_ROOT, 'test-artifacts');
const DEMO = (f: string) => fixturePath(`demo/${f}`);
const OUTPUTS = ['--outputs', 'epochs,residuals,summary,report'];
if (!HAS_CHROMIUM) console.warn(`[skip] report in a browser: ${CHROMIUM_SKIP_REASON}`);

/** What the output files call for, by the decimation rule the report states (every k-th, k = ceil(n / max)). */
function expectedMarks(dir: string) {
  const stride = (n: number, max: number) => (n <= max ? 1 : Math.ceil(n / max));
  const ep = parseCsv(readFileSync(join(dir, 'epochs.csv'), 'utf8')).rows;
  const hasPos = (r: Record<string, string>) => r.ecef_x_m !== '' && r.ecef_x_m !== undefined;
  const sPlan = stride(ep.length, PLAN_MAX_EPOCHS), sTime = stride(ep.length, TIME_SERIES_MAX_EPOCHS);
  const pointRows = existsSync(join(dir, 'points.csv')) ? parseCsv(readFileSync(join(dir, 'points.csv'), 'utf8')).rows : [];
  const points = pointRows.map((r) => r.name);
  // An occupation's epochs: those named after it, else those between its first and last epoch (points.csv times, within the stated slack).
  const occupation = Object.fromEntries(pointRows.map((p) => {
    const byName = ep.some((r) => r.point === p.name);
    const [t0, t1] = [Number(p.start_gps_tow_s) - OCCUPATION_WINDOW_SLACK_S, Number(p.end_gps_tow_s) + OCCUPATION_WINDOW_SLACK_S];
    const k = ep.filter((r) => hasPos(r) && (byName ? r.point === p.name : Number(r.gps_tow_s) >= t0 && Number(r.gps_tow_s) <= t1)).length;
    return [p.name, Math.ceil(k / stride(k, OCCUPATION_MAX_EPOCHS))];
  }));
  const rs = parseCsv(readFileSync(join(dir, 'residuals.csv'), 'utf8')).rows;
  const used = rs.filter((r) => r.status === 'used' && r.residual_m !== '' && r.elevation_deg !== '').length;
  const sky = existsSync(join(dir, 'sky.csv')) ? parseCsv(readFileSync(join(dir, 'sky.csv'), 'utf8')).rows.filter((r) => r.receiver === 'reference') : [];
  return {
    epochs: ep.length,
    referenceSatellites: new Set(sky.map((r) => r.satellite)).size,
    track: ep.filter((r, i) => i % sPlan === 0 && hasPos(r)).length,
    east: ep.filter((r, i) => i % sTime === 0 && hasPos(r)).length,
    kinds: [...new Set(ep.filter((_, i) => i % sTime === 0).map((r) => r.solution))].sort(),
    points, occupation,
    satellites: new Set(rs.filter((r) => r.azimuth_deg !== '' && r.elevation_deg !== '').map((r) => r.satellite)).size,
    used: Math.ceil(used / stride(used, RESIDUALS_MAX_USED)),
  };
}

/** Marks as the browser holds them. */
async function marksInPage(o: OpenedPage) {
  return o.page.evaluate(() => {
    const q = (s: string) => Array.from(document.querySelectorAll(s));
    const vertices = (s: string) => q(s).reduce((a, p) => a + (p as SVGPolylineElement).points.numberOfItems, 0);
    return {
      points: q('[data-chart=plan] .mark-point').map((g) => g.getAttribute('data-point')).sort(),
      controls: q('[data-chart=plan] .mark-control').length,
      track: vertices('[data-chart=plan] polyline.track'),
      east: vertices('[data-chart=time-series] [data-series=east] polyline'),
      kinds: [...new Set(q('[data-chart=time-series] .kind-run').map((r) => r.getAttribute('data-kind') ?? ''))].sort(),
      sky: q('[data-chart=sky] g.sat').length,
      referenceSky: q('[data-chart=sky] g.sat-reference').length,
      used: q('[data-chart=residuals] .used-marks circle').length,
      rejectedReasons: q('[data-chart=residuals] .rejected-marks').map((p) => p.getAttribute('data-reason')),
      occupation: Object.fromEntries(q('[data-chart=occupation]').map((f) => [f.getAttribute('data-point'), f.querySelectorAll('.epoch-dots circle').length])),
      scripts: q('script').length,
      chartsDrawn: q('figure.chart > svg').length,
      chartsWide: q('figure.chart > svg').every((s) => s.getBoundingClientRect().width > 100),
      cautions: document.querySelector('.cautions')?.textContent ?? '',
    };
  });
}

function onlyTheFile(o: OpenedPage, file: string): void {
  const url = new URL(`file://${file}`).href;
  expect(o.requests.filter((u) => u !== url && !u.startsWith('data:'))).toEqual([]);
}

async function screenshot(o: OpenedPage, name: string): Promise<string> {
  mkdirSync(ARTIFACTS, { recursive: true });
  const p = join(ARTIFACTS, name);
  await o.page.screenshot({ path: p, fullPage: true });
  return p;
}

describe.skipIf(!HAS_CHROMIUM)('HTML report of the demo scenario in chromium (simulated data: self-consistency of the report and the outputs)', () => {
  let out = '';
  let page: OpenedPage;
  beforeAll(async () => {
    requireBuiltCli();
    out = tempDir('rd-report-demo-');
    const run = runCli(['points', '--rover', DEMO('rover-1s.obs'), '--reference', DEMO('KFRD-reference-5s.obs'), '--nav', DEMO('broadcast-mixed.nav'),
      '--ref-coord', 'KFRD', '--marks', DEMO('control-marks.csv'), '--smooth', '100', '--projection', 'utm', ...OUTPUTS, '--out', out]);
    expect(run.status, run.stderr).toBe(0);
  });
  afterAll(async () => { await page?.close(); });

  it('points --outputs ...,report writes report.html in the output set: listed in summary.json with its SHA-256', () => {
    const s = JSON.parse(readFileSync(join(out, 'summary.json'), 'utf8'));
    const r = s.outputs.find((o: { kind: string }) => o.kind === 'report');
    expect(r.sha256).toBe(createHash('sha256').update(readFileSync(join(out, 'report.html'))).digest('hex'));
  });

  it('sky.csv: the reference sees each satellite within 0.1 degree of the rover at the same instant (1.5 km apart: under 0.02 degree, geometry)', () => {
    const rover = new Map(parseCsv(readFileSync(join(out, 'residuals.csv'), 'utf8')).rows.map((r) => [`${r.gps_tow_s}:${r.satellite}`, r]));
    let compared = 0;
    for (const r of parseCsv(readFileSync(join(out, 'sky.csv'), 'utf8')).rows) {
      const v = rover.get(`${r.gps_tow_s}:${r.satellite}`);
      if (!v) continue;
      compared++;
      expect(Math.abs(Number(r.elevation_deg) - Number(v.elevation_deg))).toBeLessThan(0.1);
      const dAz = Math.abs(((Number(r.azimuth_deg) - Number(v.azimuth_deg) + 540) % 360) - 180);
      expect(dAz * Math.cos((Number(v.elevation_deg) * Math.PI) / 180)).toBeLessThan(0.1);
    }
    expect(compared).toBeGreaterThan(100);
  });

  it('refdelta report DIR after a check: the page opens with no error, no request leaving the file, every mark drawn', async () => {
    expect(runCli(['check', '--points', join(out, 'points.csv'), '--marks', DEMO('control-marks.csv'), '--out', join(out, 'check')]).status).toBe(0);
    const run = runCli(['report', out]);
    expect(run.status, run.stderr).toBe(0);
    const file = join(out, 'report.html');
    page = await openFile(file);
    expect(page.errors).toEqual([]);
    onlyTheFile(page, file);
    const want = expectedMarks(out);
    const got = await marksInPage(page);
    expect(got.scripts).toBe(0);
    expect(got.chartsDrawn).toBe(4 + want.points.length); // plan, time series, sky, residuals + one scatter per point
    expect(got.chartsWide).toBe(true);
    expect(got.points).toEqual([...want.points].sort());
    // control-check.json of this run: MILLSTONE, ELMCORNER, WELLHEAD matched (FERRYPOST has no mark in fixtures/demo/control-marks.csv).
    expect(got.controls).toBe(JSON.parse(readFileSync(join(out, 'check', 'control-check.json'), 'utf8')).pairs.length);
    expect(got.controls).toBe(3);
    expect(got.track).toBe(want.track);
    expect(got.east).toBe(want.east);
    expect(got.kinds).toEqual(want.kinds);
    expect(got.sky).toBe(want.satellites);
    expect(got.referenceSky).toBe(want.referenceSatellites);
    expect(got.used).toBe(want.used);
    expect(got.occupation).toEqual(want.occupation);
    expect(got.rejectedReasons).toEqual(expect.arrayContaining(['below elevation mask', 'rejected by data snooping']));
    expect(got.cautions).toMatch(/mapping-grade/);
    expect(got.cautions).toMatch(/licensed surveyors/);
    // --projection utm at 8.78 E: UTM zone 32N on WGS 84, EPSG:32632, stated beside the points as the browser shows them.
    const coords = await page.page.evaluate(() => document.querySelector('.coords')?.textContent ?? '');
    expect(coords).toContain('WGS 84 / UTM zone 32N (EPSG:32632)');
    expect(coords).toContain('WGS84 epoch 2024.3672');
    await screenshot(page, 'report-demo.png');
  });

  it('refdelta report on the check folder alone: the points (found through control-check.json) and their marks in the plan view', async () => {
    const dir = join(out, 'check');
    expect(runCli(['report', dir]).status).toBe(0);
    const o = await openFile(join(dir, 'report.html'));
    try {
      expect(o.errors).toEqual([]);
      onlyTheFile(o, join(dir, 'report.html'));
      const got = await marksInPage(o);
      expect(got.points.length).toBe(4); // fixtures/demo/README: MILLSTONE, FERRYPOST, ELMCORNER, WELLHEAD
      expect(got.controls).toBe(3);
      expect(got.track).toBe(0);
      const heading = await o.page.evaluate(() => document.querySelector('h1')?.textContent ?? '');
      expect(heading).toMatch(/^Control check report: /);
      const summary = await o.page.evaluate(() => document.querySelector('dl.facts')?.textContent ?? '');
      expect(summary).toContain('WGS84 epoch 2024.3672'); // fixtures/demo/control-marks.csv: the marks' frame and epoch
      expect(summary).not.toMatch(/\? to \?|not stated/);
      await screenshot(o, 'report-demo-check.png');
    } finally {
      await o.close();
    }
  });

  it('prints to PDF from the browser (print stylesheet): a PDF of several A4 pages, saved beside the screenshots', async () => {
    const pdf = await page.page.pdf({ format: 'A4', printBackground: true });
    expect(pdf.subarray(0, 5).toString('latin1')).toBe('%PDF-'); // ISO 32000-1, 7.5.2 file header
    const pages = (pdf.toString('latin1').match(/\/Type\s*\/Page[^s]/g) ?? []).length;
    expect(pages).toBeGreaterThan(2);
    mkdirSync(ARTIFACTS, { recursive: true });
    writeFileSync(join(ARTIFACTS, 'report-demo.pdf'), pdf);
    expect(page.errors).toEqual([]);
  });

  it('batch --outputs ...,report: an index page with the failed session first, linking each session\'s report', async () => {
    const dir = tempDir('rd-report-batch-in-');
    copyFileSync(DEMO('rover-1s.obs'), join(dir, 'walk-a.obs'));
    writeFileSync(join(dir, 'broken.24o'), 'this is not RINEX at all\n'.repeat(20));
    const bout = tempDir('rd-report-batch-');
    const run = runCli(['batch', '--sessions', dir, '--reference', DEMO('KFRD-reference-5s.obs'), '--nav', DEMO('broadcast-mixed.nav'),
      '--ref-coord', 'KFRD', '--marks', DEMO('control-marks.csv'), ...OUTPUTS, '--out', bout]);
    expect(run.status, run.stderr).toBe(4); // README: exit 4 when some sessions failed
    expect(existsSync(join(bout, 'walk-a', 'report.html'))).toBe(true);
    const file = join(bout, 'report.html');
    const o = await openFile(file);
    try {
      expect(o.errors).toEqual([]);
      onlyTheFile(o, file);
      const rows = await o.page.evaluate(() => Array.from(document.querySelectorAll('table.sessions tbody tr')).map((tr) => ({
        text: tr.textContent ?? '', href: tr.querySelector('a')?.getAttribute('href') ?? null,
      })));
      expect(rows.length).toBe(2);
      expect(rows[0].text).toMatch(/broken/);
      expect(rows[0].href).toBeNull();
      expect(rows[1].href).toBe('walk-a/report.html');
      await screenshot(o, 'report-batch-index.png');
    } finally {
      await o.close();
    }
    // refdelta report on the batch folder afterwards: the same index, each session's page rebuilt.
    const again = runCli(['report', bout, '--json-lines']);
    expect(again.status, again.stderr).toBe(0);
    const written = again.stdout.split('\n').filter(Boolean).map((l) => JSON.parse(l)).filter((e) => e.event === 'output').map((e) => e.path);
    expect(written).toEqual([join(bout, 'walk-a', 'report.html'), join(bout, 'report.html')]);
  });
});

const D = 'cors-and-rover-2018-277';
describeShared('HTML report of the real static run in chromium', () => {
  if (!HAS_CHROMIUM) { it.skip(CHROMIUM_SKIP_REASON, () => {}); return; }
  let out = '';
  beforeAll(() => {
    requireBuiltCli();
    out = tempDir('rd-report-static-');
    const run = runCli(['points', '--rover', dataPath(`${D}/static-run/rover.obs`), '--reference', dataPath(`${D}/static-run/base.obs`),
      '--nav', dataPath(`${D}/reference/glw1277m.18n`), dataPath(`${D}/reference/glw1277m.18g`),
      // data README: base APPROX POSITION XYZ, frame WGS 84 at the epoch of observation.
      '--ref-coord', '3774089.2120,-601661.6157,5089321.2474', '--ref-frame', 'WGS84', '--ref-epoch', '2018.76',
      // Code solution: its residual rows carry residuals and directions, so every chart has real data.
      '--carrier-phase', 'off', ...OUTPUTS, '--out', out]);
    expect(run.status, run.stderr).toBe(0);
  });

  it('opens with no error and no request leaving the file; marks match the outputs; under 2 MB', async () => {
    const file = join(out, 'report.html');
    expect(statSync(file).size).toBeLessThan(2 * 1024 * 1024);
    const o = await openFile(file);
    try {
      expect(o.errors).toEqual([]);
      onlyTheFile(o, file);
      const want = expectedMarks(out);
      const got = await marksInPage(o);
      expect(got.scripts).toBe(0);
      expect(got.points).toEqual([...want.points].sort());
      expect(got.controls).toBe(0);
      expect(got.track).toBe(want.track);
      expect(got.east).toBe(want.east);
      expect(got.kinds).toEqual(want.kinds);
      expect(got.sky).toBe(want.satellites);
      expect(got.referenceSky).toBe(want.referenceSatellites);
      expect(want.referenceSatellites).toBeGreaterThan(4);
      expect(got.used).toBe(want.used);
      expect(got.occupation).toEqual(want.occupation);
      expect(Object.values(got.occupation).every((n) => n > 100)).toBe(true); // data README: "static-run/ ... both receivers still": one Doppler-detected occupation of most epochs
      // GPS and GLONASS broadcast files are given (data README): both constellations appear in the sky plot.
      const systems = await o.page.evaluate(() => [...new Set(Array.from(document.querySelectorAll('[data-chart=sky] g.sat')).map((g) => (g.getAttribute('data-satellite') ?? '').charAt(0)))].sort());
      expect(systems).toEqual(expect.arrayContaining(['G']));
      await screenshot(o, 'report-static-run.png');
    } finally {
      await o.close();
    }
  });
});

describeShared('HTML report of the real static run with carrier phase in chromium', () => {
  if (!HAS_CHROMIUM) { it.skip(CHROMIUM_SKIP_REASON, () => {}); return; }
  it('fixed and float epochs are solution kinds on the time axis; the reference sky is drawn; no error, nothing fetched', async () => {
    requireBuiltCli();
    const out = tempDir('rd-report-carrier-');
    const run = runCli(['points', '--rover', dataPath(`${D}/static-run/rover.obs`), '--reference', dataPath(`${D}/static-run/base.obs`),
      '--nav', dataPath(`${D}/reference/glw1277m.18n`), dataPath(`${D}/reference/glw1277m.18g`),
      '--ref-coord', '3774089.2120,-601661.6157,5089321.2474', '--ref-frame', 'WGS84', '--ref-epoch', '2018.76', ...OUTPUTS, '--out', out]);
    expect(run.status, run.stderr).toBe(0);
    const file = join(out, 'report.html');
    expect(statSync(file).size).toBeLessThan(2 * 1024 * 1024);
    const o = await openFile(file);
    try {
      expect(o.errors).toEqual([]);
      onlyTheFile(o, file);
      const want = expectedMarks(out);
      const got = await marksInPage(o);
      expect(got.kinds).toEqual(want.kinds);
      expect(got.kinds).toContain('fixed'); // README "--carrier-phase": on by default when both receivers recorded phase (the static run's receivers did)
      expect(got.east).toBe(want.east);
      expect(got.referenceSky).toBe(want.referenceSatellites);
      await screenshot(o, 'report-static-run-carrier.png');
    } finally {
      await o.close();
    }
  });
});
