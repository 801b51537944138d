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

export function buildSessionReportHtml(d: SessionReportData): string {
  const s: string[] = [];
  const kinds = d.epochsByKind.length ? d.epochsByKind : d.epochs ? kindsInOrder(d.epochs.kind) : [];
  const totalEpochs = kinds.reduce((a, [, n]) => a + n, 0);
  s.push(`<header><h1>Session report: ${esc(d.title)}</h1><p class="sub">${esc(d.software)}, made ${esc(d.createdUtc)}</p></header>`);
  s.push(cautionsHtml(d.cautions));
  const failed = d.points.filter((p) => p.tolerance && p.tolerance !== 'ok').length;
  const checkFailed = d.check ? d.check.pairs.filter((p) => !p.pass).length : 0;
  s.push('<h2>Summary</h2>' + factsHtml([
    ['Observed', `${d.firstUtc || '?'} to ${d.lastUtc || '?'} (UTC)`],
    ['Rover epochs', `${totalEpochs.toLocaleString('en-US')}: ${kinds.map(([k, n]) => `${n.toLocaleString('en-US')} ${k}`).join(', ')}`],
    ['Frame and epoch', d.frameText || 'not stated'],
    ['Positions refer to', d.pointReference || 'not stated'],
    ['Reference coordinate', d.referenceText || 'not stated'],
    ['Points', d.points.length ? `${d.points.length}, ${failed ? `${failed} exceeding their tolerance` : 'all within tolerance'}` : 'none in this output'],
    ['Control check', d.check ? `${d.check.pairs.length} mark(s) compared, ${checkFailed ? `${checkFailed} FAILED` : 'all pass'}` : 'none in this output'],
    ...(d.facts ?? []),
    ['Warnings', `${d.warningsTotal}`],
  ]));
  if (d.missing.length) s.push(`<ul class="plain missing">${d.missing.map((m) => `<li>${esc(m)}</li>`).join('')}</ul>`);

  s.push('<h2>Plan view</h2>');
  s.push(d.epochs || d.points.length ? planChart(d.epochs, d.points, d.check) : chartMissing('plan', 'Plan view', 'No epochs and no points in this output.'));
  if (d.points.length) {
    s.push('<h2>Points</h2>' + pointsTable(d.points));
    s.push('<p class="chart-note">sd: per-epoch scatter (1 sigma); sigma of mean: precision of the averaged coordinate, with time-correlated epochs not counted as independent; 95 % radius of the epochs: circle holding 95 % of the per-epoch scatter; the point\'s own 95 % radius (when points.csv states it) comes from the sigma of the mean, relative to the reference and, with the reference coordinate\'s own uncertainty, in the frame. Precision is not accuracy: compare with control.</p>');
    if (d.epochs) s.push(`<h3>Occupations: epochs about each point's mean</h3><div class="smalls">${d.points.map((p) => occupationChart(d.epochs!, p, d.check?.pairs.find((c) => c.point === p.name) ?? null)).join('')}</div>`);
  }
  if (d.check) s.push('<h2>Control check</h2>' + checkTables(d.check));

  s.push('<h2>Time series</h2>');
  s.push(d.epochs && d.epochs.timeGpsS.length ? timeSeriesChart(d.epochs) : chartMissing('time-series', 'Time series', 'No epochs.csv in this output.'));
  s.push('<h2>Satellites</h2>');
  const mask = Number(d.options.find(([k]) => /elevation.mask/.test(k))?.[1]);
  s.push(d.residuals && d.residuals.timeGpsS.length ? skyChart(d.residuals, mask, d.referenceSky ?? null) : chartMissing('sky', 'Sky plot', 'No residuals.csv in this output: no satellite directions.'));
  s.push(d.residuals && d.residuals.timeGpsS.length ? residualChart(d.residuals) : chartMissing('residuals', 'Residuals against elevation', 'No residuals.csv in this output.'));

  s.push('<h2>Inputs</h2>' + (d.inputs.length ? inputsTable(d.inputs) : '<p class="missing">No summary.json: inputs unknown.</p>'));
  s.push('<h2>Options</h2>' + (d.options.length ? table(['option', 'value'], d.options.map(([k, v]) => [esc(k), esc(v)]), [0, 1]) : '<p class="missing">No options recorded.</p>'));
  s.push('<h2>Warnings and notes</h2>');
  s.push(d.warnings.length || d.notes.length
    ? `<ul class="plain">${[...d.notes, ...d.warnings].map((w) => `<li>${esc(w)}</li>`).join('')}</ul>${d.warningsTotal > d.warnings.length ? `<p>${d.warningsTotal - d.warnings.length} more warning(s) in summary.json.</p>` : ''}`
    : '<p>None.</p>');
  s.push(cautionsHtml(d.cautions));
  s.push(`<footer>Made by ${esc(d.software)} from the output files of the run; every figure is in those files. Coordinates: ${esc(d.frameText || 'frame not stated')}.</footer>`);
  return pageHtml(`${d.title}: session report`, s.join('\n'));
}
