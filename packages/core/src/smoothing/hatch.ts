/**
 * Carrier smoothing of code pseudoranges (Hatch filter): Hatch, "The synergism of GPS code and carrier
 * measurements", 3rd Int. Geodetic Symp. on Satellite Doppler Positioning, 1982; Navipedia
 * "Carrier-smoothing of code pseudoranges" (check-values.md, "Carrier smoothing"):
 *   R_k = R_k / n + (n - 1)/n (R_{k-1} + lambda (Phi_k - Phi_{k-1})),  n = min(k, N),  N = tau / interval.
 * The code-minus-carrier ionosphere divergence biases the smoothed code by about -2 tau dI/dt (Navipedia).
 *
 * One smoother per signal (a satellite's L1 and L2 are smoothed by separate instances).
 * Restarts (n = 1, smoothed = raw code): first epoch; no carrier; loss of lock (LLI bit 0, RINEX 3.05
 * 5.3); a gap longer than `gapThresholdS`; a code-minus-carrier innovation beyond `codeCarrierJumpM`.
 * The half-cycle bit (LLI bit 1) alone is not a slip: a half-cycle ambiguity does not break continuity of
 * the carrier change used here beyond half a wavelength (~10 cm), far below the code noise.
 * A millisecond receiver clock jump common to all satellites is repaired (detectMillisecondClockJump).
 */
import type { SatId } from '../gnss/types.js';
import { detectMillisecondClockJump } from './clock-jump.js';
import type { ClockJump } from './clock-jump.js';

export interface CarrierSmootherOptions {
  /** Nominal observation interval (s). */
  readonly intervalS: number;
  /** Filter time constant tau (s); default 100 s (usual value, check-values.md "Carrier smoothing"). */
  readonly timeConstantS?: number;
  /**
   * A satellite missing for longer than this restarts; default 2 x intervalS (one missed epoch is
   * tolerated; a longer silence could hide a slip the receiver never flagged: common practice).
   */
  readonly gapThresholdS?: number;
  /**
   * Restart when |R_k - (R_{k-1} + lambda dPhi)| exceeds this (m); default 10 m: about 5 sigma of a
   * 2 m code noise+multipath (mapping-grade receivers, low elevations), while one epoch of ionospheric
   * divergence is millimetres. Smaller undetected slips decay out of the filter with time constant tau.
   */
  readonly codeCarrierJumpM?: number;
  /** Tolerance of the clock-jump detector (m); default 10 m. */
  readonly clockJumpToleranceM?: number;
}

export interface SmootherInput {
  readonly sat: SatId;
  readonly codeM: number;
  /** Carrier phase (cycles), NaN when none. */
  readonly phaseCycles: number;
  readonly wavelengthM: number;
  /** Loss-of-lock indicator (RINEX), 0 when blank. */
  readonly lli: number;
}

export interface SmootherOutput {
  readonly sat: SatId;
  readonly smoothedM: number;
  /** Filter length used at this epoch (1 after a restart, up to N). */
  readonly n: number;
  readonly restarted: boolean;
  readonly reason?: string;
}

interface SatState {
  n: number;
  smoothedM: number;
  codeM: number;
  phaseM: number;
  timeS: number;
}

const LLI_LOST_LOCK_BIT = 1; // RINEX 2.11 5.1 / RINEX 3.05 5.3: bit 0 = lost lock, bit 1 = half cycle

export class CarrierSmoother {
  readonly maxN: number;
  readonly timeConstantS: number;
  readonly gapThresholdS: number;
  readonly codeCarrierJumpM: number;
  readonly clockJumpToleranceM: number;
  private readonly states = new Map<SatId, SatState>();
  private lastClockJump: ClockJump | null = null;

  constructor(opts: CarrierSmootherOptions) {
    if (!(opts.intervalS > 0)) throw new RangeError(`CarrierSmoother: intervalS ${opts.intervalS} must be > 0`);
    const tau = opts.timeConstantS ?? 100;
    if (!(tau > 0)) throw new RangeError(`CarrierSmoother: timeConstantS ${tau} must be > 0`);
    this.maxN = Math.max(1, Math.round(tau / opts.intervalS));
    this.timeConstantS = tau;
    // small slack so a nominal interval with jittered time tags is not a gap
    this.gapThresholdS = opts.gapThresholdS ?? 2 * opts.intervalS + 1e-3;
    this.codeCarrierJumpM = opts.codeCarrierJumpM ?? 10;
    this.clockJumpToleranceM = opts.clockJumpToleranceM ?? 10;
  }

  /** The clock jump repaired at the last update, if any. */
  get clockJump(): ClockJump | null {
    return this.lastClockJump;
  }

  /** Forget every satellite (or one). */
  reset(sat?: SatId): void {
    if (sat === undefined) this.states.clear();
    else this.states.delete(sat);
  }

  update(epochTimeS: number, sats: readonly SmootherInput[]): SmootherOutput[] {
    // 1. which satellites continue, and their code-minus-carrier changes
    const continuing: boolean[] = new Array(sats.length);
    const cmcChange = new Float64Array(sats.length).fill(NaN);
    for (let i = 0; i < sats.length; i++) {
      const o = sats[i];
      const st = this.states.get(o.sat);
      const dt = st ? epochTimeS - st.timeS : NaN;
      const ok = !!st && dt > 0 && dt <= this.gapThresholdS && (o.lli & LLI_LOST_LOCK_BIT) === 0
        && Number.isFinite(o.codeM) && Number.isFinite(o.phaseCycles) && Number.isFinite(st.phaseM);
      continuing[i] = ok;
      if (ok) cmcChange[i] = o.codeM - o.phaseCycles * o.wavelengthM - (st!.codeM - st!.phaseM);
    }
    // 2. a common millisecond jump: shift the history of every continuing satellite
    const jump = detectMillisecondClockJump(cmcChange, { toleranceM: this.clockJumpToleranceM });
    this.lastClockJump = jump;
    // 3. per satellite
    const out: SmootherOutput[] = new Array(sats.length);
    for (let i = 0; i < sats.length; i++) {
      const o = sats[i];
      const st = this.states.get(o.sat);
      const phaseM = o.phaseCycles * o.wavelengthM;
      if (!Number.isFinite(o.codeM)) {
        this.states.delete(o.sat);
        out[i] = { sat: o.sat, smoothedM: NaN, n: 0, restarted: true, reason: 'no code pseudorange' };
        continue;
      }
      let reason: string | undefined;
      if (!st) reason = 'start';
      else if (!Number.isFinite(phaseM)) reason = 'no carrier phase';
      else if (!Number.isFinite(st.phaseM)) reason = 'carrier phase resumed';
      else if ((o.lli & LLI_LOST_LOCK_BIT) !== 0) reason = 'loss of lock (LLI bit 0)';
      else if (!(epochTimeS - st.timeS > 0)) reason = `epoch time not after the previous one (${epochTimeS} <= ${st.timeS})`;
      else if (epochTimeS - st.timeS > this.gapThresholdS) reason = `data gap of ${(epochTimeS - st.timeS).toFixed(3)} s`;
      let note: string | undefined;
      if (reason === undefined && st) {
        let history = st.smoothedM;
        if (jump && continuing[i] && Math.abs(cmcChange[i] - jump.jumpM) <= this.clockJumpToleranceM) {
          history += jump.jumpM;
          note = `receiver clock jump of ${jump.milliseconds} ms repaired`;
        }
        // Hatch 1982 / Navipedia: prediction R_{k-1} + lambda (Phi_k - Phi_{k-1})
        const predicted = history + (phaseM - st.phaseM);
        const innovation = o.codeM - predicted;
        if (Math.abs(innovation) > this.codeCarrierJumpM) {
          reason = `code-minus-carrier jump of ${innovation.toFixed(2)} m (cycle slip)`;
        } else {
          // Weight of the new code: 1/n while the filter fills, then dt/tau, so the time constant is in
          // seconds whatever the logging interval (irregular epochs included): R = w P + (1 - w) prediction.
          // n counts the epochs since the (re)start; it is not capped by a nominal interval, so a header
          // INTERVAL that is missing or wrong does not change the time constant.
          const n = st.n + 1;
          const w = Math.min(1, Math.max(1 / n, (epochTimeS - st.timeS) / this.timeConstantS));
          const smoothedM = w * o.codeM + (1 - w) * predicted;
          st.n = n; st.smoothedM = smoothedM; st.codeM = o.codeM; st.phaseM = phaseM; st.timeS = epochTimeS;
          // Reported filter length: the effective number of epochs averaged, 1 / w.
          const length = Math.round(1 / w);
          out[i] = note ? { sat: o.sat, smoothedM, n: length, restarted: false, reason: note } : { sat: o.sat, smoothedM, n: length, restarted: false };
          continue;
        }
      }
      this.states.set(o.sat, { n: 1, smoothedM: o.codeM, codeM: o.codeM, phaseM, timeS: epochTimeS });
      out[i] = { sat: o.sat, smoothedM: o.codeM, n: 1, restarted: true, reason };
    }
    // 4. bounded memory: satellites silent for long restart anyway; kept a while so the restart can say "gap"
    const forgetS = Math.max(10 * this.gapThresholdS, 600);
    for (const [sat, st] of this.states) if (epochTimeS - st.timeS > forgetS) this.states.delete(sat);
    return out;
  }
}
