/**
 * A slip test that needs two frequencies: the geometry-free combination of the between-receiver single
 * differences of phase, GF = lambda_1 dPhi_1 - lambda_f dPhi_f (m, rover minus reference, d = single
 * difference). It holds no geometry, no satellite or receiver clock (one oscillator drives both bands), no
 * troposphere, and of the ionosphere only its difference between the receivers (millimetres over a short
 * baseline, even under the equatorial disturbances that move each receiver's own combination by decimetres
 * in 30 s; measured on BELE00BRA, 2024-01-10 evening). A jump beyond that is a slip on one band or both, at
 * either receiver (the geometry-free slip test, e.g. Blewitt 1990, GRL 17(3); Teunissen & Montenbruck 2017,
 * Springer Handbook of GNSS, 20.2, here on single differences).
 *
 * GF is predicted from the previous epoch of the same arcs (the ionosphere's change over the interval is
 * left in the limit); the median change over the epoch's satellites is removed first (a change common to
 * all: an inter-frequency step of one receiver). Limit: 5 cm plus 2 mm per second of interval (common
 * practice; a one-cycle slip moves GF by 19 cm on L1, 24 cm on L2). Slips on both bands whose effects nearly
 * cancel (9 cycles on L1 and 7 on L2: 4 mm) pass unseen: the other tests remain.
 */

import { keepShape } from './kept-shapes.js';

interface GfState { tGpsS: number; gfM: number }

export class GeometryFreeMonitor {
  private readonly state = new Map<string, GfState>();
  private calls = 0;

  constructor(private readonly maxGapS: number) {
    keepShape(this);
  }

  /**
   * The keys whose GF jumped in an epoch (a slip on one of the two bands). A key names a satellite, its
   * band pair and the arcs of both bands at both receivers, so that a new arc starts a new series.
   */
  update(tGpsS: number, items: readonly { readonly key: string; readonly gfM: number }[]): Set<string> {
    const change: { key: string; d: number; dt: number }[] = [];
    for (const { key, gfM } of items) {
      const prev = this.state.get(key);
      const dt = prev ? tGpsS - prev.tGpsS : NaN;
      if (prev && dt > 0 && dt <= this.maxGapS) change.push({ key, d: gfM - prev.gfM, dt });
      this.state.set(key, { tGpsS, gfM });
    }
    const common = change.length >= 3 ? median(change.map((c) => c.d)) : 0;
    const slipped = new Set<string>();
    for (const c of change) if (Math.abs(c.d - common) > 0.05 + 0.002 * c.dt) slipped.add(c.key);
    // States of arcs that ended are dropped now and then.
    if (++this.calls % 256 === 0) for (const [k, s] of this.state) if (tGpsS - s.tGpsS > this.maxGapS) this.state.delete(k);
    return slipped;
  }
}

function median(v: number[]): number {
  const s = [...v].sort((a, b) => a - b);
  const m = s.length >> 1;
  return s.length % 2 ? s[m] : 0.5 * (s[m - 1] + s[m]);
}
