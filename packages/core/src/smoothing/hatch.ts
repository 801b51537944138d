/**
 * Carrier smoothing of code pseudoranges (Hatch filter): Hatch, "The synergism of GPS code and carrier
 * measurements", 3rd Int. Geodetic Symp. on Satellite Doppler Positioning, 1982; Navipedia
 * "Carrier-smoothing of code pseudoranges" (check-values.md, "Carrier smoothing"):
 *   R_k = R_k / n + (n - 1)/n (R_{k-1} + lambda (Phi_k - Phi_{k-1})),  n = min(k, N),  N = tau / interval.
 * The code-minus-carrier ionosphere divergence biases the smoothed code by about -2 tau dI/dt (Navipedia).
 *
 * One smoother per signal (a satellite's L1 and L2 are smoothed by separate instances).
 * Restarts (n = 1, smoothed = raw code): first epoch; no carrier (blank phase); loss of lock (LLI bit 0,
 * RINEX 3.05 5.3); a change of the half-cycle flag (LLI bit 1: the receiver changed its half-cycle
 * resolution, the carrier may have moved by half a cycle); a gap longer than `gapThresholdS`; a carrier
 * change that the Doppler does not explain (time-differenced phase against the mean Doppler of the
 * interval); a code-minus-carrier innovation beyond `codeCarrierJumpM`.
 * A millisecond receiver clock jump common to all satellites is repaired (detectMillisecondClockJump).
 */
import type { SatId } from '../gnss/index.js';
import { detectMillisecondClockJump } from './clock-jump.js';
import type { ClockJump, ClockJumpOptions } from './clock-jump.js';

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
  /** Doppler (Hz) of the same signal, NaN or absent when none. */
  readonly dopplerHz?: number;
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
  readonly sat: SatId;
  n: number;
  smoothedM: number;
  codeM: number;
  phaseM: number;
  timeS: number;
  lli: number;
  dopplerHz: number;
}

/**
 * Why a filter restarted (or a note on a continuing one), as CarrierSmoother.step records it: module-level
 * constants (a property of a constants object would be a load needing type feedback in the step).
 */
const REASON_NONE = 0;
const REASON_NO_CODE = 1;
const REASON_START = 2;
const REASON_NO_PHASE = 3;
const REASON_PHASE_RESUMED = 4;
const REASON_LOST_LOCK = 5;
const REASON_HALF_CYCLE = 6;
const REASON_NOT_AFTER = 7;
const REASON_GAP = 8;
const REASON_DOPPLER_SLIP = 9;
const REASON_CODE_CARRIER_JUMP = 10;
const REASON_CLOCK_JUMP_REPAIRED = 11;

/** The text of a reason code; `value` is the previous epoch's time (not after, gap) or the innovation (m, code-carrier jump). */
function reasonText(code: number, value: number, epochTimeS: number, jump: ClockJump | null): string | undefined {
  switch (code) {
    case REASON_NO_CODE: return 'no code pseudorange';
    case REASON_START: return 'start';
    case REASON_NO_PHASE: return 'no carrier phase';
    case REASON_PHASE_RESUMED: return 'carrier phase resumed';
    case REASON_LOST_LOCK: return 'loss of lock (LLI bit 0)';
    case REASON_HALF_CYCLE: return 'half-cycle flag changed (LLI bit 1)';
    case REASON_NOT_AFTER: return `epoch time not after the previous one (${epochTimeS} <= ${value})`;
    case REASON_GAP: return `data gap of ${(epochTimeS - value).toFixed(3)} s`;
    case REASON_DOPPLER_SLIP: return 'carrier change not explained by the Doppler (cycle slip)';
    case REASON_CODE_CARRIER_JUMP: return `code-minus-carrier jump of ${value.toFixed(2)} m (cycle slip)`;
    case REASON_CLOCK_JUMP_REPAIRED: return `receiver clock jump of ${jump!.milliseconds} ms repaired`;
    default: return undefined;
  }
}

const LLI_LOST_LOCK_BIT = 1; // RINEX 2.11 5.1 / RINEX 3.05 5.3: bit 0 = lost lock, bit 1 = half cycle
const LLI_HALF_CYCLE_BIT = 2;

/** Satellites per filter the working arrays hold before they grow (a filter is per code: all of one system's satellites in view, or more). */
const SCRATCH_START_CAPACITY = 64;

/**
 * Working arrays of one epoch's satellites (CarrierSmoother.step, dopplerSlipFlags), kept from epoch to
 * epoch and grown when an epoch has more satellites: the filter runs every epoch of every receiver. They
 * start large enough for any usual epoch, so the growth (a branch first met late in a run would cost a
 * deoptimisation of the step) is rare.
 */
class SmootherScratch {
  capacity = 0;
  continuing = new Uint8Array(0);
  slip = new Uint8Array(0);
  cmcChangeM = new Float64Array(0);
  dPhaseCycles = new Float64Array(0);
  dopplerPrevHz = new Float64Array(0);
  dopplerHz = new Float64Array(0);
  dtS = new Float64Array(0);
  /** Indices of the satellites with Doppler, and the misfits of both Doppler signs (dopplerSlipFlags). */
  index = new Int32Array(0);
  plusCycles = new Float64Array(0);
  minusCycles = new Float64Array(0);
  deviations = new Float64Array(0);
  sorted = new Float64Array(0);
  /**
   * The epoch's outputs per satellite (CarrierSmoother.step): smoothed code (m), filter length, restart
   * flag, and the reason as a code with its number (the text is made only by update(), from reasonText).
   */
  smoothedM = new Float64Array(0);
  length = new Float64Array(0);
  restarted = new Uint8Array(0);
  reason = new Uint8Array(0);
  reasonValue = new Float64Array(0);

  constructor(capacity = SCRATCH_START_CAPACITY) {
    this.grow(capacity);
  }

  private grow(c: number): void {
    this.capacity = c;
    this.continuing = new Uint8Array(c); this.slip = new Uint8Array(c);
    this.cmcChangeM = new Float64Array(c); this.dPhaseCycles = new Float64Array(c);
    this.dopplerPrevHz = new Float64Array(c); this.dopplerHz = new Float64Array(c); this.dtS = new Float64Array(c);
    this.index = new Int32Array(c); this.plusCycles = new Float64Array(c); this.minusCycles = new Float64Array(c);
    this.deviations = new Float64Array(c); this.sorted = new Float64Array(c);
    this.smoothedM = new Float64Array(c); this.length = new Float64Array(c); this.restarted = new Uint8Array(c);
    this.reason = new Uint8Array(c); this.reasonValue = new Float64Array(c);
  }

  /** Ready for n satellites: the first n of the per-satellite arrays hold NaN (no value) and 0 (no flag); nothing reads past n. */
  reset(n: number): void {
    if (n > this.capacity) this.grow(Math.max(n, 2 * this.capacity));
    this.continuing.fill(0, 0, n); this.slip.fill(0, 0, n);
    this.cmcChangeM.fill(NaN, 0, n); this.dPhaseCycles.fill(NaN, 0, n);
    this.dopplerPrevHz.fill(NaN, 0, n); this.dopplerHz.fill(NaN, 0, n); this.dtS.fill(NaN, 0, n);
  }
}

/** Median of values[0..count-1] (count >= 1), sorted in `work` by insertion (a dozen satellites). */
function medianOf(values: Float64Array, count: number, work: Float64Array): number {
  for (let i = 0; i < count; i++) {
    const x = values[i];
    let j = i - 1;
    while (j >= 0 && work[j] > x) { work[j + 1] = work[j]; j--; }
    work[j + 1] = x;
  }
  const h = count >> 1;
  return count % 2 ? work[h] : 0.5 * (work[h - 1] + work[h]);
}

/** Median absolute deviation of values[0..count-1] about m (the deviations are written over `deviations`). */
function madAbout(values: Float64Array, count: number, m: number, deviations: Float64Array, work: Float64Array): number {
  for (let i = 0; i < count; i++) deviations[i] = Math.abs(values[i] - m);
  return medianOf(deviations, count, work);
}

/**
 * Cycle slips by time-differenced carrier against Doppler. Per continuing satellite the misfit
 *   m_i = dPhi_i + (D_i,prev + D_i) / 2 * dt   (cycles; RINEX: a positive Doppler shortens the range),
 * less the misfit common to all satellites of the epoch (their median: a receiver clock step or a clock
 * term that the receiver puts in the carrier and not in the Doppler is common to every satellite, a slip
 * is not). A satellite is flagged when its misfit leaves the common one by more than one cycle plus 0.5 Hz
 * of Doppler error over the interval (about five times the Doppler noise of low-cost receivers, from
 * memory; the mean of two Dopplers follows the line-of-sight acceleration to well under a cycle over 30 s).
 * Receivers that write the Doppler with the other sign are recognised per epoch (the sign whose misfits
 * scatter less). Needs three satellites with Doppler; otherwise nothing is flagged.
 */
export function dopplerSlipFlags(dPhaseCycles: ArrayLike<number>, dopplerPrevHz: ArrayLike<number>, dopplerHz: ArrayLike<number>, dtS: ArrayLike<number>): boolean[] {
  const n = dPhaseCycles.length;
  const w = new SmootherScratch(Math.max(n, 1));
  w.reset(n);
  for (let i = 0; i < n; i++) {
    w.dPhaseCycles[i] = dPhaseCycles[i]; w.dopplerPrevHz[i] = dopplerPrevHz[i]; w.dopplerHz[i] = dopplerHz[i]; w.dtS[i] = dtS[i];
  }
  markDopplerSlips(n, w);
  return Array.from(w.slip.subarray(0, n), (f) => f === 1);
}

/** dopplerSlipFlags on the scratch's first n satellites: sets scratch.slip[i] to 1 for a slip. */
function markDopplerSlips(n: number, w: SmootherScratch): void {
  const { dPhaseCycles, dopplerPrevHz, dopplerHz, dtS, index, plusCycles, minusCycles, sorted } = w;
  let count = 0;
  for (let i = 0; i < n; i++) if (Number.isFinite(dPhaseCycles[i]) && Number.isFinite(dopplerPrevHz[i]) && Number.isFinite(dopplerHz[i]) && dtS[i] > 0) index[count++] = i;
  if (count < 3) return;
  for (let k = 0; k < count; k++) {
    const i = index[k];
    const meanDopplerCycles = 0.5 * (dopplerPrevHz[i] + dopplerHz[i]) * dtS[i];
    plusCycles[k] = dPhaseCycles[i] + meanDopplerCycles;
    minusCycles[k] = dPhaseCycles[i] - meanDopplerCycles;
  }
  const plusM = medianOf(plusCycles, count, sorted);
  const minusM = medianOf(minusCycles, count, sorted);
  const plusMad = madAbout(plusCycles, count, plusM, w.deviations, sorted);
  const minusMad = madAbout(minusCycles, count, minusM, w.deviations, sorted);
  const usePlus = plusMad <= minusMad;
  const use = usePlus ? plusCycles : minusCycles;
  const common = usePlus ? plusM : minusM;
  for (let k = 0; k < count; k++) {
    const i = index[k];
    if (Math.abs(use[k] - common) > 1 + 0.5 * dtS[i]) w.slip[i] = 1;
  }
}

export class CarrierSmoother {
  readonly maxN: number;
  readonly timeConstantS: number;
  readonly gapThresholdS: number;
  readonly codeCarrierJumpM: number;
  readonly clockJumpToleranceM: number;
  private readonly states = new Map<SatId, SatState>();
  private lastClockJump: ClockJump | null = null;
  private readonly jumpOptions: ClockJumpOptions;
  private readonly scratch = new SmootherScratch();

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
    this.jumpOptions = { toleranceM: this.clockJumpToleranceM };
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
    const count = this.step(epochTimeS, sats);
    const r = this.scratch;
    const out: SmootherOutput[] = new Array(count);
    for (let i = 0; i < count; i++) {
      const reason = reasonText(r.reason[i], r.reasonValue[i], epochTimeS, this.lastClockJump);
      const restarted = r.restarted[i] === 1;
      out[i] = reason === undefined
        ? { sat: sats[i].sat, smoothedM: r.smoothedM[i], n: r.length[i], restarted }
        : { sat: sats[i].sat, smoothedM: r.smoothedM[i], n: r.length[i], restarted, reason };
    }
    return out;
  }

  /** The last step's outputs: smoothedM, length (n) and restarted (1) of its first `count` satellites. */
  get outputs(): { readonly smoothedM: Float64Array; readonly length: Float64Array; readonly restarted: Uint8Array } {
    return this.scratch;
  }

  /**
   * update() without an object per satellite: the outputs are written to `outputs` (valid until the next
   * step), for callers that run the filter every epoch. Returns the number of satellites.
   */
  step(epochTimeS: number, sats: readonly SmootherInput[]): number {
    const count = sats.length;
    const scratch = this.scratch;
    scratch.reset(count);
    // 1. which satellites continue, their code-minus-carrier changes and carrier-against-Doppler inputs
    for (let i = 0; i < count; i++) {
      const o = sats[i];
      const st = this.states.get(o.sat);
      const dt = st ? epochTimeS - st.timeS : NaN;
      const ok = !!st && dt > 0 && dt <= this.gapThresholdS && (o.lli & LLI_LOST_LOCK_BIT) === 0
        && Number.isFinite(o.codeM) && Number.isFinite(o.phaseCycles) && Number.isFinite(st.phaseM);
      if (!ok) continue;
      scratch.continuing[i] = 1;
      scratch.cmcChangeM[i] = o.codeM - o.phaseCycles * o.wavelengthM - (st!.codeM - st!.phaseM);
      scratch.dPhaseCycles[i] = o.phaseCycles - st!.phaseM / o.wavelengthM;
      scratch.dopplerPrevHz[i] = st!.dopplerHz;
      scratch.dopplerHz[i] = o.dopplerHz ?? NaN;
      scratch.dtS[i] = dt;
    }
    markDopplerSlips(count, scratch);
    // 2. a common millisecond jump: shift the history of every continuing satellite
    const jump = detectMillisecondClockJump(scratch.cmcChangeM.subarray(0, count), this.jumpOptions);
    this.lastClockJump = jump;
    // 3. per satellite
    const { smoothedM: outM, length: outN, restarted: outRestarted, reason: outReason, reasonValue: outValue } = scratch;
    for (let i = 0; i < count; i++) {
      const o = sats[i];
      const st = this.states.get(o.sat);
      const phaseM = o.phaseCycles * o.wavelengthM;
      if (!Number.isFinite(o.codeM)) {
        this.states.delete(o.sat);
        outM[i] = NaN; outN[i] = 0; outRestarted[i] = 1; outReason[i] = REASON_NO_CODE; outValue[i] = NaN;
        continue;
      }
      // Reasons as codes (and a number), their text made by update() alone: a reason first met late in a
      // run then needs no new type feedback in this per-epoch step (a deoptimisation and a recompilation).
      let reason: number = REASON_NONE;
      let reasonValue = NaN;
      if (!st) reason = REASON_START;
      else if (!Number.isFinite(phaseM)) reason = REASON_NO_PHASE;
      else if (!Number.isFinite(st.phaseM)) reason = REASON_PHASE_RESUMED;
      else if ((o.lli & LLI_LOST_LOCK_BIT) !== 0) reason = REASON_LOST_LOCK;
      else if ((o.lli & LLI_HALF_CYCLE_BIT) !== (st.lli & LLI_HALF_CYCLE_BIT)) reason = REASON_HALF_CYCLE;
      else if (!(epochTimeS - st.timeS > 0)) { reason = REASON_NOT_AFTER; reasonValue = st.timeS; }
      else if (epochTimeS - st.timeS > this.gapThresholdS) { reason = REASON_GAP; reasonValue = st.timeS; }
      else if (scratch.slip[i] === 1) reason = REASON_DOPPLER_SLIP;
      let note: number = REASON_NONE;
      if (reason === REASON_NONE && st) {
        let history = st.smoothedM;
        if (jump && scratch.continuing[i] === 1 && Math.abs(scratch.cmcChangeM[i] - jump.jumpM) <= this.clockJumpToleranceM) {
          history += jump.jumpM;
          note = REASON_CLOCK_JUMP_REPAIRED;
        }
        // Hatch 1982 / Navipedia: prediction R_{k-1} + lambda (Phi_k - Phi_{k-1})
        const predicted = history + (phaseM - st.phaseM);
        const innovation = o.codeM - predicted;
        if (Math.abs(innovation) > this.codeCarrierJumpM) {
          reason = REASON_CODE_CARRIER_JUMP;
          reasonValue = innovation;
        } else {
          // Weight of the new code: 1/n while the filter fills, then dt/tau, so the time constant is in
          // seconds whatever the logging interval (irregular epochs included): R = w P + (1 - w) prediction.
          // n counts the epochs since the (re)start; it is not capped by a nominal interval, so a header
          // INTERVAL that is missing or wrong does not change the time constant.
          const n = st.n + 1;
          const w = Math.min(1, Math.max(1 / n, (epochTimeS - st.timeS) / this.timeConstantS));
          const smoothedM = w * o.codeM + (1 - w) * predicted;
          st.n = n; st.smoothedM = smoothedM; st.codeM = o.codeM; st.phaseM = phaseM; st.timeS = epochTimeS;
          st.lli = o.lli; st.dopplerHz = o.dopplerHz ?? NaN;
          // Reported filter length: the effective number of epochs averaged, 1 / w.
          const length = Math.round(1 / w);
          outM[i] = smoothedM; outN[i] = length; outRestarted[i] = 0; outReason[i] = note; outValue[i] = NaN;
          continue;
        }
      }
      this.states.set(o.sat, { sat: o.sat, n: 1, smoothedM: o.codeM, codeM: o.codeM, phaseM, timeS: epochTimeS, lli: o.lli, dopplerHz: o.dopplerHz ?? NaN });
      outM[i] = o.codeM; outN[i] = 1; outRestarted[i] = 1; outReason[i] = reason; outValue[i] = reasonValue;
    }
    // 4. bounded memory: satellites silent for long restart anyway; kept a while so the restart can say "gap"
    const forgetS = Math.max(10 * this.gapThresholdS, 600);
    for (const st of this.states.values()) if (epochTimeS - st.timeS > forgetS) this.states.delete(st.sat);
    return count;
  }
}
