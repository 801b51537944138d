/**
 * Offsets that stay constant over a session (between-receiver code biases), estimated from one series of
 * samples per key (a GLONASS frequency channel, or a satellite):
 * - location: the median (breakdown point 50 %: outliers and slips do not move it);
 * - scale: 1.4826 x the median absolute deviation (consistent with sigma for normal errors: Huber &
 *   Ronchetti, "Robust Statistics", 2009, 5.1);
 * - precision of the location: scale / sqrt(n_eff), n_eff from the series' autocorrelation (Geyer's
 *   initial positive sequence, time-correlation.ts), times sqrt(pi/2) for the median's efficiency under
 *   normal errors (Kendall & Stuart, the asymptotic variance of the median, pi sigma^2 / (2 n));
 * - significance: |offset| / sigma > N^-1(1 - alpha/2) (a two-sided test of a zero offset);
 * - constancy: the medians of the first and the second half of the series agree within their combined
 *   sigma at the same level (a quantity that drifts is no session constant).
 * Memory: one Float32 per sample (a millimetre resolves to 1e-7 of a 10 m offset).
 */
import { normalQuantile } from './distributions.js';
import { batchMeansStandardError, effectiveSampleSize } from './time-correlation.js';

export interface ConstantOffsetEstimate {
  readonly offsetM: number;
  /** Standard deviation of the estimate (m). */
  readonly sigmaM: number;
  /** Robust scatter of the samples (m). */
  readonly scatterM: number;
  readonly samples: number;
  readonly nEff: number;
  /** Different from zero at the test level. */
  readonly significant: boolean;
  /** The two halves of the session agree. */
  readonly stable: boolean;
}

function medianOf(v: Float64Array): number {
  const s = Float64Array.from(v).sort();
  const m = s.length >> 1;
  return s.length % 2 ? s[m] : 0.5 * (s[m - 1] + s[m]);
}

function locationAndSigma(v: Float64Array): { m: number; scatter: number; sigma: number; nEff: number } {
  const m = medianOf(v);
  const dev = new Float64Array(v.length);
  for (let i = 0; i < v.length; i++) dev[i] = Math.abs(v[i] - m);
  const scatter = 1.4826 * medianOf(dev);
  const { nEff } = effectiveSampleSize(v);
  const batch = batchMeansStandardError(v);
  const ips = (scatter * Math.sqrt(Math.PI / 2)) / Math.sqrt(nEff);
  return { m, scatter, sigma: Number.isFinite(batch) ? Math.max(ips, batch) : ips, nEff };
}

/** Estimates one constant offset from its samples in time order; null with fewer than `minSamples`. */
export function estimateConstantOffset(samples: ArrayLike<number>, alpha: number, minSamples = 10): ConstantOffsetEstimate | null {
  const n = samples.length;
  if (n < minSamples) return null;
  const v = Float64Array.from(samples as ArrayLike<number>);
  const all = locationAndSigma(v);
  const z = normalQuantile(1 - alpha / 2);
  const h = n >> 1;
  const a = locationAndSigma(v.subarray(0, h));
  const b = locationAndSigma(v.subarray(h));
  const stable = Math.abs(a.m - b.m) <= z * Math.hypot(a.sigma, b.sigma);
  return {
    offsetM: all.m, sigmaM: all.sigma, scatterM: all.scatter, samples: n, nEff: all.nEff,
    significant: Math.abs(all.m) > z * all.sigma, stable,
  };
}

/** Samples per key, kept compactly until the estimate is asked for. */
export class ConstantOffsetSamples {
  private readonly series = new Map<string, { values: Float32Array; n: number }>();

  add(key: string, valueM: number): void {
    if (!Number.isFinite(valueM)) return;
    let s = this.series.get(key);
    if (!s) { s = { values: new Float32Array(64), n: 0 }; this.series.set(key, s); }
    if (s.n === s.values.length) {
      const grown = new Float32Array(s.values.length * 2);
      grown.set(s.values);
      s.values = grown;
    }
    s.values[s.n++] = valueM;
  }

  keys(): string[] {
    return [...this.series.keys()];
  }

  samples(key: string): Float32Array {
    const s = this.series.get(key);
    return s ? s.values.subarray(0, s.n) : new Float32Array(0);
  }
}
