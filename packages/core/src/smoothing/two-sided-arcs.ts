/**
 * Carrier smoothing forwards and backwards, combined, from per-arc summaries.
 *
 * A Hatch filter (hatch.ts) is an exponential average of code minus carrier (CMC = P - lambda Phi) over the
 * past, added back to the carrier: smoothed P_k = lambda Phi_k + <CMC>_k. Run forwards it starts every arc
 * unconverged (raw code at the first epoch) and lags the ionospheric divergence of CMC by tau dCMC/dt; run
 * backwards it does the mirror. Their combination is the two-sided exponential average
 *   <CMC>(t) = sum_i w_i CMC_i / sum_i w_i,   w_i = exp(-|t - t_i| / tau),
 * over the whole arc: no epoch starts unconverged, and the linear part of the divergence cancels
 * (Navipedia "Carrier-smoothing of code pseudoranges" for the one-sided filter and its divergence bias).
 *
 * Bounded memory: an arc (one satellite and code between two restarts of the forward filter, the same
 * restarts in both passes) keeps sums of CMC, of counts and of times in bins of tau/10; the two-sided sums
 * at each bin come from one forward and one backward recursion over the bins (decay exp(-bin/tau) per
 * bin), and are interpolated linearly between bin mean times. Per arc: three doubles per bin, e.g. 30
 * satellites x one day x 10 s bins = 2.6 million doubles per receiver at most.
 *
 * Precision: for white code noise the two-sided average of N_eff samples has variance sigma^2 / N_eff; code
 * multipath is correlated over tens of seconds, so the variance factor used is
 *   max(1 / N_eff, T_corr / W),  W = N_eff x mean sampling interval (the window's length in seconds),
 * with T_corr = CODE_ERROR_CORRELATION_S (an assumption, see below), never above 1.
 */

/**
 * Correlation time of code multipath and noise (s) used for the smoothed code's variance. Multipath of a
 * static antenna decorrelates over minutes, of a moving one over seconds; 60 s is a middle value (from
 * memory: common practice quotes "tens of seconds to minutes"), conservative for moving receivers.
 */
export const CODE_ERROR_CORRELATION_S = 60;

export class SmoothingArc {
  private sums = new Float64Array(16);
  private counts = new Float64Array(16);
  private times = new Float64Array(16);
  private bins = 0;
  private samples = 0;
  private lastS: number;
  private twoSided: { value: Float64Array; weight: Float64Array; time: Float64Array } | null = null;

  constructor(readonly startS: number, private readonly binS: number, private readonly timeConstantS: number) {
    this.lastS = startS;
  }

  /** One epoch of the arc in time order (cmcM: code minus carrier, clock jumps repaired). */
  add(tS: number, cmcM: number): void {
    if (!Number.isFinite(cmcM)) return;
    const j = Math.floor((tS - this.startS) / this.binS);
    if (j >= this.sums.length) this.grow(j + 1);
    this.sums[j] += cmcM;
    this.counts[j] += 1;
    this.times[j] += tS - this.startS;
    this.bins = Math.max(this.bins, j + 1);
    this.samples++;
    this.lastS = tS;
  }

  private grow(n: number): void {
    const size = Math.max(n, this.sums.length * 2);
    for (const k of ['sums', 'counts', 'times'] as const) {
      const a = new Float64Array(size);
      a.set(this[k]);
      this[k] = a;
    }
  }

  /** Builds the two-sided averages once the arc is complete (forward and backward recursions over the bins). */
  finish(): void {
    const n = this.bins;
    const d = Math.exp(-this.binS / this.timeConstantS);
    const fv = new Float64Array(n), fw = new Float64Array(n);
    for (let j = 0; j < n; j++) {
      fv[j] = this.sums[j] + (j > 0 ? d * fv[j - 1] : 0);
      fw[j] = this.counts[j] + (j > 0 ? d * fw[j - 1] : 0);
    }
    const value = new Float64Array(n), weight = new Float64Array(n), time = new Float64Array(n);
    let bv = 0, bw = 0;
    for (let j = n - 1; j >= 0; j--) {
      // The bin's own sums are in both recursions: counted once.
      value[j] = fv[j] + bv;
      weight[j] = fw[j] + bw;
      time[j] = this.counts[j] > 0 ? this.startS + this.times[j] / this.counts[j] : NaN;
      bv = d * (bv + this.sums[j]);
      bw = d * (bw + this.counts[j]);
    }
    this.twoSided = { value, weight, time };
    // The raw bins are no longer needed.
    this.sums = this.counts = this.times = new Float64Array(0);
  }

  /** Mean sampling interval of the arc (s). */
  get intervalS(): number {
    return this.samples > 1 ? (this.lastS - this.startS) / (this.samples - 1) : NaN;
  }

  /** Two-sided CMC average at time t and its variance factor relative to one raw code; null before finish(). */
  at(tS: number): { cmcM: number; varianceFactor: number } | null {
    const out = { cmcM: NaN, varianceFactor: NaN };
    return this.atInto(tS, out) ? out : null;
  }

  /** at() written into `out` (no object per call); false where at() gives null. */
  atInto(tS: number, out: { cmcM: number; varianceFactor: number }): boolean {
    const ts = this.twoSided;
    if (!ts || ts.value.length === 0) return false;
    const j = Math.min(Math.max(Math.floor((tS - this.startS) / this.binS), 0), ts.value.length - 1);
    const here = ts.weight[j] > 0 ? ts.value[j] / ts.weight[j] : NaN;
    // Interpolate towards the neighbouring bin on t's side of this bin's mean time.
    const k = tS >= ts.time[j] ? j + 1 : j - 1;
    let cmc = here;
    if (k >= 0 && k < ts.value.length && Number.isFinite(ts.time[k]) && Number.isFinite(ts.time[j]) && ts.weight[k] > 0 && ts.time[k] !== ts.time[j]) {
      const other = ts.value[k] / ts.weight[k];
      const u = (tS - ts.time[j]) / (ts.time[k] - ts.time[j]);
      cmc = here + Math.min(Math.max(u, 0), 1) * (other - here);
    }
    const nEff = Math.max(1, ts.weight[j]);
    const windowS = Number.isFinite(this.intervalS) ? nEff * this.intervalS : 0;
    const factor = Math.min(1, Math.max(1 / nEff, windowS > 0 ? CODE_ERROR_CORRELATION_S / windowS : 1));
    out.cmcM = cmc;
    out.varianceFactor = factor;
    return true;
  }
}
