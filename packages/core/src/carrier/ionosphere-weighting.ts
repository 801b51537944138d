/**
 * The differential ionosphere of a dual-frequency session, weighted (the ionosphere-weighted model of
 * Odijk 2002, "Fast precise GPS positioning in the presence of ionospheric delays", PhD thesis, Delft; also
 * Teunissen & Montenbruck 2017, Springer Handbook of GNSS, ch. 23): one state per satellite, the
 * between-receiver single difference of the slant delay on the primary band (m), entering the code of band f
 * as +mu_f I and its phase as -mu_f I, mu_f = (lambda_f / lambda_1)^2 (first-order delay proportional to
 * 1 / f^2; e.g. Misra & Enge 2011, 5.3), with a prior of zero and a standard deviation growing with the
 * baseline:
 *
 *   sigma_I = (0.5 mm + 4 mm/km * baseline) * F(el),
 *
 * F the single-layer obliquity factor at 350 km (the shell height of the broadcast model, IS-GPS-200
 * 20.3.3.5.2.5). 4 mm per km of vertical delay difference is a disturbed mid-latitude gradient (quiet days
 * give about 1 mm/km; from memory, order of magnitude as in Odijk 2002 and Wanninger 1993): cautious, so
 * that a gradient the prior does not expect is estimated rather than forced into the integers (with the
 * simulator, 2 mm/km let a 6 km baseline under a 4 mm/km gradient fix wrongly). The state
 * follows a random walk that regains its prior variance in 600 s (the ionosphere between two receivers
 * decorrelates over tens of minutes; common practice).
 *
 * Why: with one frequency the ionosphere is neglected (its effect under a few km is millimetres to a few
 * centimetres per double difference, which the single-frequency float tolerates). With two, the integer
 * search becomes so precise that a neglected ionosphere of a centimetre or two makes it fix wrong integers
 * with high confidence (measured with the simulator: about 6 km at 4 mm/km of gradient), so a session with
 * further bands estimates it. At zero and very short baselines the prior is a millimetre or two: the
 * estimate is then close to the neglect, and little is lost. Satellites with the primary band only keep the
 * neglect (with the simulator at 6 km, a state for them too left one static session of two without a fix and
 * the other with centimetre errors: their code alone cannot separate ionosphere and ambiguity).
 *
 * Limit: beyond about 5 km the simulator's fixed positions carry centimetre errors with one frequency or
 * more, and its sessions of 8 minutes fix late or wrongly beyond 10 km (the ionosphere weighting helps the
 * dual-frequency case, it does not make it safe); the session warns beyond 10 km.
 */

/** Shell height of the single-layer ionosphere (m): IS-GPS-200 20.3.3.5.2.5. */
const SHELL_HEIGHT_M = 350e3;
const EARTH_RADIUS_M = 6371e3;

export interface IonosphereWeighting {
  /** Standard deviation of the single-difference vertical delay on the primary band (m). */
  readonly verticalSigmaM: number;
  /** Random walk of the state (m^2 per s, before the obliquity factor). */
  readonly randomWalkM2PerS: number;
}

/** The weighting for a baseline length (m): the file comment's prior and random walk. */
export function ionosphereWeighting(baselineM: number): IonosphereWeighting {
  const sigma = 0.0005 + 0.004 * Math.max(baselineM, 0) / 1000;
  return { verticalSigmaM: sigma, randomWalkM2PerS: (sigma * sigma) / 600 };
}

/** Single-layer obliquity factor F(el) = 1 / sqrt(1 - (R cos el / (R + h))^2). */
export function ionosphereObliquity(elevationRad: number): number {
  const s = (EARTH_RADIUS_M * Math.cos(elevationRad)) / (EARTH_RADIUS_M + SHELL_HEIGHT_M);
  return 1 / Math.sqrt(1 - s * s);
}

/** mu = (lambda / lambda_primary)^2: the first-order delay on a band per unit of delay on the primary band. */
export function ionosphereFactor(wavelengthM: number, primaryWavelengthM: number): number {
  return (wavelengthM / primaryWavelengthM) ** 2;
}
