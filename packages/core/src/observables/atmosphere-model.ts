/**
 * The a-priori atmosphere applied to every modelled range: Klobuchar ionosphere (GPS coefficients; the
 * BeiDou variant for BeiDou satellites when its coefficients are present) scaled to the signal's
 * frequency, and the Saastamoinen troposphere with a standard atmosphere at the receiver height and the
 * Niell mapping function (see atmosphere/).
 */
import type { GeodeticRad, GnssSystem } from '../gnss/index.js';
import type { IonosphereCoefficients } from '../gnss/index.js';
import { beidouKlobucharDelayM, klobucharDelayM, scaleIonosphereDelayM, slantTroposphereM } from '../atmosphere/index.js';
import { calendarFromSeconds, gpsToUtcS, daysFromCivil } from '../time/index.js';

export function dayOfYear(gpsS: number): number {
  const c = calendarFromSeconds(gpsToUtcS(gpsS));
  return daysFromCivil(c.year, c.month, c.day) - daysFromCivil(c.year, 1, 1) + 1 + (HOUR_FRACTIONS[c.hour] ?? c.hour / 24);
}

/**
 * h / 24 for the hours of a day, the same doubles as the division. Read from an array of doubles, the
 * fraction is a double from the first epoch on: V8 would otherwise take the integer results of hour 0
 * (a day file's first hour) as integer arithmetic and deoptimise every function holding it at hour 1.
 */
const HOUR_FRACTIONS: readonly number[] = Array.from({ length: 24 }, (_, h) => h / 24);

/** L1-band (or the given frequency's) slant ionospheric group delay (m); 0 when no coefficients. */
export function ionosphereDelayM(
  iono: IonosphereCoefficients, system: GnssSystem, rx: GeodeticRad, elevationRad: number, azimuthRad: number,
  gpsS: number, frequencyHz: number,
): number {
  if (system === 'C' && iono.beidou) {
    return scaleIonosphereDelayM(beidouKlobucharDelayM(iono.beidou, rx.latRad, rx.lonRad, elevationRad, azimuthRad, gpsS), frequencyHz, 1561.098e6);
  }
  // BeiDou's coefficients belong to BeiDou's own variant of the model (BDS ICD B1I 5.2.4.7): never fed to the GPS one.
  const k = iono.gps ?? iono.qzss;
  if (!k) return 0;
  return scaleIonosphereDelayM(klobucharDelayM(k, rx.latRad, rx.lonRad, elevationRad, azimuthRad, gpsS), frequencyHz);
}

export function troposphereDelayM(rx: GeodeticRad, elevationRad: number, doy: number): number {
  // Below the ellipsoid by more than a few hundred metres is not a real receiver: clamp the model's input.
  const h = Math.min(Math.max(rx.heightM, -500), 9000);
  return slantTroposphereM(rx.latRad, h, Math.max(elevationRad, 0.02), doy);
}
