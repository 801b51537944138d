/**
 * The real static run of ../shared/data/cors-and-rover-2018-277 (see its README): loaders and the
 * comparison of engine solutions with the rover's carrier-phase truth (rows of fix quality 4).
 */
import { readFileSync } from 'node:fs';
import { ecefToEnu } from '../../packages/core/src/geodesy/index.js';
import { mergeNav, readNav } from '../../packages/core/src/rinex/nav-reader.js';
import { readObsStream } from '../../packages/core/src/rinex/obs-reader.js';
import type { EcefM } from '../../packages/core/src/gnss/types.js';
import type { EpochSolution } from '../../packages/core/src/session/index.js';
import { dataPath } from './shared.js';

export const RUN = 'cors-and-rover-2018-277/';

async function* text(path: string): AsyncIterable<string> {
  yield readFileSync(path, 'latin1');
}

export const openObs = (rel: string) => readObsStream(rel.split('/').pop()!, text(dataPath(RUN + rel)));

export async function corsNav() {
  const parts = [];
  for (const f of ['glw1277m.18n', 'glw1277m.18g', 'glw1277n.18n', 'glw1277n.18g']) parts.push(await readNav(f, text(dataPath(RUN + 'reference/' + f))));
  return mergeNav(parts);
}

/** Truth rows of fix quality 4 keyed by whole GPS second. */
export function roverTruth(): Map<number, EcefM> {
  const out = new Map<number, EcefM>();
  const lines = readFileSync(dataPath(RUN + 'static-run/rover-truth.csv'), 'utf8').split(/\r?\n/).slice(1);
  for (const line of lines) {
    const f = line.split(',');
    if (f.length < 7 || f[6].trim() !== '4') continue;
    out.set(Math.round(Number(f[0]) * 604800 + Number(f[1])), { x: Number(f[2]), y: Number(f[3]), z: Number(f[4]) });
  }
  return out;
}

export function percentile(values: readonly number[], p: number): number {
  const s = [...values].sort((a, b) => a - b);
  return s[Math.min(s.length - 1, Math.floor(p * s.length))];
}

export interface ErrorStats {
  readonly compared: number;
  readonly solved: number;
  readonly epochs: number;
  readonly meanEnu: [number, number, number];
  readonly h50: number;
  readonly h95: number;
  readonly v95: number;
  /** Same after removing the mean offset. */
  readonly h95Demeaned: number;
  readonly h50Demeaned: number;
  readonly v95Demeaned: number;
}

/** Errors of solutions against a truth function (ENU at the truth point). */
export function errorStats(solutions: readonly EpochSolution[], truthAt: (s: EpochSolution) => EcefM | undefined): ErrorStats {
  const enu: [number, number, number][] = [];
  let solved = 0;
  for (const s of solutions) {
    if (!s.position) continue;
    solved++;
    const t = truthAt(s);
    if (!t) continue;
    const e = ecefToEnu(s.position.ecef, t);
    enu.push([e.e, e.n, e.u]);
  }
  const mean = [0, 1, 2].map((i) => enu.reduce((a, r) => a + r[i], 0) / enu.length) as [number, number, number];
  const h = enu.map((r) => Math.hypot(r[0], r[1]));
  const v = enu.map((r) => Math.abs(r[2]));
  const hd = enu.map((r) => Math.hypot(r[0] - mean[0], r[1] - mean[1]));
  const vd = enu.map((r) => Math.abs(r[2] - mean[2]));
  return {
    compared: enu.length, solved, epochs: solutions.length, meanEnu: mean,
    h50: percentile(h, 0.5), h95: percentile(h, 0.95), v95: percentile(v, 0.95),
    h50Demeaned: percentile(hd, 0.5), h95Demeaned: percentile(hd, 0.95), v95Demeaned: percentile(vd, 0.95),
  };
}

export const fmt = (s: ErrorStats) =>
  `solved ${s.solved}/${s.epochs}, compared ${s.compared}: H50 ${s.h50.toFixed(2)} H95 ${s.h95.toFixed(2)} V95 ${s.v95.toFixed(2)} m; ` +
  `mean E/N/U ${s.meanEnu.map((x) => x.toFixed(2)).join('/')} m; demeaned H50 ${s.h50Demeaned.toFixed(2)} H95 ${s.h95Demeaned.toFixed(2)} V95 ${s.v95Demeaned.toFixed(2)} m`;
