/**
 * GLONASS inter-frequency code biases between unlike receivers. GLONASS satellites transmit on different
 * frequencies (channel k), and each receiver type delays each frequency differently, so a between-receiver
 * difference carries an offset per channel that does not cancel (e.g. Wanninger 2012, "Carrier-phase
 * inter-frequency biases of GLONASS receivers", J. Geodesy 86; the code biases reach decimetres to metres).
 * The relative GLONASS clock absorbs their mean; what remains is estimated here per channel as the running
 * mean of that channel's post-fit residuals (a recursive mean over up to `windowEpochs` epochs) and
 * removed from later epochs. Until a channel has `minEpochs` samples its satellites are down-weighted.
 */
export class GlonassChannelOffsets {
  private readonly offsetM = new Map<number, number>();
  private readonly count = new Map<number, number>();

  constructor(
    private readonly windowEpochs = 600,
    readonly minEpochs = 30,
  ) {}

  /** Current offset estimate (m) of channel k, 0 before any sample. */
  offset(k: number): number {
    return this.offsetM.get(k) ?? 0;
  }

  samples(k: number): number {
    return this.count.get(k) ?? 0;
  }

  /** Variance inflation for a channel still being learnt: 1 once minEpochs samples are in. */
  varianceFactor(k: number): number {
    const n = this.samples(k);
    return n >= this.minEpochs ? 1 : 1 + 9 * (1 - n / this.minEpochs);
  }

  /** Feeds the post-fit residual (m) of a satellite on channel k, computed with the current offset removed. */
  update(k: number, residualM: number): void {
    if (!Number.isFinite(residualM)) return;
    const n = Math.min(this.samples(k) + 1, this.windowEpochs);
    this.count.set(k, n);
    this.offsetM.set(k, this.offset(k) + residualM / n);
  }

  /** Offsets as a plain record for the summary (channel -> m). */
  snapshot(): Record<string, number> {
    const out: Record<string, number> = {};
    for (const [k, v] of [...this.offsetM].sort((a, b) => a[0] - b[0])) out[String(k)] = Math.round(v * 1000) / 1000;
    return out;
  }
}
