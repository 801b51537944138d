/**
 * A simulated receiver clock: offset = offset0 + drift (t - t0) + wander(t), and, for receivers steered
 * by millisecond steps, the offset is kept within +-0.5 ms by subtracting whole milliseconds (the common
 * low-cost receiver behaviour: each step makes every pseudorange jump by c x 1 ms = 299,792.458 m).
 * The carrier phase either follows the steps or stays continuous (ReceiverProfile.phaseFollowsJumps).
 */
import type { ReceiverProfile } from './errors.js';
import { ZERO_PROCESS, type SlowProcess } from './slow-process.js';

const MS = 1e-3;

export interface ReceiverClock {
  /** Offset applied to the epoch tag and the pseudoranges (s). */
  codeOffsetS(tGpsS: number): number;
  /** Offset seen by the carrier phase (s). */
  phaseOffsetS(tGpsS: number): number;
  /** Frequency offset (s/s), seen by the Doppler. */
  driftSS(tGpsS: number): number;
}

export const PERFECT_CLOCK: ReceiverClock = { codeOffsetS: () => 0, phaseOffsetS: () => 0, driftSS: () => 0 };

export class SteeredReceiverClock implements ReceiverClock {
  constructor(
    private readonly profile: ReceiverProfile,
    private readonly t0GpsS: number,
    private readonly wander: SlowProcess = ZERO_PROCESS,
  ) {}

  /** The free-running offset (s), before millisecond steering. */
  rawOffsetS(tGpsS: number): number {
    return this.profile.clockOffsetS + this.profile.clockDriftSS * (tGpsS - this.t0GpsS) + this.wander.at(tGpsS);
  }

  /** Whole milliseconds removed by steering at t. */
  stepsMs(tGpsS: number): number {
    return this.profile.clockJumpsMs ? Math.round(this.rawOffsetS(tGpsS) / MS) : 0;
  }

  codeOffsetS(tGpsS: number): number {
    return this.rawOffsetS(tGpsS) - this.stepsMs(tGpsS) * MS;
  }

  phaseOffsetS(tGpsS: number): number {
    return this.profile.phaseFollowsJumps ? this.codeOffsetS(tGpsS) : this.rawOffsetS(tGpsS);
  }

  driftSS(tGpsS: number): number {
    return this.profile.clockDriftSS + this.wander.rateAt(tGpsS);
  }
}
