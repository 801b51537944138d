/**
 * The code measurement model, once, for every stage that needs it (reference corrections, single
 * differences, standalone fixes):
 *   P = rho + c (dt_rx - dt_sv) + T + I + e
 * (Misra & Enge 2011, eq. 5.5; IS-GPS-200 20.3.3.3.3 for dt_sv with its relativistic and group-delay terms),
 * so the misclosure of a code observation at a trial receiver position, receiver clock left in, is
 *   P - (rho - c dt_sv + T + I).
 * The look from a receiver (elevation, azimuth) and its a-priori atmosphere (atmosphere-model.ts) are kept
 * together: they change with the receiver position only through metres-scale changes of the look angles.
 */
import type { EcefM, GeodeticRad, GnssSystem, IonosphereCoefficients, SatId } from '../gnss/index.js';
import { azimuthElevation } from '../geodesy/index.js';
import { ionosphereDelayM, troposphereDelayM } from './atmosphere-model.js';

/** A satellite seen from a receiver: look angles and the a-priori slant delays of the model (m). */
export interface ReceiverLook {
  readonly elevationRad: number;
  readonly azimuthRad: number;
  readonly troposphereM: number;
  /** Group delay on the signal's frequency; 0 when the frequency or the coefficients are unknown. */
  readonly ionosphereM: number;
}

/**
 * Look and atmosphere of a satellite at `satPos` from a receiver at `rx` (geodetic `g`). Below `maskRad` only
 * the angles are computed (delays NaN): the satellite will not be used.
 */
export function lookFrom(
  rx: EcefM, g: GeodeticRad, satPos: EcefM, system: GnssSystem, frequencyHz: number,
  iono: IonosphereCoefficients, tagGpsS: number, dayOfYear: number, maskRad = -Infinity,
): ReceiverLook {
  const ae = azimuthElevation(rx, satPos, g.latRad, g.lonRad);
  const el = ae.elevationRad;
  if (el < maskRad) return { elevationRad: el, azimuthRad: ae.azimuthRad, troposphereM: NaN, ionosphereM: NaN };
  return {
    elevationRad: el, azimuthRad: ae.azimuthRad,
    troposphereM: troposphereDelayM(g, el, dayOfYear),
    ionosphereM: Number.isFinite(frequencyHz) ? ionosphereDelayM(iono, system, g, el, ae.azimuthRad, tagGpsS, frequencyHz) : 0,
  };
}

/** Observed minus modelled code (m), receiver clock left in: P - (rho - c dt_sv + T + I). */
export function codeMisclosureM(codeM: number, rangeM: number, satClockM: number, look: ReceiverLook): number {
  return codeM - rangeM + satClockM - look.troposphereM - look.ionosphereM;
}

/** One linearised code observation at a trial position: what a position fix (solve/position-fix.ts) consumes. */
export interface LinearRow {
  readonly sat: SatId;
  readonly system: GnssSystem;
  /** Receiver-to-satellite unit vector (ECEF). */
  readonly losX: number;
  readonly losY: number;
  readonly losZ: number;
  /** Observed minus computed at the trial position, receiver clock excluded (m). */
  readonly misclosureM: number;
  /** A-priori variance (m^2). */
  readonly varianceM2: number;
}
