/**
 * The simulated ("true") ionospheric delay on L1/E1: the broadcast Klobuchar model scaled, plus a
 * travelling wave that gives the vertical delay a horizontal gradient, so the delay decorrelates with the
 * distance between receivers.
 *
 * Pierce point and obliquity: IS-GPS-200 20.3.3.5.2.5, fig. 20-4 (psi = 0.0137/(E + 0.11) - 0.022
 * semicircles; F = 1 + 16 (0.53 - E)^3). Wave: dI_v = A sin(2 pi s / L + 2 pi t / T + phi0) with s the
 * pierce point's distance along the wave's azimuth; its largest gradient is 2 pi A / L, so A = g L / (2 pi).
 */
import type { KlobucharCoefficients } from '@refdelta/core';
import { klobucharDelayM } from '@refdelta/core';
import type { IonoErrorParams } from './errors.js';

const GPS_PI = 3.1415926535898; // IS-GPS-200 value of pi for the curve fits
/** Mean Earth radius (km) for pierce-point distances (common practice). */
const EARTH_RADIUS_KM = 6371;

export interface IonoOrigin {
  readonly latRad: number;
  readonly lonRad: number;
}

export class IonoTruth {
  private readonly ampM: number;
  private readonly cosAz: number;
  private readonly sinAz: number;

  constructor(
    private readonly params: IonoErrorParams,
    private readonly coeffs: KlobucharCoefficients,
    private readonly origin: IonoOrigin,
    private readonly phase0Rad: number,
  ) {
    this.ampM = (params.gradientMPerKm * params.waveLengthKm) / (2 * Math.PI);
    const az = (params.waveAzimuthDeg * Math.PI) / 180;
    this.cosAz = Math.cos(az);
    this.sinAz = Math.sin(az);
  }

  /** L1 slant ionospheric group delay (m) for a receiver at (lat, lon) and a satellite at (el, az), GPS time t. */
  slantDelayL1M(latRad: number, lonRad: number, elevationRad: number, azimuthRad: number, tGpsS: number): number {
    const base = this.params.klobucharScale * klobucharDelayM(this.coeffs, latRad, lonRad, elevationRad, azimuthRad, tGpsS);
    // Pierce point, IS-GPS-200 fig. 20-4 (semicircles).
    const e = elevationRad / GPS_PI;
    const psi = 0.0137 / (e + 0.11) - 0.022;
    const phiI = latRad / GPS_PI + psi * Math.cos(azimuthRad);
    const lamI = lonRad / GPS_PI + (psi * Math.sin(azimuthRad)) / Math.cos(phiI * GPS_PI);
    const f = 1 + 16 * (0.53 - e) ** 3;
    const dNorthKm = (phiI * GPS_PI - this.origin.latRad) * EARTH_RADIUS_KM;
    const dEastKm = (lamI * GPS_PI - this.origin.lonRad) * EARTH_RADIUS_KM * Math.cos(this.origin.latRad);
    const s = dNorthKm * this.cosAz + dEastKm * this.sinAz;
    const wave = this.ampM * Math.sin((2 * Math.PI * s) / this.params.waveLengthKm + (2 * Math.PI * tGpsS) / this.params.wavePeriodS + this.phase0Rad);
    return Math.max(0, base + f * wave);
  }
}
