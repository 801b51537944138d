/**
 * One small scatter per occupation: each epoch's east/north about the point's mean, with the circle
 * that holds 95 % of a bivariate normal with the point's per-epoch standard deviations.
 */
import { circularErrorRadiusM } from '../accuracy/index.js';
import { chartFigure } from './chart-frame.js';
import { decimatedIndices, decimationNote, decimationStride } from './decimate.js';
import { OKABE_ITO } from './palette.js';
import type { EpochSeries, ReportCheckPair, ReportPoint } from './report-data.js';
import { esc, linearScale, niceTicks, px, tickDecimals } from './svg-kit.js';

export const OCCUPATION_MAX_EPOCHS = 800;
const S = 300, M = 44;

/** Half-width of the time window matching epochs to an occupation's first/last epoch tags (s): tags and estimated GPS time differ by the receiver clock offset (milliseconds). */
export const OCCUPATION_WINDOW_SLACK_S = 0.5;

/**
 * Epoch indices of an occupation with a position: by the epochs' point column when any epoch carries
 * the point's name (event flags, windows), else by the occupation's time window (static detection).
 */
export function occupationEpochs(ep: EpochSeries, p: Pick<ReportPoint, 'name' | 'startGpsS' | 'endGpsS'>): number[] {
  const out: number[] = [];
  const byName = ep.point.includes(p.name);
  const t0 = p.startGpsS - OCCUPATION_WINDOW_SLACK_S, t1 = p.endGpsS + OCCUPATION_WINDOW_SLACK_S;
  for (let i = 0; i < ep.point.length; i++) {
    const inside = byName ? ep.point[i] === p.name : ep.timeGpsS[i] >= t0 && ep.timeGpsS[i] <= t1;
    if (inside && Number.isFinite(ep.eastM[i]) && Number.isFinite(ep.northM[i])) out.push(i);
  }
  return out;
}

/** The 95 % radius of the per-epoch scatter (accuracy/circular-error.ts). */
export function scatterRadius95M(p: ReportPoint): number {
  return Number.isFinite(p.sdEastM) && Number.isFinite(p.sdNorthM) ? circularErrorRadiusM(0.95, p.sdEastM, p.sdNorthM) : NaN;
}

/** `mark`: the control check of this point, drawn as the published mark's position relative to the point's mean. */
export function occupationChart(ep: EpochSeries, p: ReportPoint, mark: ReportCheckPair | null = null): string {
  const all = occupationEpochs(ep, p);
  const stride = decimationStride(all.length, OCCUPATION_MAX_EPOCHS);
  const idx = decimatedIndices(all.length, stride).map((j) => all[j]);
  let ce = p.eastM, cn = p.northM;
  if (!Number.isFinite(ce) || !Number.isFinite(cn)) {
    ce = all.reduce((s, i) => s + ep.eastM[i], 0) / Math.max(1, all.length);
    cn = all.reduce((s, i) => s + ep.northM[i], 0) / Math.max(1, all.length);
  }
  const r95 = scatterRadius95M(p);
  let half = Number.isFinite(r95) ? r95 * 1.25 : 0.1;
  for (const i of idx) half = Math.max(half, Math.abs(ep.eastM[i] - ce) * 1.05, Math.abs(ep.northM[i] - cn) * 1.05);
  // The check's differences are point minus mark: the mark is at minus them from the point.
  const me = mark ? -mark.dEastM : NaN, mn = mark ? -mark.dNorthM : NaN;
  if (Number.isFinite(me) && Number.isFinite(mn)) half = Math.max(half, Math.abs(me) * 1.15, Math.abs(mn) * 1.15);
  half = Math.max(half, 0.01);
  const x = linearScale(-half, half, M, S - 10), y = linearScale(-half, half, S - M + 10, 10);
  const k = (S - 10 - M) / (2 * half);
  const ticks = niceTicks(-half, half, 4);
  const dec = tickDecimals(ticks);
  const dots = idx.map((i) => `<circle cx="${px(x(ep.eastM[i] - ce))}" cy="${px(y(ep.northM[i] - cn))}" r="1.6"/>`).join('');
  const body = `<rect class="panel" x="${M}" y="10" width="${S - 10 - M}" height="${S - M}"/>` +
    `<g class="axis">${ticks.map((t) => `<line class="grid" x1="${px(x(t))}" x2="${px(x(t))}" y1="10" y2="${S - M + 10}"/><text x="${px(x(t))}" y="${S - M + 24}" text-anchor="middle">${t.toFixed(dec)}</text>` +
      `<line class="grid" y1="${px(y(t))}" y2="${px(y(t))}" x1="${M}" x2="${S - 10}"/><text x="${M - 4}" y="${px(y(t) + 4)}" text-anchor="end">${t.toFixed(dec)}</text>`).join('')}` +
    `<text class="axis-label" x="${px((M + S) / 2)}" y="${S - 4}" text-anchor="middle">East (m)</text><text class="axis-label" transform="translate(12 ${px(S / 2)}) rotate(-90)" text-anchor="middle">North (m)</text></g>` +
    `<g class="epoch-dots" fill="${OKABE_ITO.blue}" fill-opacity="0.55">${dots}</g>` +
    (Number.isFinite(r95) ? `<circle class="radius95" cx="${px(x(0))}" cy="${px(y(0))}" r="${px(r95 * k)}" fill="none" stroke="${OKABE_ITO.vermillion}" stroke-width="1.8"/>` : '') +
    `<path d="M${px(x(0) - 6)} ${px(y(0))}h12M${px(x(0))} ${px(y(0) - 6)}v12" stroke="#000" stroke-width="1.5"/>` +
    (mark && Number.isFinite(me) && Number.isFinite(mn)
      ? `<path class="mark-control" d="M${px(x(me))} ${px(y(mn) - 7)}l6 11h-12z" fill="none" stroke="${mark.pass ? '#000' : OKABE_ITO.vermillion}" stroke-width="2"/>`
      : '');
  return chartFigure({
    chart: 'occupation', className: 'small', title: `${p.name}: ${all.length.toLocaleString('en-US')} epochs about the mean`, widthPx: S, heightPx: S, body,
    caption: [
      Number.isFinite(r95) ? `Red circle: 95 % radius ${r95.toFixed(3)} m of the per-epoch scatter (sd east ${p.sdEastM.toFixed(3)} m, north ${p.sdNorthM.toFixed(3)} m).` : 'No scatter figures for this point.',
      ...(mark ? [`Triangle: published mark ${mark.mark}, ${mark.horizontalM.toFixed(3)} m horizontally from the point (${mark.pass ? 'pass' : 'FAIL'}).`] : []),
      // A carrier-phase point averages its fixed epochs alone when they are enough (report/points-summary.ts, chooseEpochs): the dots are every epoch of the occupation.
      ...(p.epochs > 0 && p.epochs !== all.length ? [`The point's coordinate averages ${p.epochs.toLocaleString('en-US')} of these epochs${p.solutionKinds ? ` (${p.solutionKinds})` : ''}.`] : []),
      `${decimationNote(idx.length, all.length, stride, 'epochs')}.`,
    ],
    data: { point: p.name, epochs: all.length, 'epochs-drawn': idx.length },
  });
}
