/**
 * Sky plot: each satellite's track in azimuth/elevation as seen from the rover (from the residual rows),
 * coloured by constellation; satellites never used in a solution are dashed.
 */
import { chartFigure, legendHtml } from './chart-frame.js';
import { CATEGORY_COLOURS, SYSTEM_NAMES, systemColour } from './palette.js';
import type { ResidualSeries, SkySeries } from './report-data.js';
import { esc, finiteRange, px } from './svg-kit.js';

/** Largest number of vertices per satellite track. */
export const SKY_MAX_VERTICES_PER_SATELLITE = 180;
const S = 440, R = 180, C = S / 2;

export interface SkyTrack { readonly satellite: string; readonly rows: number[]; readonly used: boolean }

/** Per satellite with at least one finite azimuth/elevation: the rows drawn (at most one per span / 180). */
export function skyTracks(rs: SkySeries & { readonly rejection?: ArrayLike<number> }): SkyTrack[] {
  const [t0, t1] = finiteRange(rs.timeGpsS);
  const minDtS = Math.max(0, (t1 - t0) / SKY_MAX_VERTICES_PER_SATELLITE);
  const rows = rs.satellites.map(() => [] as number[]);
  const last = rs.satellites.map(() => -Infinity);
  const used = rs.satellites.map(() => !rs.rejection);
  for (let i = 0; i < rs.timeGpsS.length; i++) {
    const s = rs.satellite[i];
    if (rs.rejection && rs.rejection[i] === 0) used[s] = true;
    if (!Number.isFinite(rs.azimuthDeg[i]) || !Number.isFinite(rs.elevationDeg[i])) continue;
    if (rs.timeGpsS[i] - last[s] < minDtS) continue;
    rows[s].push(i);
    last[s] = rs.timeGpsS[i];
  }
  return rs.satellites.map((satellite, s) => ({ satellite, rows: rows[s], used: used[s] })).filter((t) => t.rows.length > 0).sort((a, b) => a.satellite.localeCompare(b.satellite));
}

function polar(azDeg: number, elDeg: number): [number, number] {
  const r = (R * (90 - Math.max(0, Math.min(90, elDeg)))) / 90;
  const a = (azDeg * Math.PI) / 180;
  return [C + r * Math.sin(a), C - r * Math.cos(a)];
}

/** Polylines of one track, broken where the satellite was not seen for more than 10 minutes or 3 drawn steps. */
function trackLines(sky: SkySeries, rows: readonly number[], minStepS: number, attrs: string): string {
  const segments: string[][] = [[]];
  rows.forEach((row, j) => {
    if (j > 0 && sky.timeGpsS[row] - sky.timeGpsS[rows[j - 1]] > Math.max(600, 3 * minStepS)) segments.push([]);
    const [x, y] = polar(sky.azimuthDeg[row], sky.elevationDeg[row]);
    segments[segments.length - 1].push(`${px(x)},${px(y)}`);
  });
  return segments.map((sg) => `<polyline fill="none" ${attrs} points="${sg.join(' ')}"/>`).join('');
}

export function skyChart(rs: ResidualSeries, elevationMaskDeg: number, reference: SkySeries | null = null): string {
  const tracks = skyTracks(rs);
  const refTracks = reference ? skyTracks(reference) : [];
  const roverSats = new Set(tracks.map((t) => t.satellite));
  const [t0, t1] = finiteRange(rs.timeGpsS);
  const minStepS = (t1 - t0) / SKY_MAX_VERTICES_PER_SATELLITE;
  const parts: string[] = [`<g class="axis">`];
  for (const el of [0, 30, 60]) parts.push(`<circle class="grid" cx="${C}" cy="${C}" r="${px((R * (90 - el)) / 90)}" fill="none"/><text x="${C + 3}" y="${px(C - (R * (90 - el)) / 90 + 12)}">${el}°</text>`);
  if (Number.isFinite(elevationMaskDeg) && elevationMaskDeg > 0) parts.push(`<circle class="mask" cx="${C}" cy="${C}" r="${px((R * (90 - elevationMaskDeg)) / 90)}" fill="none" stroke="#777" stroke-dasharray="2 3"/>`);
  for (const [lbl, az] of [['N', 0], ['E', 90], ['S', 180], ['W', 270]] as const) {
    const [x1, y1] = polar(az, 0);
    const [x2, y2] = polar(az, -12);
    parts.push(`<line class="grid" x1="${C}" y1="${C}" x2="${px(x1)}" y2="${px(y1)}"/><text class="axis-label" x="${px(x2)}" y="${px(y2 + 5)}" text-anchor="middle">${lbl}</text>`);
  }
  parts.push('</g>');
  const systems = new Set<string>();
  // The reference's tracks first (beneath), thin and light; a satellite the rover never saw gets a label.
  for (const t of refTracks) {
    const sys = t.satellite.charAt(0);
    systems.add(sys);
    const last = t.rows[t.rows.length - 1];
    const [lx, ly] = polar(reference!.azimuthDeg[last], reference!.elevationDeg[last]);
    parts.push(`<g class="sat-reference" data-satellite="${esc(t.satellite)}">` +
      trackLines(reference!, t.rows, minStepS, `stroke="${systemColour(sys)}" stroke-opacity="0.45" stroke-width="5" stroke-linecap="round"`) +
      (roverSats.has(t.satellite) ? '' : `<text class="sat-label ref-only" x="${px(lx + 5)}" y="${px(ly - 4)}">${esc(t.satellite)} (reference only)</text>`) + '</g>');
  }
  for (const t of tracks) {
    const sys = t.satellite.charAt(0);
    systems.add(sys);
    const last = t.rows[t.rows.length - 1];
    const [lx, ly] = polar(rs.azimuthDeg[last], rs.elevationDeg[last]);
    const colour = systemColour(sys);
    parts.push(`<g class="sat" data-satellite="${esc(t.satellite)}" data-used="${t.used}">` +
      trackLines(rs, t.rows, minStepS, `stroke="${colour}" stroke-width="${t.used ? 2 : 1.2}"${t.used ? '' : ' stroke-dasharray="4 3"'}`) +
      `<circle cx="${px(lx)}" cy="${px(ly)}" r="3" fill="${colour}"/><text class="sat-label" x="${px(lx + 5)}" y="${px(ly - 4)}">${esc(t.satellite)}</text></g>`);
  }
  const legend = legendHtml([
    ...[...systems].sort().map((s, i) => ({ colour: systemColour(s) ?? CATEGORY_COLOURS[i], label: SYSTEM_NAMES[s] ?? s, shape: 'line' as const })),
    { colour: '#777', label: 'rover (dashed: never used in a solution)', shape: 'line' },
    ...(refTracks.length ? [{ colour: '#bbb', label: 'reference: wide light band', shape: 'box' as const }] : []),
  ]);
  return chartFigure({
    chart: 'sky', title: `Sky plot: ${tracks.length} satellites at the rover${reference ? `, ${refTracks.length} at the reference` : ''}`, widthPx: S, heightPx: S, body: parts.join(''),
    caption: [
      tracks.length ? 'Rover: azimuth/elevation from residuals.csv, the dot ends each track.' : 'Rover: residuals.csv gives no azimuth/elevation, no rover track drawn.',
      reference ? 'Reference: directions from the broadcast ephemerides at the reference coordinate for the satellites it observed (sky.csv).' : 'No sky.csv: the reference receiver\'s satellites are not drawn.',
      `Tracks drawn with at most ${SKY_MAX_VERTICES_PER_SATELLITE} vertices per satellite.`,
      Number.isFinite(elevationMaskDeg) ? `Dotted ring: elevation mask ${elevationMaskDeg}°.` : '',
    ].filter(Boolean),
    data: { satellites: tracks.length, 'reference-satellites': refTracks.length },
    after: legend,
  });
}
