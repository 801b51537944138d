/**
 * Plan view: the rover's track and the points in local east/north metres at the reference, each point
 * with its 95 % precision ellipse and, when it was checked, the published mark it was compared with.
 */
import { chartFigure, legendHtml } from './chart-frame.js';
import { decimatedIndices, decimationNote, decimationStride } from './decimate.js';
import { OKABE_ITO } from './palette.js';
import type { EpochSeries, ReportControlCheck, ReportPoint } from './report-data.js';
import { esc, linearScale, niceTicks, px, roundDown125, tickDecimals } from './svg-kit.js';

export const PLAN_MAX_EPOCHS = 1500;
/** sqrt of the chi-square 95 % quantile with 2 degrees of freedom: 2.4477 (a bivariate normal's 95 % ellipse, any statistics text). */
export const ELLIPSE_95_SCALE = Math.sqrt(-2 * Math.log(0.05));

// A square panel (equal scale on both axes) with the scale bar above it.
const M = 54, TOP = 30, SIDE = 520, W = M + SIDE + 12, H = TOP + SIDE + 46;

/** `origin`: what east/north are about when not the reference coordinate (e.g. 'the point P1'). */
export function planChart(ep: EpochSeries | null, points: readonly ReportPoint[], check: ReportControlCheck | null, origin?: string): string {
  const about = origin || 'the reference';
  const n = ep?.timeGpsS.length ?? 0;
  const stride = decimationStride(n, PLAN_MAX_EPOCHS);
  const idx = ep ? decimatedIndices(n, stride, (i) => Number.isFinite(ep.eastM[i]) && Number.isFinite(ep.northM[i])) : [];
  const pts = points.filter((p) => Number.isFinite(p.eastM) && Number.isFinite(p.northM));
  const marks = check ? check.pairs.map((c) => {
    const p = pts.find((q) => q.name === c.point);
    // The check's differences are point minus mark, east/north at the mark (metres: the rotation between
    // the two local frames is negligible over a few metres).
    return p ? { pair: c, eastM: p.eastM - c.dEastM, northM: p.northM - c.dNorthM, p } : null;
  }).filter((m): m is NonNullable<typeof m> => m !== null) : [];
  // Extent: track, points with their ellipses, marks; equal scale on both axes.
  let e0 = Infinity, e1 = -Infinity, n0 = Infinity, n1 = -Infinity;
  const grow = (e: number, nn: number, r = 0) => { e0 = Math.min(e0, e - r); e1 = Math.max(e1, e + r); n0 = Math.min(n0, nn - r); n1 = Math.max(n1, nn + r); };
  for (const i of idx) grow(ep!.eastM[i], ep!.northM[i]);
  for (const p of pts) grow(p.eastM, p.northM, ELLIPSE_95_SCALE * Math.max(p.sigmaMeanEastM || 0, p.sigmaMeanNorthM || 0));
  for (const m of marks) grow(m.eastM, m.northM);
  if (!(e1 >= e0)) { e0 = -1; e1 = 1; n0 = -1; n1 = 1; }
  const span = Math.max(e1 - e0, n1 - n0, 2) * 1.1;
  const ce = (e0 + e1) / 2, cn = (n0 + n1) / 2;
  const x = linearScale(ce - span / 2, ce + span / 2, M, M + SIDE);
  const y = linearScale(cn - span / 2, cn + span / 2, TOP + SIDE, TOP);
  const kx = SIDE / span; // px per metre, both axes
  const parts: string[] = [];
  const ticksE = niceTicks(ce - span / 2, ce + span / 2, 5), ticksN = niceTicks(cn - span / 2, cn + span / 2, 5);
  const dec = tickDecimals(ticksE);
  parts.push(`<rect class="panel" x="${M}" y="${TOP}" width="${SIDE}" height="${SIDE}"/>`);
  parts.push(`<g class="axis">${ticksE.map((t) => `<line class="grid" x1="${px(x(t))}" x2="${px(x(t))}" y1="${TOP}" y2="${TOP + SIDE}"/><text x="${px(x(t))}" y="${TOP + SIDE + 16}" text-anchor="middle">${t.toFixed(dec)}</text>`).join('')}` +
    `${ticksN.map((t) => `<line class="grid" y1="${px(y(t))}" y2="${px(y(t))}" x1="${M}" x2="${M + SIDE}"/><text x="${M - 4}" y="${px(y(t) + 4)}" text-anchor="end">${t.toFixed(dec)}</text>`).join('')}` +
    `<text class="axis-label" x="${px((M + W) / 2)}" y="${H - 6}" text-anchor="middle">East of ${esc(about)} (m)</text>` +
    `<text class="axis-label" transform="translate(14 ${px(H / 2)}) rotate(-90)" text-anchor="middle">North of ${esc(about)} (m)</text></g>`);
  if (idx.length) {
    parts.push(`<polyline class="track" fill="none" stroke="${OKABE_ITO.skyBlue}" stroke-width="1.2" stroke-linejoin="round" points="${idx.map((i) => `${px(x(ep!.eastM[i]))},${px(y(ep!.northM[i]))}`).join(' ')}"/>`);
  }
  for (const m of marks) {
    const mx = x(m.eastM), my = y(m.northM);
    parts.push(`<g class="mark-control" data-mark="${esc(m.pair.mark)}"><line x1="${px(mx)}" y1="${px(my)}" x2="${px(x(m.p.eastM))}" y2="${px(y(m.p.northM))}" stroke="${OKABE_ITO.black}" stroke-dasharray="3 2"/>` +
      `<path d="M${px(mx)} ${px(my - 7)}l6 11h-12z" fill="none" stroke="${m.pair.pass ? OKABE_ITO.black : OKABE_ITO.vermillion}" stroke-width="1.8"><title>${esc(`mark ${m.pair.mark}: horizontal difference ${m.pair.horizontalM.toFixed(3)} m, ${m.pair.pass ? 'pass' : 'FAIL'}`)}</title></path></g>`);
  }
  for (const p of pts) {
    const px0 = x(p.eastM), py0 = y(p.northM);
    const rx = ELLIPSE_95_SCALE * (p.sigmaMeanEastM || 0) * kx, ry = ELLIPSE_95_SCALE * (p.sigmaMeanNorthM || 0) * kx;
    parts.push(`<g class="mark-point" data-point="${esc(p.name)}">` +
      (rx > 0 || ry > 0 ? `<ellipse class="ellipse95" cx="${px(px0)}" cy="${px(py0)}" rx="${px(Math.max(rx, 0.5))}" ry="${px(Math.max(ry, 0.5))}" fill="${OKABE_ITO.orange}" fill-opacity="0.25" stroke="${OKABE_ITO.orange}" stroke-width="1.5"/>` : '') +
      `<circle cx="${px(px0)}" cy="${px(py0)}" r="3.5" fill="${p.tolerance === 'ok' ? OKABE_ITO.blue : OKABE_ITO.vermillion}"/>` +
      `<text class="point-label" x="${px(px0 + 7)}" y="${px(py0 - 6)}">${esc(p.name)}</text>` +
      `<title>${esc(`${p.name}: east ${p.eastM.toFixed(3)} m, north ${p.northM.toFixed(3)} m; 95 % ellipse semi-axes ${(ELLIPSE_95_SCALE * p.sigmaMeanEastM).toFixed(3)} / ${(ELLIPSE_95_SCALE * p.sigmaMeanNorthM).toFixed(3)} m`)}</title></g>`);
  }
  // Scale bar: a round length near a fifth of the width.
  const bar = roundDown125(span / 5);
  parts.push(`<g class="scale-bar"><line x1="${px(M + SIDE - bar * kx)}" x2="${M + SIDE}" y1="${TOP - 8}" y2="${TOP - 8}" stroke="#000" stroke-width="2"/><text x="${px(M + SIDE - bar * kx - 6)}" y="${TOP - 4}" text-anchor="end">${bar} m</text></g>`);
  const legend = legendHtml([
    ...(idx.length ? [{ colour: OKABE_ITO.skyBlue, label: 'track (epoch positions)', shape: 'line' as const }] : []),
    { colour: OKABE_ITO.blue, label: 'point within tolerance', shape: 'dot' },
    { colour: OKABE_ITO.vermillion, label: 'point exceeding tolerance', shape: 'dot' },
    { colour: OKABE_ITO.orange, label: '95 % ellipse of the mean', shape: 'box' },
    ...(marks.length ? [{ colour: OKABE_ITO.black, label: 'published control mark (red: failed)', shape: 'triangle' as const }] : []),
  ]);
  return chartFigure({
    chart: 'plan', title: 'Track, points and control marks', widthPx: W, heightPx: H, body: parts.join(''),
    caption: [
      origin ? `Local east/north about ${origin} (no reference coordinate in this folder), equal scale on both axes.` : 'Local east/north at the reference coordinate, equal scale on both axes.',
      'Ellipses: 95 % (2.4477 sigma) from sigma_mean east/north, axes along east and north (points.csv gives no east-north correlation); at this scale they may be too small to see: the occupation charts below show each point\'s scatter.',
      ep ? `Track of the epoch positions. ${decimationNote(idx.length, n, stride, 'epochs')}.` : 'No epochs.csv: no track.',
    ],
    data: { points: pts.length, marks: marks.length, 'track-vertices': idx.length, stride },
    after: legend,
  });
}
