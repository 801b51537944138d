/**
 * East/north/up, satellites used, PDOP and the solution kind of every epoch on one UTC time axis.
 * Positions are drawn about their median so metre-level scatter of a far point stays visible.
 */
import { leapSecondsAtGps } from '../time/index.js';
import { chartFigure, legendHtml } from './chart-frame.js';
import { decimatedIndices, decimationNote, decimationStride } from './decimate.js';
import { kindColour, OKABE_ITO } from './palette.js';
import type { EpochSeries } from './report-data.js';
import { clockText, esc, finiteRange, linearScale, niceTicks, padRange, px, quantile, tickDecimals, type LinearScale } from './svg-kit.js';

export const TIME_SERIES_MAX_EPOCHS = 1500;
const W = 960, LEFT = 78, RIGHT = 16, TOP = 8;

interface Panel { readonly label: string; readonly unit: string; readonly values: ArrayLike<number>; readonly heightPx: number; readonly colour: string; readonly offset: number; readonly step?: boolean }

/** Kinds in order of first appearance, with epoch counts over all epochs. */
export function kindsInOrder(kinds: readonly string[]): [string, number][] {
  const m = new Map<string, number>();
  for (const k of kinds) m.set(k, (m.get(k) ?? 0) + 1);
  return [...m.entries()];
}

export function timeSeriesChart(ep: EpochSeries): string {
  const n = ep.timeGpsS.length;
  const stride = decimationStride(n, TIME_SERIES_MAX_EPOCHS);
  const idx = decimatedIndices(n, stride);
  const [t0, t1] = finiteRange(ep.timeGpsS);
  const x = linearScale(t0, t1, LEFT, W - RIGHT);
  const med = (v: ArrayLike<number>) => { const q = quantile(v, 0.5); return Number.isFinite(q) ? q : 0; };
  const panels: Panel[] = [
    { label: 'East', unit: 'm', values: ep.eastM, heightPx: 100, colour: OKABE_ITO.blue, offset: med(ep.eastM) },
    { label: 'North', unit: 'm', values: ep.northM, heightPx: 100, colour: OKABE_ITO.blue, offset: med(ep.northM) },
    { label: 'Up', unit: 'm', values: ep.upM, heightPx: 100, colour: OKABE_ITO.blue, offset: med(ep.upM) },
    { label: 'Satellites', unit: '', values: ep.satellitesUsed, heightPx: 70, colour: OKABE_ITO.vermillion, offset: 0, step: true },
    { label: 'PDOP', unit: '', values: ep.pdop, heightPx: 70, colour: OKABE_ITO.reddishPurple, offset: 0 },
  ];
  // A gap in the line where epochs are missing: more than 3 plotted intervals apart (common practice).
  const dts: number[] = [];
  for (let j = 1; j < idx.length; j++) dts.push(ep.timeGpsS[idx[j]] - ep.timeGpsS[idx[j - 1]]);
  const gapS = 3 * (quantile(dts, 0.5) || 1);
  let y = TOP;
  const parts: string[] = [];
  let plotted = 0;
  for (const p of panels) {
    const vals = idx.map((i) => p.values[i] - p.offset);
    let [lo, hi] = finiteRange(vals);
    if (!Number.isFinite(lo)) { lo = 0; hi = 1; }
    [lo, hi] = p.step ? [Math.min(0, lo), hi + 1] : padRange([lo, hi], 0.05, p.unit === 'm' ? 0.05 : 0.2);
    const ys = linearScale(lo, hi, y + p.heightPx, y + 4);
    parts.push(panelAxes(p, ys, y, x));
    const lines = polylines(idx, vals, ep.timeGpsS, x, ys, gapS);
    if (lines.vertices === 0) parts.push(`<text class="no-values" x="${px((LEFT + W - RIGHT) / 2)}" y="${px(y + p.heightPx / 2 + 4)}" text-anchor="middle">no values in epochs.csv</text>`);
    if (p.label === 'East') plotted = lines.vertices;
    parts.push(`<g class="series" data-series="${esc(p.label.toLowerCase())}" fill="none" stroke="${p.colour}" stroke-width="1.3" stroke-linejoin="round">${lines.svg}</g>`);
    y += p.heightPx + 10;
  }
  // Solution kind strip: one rectangle per run of equal kind among the plotted epochs.
  const kinds = kindsInOrder(ep.kind);
  const unknown = new Map<string, number>();
  const colourOf = (k: string) => { if (!unknown.has(k)) unknown.set(k, unknown.size); return kindColour(k, unknown.get(k)!); };
  const strip: string[] = [];
  for (let a = 0; a < idx.length;) {
    let b = a;
    while (b + 1 < idx.length && ep.kind[idx[b + 1]] === ep.kind[idx[a]]) b++;
    const xa = a === 0 ? x(ep.timeGpsS[idx[a]]) : (x(ep.timeGpsS[idx[a - 1]]) + x(ep.timeGpsS[idx[a]])) / 2;
    const xb = b === idx.length - 1 ? x(ep.timeGpsS[idx[b]]) : (x(ep.timeGpsS[idx[b]]) + x(ep.timeGpsS[idx[b + 1]])) / 2;
    strip.push(`<rect class="kind-run" data-kind="${esc(ep.kind[idx[a]])}" x="${px(xa)}" y="${px(y)}" width="${px(Math.max(0.6, xb - xa))}" height="18" fill="${colourOf(ep.kind[idx[a]])}"/>`);
    a = b + 1;
  }
  parts.push(`<text class="axis-label" x="${LEFT - 6}" y="${px(y + 13)}" text-anchor="end">Solution</text><g class="kind-strip">${strip.join('')}</g>`);
  y += 18 + 6;
  // Time axis (UTC).
  const leap = leapSecondsAtGps(t0);
  // Ticks at round UTC minutes/hours, placed on the GPS time axis.
  const ticks = niceTimeTicks(t0 - leap, t1 - leap).map((u) => u + leap);
  const withS = t1 - t0 < 600;
  // Vertical grid lines beneath everything else; the tick labels under the strip.
  parts.unshift(`<g class="axis">${ticks.map((t) => `<line x1="${px(x(t))}" y1="${TOP}" x2="${px(x(t))}" y2="${px(y - 6)}" class="grid"/>`).join('')}</g>`);
  parts.push(`<g class="axis">${ticks.map((t) => `<text x="${px(x(t))}" y="${px(y + 14)}" text-anchor="middle">${clockText(t, leap, withS)}</text>`).join('')}</g>`);
  parts.push(`<text class="axis-label" x="${px((LEFT + W - RIGHT) / 2)}" y="${px(y + 32)}" text-anchor="middle">UTC time</text>`);
  const height = Math.ceil(y + 40);
  const legend = legendHtml(kinds.map(([k, c], i) => ({ colour: colourOf(k) ?? kindColour(k, i), label: `${k}: ${c.toLocaleString('en-US')} epochs` })));
  const offsets = panels.slice(0, 3).map((p) => `${p.label.toLowerCase()} ${p.offset.toFixed(3)} m`).join(', ');
  return chartFigure({
    chart: 'time-series', title: 'Position, satellites, PDOP and solution kind against time', widthPx: W, heightPx: height,
    body: parts.join(''),
    caption: [
      `East/north/up are local coordinates at the reference, drawn minus their median (${offsets}).`,
      `${decimationNote(idx.length, n, stride, 'epochs')}.`,
      'A line breaks where epochs are missing or have no position.',
    ],
    data: { epochs: n, stride, 'epochs-drawn': idx.length, 'positions-drawn': plotted },
    after: legend,
  });
}

function panelAxes(p: Panel, ys: LinearScale, top: number, x: LinearScale): string {
  const [lo, hi] = ys.domain;
  const ticks = niceTicks(lo, hi, 3);
  const dec = p.step ? 0 : tickDecimals(ticks);
  const x0 = x.domain[0], x1 = x.domain[1];
  return `<g class="axis"><rect class="panel" x="${px(x(x0))}" y="${px(top)}" width="${px(x(x1) - x(x0))}" height="${p.heightPx}"/>` +
    ticks.map((t) => `<line class="grid" x1="${px(x(x0))}" x2="${px(x(x1))}" y1="${px(ys(t))}" y2="${px(ys(t))}"/><text x="${px(x(x0) - 4)}" y="${px(ys(t) + 4)}" text-anchor="end">${t.toFixed(dec)}</text>`).join('') +
    `<text class="axis-label" transform="translate(14 ${px(top + p.heightPx / 2)}) rotate(-90)" text-anchor="middle">${esc(p.label)}${p.unit ? ` (${p.unit})` : ''}</text></g>`;
}

/** Polylines through the finite values, broken at gaps; vertices = values drawn. */
function polylines(idx: readonly number[], vals: readonly number[], t: ArrayLike<number>, x: LinearScale, y: LinearScale, gapS: number): { svg: string; vertices: number } {
  const out: string[] = [];
  let cur: string[] = [];
  let lastT = NaN;
  let vertices = 0;
  const flush = () => { if (cur.length) out.push(`<polyline points="${cur.join(' ')}"/>`); cur = []; };
  for (let j = 0; j < idx.length; j++) {
    const v = vals[j];
    if (!Number.isFinite(v)) { flush(); continue; }
    const ti = t[idx[j]];
    if (cur.length && ti - lastT > gapS) flush();
    cur.push(`${px(x(ti))},${px(y(v))}`);
    lastT = ti;
    vertices++;
  }
  flush();
  return { svg: out.join(''), vertices };
}

/** Time ticks at round minutes or hours (common practice). */
function niceTimeTicks(t0: number, t1: number): number[] {
  const span = t1 - t0;
  const steps = [10, 30, 60, 120, 300, 600, 900, 1800, 3600, 7200, 10800, 21600];
  const step = steps.find((s) => span / s <= 8) ?? 43200;
  const out: number[] = [];
  for (let t = Math.ceil(t0 / step) * step; t <= t1; t += step) out.push(t);
  return out;
}
