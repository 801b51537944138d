/** HTML tables and lists of the report. */
import { scatterRadius95M } from './chart-occupation.js';
import type { ReportCheckPair, ReportControlCheck, ReportInput, ReportPoint } from './report-data.js';
import { esc, num } from './svg-kit.js';

export function badge(word: string): string {
  const cls = word === 'ok' || word === 'pass' || word === 'accepted' ? 'pass' : word === 'failed' || word === 'fail' || word.startsWith('exceeds') || word.startsWith('rejected') ? 'fail' : 'other';
  return `<span class="badge ${cls}">${esc(word)}</span>`;
}

export function table(head: readonly string[], rows: readonly (readonly string[])[], textColumns: readonly number[] = [0]): string {
  const cell = (c: string, i: number, tag: string) => `<${tag}${textColumns.includes(i) ? ' class="t"' : ''}>${c}</${tag}>`;
  // In a box of its own: a table wider than the page scrolls inside it, not the page.
  return `<div class="table-box"><table><thead><tr>${head.map((h, i) => cell(esc(h), i, 'th')).join('')}</tr></thead><tbody>${rows.map((r) => `<tr>${r.map((c, i) => cell(c, i, 'td')).join('')}</tr>`).join('')}</tbody></table></div>`;
}

/** Two tables: the coordinates, then precision and the tolerance result. */
export function pointsTable(points: readonly ReportPoint[]): string {
  const grid = points.some((p) => Number.isFinite(p.eastingM));
  const ortho = points.some((p) => Number.isFinite(p.orthometricHeightM));
  const coords = table(
    ['point', 'epochs', 'duration (s)', 'latitude (°)', 'longitude (°)', 'ellipsoidal height (m)', ...(grid ? ['easting (m)', 'northing (m)'] : []), ...(ortho ? ['orthometric height (m)'] : [])],
    points.map((p) => [
      esc(p.name), String(p.epochs), num(p.durationS, 0), num(p.latitudeDeg, 8), num(p.longitudeDeg, 8), num(p.heightM, 3),
      ...(grid ? [num(p.eastingM, 3), num(p.northingM, 3)] : []), ...(ortho ? [num(p.orthometricHeightM, 3)] : []),
    ]));
  const stated = points.some((p) => Number.isFinite(p.radius95RelativeM ?? NaN) || Number.isFinite(p.radius95M ?? NaN));
  const precision = table(
    ['point', 'sd east (m)', 'sd north (m)', 'sd up (m)', 'sigma mean east (m)', 'sigma mean north (m)', 'sigma mean up (m)', '95 % radius of the epochs (m)',
      ...(stated ? ['95 % radius of the point, relative to the reference (m)', '95 % radius in the frame (m)'] : []), 'tolerance'],
    points.map((p) => [
      esc(p.name), num(p.sdEastM, 3), num(p.sdNorthM, 3), num(p.sdUpM, 3), num(p.sigmaMeanEastM, 3), num(p.sigmaMeanNorthM, 3), num(p.sigmaMeanUpM, 3),
      num(scatterRadius95M(p), 3), ...(stated ? [num(p.radius95RelativeM ?? NaN, 3), num(p.radius95M ?? NaN, 3)] : []), badge(p.tolerance || 'unknown'),
    ]));
  return coords + precision;
}

/** The difference test's cell: its word as a badge with the test statistics ('' when not tested). */
function differenceTestCell(p: ReportCheckPair): string {
  const word = p.differenceTest ?? '';
  if (word === '') return '<span class="missing">not tested</span>';
  const stats = [
    ...(Number.isFinite(p.chi2H ?? NaN) ? [`χ²<sub>h</sub> ${num(p.chi2H!, 2)}`] : []),
    ...(Number.isFinite(p.chi2V ?? NaN) ? [`χ²<sub>v</sub> ${num(p.chi2V!, 2)}`] : []),
  ];
  return `${badge(word)}${stats.length ? ` <span class="stat">${stats.join(', ')}</span>` : ''}`;
}

export function checkTables(c: ReportControlCheck): string {
  const tested = c.pairs.some((p) => p.differenceTest !== undefined);
  const rows = c.pairs.map((p) => [
    esc(p.point), esc(p.mark), esc(p.matchedBy), num(p.dEastM, 3), num(p.dNorthM, 3), num(p.dUpM, 3), num(p.horizontalM, 3), badge(p.pass ? 'pass' : 'fail'),
    ...(tested ? [differenceTestCell(p)] : []),
  ]);
  const critical = Number.isFinite(c.criticalHorizontal ?? NaN) && Number.isFinite(c.criticalVertical ?? NaN)
    ? ` (χ² against ${num(c.criticalHorizontal!, 3)} horizontally, 2 degrees of freedom, and ${num(c.criticalVertical!, 3)} vertically, 1 degree of freedom)` : '';
  return `<p>Computed point minus published mark, east/north/up at the mark${c.frameText ? `, in ${esc(c.frameText)} (the marks' frame and epoch)` : ''}. ` +
    `Tolerance: pass when horizontal ≤ ${num(c.toleranceHM, 2)} m and |up| ≤ ${num(c.toleranceVM, 2)} m.` +
    (tested ? ` Difference test at 95 %${critical}: is the difference larger than the point's precision and the mark's accuracy explain? ` +
      '"rejected" means it is, even within the tolerance: check the mark\'s published coordinate and the occupation. It does not change pass/fail.' : '') + '</p>' +
    table(['point', 'mark', 'matched by', 'dE (m)', 'dN (m)', 'dU (m)', 'horizontal (m)', 'tolerance', ...(tested ? ['difference test (95 %)'] : [])], rows, [0, 1, 2, ...(tested ? [8] : [])]) +
    (c.unmatchedPoints.length ? `<p>Points without a mark: ${c.unmatchedPoints.map(esc).join(', ')}.</p>` : '') +
    (c.unmatchedMarks.length ? `<p>Marks without a point: ${c.unmatchedMarks.map(esc).join(', ')}.</p>` : '') +
    (c.nssda.length ? `<h3>NSSDA (FGDC-STD-007.3-1998)</h3>${table(['figure', 'value'], c.nssda.map(([k, v]) => [esc(k), esc(v)]), [0, 1])}` : '') +
    (c.warnings.length ? `<ul class="plain">${c.warnings.map((w) => `<li>${esc(w)}</li>`).join('')}</ul>` : '');
}

export function inputsTable(inputs: readonly ReportInput[]): string {
  const name = (p: string) => p.split(/[\\/]/).pop() ?? p;
  return table(['kind', 'file', 'bytes', 'SHA-256'], inputs.map((i) => [esc(i.kind), `<span title="${esc(i.path)}">${esc(name(i.path))}</span>`, i.bytes === null ? '' : i.bytes.toLocaleString('en-US'), `<span class="hash-text">${esc(i.sha256)}</span>`]), [0, 1])
    .replace(/<td><span class="hash-text">/g, '<td class="hash"><span class="hash-text">');
}

/** Label/value lines; a third element is a class for the line ('alert' draws it as a warning). */
export function factsHtml(lines: readonly (readonly [string, string, string?])[]): string {
  return `<dl class="facts">${lines.map(([k, v, cls]) => `<dt${cls ? ` class="${esc(cls)}"` : ''}>${esc(k)}</dt><dd${cls ? ` class="${esc(cls)}"` : ''}>${esc(v)}</dd>`).join('')}</dl>`;
}
