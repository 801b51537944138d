/**
 * Broadcast ionosphere models of the Klobuchar type.
 *
 * GPS: IS-GPS-200 20.3.3.5.2.5 and figure 20-4 (Klobuchar, "Ionospheric time-delay algorithm for
 * single-frequency GPS users", IEEE Trans. AES-23(3), 1987): thin shell at 350 km, geomagnetic latitude of
 * the pierce point, cosine day-time bump; result is the L1 slant delay.
 *
 * BeiDou: BDS-SIS-ICD-B1I 5.2.4.7 (as we know it; "from memory" where marked): 375 km shell, geographic
 * latitude of the pierce point, |phi_M| in the polynomials, period clamped to [72000, 172800] s, BDT.
 * Result is the B1I slant delay.
 */
import type { KlobucharCoefficients } from '../gnss/index.js';
import { gpsToBdtS } from '../time/index.js';
import { FREQ_L1_HZ, GPS_PI, SPEED_OF_LIGHT_MS } from './constants.js';

/**
 * GPS Klobuchar L1 slant ionospheric delay (m). Latitude/longitude geodetic (rad), elevation/azimuth (rad),
 * `gpsTimeS` GPS time of week (s) (any GPS seconds work: only the time of day is used).
 */
export function klobucharDelayM(
  coeffs: KlobucharCoefficients,
  latRad: number,
  lonRad: number,
  elevationRad: number,
  azimuthRad: number,
  gpsTimeS: number,
): number {
  const { alpha, beta } = coeffs;
  const phiU = latRad / GPS_PI; // semicircles
  const lamU = lonRad / GPS_PI;
  const e = elevationRad / GPS_PI;
  // Earth-centred angle, semicircles (IS-GPS-200 fig. 20-4: psi = 0.0137 / (E + 0.11) - 0.022)
  const psi = 0.0137 / (e + 0.11) - 0.022;
  // sub-ionospheric latitude, clamped to +-0.416 semicircles
  let phiI = phiU + psi * Math.cos(azimuthRad);
  if (phiI > 0.416) phiI = 0.416;
  else if (phiI < -0.416) phiI = -0.416;
  // sub-ionospheric longitude
  const lamI = lamU + (psi * Math.sin(azimuthRad)) / Math.cos(phiI * GPS_PI);
  // geomagnetic latitude of the pierce point
  const phiM = phiI + 0.064 * Math.cos((lamI - 1.617) * GPS_PI);
  // local time at the pierce point, [0, 86400)
  let t = 4.32e4 * lamI + gpsTimeS;
  t -= Math.floor(t / 86400) * 86400;
  // obliquity factor F = 1 + 16 (0.53 - E)^3
  const f = 1 + 16 * (0.53 - e) ** 3;
  let amp = alpha[0] + phiM * (alpha[1] + phiM * (alpha[2] + phiM * alpha[3]));
  if (amp < 0) amp = 0;
  let per = beta[0] + phiM * (beta[1] + phiM * (beta[2] + phiM * beta[3]));
  if (per < 72000) per = 72000;
  const x = (2 * GPS_PI * (t - 50400)) / per; // radians
  // One product for day and night (the night branch, first met late in a run, then needs no new type feedback).
  const delayS = f * (Math.abs(x) < 1.57 ? 5e-9 + amp * (1 - (x * x) / 2 + (x * x * x * x) / 24) : 5e-9);
  return delayS * SPEED_OF_LIGHT_MS;
}

/** Scale a first-order ionospheric group delay from one carrier to another: (f_ref / f)^2 (e.g. IS-GPS-200 20.3.3.3.3.2). */
export function scaleIonosphereDelayM(delayM: number, toFrequencyHz: number, fromFrequencyHz = FREQ_L1_HZ): number {
  const r = fromFrequencyHz / toFrequencyHz;
  return delayM * r * r;
}

/** Mean Earth radius and shell height of the BeiDou model (BDS-SIS-ICD-B1I 5.2.4.7: R = 6378 km, h = 375 km). */
const BDS_EARTH_RADIUS_KM = 6378;
const BDS_SHELL_HEIGHT_KM = 375;

/**
 * BeiDou Klobuchar B1I slant ionospheric delay (m), BDS-SIS-ICD-B1I 5.2.4.7 (from memory).
 * `gpsTimeS` is GPS time (TOW or continuous); converted to BDT (= GPST - 14 s) for the local time.
 */
export function beidouKlobucharDelayM(
  coeffs: KlobucharCoefficients,
  latRad: number,
  lonRad: number,
  elevationRad: number,
  azimuthRad: number,
  gpsTimeS: number,
): number {
  const { alpha, beta } = coeffs;
  const ratio = BDS_EARTH_RADIUS_KM / (BDS_EARTH_RADIUS_KM + BDS_SHELL_HEIGHT_KM);
  const cosE = Math.cos(elevationRad);
  // Earth-centred angle of the pierce point (spherical geometry, ICD 5.2.4.7): psi = pi/2 - E - asin(R/(R+h) cos E)
  const psi = Math.PI / 2 - elevationRad - Math.asin(ratio * cosE);
  // geographic latitude and longitude of the pierce point
  const sinPhiM = Math.sin(latRad) * Math.cos(psi) + Math.cos(latRad) * Math.sin(psi) * Math.cos(azimuthRad);
  const phiM = Math.asin(Math.max(-1, Math.min(1, sinPhiM)));
  const lamM = lonRad + Math.asin(Math.max(-1, Math.min(1, (Math.sin(psi) * Math.sin(azimuthRad)) / Math.cos(phiM))));
  // local time at the pierce point from BDT seconds (BDT = GPST - 14 s, check-values.md constants)
  let t = gpsToBdtS(gpsTimeS) + (lamM * 43200) / Math.PI;
  t -= Math.floor(t / 86400) * 86400;
  const phiSc = Math.abs(phiM / Math.PI); // |phi_M| in semicircles
  let a2 = alpha[0] + phiSc * (alpha[1] + phiSc * (alpha[2] + phiSc * alpha[3]));
  if (a2 < 0) a2 = 0;
  let a4 = beta[0] + phiSc * (beta[1] + phiSc * (beta[2] + phiSc * beta[3]));
  if (a4 >= 172800) a4 = 172800;
  else if (a4 < 72000) a4 = 72000;
  // vertical delay: 5 ns night-time constant plus the cosine day-time term (ICD 5.2.4.7)
  const iz = Math.abs(t - 50400) < a4 / 4 ? 5e-9 + a2 * Math.cos((2 * Math.PI * (t - 50400)) / a4) : 5e-9;
  // thin-shell obliquity 1 / sqrt(1 - (R/(R+h) cos E)^2)
  const obliquity = 1 / Math.sqrt(1 - (ratio * cosE) ** 2);
  return obliquity * iz * SPEED_OF_LIGHT_MS;
}
