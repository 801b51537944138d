/**
 * Descriptive statistics for the reports: percentiles, scatter of positions about their mean, errors
 * against a truth.
 */
import type { EcefM, EnuM } from '../gnss/index.js';
import { ecefToGeodetic } from '../geodesy/index.js';
import { ecefDeltaToEnu } from '../geodesy/index.js';

/**
 * Percentile by linear interpolation between closest ranks: h = (n - 1) p, x[floor h] + (h - floor h)
 * (x[floor h + 1] - x[floor h]) (Hyndman & Fan 1996, "Sample quantiles in statistical packages",
 * definition 7). `p` in [0, 1]. NaN for an empty sample.
 */
export function percentile(values: readonly number[], p: number): number {
  if (!(p >= 0 && p <= 1)) throw new RangeError(`percentile p must be in [0, 1], got ${p}`);
  const xs = values.filter(Number.isFinite).sort((a, b) => a - b);
  if (xs.length === 0) return NaN;
  const h = (xs.length - 1) * p;
  const lo = Math.floor(h);
  const hi = Math.min(lo + 1, xs.length - 1);
  return xs[lo] + (h - lo) * (xs[hi] - xs[lo]);
}

export function mean(values: readonly number[]): number {
  if (values.length === 0) return NaN;
  let s = 0;
  for (const v of values) s += v;
  return s / values.length;
}

/** Root mean square. */
export function rms(values: readonly number[]): number {
  if (values.length === 0) return NaN;
  let s = 0;
  for (const v of values) s += v * v;
  return Math.sqrt(s / values.length);
}

/** Horizontal and vertical error (or scatter) figures of a set of ENU differences. */
export interface HorizontalVerticalStats {
  readonly count: number;
  readonly horizontalMedianM: number;
  readonly horizontal95M: number;
  readonly horizontalMaxM: number;
  readonly verticalMedianM: number;
  readonly vertical95M: number;
  readonly verticalMaxM: number;
  readonly rmsEastM: number;
  readonly rmsNorthM: number;
  readonly rmsUpM: number;
  /** NSSDA horizontal accuracy at 95 %: 1.7308 RMSE_r (valid when RMSE_x ~ RMSE_y). FGDC-STD-007.3-1998 section 3.2.2. */
  readonly nssdaHorizontal95M: number;
  /** NSSDA vertical accuracy at 95 %: 1.9600 RMSE_z. FGDC-STD-007.3-1998 section 3.2.2. */
  readonly nssdaVertical95M: number;
}

/** Statistics of ENU differences: horizontal = sqrt(e^2 + n^2), vertical = |u|. */
export function horizontalVerticalStats(d: readonly EnuM[]): HorizontalVerticalStats {
  const h = d.map((v) => Math.hypot(v.e, v.n));
  const u = d.map((v) => Math.abs(v.u));
  const rmsE = rms(d.map((v) => v.e));
  const rmsN = rms(d.map((v) => v.n));
  const rmsU = rms(d.map((v) => v.u));
  return {
    count: d.length,
    horizontalMedianM: percentile(h, 0.5),
    horizontal95M: percentile(h, 0.95),
    horizontalMaxM: h.length ? Math.max(...h) : NaN,
    verticalMedianM: percentile(u, 0.5),
    vertical95M: percentile(u, 0.95),
    verticalMaxM: u.length ? Math.max(...u) : NaN,
    rmsEastM: rmsE,
    rmsNorthM: rmsN,
    rmsUpM: rmsU,
    // FGDC-STD-007.3-1998 (NSSDA) 3.2.2: RMSE_r = sqrt(RMSE_x^2 + RMSE_y^2); accuracy_r = 1.7308 RMSE_r.
    nssdaHorizontal95M: 1.7308 * Math.hypot(rmsE, rmsN),
    nssdaVertical95M: 1.96 * rmsU,
  };
}

/** ENU differences of positions from a point, rotated at that point (WGS-84 ellipsoid normal). */
export function enuDifferences(positions: readonly EcefM[], origin: EcefM): EnuM[] {
  const g = ecefToGeodetic(origin);
  return positions.map((p) => ecefDeltaToEnu({ x: p.x - origin.x, y: p.y - origin.y, z: p.z - origin.z }, g.latRad, g.lonRad));
}

export function meanEcef(positions: readonly EcefM[]): EcefM | null {
  if (positions.length === 0) return null;
  // Differences from the first point keep the sum well conditioned at 6e6 m magnitudes.
  const o = positions[0];
  let x = 0, y = 0, z = 0;
  for (const p of positions) { x += p.x - o.x; y += p.y - o.y; z += p.z - o.z; }
  const n = positions.length;
  return { x: o.x + x / n, y: o.y + y / n, z: o.z + z / n };
}

export interface ScatterStats extends HorizontalVerticalStats {
  /** Mean position the scatter is about (ECEF m), null for no positions. */
  readonly meanEcef: EcefM | null;
}

/** Scatter of epoch positions about their own mean (precision, not accuracy). */
export function positionScatter(positions: readonly EcefM[]): ScatterStats {
  const m = meanEcef(positions);
  const d = m ? enuDifferences(positions, m) : [];
  return { ...horizontalVerticalStats(d), meanEcef: m };
}
