/**
 * The simulated ("true") tropospheric delay: the standard atmosphere at the receiver's height with
 * Saastamoinen zenith delays and Niell mapping (atmosphere/troposphere.ts; Saastamoinen 1972, Davis et
 * al. 1985, Niell 1996), plus a slowly varying zenith wet error of the receiver, mapped with the wet
 * mapping function. Lower sites see more delay because pressure and humidity grow downwards.
 */
import { slantTroposphere } from '@refdelta/core';
import { ZERO_PROCESS, type SlowProcess } from './slow-process.js';

export class TropoTruth {
  constructor(private readonly zenithWetError: SlowProcess = ZERO_PROCESS) {}

  /** Slant delay (m), same on every frequency (the troposphere is not dispersive at L band). */
  slantDelayM(latRad: number, heightM: number, elevationRad: number, dayOfYear: number, tGpsS: number): number {
    const s = slantTroposphere(latRad, heightM, elevationRad, dayOfYear);
    return s.slantM + this.zenithWetError.at(tGpsS) * s.mapping.wet;
  }
}
