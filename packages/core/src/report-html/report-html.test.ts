/**
 * The HTML report builders without a browser (test/report-browser.test.ts opens the pages in chromium):
 * escaping, the decimation rule, any solution kind, the page's size for a day at 1 Hz.
 */
import { describe, expect, it } from 'vitest';
import { buildBatchIndexHtml, buildSessionReportHtml, decimatedIndices, decimationStride, ELLIPSE_95_SCALE, syntheticSessionReportData } from './index.js';
import { ordinal } from './decimate.js';
import { occupationChart, occupationEpochs } from './chart-occupation.js';
import { esc, niceTicks } from './svg-kit.js';

describe('report-html builders', () => {
  it('escapes the five characters HTML gives meaning to (HTML Living Standard, 13.1.2.6 / character references)', () => {
    expect(esc(`<b a="1">&'`)).toBe('&lt;b a=&quot;1&quot;&gt;&amp;&#39;');
  });

  it('95 % ellipse scale: sqrt of the chi-square 95 % quantile for 2 degrees of freedom, 5.991 (any chi-square table)', () => {
    expect(ELLIPSE_95_SCALE ** 2).toBeCloseTo(5.991, 3);
  });

  it('decimation keeps entries 0, k, 2k... with k = ceil(n / max): ceil(n / k) marks, never more than max', () => {
    for (const [n, max] of [[10, 20], [86_400, 1500], [1501, 1500], [3000, 1500]]) {
      const k = decimationStride(n, max);
      const idx = decimatedIndices(n, k);
      expect(idx.length).toBe(Math.ceil(n / k));
      expect(idx.length).toBeLessThanOrEqual(max);
      expect(idx[1] ?? k).toBe(k);
    }
  });

  it('ordinals in the decimation note follow English usage', () => {
    expect([1, 2, 3, 4, 11, 12, 13, 21, 22, 58, 101, 112].map(ordinal)).toEqual(['1st', '2nd', '3rd', '4th', '11th', '12th', '13th', '21st', '22nd', '58th', '101st', '112th']);
  });

  it("an occupation's scatter says how many of its epochs the point averages when that is not all of them", () => {
    const n = 40;
    const epochs = {
      timeGpsS: Array.from({ length: n }, (_, i) => 1e9 + i), eastM: Array.from({ length: n }, (_, i) => 0.01 * (i % 5)), northM: Array.from({ length: n }, (_, i) => 0.01 * (i % 3)),
      upM: new Array<number>(n).fill(0), satellitesUsed: new Array<number>(n).fill(8), pdop: new Array<number>(n).fill(1.5),
      kind: Array.from({ length: n }, (_, i) => (i < 36 ? 'fixed' : 'float')), point: new Array<string>(n).fill('A'),
    };
    const p = { ...syntheticSessionReportData(8).points[0], name: 'A', epochs: n, startGpsS: 1e9, endGpsS: 1e9 + n - 1 };
    expect(occupationEpochs(epochs, p)).toHaveLength(n);
    expect(occupationChart(epochs, p)).not.toMatch(/averages/);
    expect(occupationChart(epochs, { ...p, epochs: 36, solutionKinds: 'fixed:36' })).toContain('The point&#39;s coordinate averages 36 of these epochs (fixed:36).');
  });

  it('axis ticks: 1-2-5 steps, at least two inside any range (common practice)', () => {
    expect(niceTicks(-164, 169, 3)).toEqual([-100, 0, 100]);
    expect(niceTicks(1.1, 1.7, 3).map((v) => Number(v.toFixed(6)))).toEqual([1.2, 1.4, 1.6]);
  });

  it('a day at 1 Hz with every solution kind (code, smoothed, float, fixed, none) gives a page under 2 MB, no script, each kind in the legend', () => {
    const d = syntheticSessionReportData();
    const html = buildSessionReportHtml(d);
    expect(html.length).toBeLessThan(2 * 1024 * 1024);
    expect(html).not.toMatch(/<script/i);
    for (const k of ['code', 'smoothed', 'float', 'fixed', 'none']) expect(html).toContain(`data-kind="${k}"`);
    // The only URL in the page is the SVG namespace name (never fetched).
    expect([...html.matchAll(/https?:\/\/[^"' )]+/g)].map((m) => m[0]).every((u) => u === 'http://www.w3.org/2000/svg')).toBe(true);
    expect(html).toMatch(/every \d+th of 86,400 epochs/);
  });

  it('names from the data are escaped; an unknown kind word is drawn with a colour and listed', () => {
    const d = syntheticSessionReportData(600, 4);
    const html = buildSessionReportHtml({
      ...d, title: '<x>', points: d.points.map((p, i) => (i === 0 ? { ...p, name: 'A&B "1"' } : p)),
      epochs: { ...d.epochs!, kind: d.epochs!.kind.map((k, i) => (i < 100 ? 'ppp-converging' : k)) },
    });
    expect(html).toContain('&lt;x&gt;');
    expect(html).toContain('A&amp;B &quot;1&quot;');
    expect(html).not.toContain('A&B "1"');
    expect(html).toContain('data-kind="ppp-converging"');
    expect(html).toMatch(/ppp-converging: 100 epochs/);
  });

  it('batch index: failed sessions first, links only to sessions with a report', () => {
    const html = buildBatchIndexHtml({
      title: 'b', software: 'refdelta', createdUtc: '', cautions: [],
      sessions: [
        { session: 'a', status: 'ok', reason: '', epochs: 10, solvedEpochs: 10, points: 1, reportHref: 'a/report.html' },
        { session: 'z', status: 'failed', reason: 'not RINEX', epochs: 0, solvedEpochs: 0, points: 0, reportHref: null },
      ],
    });
    expect(html.indexOf('>z<')).toBeLessThan(html.indexOf('>a<'));
    expect(html).toContain('<a href="a/report.html">a</a>');
    expect(html).toMatch(/mapping-grade/);
  });
});

describe('report page: what a reader must see stated', () => {
  const check = {
    toleranceHM: 1, toleranceVM: 2, criticalHorizontal: 5.991, criticalVertical: 3.841, frameText: 'WGS84 epoch 2018.76', pointsFile: '/p/points.csv', marksFile: '/p/marks.csv',
    pairs: [
      { point: 'P1', mark: 'P1', matchedBy: 'name', dEastM: 0.001, dNorthM: 0.001, dUpM: 0.008, horizontalM: 0.001, pass: true, differenceTest: 'accepted', chi2H: 0.01, chi2V: 0.11 },
      { point: 'WELLHEAD', mark: 'WELLHEAD', matchedBy: 'name', dEastM: 0.2, dNorthM: 0.1, dUpM: 0.01, horizontalM: 0.224, pass: true, differenceTest: 'rejected-horizontal', chi2H: 6.97, chi2V: 0.2 },
    ],
    unmatchedPoints: [], unmatchedMarks: [], nssda: [['Horizontal accuracy at 95 %', '0.0034 m']] as [string, string][], warnings: [],
  };

  it('the control check table has the difference test beside the tolerance: a mark within tolerance whose difference is rejected says both', () => {
    const html = buildSessionReportHtml({ ...syntheticSessionReportData(60, 4), check });
    expect(html).toContain('<th>difference test (95 %)</th>'.replace('<th>', '<th class="t">'));
    const row = /<tr><td class="t">WELLHEAD<\/td>.*?<\/tr>/.exec(html)![0];
    expect(row).toContain('<span class="badge pass">pass</span>');
    expect(row).toContain('<span class="badge fail">rejected-horizontal</span>');
    expect(row).toMatch(/χ²<sub>h<\/sub> 6\.97/);
    expect(html).toMatch(/difference test: 1 rejected/);
  });

  it("a control check's outputs alone: titled for what they are, the check's frame and epoch, no placeholder for the run's missing figures", () => {
    const d = syntheticSessionReportData(60, 4);
    const html = buildSessionReportHtml({
      ...d, kind: 'control-check', epochs: null, residuals: null, epochsByKind: [], firstUtc: '', lastUtc: '', referenceText: '', frameText: 'WGS84 epoch 2018.76', facts: [], check,
    });
    expect(html).toContain('<h1>Control check report: ');
    expect(html).toContain('<dt>Frame and epoch</dt><dd>WGS84 epoch 2018.76</dd>');
    expect(html).not.toMatch(/\? to \?|Rover epochs|<dt>Observed|Time series|Sky plot/);
    expect(html).toContain('<dd>/p/marks.csv</dd>');
  });

  it('the grid CRS and heights beside the points; an incomplete input in the Summary', () => {
    const d = syntheticSessionReportData(60, 4);
    const html = buildSessionReportHtml({
      ...d, points: d.points.map((p) => ({ ...p, eastingM: 483413.361, northingM: 5219757.238, orthometricHeightM: 360.787 })),
      gridCrsText: 'WGS 84 / UTM zone 32N (EPSG:32632)', heightsText: 'ellipsoidal; orthometric above EGM96 geoid', heightsCaution: 'EGM96 is a global geoid model, not a national vertical datum',
      incompleteInput: 'observations were lost while reading: r.obs:4491: epoch skipped',
    });
    const points = html.slice(html.indexOf('<h2>Points</h2>'), html.indexOf('<table', html.indexOf('<h2>Points</h2>')));
    expect(points).toContain('<dt>Easting, northing</dt><dd>WGS 84 / UTM zone 32N (EPSG:32632)</dd>');
    expect(points).toContain('EGM96 geoid');
    expect(points).toContain('not a national vertical datum');
    const summary = html.slice(html.indexOf('<h2>Summary</h2>'), html.indexOf('<h2>Plan view</h2>'));
    expect(summary).toContain('<dt class="alert">Input</dt><dd class="alert">INCOMPLETE: observations were lost while reading: r.obs:4491: epoch skipped</dd>');
    expect(summary).toContain('EPSG:32632');
  });

  it('the batch index table is in a box of its own that scrolls, and long names and reasons may wrap', () => {
    const html = buildBatchIndexHtml({
      title: 'b', software: 'refdelta', createdUtc: '', cautions: [],
      sessions: [{ session: 'hubu00DEU_R_20230931500_01H_30S_MO', status: 'failed', reason: 'x'.repeat(300), epochs: 0, solvedEpochs: 0, points: 0, reportHref: null }],
    });
    expect(html).toContain('<div class="table-box"><table class="sessions">');
    expect(html).toMatch(/\.table-box\{max-width:100%;overflow-x:auto\}/);
    expect(html).toMatch(/table\.sessions td\.t\{overflow-wrap:anywhere\}/);
  });
});

describe('residual chart with carrier-phase and code residuals', () => {
  it('draws phase in millimetres and code in metres on panels of their own (self-consistency)', async () => {
    const { residualChart } = await import('./chart-residuals.js');
    // Four used rows: two phase residuals of 3 and -4 mm, two code residuals of 0.8 and -0.6 m.
    const rs = {
      timeGpsS: [0, 0, 0, 0], satellite: [0, 1, 0, 1], satellites: ['G01', 'G02'], elevationDeg: [30, 60, 30, 60], azimuthDeg: [0, 90, 0, 90],
      residualM: [0.003, -0.004, 0.8, -0.6], phase: [1, 1, 0, 0], rejection: [0, 0, 0, 0], reasons: [],
    };
    const svg = residualChart(rs);
    expect(svg).toContain('Phase residual (mm)');
    expect(svg).toContain('Residual (m)');
    const groups = [...svg.matchAll(/<g class="used-marks" data-unit="(mm|m)"[^>]*>(.*?)<\/g>/g)].map((m) => [m[1], (m[2].match(/<circle/g) ?? []).length]);
    expect(groups).toEqual([['mm', 2], ['m', 2]]);
    // Code-only series (no phase column): one panel, as before.
    const codeOnly = residualChart({ ...rs, phase: undefined });
    expect(codeOnly).not.toContain('Phase residual');
    expect([...codeOnly.matchAll(/class="used-marks"/g)].length).toBe(1);
  });
});
