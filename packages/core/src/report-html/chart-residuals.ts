/**
 * Residuals against elevation: the used observations' post-fit residuals, and beneath the chart every
 * rejected observation at its elevation, one row per reason (rejected observations have no residual).
 */
import { chartFigure, legendHtml } from './chart-frame.js';
import { decimationNote, decimationStride } from './decimate.js';
import { CATEGORY_COLOURS, OKABE_ITO } from './palette.js';
import type { ResidualSeries } from './report-data.js';
import { esc, linearScale, niceTicks, px, quantile, tickDecimals } from './svg-kit.js';

export const RESIDUALS_MAX_USED = 3000;
export const RESIDUALS_MAX_REJECTED_PER_REASON = 400;
const W = 960, LEFT = 70, RIGHT = 16, TOP = 10, PLOT_H = 260, PLOT_H_TWO = 180, PANEL_GAP = 12, ROW_H = 16;

/** Rows drawn: used rows with a residual at a stride, rejected rows per reason at a stride. */
export function residualRowsDrawn(rs: ResidualSeries): { used: number[]; usedTotal: number; usedStride: number; rejected: number[][]; rejectedTotals: number[]; rejectedStrides: number[] } {
  const usedAll: number[] = [];
  const rejAll: number[][] = rs.reasons.map(() => []);
  for (let i = 0; i < rs.timeGpsS.length; i++) {
    const k = rs.rejection[i];
    if (k === 0) { if (Number.isFinite(rs.residualM[i]) && Number.isFinite(rs.elevationDeg[i])) usedAll.push(i); } else if (Number.isFinite(rs.elevationDeg[i])) rejAll[k - 1].push(i);
  }
  const usedStride = decimationStride(usedAll.length, RESIDUALS_MAX_USED);
  const rejectedStrides = rejAll.map((r) => decimationStride(r.length, RESIDUALS_MAX_REJECTED_PER_REASON));
  return {
    used: usedAll.filter((_, j) => j % usedStride === 0), usedTotal: usedAll.length, usedStride,
    rejected: rejAll.map((r, k) => r.filter((_, j) => j % rejectedStrides[k] === 0)), rejectedTotals: rejAll.map((r) => r.length), rejectedStrides,
  };
}

/** One residual panel: carrier-phase residuals in millimetres, or code residuals in metres. */
interface ResidualPanel {
  readonly label: string;
  readonly unit: 'mm' | 'm';
  /** Metres to the panel's unit. */
  readonly factor: number;
  /** Smallest half-range drawn, in the panel's unit. */
  readonly minHalfRange: number;
  readonly rows: readonly number[];
}

/**
 * Phase residuals are millimetres and code residuals metres: on one scale the phase would be a flat line
 * at zero, so each kind present gets its own panel (phase above, code below), one above the other.
 */
function residualPanels(rs: ResidualSeries, used: readonly number[]): ResidualPanel[] {
  const isPhase = (i: number): boolean => rs.phase !== undefined && rs.phase[i] === 1;
  const phase = used.filter(isPhase), code = used.filter((i) => !isPhase(i));
  const panels: ResidualPanel[] = [];
  if (phase.length > 0) panels.push({ label: 'Phase residual (mm)', unit: 'mm', factor: 1000, minHalfRange: 5, rows: phase });
  if (code.length > 0 || phase.length === 0) panels.push({ label: 'Residual (m)', unit: 'm', factor: 1, minHalfRange: 0.1, rows: code });
  return panels;
}

export function residualChart(rs: ResidualSeries): string {
  const d = residualRowsDrawn(rs);
  const panels = residualPanels(rs, d.used);
  const plotH = panels.length === 1 ? PLOT_H : PLOT_H_TWO;
  const x = linearScale(0, 90, LEFT, W - RIGHT);
  const parts: string[] = [];
  const clippedNotes: string[] = [];
  let top = TOP;
  for (const panel of panels) {
    const vals = panel.rows.map((i) => rs.residualM[i] * panel.factor);
    // Vertical range: the 0.5 % and 99.5 % quantiles, so a few gross values do not flatten the rest; the
    // values beyond are drawn at the edge (and counted in the note).
    const lim = Math.max(Math.abs(quantile(vals, 0.005)) || 0, Math.abs(quantile(vals, 0.995)) || 0, panel.minHalfRange) * 1.15;
    const y = linearScale(-lim, lim, top + plotH, top);
    const yt = niceTicks(-lim, lim, 6), dec = tickDecimals(yt);
    parts.push(`<rect class="panel" x="${LEFT}" y="${top}" width="${W - RIGHT - LEFT}" height="${plotH}"/>`);
    parts.push(`<g class="axis">${yt.map((t) => `<line class="grid${t === 0 ? ' zero' : ''}" x1="${LEFT}" x2="${W - RIGHT}" y1="${px(y(t))}" y2="${px(y(t))}"/><text x="${LEFT - 4}" y="${px(y(t) + 4)}" text-anchor="end">${t.toFixed(dec)}</text>`).join('')}` +
      `<text class="axis-label" transform="translate(16 ${top + plotH / 2}) rotate(-90)" text-anchor="middle">${panel.label}</text></g>`);
    let clipped = 0;
    const dots = panel.rows.map((i, j) => {
      let v = vals[j];
      if (v > lim) { v = lim; clipped++; } else if (v < -lim) { v = -lim; clipped++; }
      return `<circle cx="${px(x(rs.elevationDeg[i]))}" cy="${px(y(v))}" r="1.5"/>`;
    }).join('');
    parts.push(`<g class="used-marks" data-unit="${panel.unit}" fill="${OKABE_ITO.blue}" fill-opacity="0.45">${dots}</g>`);
    if (clipped) clippedNotes.push(`${clipped} ${panel.unit === 'mm' ? 'phase ' : ''}residual(s) beyond ±${lim.toFixed(panel.unit === 'mm' ? 1 : 2)} ${panel.unit} are drawn at the edge.`);
    top += plotH + PANEL_GAP;
  }
  top -= PANEL_GAP;
  // Rejected: one row per reason beneath the plot.
  let yRow = top + 14;
  const reasonsShown = rs.reasons.map((r, k) => ({ r, k })).filter(({ k }) => d.rejectedTotals[k] > 0);
  reasonsShown.forEach(({ r, k }, j) => {
    const c = CATEGORY_COLOURS[j % CATEGORY_COLOURS.length];
    const yy = yRow + ROW_H / 2;
    parts.push(`<text class="reason-label" x="${LEFT - 4}" y="${px(yy + 4)}" text-anchor="end">${j + 1}</text>`);
    parts.push(`<path class="rejected-marks" data-reason="${esc(r)}" data-marks="${d.rejected[k].length}" stroke="${c}" stroke-width="1.4" fill="none" d="${d.rejected[k].map((i) => `M${px(x(rs.elevationDeg[i]) - 3)} ${px(yy - 3)}l6 6m0-6l-6 6`).join('')}"/>`);
    yRow += ROW_H;
  });
  const xt = [0, 10, 20, 30, 40, 50, 60, 70, 80, 90];
  parts.push(`<g class="axis">${xt.map((t) => `<line class="grid" x1="${px(x(t))}" x2="${px(x(t))}" y1="${TOP}" y2="${yRow}"/><text x="${px(x(t))}" y="${yRow + 14}" text-anchor="middle">${t}</text>`).join('')}` +
    `<text class="axis-label" x="${px((LEFT + W - RIGHT) / 2)}" y="${yRow + 32}" text-anchor="middle">Elevation (degrees)</text></g>`);
  const legend = legendHtml([
    { colour: OKABE_ITO.blue, label: `used: ${d.usedTotal.toLocaleString('en-US')} observations`, shape: 'dot' },
    ...reasonsShown.map(({ r, k }, j) => ({ colour: CATEGORY_COLOURS[j % CATEGORY_COLOURS.length], label: `${j + 1} rejected, ${r}: ${d.rejectedTotals[k].toLocaleString('en-US')}`, shape: 'cross' as const })),
  ]);
  const rejDrawn = d.rejected.reduce((s, r) => s + r.length, 0), rejTotal = d.rejectedTotals.reduce((s, n) => s + n, 0);
  return chartFigure({
    chart: 'residuals', title: 'Residuals against elevation', widthPx: W, heightPx: yRow + 40, body: parts.join(''),
    caption: [
      `Post-fit residuals of the used observations (single differences, or code for standalone epochs${panels.length > 1 ? '; carrier phase in millimetres above, code in metres below' : ''}); rejected observations have no residual and are drawn in the numbered rows beneath, one per reason (reasons grouped by their words, figures left out).`,
      d.usedTotal === 0 ? 'No used observation has a residual value in residuals.csv.' : `Used: ${decimationNote(d.used.length, d.usedTotal, d.usedStride, 'observations')}.`,
      `Rejected: ${rejDrawn === rejTotal ? `all ${rejTotal.toLocaleString('en-US')} drawn` : `${rejDrawn.toLocaleString('en-US')} of ${rejTotal.toLocaleString('en-US')} drawn (at most ${RESIDUALS_MAX_REJECTED_PER_REASON} per reason, evenly spaced)`}.`,
      ...clippedNotes,
    ].filter(Boolean),
    data: { 'used-total': d.usedTotal, 'used-drawn': d.used.length, 'rejected-total': rejTotal, 'rejected-drawn': rejDrawn, reasons: reasonsShown.length },
    after: legend,
  });
}
