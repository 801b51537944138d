/**
 * Carrier smoothing of one receiver's primary-band pseudoranges (Hatch filter, smoothing/hatch.ts), one
 * filter per code type, with the receiver's millisecond clock steps repaired inside the filter.
 */
import type { GnssSystem, ObsEpoch, SatId } from '../gnss/index.js';
import { carrierWavelengthM, companionCodes, satSystem } from '../gnss/index.js';
import { primaryCodes, pseudorangeOf } from '../observables/index.js';
import { CarrierSmoother } from './hatch.js';

export class ReceiverSmoother {
  private readonly filters = new Map<string, CarrierSmoother>();
  restarts = 0;

  constructor(
    private readonly intervalS: number,
    private readonly timeConstantS: number,
    private readonly systems: readonly GnssSystem[],
    private readonly glonassChannels: ReadonlyMap<number, number>,
    private readonly maxGapS: number,
  ) {}

  /** Smoothed pseudoranges of the epoch: sat -> code -> m (only where the filter had a value). */
  update(epoch: ObsEpoch): Map<SatId, Map<string, number>> {
    const inputs = new Map<string, Array<{ sat: SatId; codeM: number; phaseCycles: number; wavelengthM: number; lli: number }>>();
    for (const s of epoch.sats) {
      const system = satSystem(s.sat);
      if (!this.systems.includes(system)) continue;
      const k = system === 'R' ? this.glonassChannels.get(Number(s.sat.slice(1))) : undefined;
      for (const code of primaryCodes(system, s)) {
        const comp = companionCodes(code, s.codes);
        const pi = comp.phase ? s.codes.indexOf(comp.phase) : -1;
        const phase = pi >= 0 ? s.values[pi] : NaN;
        const lli = pi >= 0 ? s.lli[pi] : 0;
        const wl = comp.phase ? carrierWavelengthM(system, comp.phase, k) : NaN;
        let list = inputs.get(code);
        if (!list) { list = []; inputs.set(code, list); }
        list.push({ sat: s.sat, codeM: pseudorangeOf(s, code), phaseCycles: Number.isFinite(wl) ? phase : NaN, wavelengthM: wl, lli });
      }
    }
    const out = new Map<SatId, Map<string, number>>();
    for (const [code, list] of inputs) {
      let f = this.filters.get(code);
      if (!f) { f = new CarrierSmoother({ intervalS: this.intervalS, timeConstantS: this.timeConstantS, gapThresholdS: Math.max(this.maxGapS, 2 * this.intervalS + 1e-3) }); this.filters.set(code, f); }
      for (const r of f.update(epoch.tagGpsS, list)) {
        if (r.restarted && r.n <= 1) this.restarts++;
        if (!Number.isFinite(r.smoothedM)) continue;
        let m = out.get(r.sat);
        if (!m) { m = new Map(); out.set(r.sat, m); }
        m.set(code, r.smoothedM);
      }
    }
    return out;
  }

  reset(): void {
    for (const f of this.filters.values()) f.reset();
  }
}
