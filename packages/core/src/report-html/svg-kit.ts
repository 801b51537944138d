/** Small pieces shared by the charts: escaping, number text, linear scales and "nice" axis ticks. */

/** Text for HTML/SVG content and attribute values. */
export function esc(s: string): string {
  return s.replace(/&/g, '&amp;').replace(/</g, '&lt;').replace(/>/g, '&gt;').replace(/"/g, '&quot;').replace(/'/g, '&#39;');
}

/** A pixel coordinate with one decimal (keeps a day of data small). */
export function px(v: number): string {
  return (Math.round(v * 10) / 10).toString();
}

/** Number text for tables: fixed decimals, '' for NaN. */
export function num(v: number, decimals: number): string {
  return Number.isFinite(v) ? v.toFixed(decimals) : '';
}

export interface LinearScale {
  (v: number): number;
  readonly domain: readonly [number, number];
}

/** Maps [d0, d1] onto [r0, r1]; a zero-width domain is widened by one unit each side. */
export function linearScale(d0: number, d1: number, r0: number, r1: number): LinearScale {
  if (!(d1 > d0)) { d0 -= 1; d1 += 1; }
  const k = (r1 - r0) / (d1 - d0);
  const f = ((v: number) => r0 + (v - d0) * k) as LinearScale;
  Object.defineProperty(f, 'domain', { value: [d0, d1] });
  return f;
}

/** Tick values at 1, 2 or 5 times a power of ten covering [lo, hi], about `count` of them (common practice). */
export function niceTicks(lo: number, hi: number, count = 5): number[] {
  if (!(hi > lo)) return [lo];
  const raw = (hi - lo) / Math.max(1, count);
  const p = 10 ** Math.floor(Math.log10(raw));
  // The smallest 1-2-5 step giving at most `count` intervals.
  const step = [0.1, 0.2, 0.5, 1, 2, 5, 10].map((m) => m * p).find((s) => Math.floor((hi - lo) / s) <= count) ?? 10 * p;
  const out: number[] = [];
  for (let v = Math.ceil(lo / step) * step; v <= hi + step * 1e-9; v += step) out.push(Math.abs(v) < step * 1e-9 ? 0 : v);
  return out;
}

/** Decimals needed to print ticks of this spacing. */
export function tickDecimals(ticks: readonly number[]): number {
  if (ticks.length < 2) return 2;
  const step = Math.abs(ticks[1] - ticks[0]);
  return Math.max(0, Math.min(6, -Math.floor(Math.log10(step) + 1e-9)));
}

/** The largest 1, 2 or 5 times a power of ten not above v (scale bars). */
export function roundDown125(v: number): number {
  const p = 10 ** Math.floor(Math.log10(v));
  return [5, 2, 1].map((m) => m * p).find((s) => s <= v) ?? p;
}

/** Smallest and largest finite values (NaN, NaN when none). */
export function finiteRange(values: ArrayLike<number>, pick?: (i: number) => boolean): [number, number] {
  let lo = Infinity, hi = -Infinity;
  for (let i = 0; i < values.length; i++) {
    const v = values[i];
    if (!Number.isFinite(v) || (pick && !pick(i))) continue;
    if (v < lo) lo = v;
    if (v > hi) hi = v;
  }
  return lo <= hi ? [lo, hi] : [NaN, NaN];
}

/** Pads a range by a fraction of its width (at least `minPad`). */
export function padRange([lo, hi]: readonly [number, number], frac: number, minPad: number): [number, number] {
  const pad = Math.max((hi - lo) * frac, minPad);
  return [lo - pad, hi + pad];
}

/** The value at fraction q of the sorted finite values (nearest rank; common practice). */
export function quantile(values: ArrayLike<number>, q: number): number {
  const v: number[] = [];
  for (let i = 0; i < values.length; i++) if (Number.isFinite(values[i])) v.push(values[i]);
  if (!v.length) return NaN;
  v.sort((a, b) => a - b);
  return v[Math.min(v.length - 1, Math.max(0, Math.ceil(q * v.length) - 1))];
}

/** UTC clock text "hh:mm" or "hh:mm:ss" of GPS seconds (UTC = GPS - leap seconds). */
export function clockText(gpsS: number, leapS: number, withSeconds: boolean): string {
  const d = new Date(Date.UTC(1980, 0, 6) + (gpsS - leapS) * 1000);
  const t = d.toISOString().slice(11, withSeconds ? 19 : 16);
  return t;
}
