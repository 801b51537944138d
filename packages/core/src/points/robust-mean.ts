/**
 * Robust location: Huber's M-estimator with the MAD as (fixed) scale.
 * P. J. Huber, "Robust estimation of a location parameter", Ann. Math. Statist. 35 (1964) 73-101;
 * F. R. Hampel, E. M. Ronchetti, P. J. Rousseeuw, W. A. Stahel, "Robust Statistics: The Approach Based
 * on Influence Functions" (1986), section 2.3 (MAD scale, 1.4826 = 1 / Phi^-1(3/4) for consistency at
 * the normal).
 *
 * Iteratively reweighted mean: w_i = min(1, k s / |x_i - mu|), mu = sum w_i x_i / sum w_i, until the
 * step is below 1e-9 s (or 1e-12 m absolute). k = 1.5 (Huber's own proposal; about 96 % efficiency at
 * the normal, Hampel et al. 1986). A zero MAD (more than half the values equal) returns the median.
 * Multi-dimensional data (ENU) are handled componentwise: simple, and the components of a GNSS
 * position are estimated from the same epochs, so one bad epoch is downweighted in each component it
 * spoils (documented choice; a 3-D version would downweight it in all at once).
 */
export interface RobustMeanOptions {
  /** Huber tuning constant in units of the scale (default 1.5). */
  readonly k?: number;
  readonly maxIterations?: number;
}

export interface RobustMeanResult {
  readonly mean: number;
  /** MAD * 1.4826. */
  readonly scale: number;
  readonly iterations: number;
  readonly converged: boolean;
}

export const MAD_TO_SIGMA = 1.4826;

export function median(values: ArrayLike<number>): number {
  const a = Float64Array.from(values as ArrayLike<number>).sort();
  const n = a.length;
  if (n === 0) return NaN;
  return n % 2 ? a[(n - 1) / 2]! : 0.5 * (a[n / 2 - 1]! + a[n / 2]!);
}

export function robustMean(values: Float64Array, opts: RobustMeanOptions = {}): RobustMeanResult {
  const n = values.length;
  if (n === 0) return { mean: NaN, scale: NaN, iterations: 0, converged: false };
  const k = opts.k ?? 1.5;
  const maxIt = opts.maxIterations ?? 100;
  const med = median(values);
  const dev = new Float64Array(n);
  for (let i = 0; i < n; i++) dev[i] = Math.abs(values[i]! - med);
  const scale = MAD_TO_SIGMA * median(dev);
  if (!(scale > 0)) return { mean: med, scale: 0, iterations: 0, converged: true };
  let mu = med;
  for (let it = 1; it <= maxIt; it++) {
    let sw = 0, swx = 0;
    for (let i = 0; i < n; i++) {
      const r = Math.abs(values[i]! - mu);
      // Huber weight psi(r)/r
      const w = r <= k * scale ? 1 : (k * scale) / r;
      sw += w;
      swx += w * values[i]!;
    }
    const next = swx / sw;
    const step = Math.abs(next - mu);
    mu = next;
    if (step <= Math.max(1e-9 * scale, 1e-12)) return { mean: mu, scale, iterations: it, converged: true };
  }
  return { mean: mu, scale, iterations: maxIt, converged: false };
}
