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

/**
 * Positions collected one at a time as interleaved ECEF x, y, z (m) in one growing Float64Array: a day at
 * 1 Hz is 2 MB, where as many small objects take several times that and stay in the collector's old
 * generation.
 */
export class PositionSeries {
  // Small at first: the growth is met (and its type feedback recorded) in the first epochs, before push()
  // and its callers are optimised, so a growth later in a run does not deoptimise them.
  private xyz = new Float64Array(3 * 16);
  length = 0;

  push(p: EcefM): void {
    if (3 * this.length === this.xyz.length) {
      const b = new Float64Array(2 * this.xyz.length);
      b.set(this.xyz);
      this.xyz = b;
    }
    const i = 3 * this.length++;
    this.xyz[i] = p.x; this.xyz[i + 1] = p.y; this.xyz[i + 2] = p.z;
  }

  /** Position i as x, y, z (m). */
  x(i: number): number { return this.xyz[3 * i]; }
  y(i: number): number { return this.xyz[3 * i + 1]; }
  z(i: number): number { return this.xyz[3 * i + 2]; }
}

/** The percentile of percentile() over typed values (finite ones, sorted ascending). */
function percentileOfTyped(values: Float64Array, p: number): number {
  let n = 0;
  const all = new Float64Array(values.length);
  for (const v of values) if (Number.isFinite(v)) all[n++] = v;
  const xs = all.subarray(0, n).sort();
  if (n === 0) return NaN;
  const h = (n - 1) * p;
  const lo = Math.floor(h);
  const hi = Math.min(lo + 1, n - 1);
  return xs[lo] + (h - lo) * (xs[hi] - xs[lo]);
}

function maxOfTyped(values: Float64Array): number {
  let m = -Infinity;
  for (const v of values) {
    if (Number.isNaN(v)) return NaN;
    if (v > m) m = v;
  }
  return values.length ? m : NaN;
}

function rmsOfTyped(values: Float64Array): number {
  if (values.length === 0) return NaN;
  let s = 0;
  for (const v of values) s += v * v;
  return Math.sqrt(s / values.length);
}

/** positionScatter() of a PositionSeries: the same figures, without an object per position. */
export function seriesScatter(series: PositionSeries): ScatterStats {
  const n = series.length;
  if (n === 0) return positionScatter([]);
  // Mean as meanEcef: differences from the first point, summed in order.
  const ox = series.x(0), oy = series.y(0), oz = series.z(0);
  let sx = 0, sy = 0, sz = 0;
  for (let i = 0; i < n; i++) { sx += series.x(i) - ox; sy += series.y(i) - oy; sz += series.z(i) - oz; }
  const m = { x: ox + sx / n, y: oy + sy / n, z: oz + sz / n };
  const g = ecefToGeodetic(m);
  const e = new Float64Array(n), nn = new Float64Array(n), u = new Float64Array(n), h = new Float64Array(n), ua = new Float64Array(n);
  for (let i = 0; i < n; i++) {
    const d = ecefDeltaToEnu({ x: series.x(i) - m.x, y: series.y(i) - m.y, z: series.z(i) - m.z }, g.latRad, g.lonRad);
    e[i] = d.e; nn[i] = d.n; u[i] = d.u;
    h[i] = Math.hypot(d.e, d.n); ua[i] = Math.abs(d.u);
  }
  const rmsE = rmsOfTyped(e), rmsN = rmsOfTyped(nn), rmsU = rmsOfTyped(u);
  return {
    count: n,
    horizontalMedianM: percentileOfTyped(h, 0.5),
    horizontal95M: percentileOfTyped(h, 0.95),
    horizontalMaxM: maxOfTyped(h),
    verticalMedianM: percentileOfTyped(ua, 0.5),
    vertical95M: percentileOfTyped(ua, 0.95),
    verticalMaxM: maxOfTyped(ua),
    rmsEastM: rmsE,
    rmsNorthM: rmsN,
    rmsUpM: rmsU,
    // As horizontalVerticalStats (FGDC-STD-007.3-1998 section 3.2.2).
    nssdaHorizontal95M: 1.7308 * Math.hypot(rmsE, rmsN),
    nssdaVertical95M: 1.96 * rmsU,
    meanEcef: m,
  };
}
