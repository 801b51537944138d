/**
 * Phase arcs of one receiver: a new arc (and so a new ambiguity) starts at every sign of a cycle slip:
 *  - loss-of-lock indicator bit 0 (RINEX 3.05 section 5.3);
 *  - a change of the half-cycle bit (LLI bit 1: the receiver has not yet resolved, or has just
 *    resolved, the half-cycle ambiguity of its phase);
 *  - blank phase (tracking lost);
 *  - a gap in the satellite's epochs longer than `maxGapS`;
 *  - the satellite's return after it was absent from one or more of the receiver's epochs (the receiver
 *    recorded other satellites but not this one, so it did not track it: its phase has no more continuity
 *    than a blank one, and a tracking loop that reacquires a signal starts its cycle count anew, flagged or
 *    not). Absent means not listed in the file's epoch at all: a satellite listed but left out of the
 *    solution for a while (blank code, no ephemeris) was tracked, and its return is judged by the tests
 *    below (update's `listed`). Gaps of the whole receiver (every satellite missing, as in irregular
 *    logging or under a bridge) are no such sign: the Doppler test and the time-differenced test
 *    (time-differenced-slips.ts) span them;
 *  - time-differenced phase against the Doppler: the phase change between epochs predicted by the mean
 *    Doppler (trapezoid rule; RINEX: Doppler positive for approaching satellites, phase grows with
 *    range), in metres, less the median over the epoch's satellites (so a receiver clock step common to
 *    all is no slip: common in metres, not in cycles, when the carriers differ as GLONASS FDMA ones do),
 *    beyond 1 cycle + 0.2 cycles per second of interval (several times the Doppler noise of a low-cost
 *    receiver integrated over the interval; common practice);
 *  - code minus phase jumping by more than 5 m plus 1 m per second of interval, less the median over the
 *    epoch's satellites (a clock step applied to the code only is common to all; the code noise and the
 *    divergence of a few cm/s cannot reach the limit; common practice).
 * The test of the single differences between epochs against geometry is done on both receivers together
 * (time-differenced-slips.ts); the filter does not test phase innovations (float-filter.ts says why).
 *
 * Code clock steps: many receivers steer their clock by whole milliseconds applied to the code (and the
 * epoch tag) while the phase runs on. The median change of code minus phase over the satellites is then
 * c x 1 ms (299,792 m) at the step; steps beyond 1 km (code noise and ionospheric divergence change it by
 * centimetres per second) are summed in `codeClockStepsM`, which the session adds to the phase in metres
 * so that phase and code keep one receiver clock (what the filter's GLONASS phase needs: FDMA double
 * differences keep their integer nature only with the code clock, float-filter.ts).
 */
import type { SatId } from '../gnss/index.js';
import { keepShape } from './kept-shapes.js';

interface ArcState {
  arc: number;
  tGpsS: number;
  phaseCycles: number;
  codeM: number;
  dopplerHz: number;
  wavelengthM: number;
  halfCycle: boolean;
}

export interface ArcInput {
  readonly sat: SatId;
  /** NaN when blank. */
  readonly phaseCycles: number;
  readonly codeM: number;
  /** NaN when absent. */
  readonly dopplerHz: number;
  readonly lli: number;
  readonly wavelengthM: number;
}

export class ArcTracker {
  private readonly state = new Map<SatId, ArcState>();
  private nextArc = 1;
  /** Count of arcs started by each cause, for the summary. */
  readonly causes = { lli: 0, halfCycle: 0, blank: 0, gap: 0, absent: 0, doppler: 0, codeMinusPhase: 0 };
  /** Sum of the code clock steps not followed by the phase (m; see the file comment). */
  codeClockStepsM = 0;
  /** Time of the previous epoch given to update (NaN before the first). */
  private previousEpochGpsS = NaN;
  /** Per satellite, the last epoch whose file listed it, and the first of its current run of listed epochs. */
  private readonly lastListedGpsS = new Map<SatId, number>();
  private readonly listedSinceGpsS = new Map<SatId, number>();

  constructor(private readonly maxGapS: number) {
    keepShape(this);
  }

  /**
   * Arc number per satellite for one epoch (0 for a satellite without usable phase). `tGpsS` is the
   * epoch's estimated GPS time; `listed`, the satellites the file's epoch lists (of the systems read),
   * also those left out of `sats` (blank code, no ephemeris); when null, those of `sats`.
   */
  update(tGpsS: number, sats: readonly ArcInput[], listed: readonly SatId[] | null = null): Map<SatId, number> {
    const out = new Map<SatId, number>();
    if (listed === null) for (const s of sats) this.noteListed(s.sat, tGpsS);
    else for (const sat of listed) this.noteListed(sat, tGpsS);
    // Doppler test residuals (m) for the common-mode removal.
    const dopplerResidual = new Map<SatId, number>();
    for (const s of sats) {
      const prev = this.state.get(s.sat);
      if (!prev || !Number.isFinite(s.phaseCycles) || !Number.isFinite(prev.dopplerHz) || !Number.isFinite(s.dopplerHz)) continue;
      const dt = tGpsS - prev.tGpsS;
      if (!(dt > 0) || dt > this.maxGapS) continue;
      const predicted = -0.5 * (prev.dopplerHz + s.dopplerHz) * dt;
      dopplerResidual.set(s.sat, (s.phaseCycles - prev.phaseCycles - predicted) * s.wavelengthM);
    }
    const common = median([...dopplerResidual.values()]);
    // Code minus phase changes, less their median: a receiver clock step applied to the code only is common.
    const cmpChange = new Map<SatId, number>();
    for (const s of sats) {
      const prev = this.state.get(s.sat);
      if (!prev || !Number.isFinite(s.phaseCycles) || !Number.isFinite(s.codeM)) continue;
      cmpChange.set(s.sat, (s.codeM - s.phaseCycles * s.wavelengthM) - (prev.codeM - prev.phaseCycles * prev.wavelengthM));
    }
    const commonCmp = median([...cmpChange.values()]);
    if (cmpChange.size >= 2 && Math.abs(commonCmp) > 1000) this.codeClockStepsM += commonCmp;
    for (const s of sats) {
      const prev = this.state.get(s.sat);
      if (!Number.isFinite(s.phaseCycles) || !Number.isFinite(s.codeM)) {
        if (prev && !Number.isFinite(s.phaseCycles)) { this.state.delete(s.sat); this.causes.blank++; }
        out.set(s.sat, 0);
        continue;
      }
      const half = (s.lli & 2) !== 0;
      let slip = prev === undefined;
      if (prev) {
        const dt = tGpsS - prev.tGpsS;
        if ((s.lli & 1) !== 0) { slip = true; this.causes.lli++; }
        else if (half !== prev.halfCycle) { slip = true; this.causes.halfCycle++; }
        else if (!(dt > 0) || dt > this.maxGapS) { slip = true; this.causes.gap++; }
        else if (this.listedSinceGpsS.get(s.sat)! > prev.tGpsS) { slip = true; this.causes.absent++; }
        else {
          const r = dopplerResidual.get(s.sat);
          if (r !== undefined && dopplerResidual.size >= 2 && Math.abs(r - common) > (1 + 0.2 * dt) * s.wavelengthM) { slip = true; this.causes.doppler++; }
          else {
            const cmp = (cmpChange.get(s.sat) ?? commonCmp) - commonCmp;
            if (cmpChange.size >= 2 && Math.abs(cmp) > 5 + 1 * dt) { slip = true; this.causes.codeMinusPhase++; }
          }
        }
      }
      const arc = slip ? this.nextArc++ : prev!.arc;
      this.state.set(s.sat, { arc, tGpsS, phaseCycles: s.phaseCycles, codeM: s.codeM, dopplerHz: s.dopplerHz, wavelengthM: s.wavelengthM, halfCycle: half });
      out.set(s.sat, arc);
    }
    // Satellites not in this epoch keep their state: the gap and absence tests decide on their return.
    this.previousEpochGpsS = tGpsS;
    return out;
  }

  /** Records that the epoch at tGpsS lists `sat`: a run of listed epochs starts where the previous epoch did not list it. */
  private noteListed(sat: SatId, tGpsS: number): void {
    const last = this.lastListedGpsS.get(sat);
    if (last === undefined || last < this.previousEpochGpsS) this.listedSinceGpsS.set(sat, tGpsS);
    this.lastListedGpsS.set(sat, tGpsS);
  }

  /** Whether the satellite's current arc still carries an unresolved half cycle (not to be fixed). */
  halfCycleUnresolved(sat: SatId): boolean {
    return this.state.get(sat)?.halfCycle ?? false;
  }
}

function median(v: number[]): number {
  if (v.length === 0) return 0;
  const s = [...v].sort((a, b) => a - b);
  const m = s.length >> 1;
  return s.length % 2 ? s[m] : 0.5 * (s[m - 1] + s[m]);
}
