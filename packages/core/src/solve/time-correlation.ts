/**
 * Precision of the mean of a time-correlated series (per-epoch GNSS positions are strongly correlated:
 * multipath and atmosphere change over minutes).
 *
 * - Sample autocorrelation rho_k = c_k / c_0, c_k = (1/n) sum (x_t - xbar)(x_{t+k} - xbar)
 *   (Box & Jenkins, "Time Series Analysis", eq. 2.1.12 - the biased estimator, which keeps the
 *   sequence positive definite).
 * - Effective number of independent epochs n_eff = n / tau, tau = 1 + 2 sum_{k>=1} rho_k, with the
 *   sum truncated by Geyer's initial positive sequence: pairs Gamma_m = rho_{2m} + rho_{2m+1} are
 *   added while positive (C. J. Geyer, "Practical Markov chain Monte Carlo", Statistical Science 7
 *   (1992) 473-483, section 3.3). n_eff is kept within [1, n].
 * - Cross-check: the batch-means standard error (b batches of m = floor(sqrt n) epochs; standard error =
 *   sd(batch means) / sqrt(b); e.g. Geyer 1992 section 3.2).
 * The series is taken as equally spaced (epoch gaps are ignored: documented simplification).
 */
/** Deviations from the mean and their sum of squares (n c_0). */
function centred(x: ArrayLike<number>): { d: Float64Array; c0: number } {
  const n = x.length;
  let mean = 0;
  for (let i = 0; i < n; i++) mean += x[i]!;
  mean /= n;
  const d = new Float64Array(n);
  let c0 = 0;
  for (let i = 0; i < n; i++) {
    d[i] = x[i]! - mean;
    c0 += d[i]! * d[i]!;
  }
  return { d, c0 };
}

export function autocorrelation(x: ArrayLike<number>, maxLag: number): Float64Array {
  const n = x.length;
  const { d, c0 } = centred(x);
  const L = Math.min(maxLag, n - 1);
  const rho = new Float64Array(L + 1);
  rho[0] = 1;
  if (c0 === 0) return rho;
  for (let k = 1; k <= L; k++) {
    let c = 0;
    for (let i = 0; i + k < n; i++) c += d[i]! * d[i + k]!;
    rho[k] = c / c0;
  }
  return rho;
}

/** rho_k of the centred series d with lag-0 sum c0 (a module-level function: one compiled code for every call). */
function lagCorrelation(d: Float64Array, c0: number, k: number): number {
  const n = d.length;
  let c = 0;
  for (let i = 0; i + k < n; i++) c += d[i]! * d[i + k]!;
  return c / c0;
}

/**
 * Integrated autocorrelation time tau and n_eff = n / tau (Geyer 1992 initial positive sequence). The
 * autocorrelation is computed lag by lag only until the sequence stops, so the cost is n times the
 * correlation length, not n^2 (a day of 1 s epochs stays cheap).
 */
export function effectiveSampleSize(x: ArrayLike<number>): { nEff: number; tau: number } {
  const n = x.length;
  if (n < 4) return { nEff: n, tau: 1 };
  const { d, c0 } = centred(x);
  if (c0 === 0) return { nEff: n, tau: 1 };
  // Geyer (1992) 3.3: tau = -1 + 2 sum_m Gamma_m, Gamma_m = rho_2m + rho_2m+1 while Gamma_m > 0.
  let sum = 0;
  for (let m = 0; 2 * m + 1 <= n - 1; m++) {
    const g = (m === 0 ? 1 : lagCorrelation(d, c0, 2 * m)) + lagCorrelation(d, c0, 2 * m + 1);
    if (!(g > 0)) break;
    sum += g;
  }
  const tau = Math.max(-1 + 2 * sum, 1 / n);
  const nEff = Math.min(n, Math.max(1, n / tau));
  return { nEff, tau: n / nEff };
}

/** Standard error of the mean by non-overlapping batch means; NaN with fewer than 2 batches. */
export function batchMeansStandardError(x: ArrayLike<number>, batchSize?: number): number {
  const n = x.length;
  const m = batchSize ?? Math.max(1, Math.floor(Math.sqrt(n)));
  const b = Math.floor(n / m);
  if (b < 2) return NaN;
  const means = new Float64Array(b);
  for (let j = 0; j < b; j++) {
    let s = 0;
    for (let i = j * m; i < (j + 1) * m; i++) s += x[i]!;
    means[j] = s / m;
  }
  let mu = 0;
  for (const v of means) mu += v;
  mu /= b;
  let ss = 0;
  for (const v of means) ss += (v - mu) * (v - mu);
  return Math.sqrt(ss / (b - 1)) / Math.sqrt(b);
}

export function standardDeviation(x: ArrayLike<number>): number {
  const n = x.length;
  if (n < 2) return NaN;
  let mu = 0;
  for (let i = 0; i < n; i++) mu += x[i]!;
  mu /= n;
  let ss = 0;
  for (let i = 0; i < n; i++) ss += (x[i]! - mu) * (x[i]! - mu);
  return Math.sqrt(ss / (n - 1));
}
