/**
 * One self-contained HTML page for a session: inline CSS and SVG, no script, no external resource, so
 * it opens anywhere, prints to PDF and can be handed over as one file.
 */
import { kindsInOrder, timeSeriesChart } from './chart-time-series.js';
import { chartMissing } from './chart-frame.js';
import { occupationChart } from './chart-occupation.js';
import { planChart } from './chart-plan.js';
import { residualChart } from './chart-residuals.js';
import { skyChart } from './chart-sky.js';
import { REPORT_CSS } from './page-style.js';
import type { SessionReportData } from './report-data.js';
import { esc } from './svg-kit.js';
import { checkTables, factsHtml, inputsTable, pointsTable, table } from './tables.js';

/** The cautions printed on every page when the run's summary gives none (README "Cautions"). */
export const REPORT_CAUTIONS: readonly string[] = [
  'Results are for mapping-grade work (code: decimetres to a metre or two with low-cost receivers; carrier phase: centimetres when every integer is right), not for boundary, engineering or geodetic control surveys.',
  'Verify them on known control points before use.',
  'Defer to local codes and to licensed surveyors wherever positions are used to dig, build or draw boundaries.',
];

export function cautionsHtml(cautions: readonly string[]): string {
  return `<section class="cautions" aria-label="cautions"><strong>Cautions</strong><ul>${(cautions.length ? cautions : REPORT_CAUTIONS).map((c) => `<li>${esc(c)}</li>`).join('')}</ul></section>`;
}

export function pageHtml(title: string, body: string): string {
  return `<!DOCTYPE html>\n<html lang="en"><head><meta charset="utf-8"><meta name="viewport" content="width=device-width, initial-scale=1">` +
    `<meta http-equiv="Content-Security-Policy" content="default-src 'none'; style-src 'unsafe-inline'; img-src data:">` +
    `<title>${esc(title)}</title><style>${REPORT_CSS}</style></head><body>\n${body}\n</body></html>\n`;
}

/** The coordinates' frame, CRS and heights, stated above the points table (every coordinate carries its frame and epoch). */
function pointsCoordinatesHtml(d: SessionReportData): string {
  const frame = d.pointsFrameText || d.frameText;
  const grid = d.points.some((p) => Number.isFinite(p.eastingM));
  const ortho = d.points.some((p) => Number.isFinite(p.orthometricHeightM));
  const lines: (readonly [string, string, string?])[] = [
    ['Frame and epoch', frame || 'not stated'],
    ['Latitude, longitude', `geographic, in ${frame || 'the frame of the run (not stated)'}`],
  ];
  if (grid) lines.push(['Easting, northing', d.gridCrsText || 'grid CRS not stated (see points.csv.meta.json)']);
  if (grid && d.gridDatumNote) lines.push(['Grid datum', d.gridDatumNote]);
  lines.push(['Heights', d.heightsText || (ortho ? 'ellipsoidal; orthometric above a geoid model not stated here (see points.csv.meta.json)' : 'ellipsoidal')]);
  if (d.heightsCaution) lines.push(['Height caution', d.heightsCaution, 'alert']);
  return `<div class="coords">${factsHtml(lines)}</div>`;
}

/** The Summary's lines: only what the folder states (no placeholders for a check's outputs alone). */
function summaryLines(d: SessionReportData, kinds: readonly (readonly [string, number])[]): (readonly [string, string, string?])[] {
  const totalEpochs = kinds.reduce((a, [, n]) => a + n, 0);
  const failed = d.points.filter((p) => p.tolerance && p.tolerance !== 'ok').length;
  const checkFailed = d.check ? d.check.pairs.filter((p) => !p.pass).length : 0;
  const checkRejected = d.check ? d.check.pairs.filter((p) => (p.differenceTest ?? '').startsWith('rejected')).length : 0;
  const checkOnly = d.kind === 'control-check';
  const lines: (readonly [string, string, string?])[] = [];
  if (d.incompleteInput) lines.push(['Input', `INCOMPLETE: ${d.incompleteInput}`, 'alert']);
  if (checkOnly && d.check) {
    if (d.check.pointsFile) lines.push(['Points checked', d.check.pointsFile]);
    if (d.check.marksFile) lines.push(['Against the marks of', d.check.marksFile]);
  }
  if (!checkOnly || d.firstUtc) lines.push(['Observed', `${d.firstUtc || 'not stated'} to ${d.lastUtc || 'not stated'} (UTC)`]);
  if (!checkOnly || totalEpochs > 0) lines.push(['Rover epochs', totalEpochs > 0 ? `${totalEpochs.toLocaleString('en-US')}: ${kinds.map(([k, n]) => `${n.toLocaleString('en-US')} ${k}`).join(', ')}` : 'none in this output']);
  lines.push(['Frame and epoch', d.frameText || 'not stated']);
  lines.push(['Positions refer to', d.pointReference || 'not stated']);
  if (!checkOnly || d.referenceText) lines.push(['Reference coordinate', d.referenceText || 'not stated']);
  lines.push(['Points', d.points.length ? `${d.points.length}, ${failed ? `${failed} exceeding their tolerance` : 'all within tolerance'}` : 'none in this output']);
  if (d.points.some((p) => Number.isFinite(p.eastingM))) lines.push(['Grid coordinates', d.gridCrsText || 'grid CRS not stated']);
  if (d.points.length) lines.push(['Heights', d.heightsText || 'ellipsoidal']);
  if (d.points.length && d.heightsCaution) lines.push(['Height caution', d.heightsCaution, 'alert']);
  lines.push(['Control check', d.check
    ? `${d.check.pairs.length} mark(s) compared: ${checkFailed ? `${checkFailed} FAILED the tolerance` : 'all within the tolerance'}` +
      (d.check.pairs.some((p) => p.differenceTest) ? `; difference test: ${checkRejected ? `${checkRejected} rejected (larger than the precision and the mark's accuracy explain)` : 'all accepted'}` : '')
    : 'none in this output', checkFailed || checkRejected ? 'alert' : undefined]);
  lines.push(...(d.facts ?? []));
  lines.push(['Warnings', `${d.warningsTotal}`]);
  return lines;
}

export function buildSessionReportHtml(d: SessionReportData): string {
  const s: string[] = [];
  const kinds = d.epochsByKind.length ? d.epochsByKind : d.epochs ? kindsInOrder(d.epochs.kind) : [];
  const checkOnly = d.kind === 'control-check';
  const heading = checkOnly ? 'Control check report' : 'Session report';
  s.push(`<header><h1>${heading}: ${esc(d.title)}</h1><p class="sub">${esc(d.software)}, made ${esc(d.createdUtc)}</p></header>`);
  s.push(cautionsHtml(d.cautions));
  s.push('<h2>Summary</h2>' + factsHtml(summaryLines(d, kinds)));
  if (d.missing.length) s.push(`<ul class="plain missing">${d.missing.map((m) => `<li>${esc(m)}</li>`).join('')}</ul>`);

  s.push('<h2>Plan view</h2>');
  s.push(d.epochs || d.points.length ? planChart(d.epochs, d.points, d.check, d.planOrigin) : chartMissing('plan', 'Plan view', 'No epochs and no points in this output.'));
  if (d.points.length) {
    s.push('<h2>Points</h2>' + pointsCoordinatesHtml(d) + pointsTable(d.points));
    s.push('<p class="chart-note">sd: per-epoch scatter (1 sigma); sigma of mean: precision of the averaged coordinate, with time-correlated epochs not counted as independent; 95 % radius of the epochs: circle holding 95 % of the per-epoch scatter; the point\'s own 95 % radius (when points.csv states it) comes from the sigma of the mean, relative to the reference and, with the reference coordinate\'s own uncertainty, in the frame. Precision is not accuracy: compare with control.</p>');
    if (d.epochs) s.push(`<h3>Occupations: epochs about each point's mean</h3><div class="smalls">${d.points.map((p) => occupationChart(d.epochs!, p, d.check?.pairs.find((c) => c.point === p.name) ?? null)).join('')}</div>`);
  }
  if (d.check) s.push('<h2>Control check</h2>' + checkTables(d.check));

  // A check's outputs alone hold no epochs or satellites: those sections would only say so.
  if (!checkOnly) {
    s.push('<h2>Time series</h2>');
    s.push(d.epochs && d.epochs.timeGpsS.length ? timeSeriesChart(d.epochs) : chartMissing('time-series', 'Time series', 'No epochs.csv in this output.'));
    s.push('<h2>Satellites</h2>');
    const mask = Number(d.options.find(([k]) => /elevation.mask/.test(k))?.[1]);
    s.push(d.residuals && d.residuals.timeGpsS.length ? skyChart(d.residuals, mask, d.referenceSky ?? null) : chartMissing('sky', 'Sky plot', 'No residuals.csv in this output: no satellite directions.'));
    s.push(d.residuals && d.residuals.timeGpsS.length ? residualChart(d.residuals) : chartMissing('residuals', 'Residuals against elevation', 'No residuals.csv in this output.'));
  }

  s.push('<h2>Inputs</h2>' + (d.inputs.length ? inputsTable(d.inputs) : '<p class="missing">No summary.json: inputs unknown.</p>'));
  s.push('<h2>Options</h2>' + (d.options.length ? table(['option', 'value'], d.options.map(([k, v]) => [esc(k), esc(v)]), [0, 1]) : '<p class="missing">No options recorded.</p>'));
  s.push('<h2>Warnings and notes</h2>');
  s.push(d.warnings.length || d.notes.length
    ? `<ul class="plain">${[...d.notes, ...d.warnings].map((w) => `<li>${esc(w)}</li>`).join('')}</ul>${d.warningsTotal > d.warnings.length ? `<p>${d.warningsTotal - d.warnings.length} more warning(s) in summary.json.</p>` : ''}`
    : '<p>None.</p>');
  s.push(cautionsHtml(d.cautions));
  const coords = [d.frameText || 'frame not stated', ...(d.gridCrsText && d.points.some((p) => Number.isFinite(p.eastingM)) ? [`easting/northing: ${d.gridCrsText}`] : [])].join('; ');
  s.push(`<footer>Made by ${esc(d.software)} from the output files of the ${checkOnly ? 'control check' : 'run'}; every figure is in those files. Coordinates: ${esc(coords)}.</footer>`);
  return pageHtml(`${d.title}: ${checkOnly ? 'control check report' : 'session report'}`, s.join('\n'));
}
