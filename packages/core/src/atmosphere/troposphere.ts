/**
 * Tropospheric delay: standard atmosphere at the receiver height, Saastamoinen zenith delays, Niell (1996)
 * mapping functions.
 *
 * - Standard atmosphere: Berg, "Allgemeine Meteorologie" (1948), as used in e.g. Hofmann-Wellenhof et al.,
 *   "GNSS" (2008) 5.3.3: P = 1013.25 (1 - 2.2557e-5 h)^5.2568 hPa, T = 288.15 - 0.0065 h K; relative
 *   humidity 50 % at every height (common practice); water-vapour pressure from the Magnus–Tetens formula
 *   e_s = 6.1078 exp(17.27 t / (t + 237.3)) hPa, t in deg C (Tetens 1930; Murray 1967).
 * - Zenith hydrostatic delay: Saastamoinen (1972) with the gravity term of Davis et al. (1985), Radio
 *   Science 20(6): ZHD = 0.0022768 P / (1 - 0.00266 cos 2phi - 2.8e-7 h).
 * - Zenith wet delay: Saastamoinen (1972): ZWD = 0.002277 (1255 / T + 0.05) e.
 * - Mapping: Niell, "Global mapping functions for the atmosphere delay at radio wavelengths",
 *   J. Geophys. Res. 101(B2), 3227-3246 (1996), continued fraction (eq. 4), coefficient table 3 (from
 *   memory; checked by m(90 deg) = 1 and the 5 deg value against a spherical-shell estimate), seasonal term
 *   with DOY 28 phase, height correction (eq. 6).
 * Valid in the troposphere: heights are clamped to [-500, 9000] m (standard atmosphere range, our choice).
 */

const MIN_HEIGHT_M = -500;
const MAX_HEIGHT_M = 9000;
/** Niell's functions were fitted down to 3 deg; below 1 deg (or negative) the elevation is clamped (our choice). */
const MIN_ELEVATION_RAD = Math.PI / 180;

export interface StandardAtmosphere {
  readonly pressureHPa: number;
  readonly temperatureK: number;
  /** Partial pressure of water vapour (hPa). */
  readonly waterVapourHPa: number;
}

/** Berg (1948) standard atmosphere at an ellipsoidal/orthometric height (m); relative humidity default 0.5. */
export function standardAtmosphere(heightM: number, relativeHumidity = 0.5): StandardAtmosphere {
  const h = Math.min(MAX_HEIGHT_M, Math.max(MIN_HEIGHT_M, heightM));
  const pressureHPa = 1013.25 * (1 - 2.2557e-5 * h) ** 5.2568; // Berg 1948
  const temperatureK = 288.15 - 0.0065 * h; // Berg 1948
  const tC = temperatureK - 273.15;
  const saturationHPa = 6.1078 * Math.exp((17.27 * tC) / (tC + 237.3)); // Magnus–Tetens (Murray 1967)
  return { pressureHPa, temperatureK, waterVapourHPa: relativeHumidity * saturationHPa };
}

/** Zenith hydrostatic delay (m): Saastamoinen 1972 / Davis et al. 1985. Pressure hPa, geodetic latitude rad, height m. */
export function saastamoinenZenithHydrostaticM(pressureHPa: number, latRad: number, heightM: number): number {
  return (0.0022768 * pressureHPa) / (1 - 0.00266 * Math.cos(2 * latRad) - 2.8e-7 * heightM);
}

/** Zenith wet delay (m): Saastamoinen 1972, ZWD = 0.002277 (1255/T + 0.05) e. Temperature K, water vapour hPa. */
export function saastamoinenZenithWetM(temperatureK: number, waterVapourHPa: number): number {
  return 0.002277 * (1255 / temperatureK + 0.05) * waterVapourHPa;
}

// Niell 1996, table 3: coefficients at latitudes 15, 30, 45, 60, 75 deg (from memory).
const NIELL_LAT_DEG = [15, 30, 45, 60, 75] as const;
/** Hydrostatic a, b, c: average. */
const NMF_H_AVG: readonly (readonly [number, number, number])[] = [
  [1.2769934e-3, 2.9153695e-3, 62.610505e-3],
  [1.268323e-3, 2.9152299e-3, 62.837393e-3],
  [1.2465397e-3, 2.9288445e-3, 63.721774e-3],
  [1.2196049e-3, 2.9022565e-3, 63.824265e-3],
  [1.2045996e-3, 2.9024912e-3, 64.258455e-3],
];
/** Hydrostatic a, b, c: seasonal amplitude. */
const NMF_H_AMP: readonly (readonly [number, number, number])[] = [
  [0, 0, 0],
  [1.2709626e-5, 2.1414979e-5, 9.01284e-5],
  [2.6523662e-5, 3.0160779e-5, 4.3497037e-5],
  [3.4000452e-5, 7.2562722e-5, 84.795348e-5],
  [4.1202191e-5, 11.723375e-5, 170.37206e-5],
];
/** Height correction a, b, c (Niell 1996, table 3, "height correction"). */
const NMF_HT: readonly [number, number, number] = [2.53e-5, 5.49e-3, 1.14e-3];
/** Wet a, b, c. */
const NMF_W: readonly (readonly [number, number, number])[] = [
  [5.8021897e-4, 1.4275268e-3, 4.3472961e-2],
  [5.6794847e-4, 1.5138625e-3, 4.672951e-2],
  [5.8118019e-4, 1.4572752e-3, 4.3908931e-2],
  [5.9727542e-4, 1.5007428e-3, 4.4626982e-2],
  [6.1641693e-4, 1.7599082e-3, 5.4736038e-2],
];

/** Marini (1972) continued fraction normalised to 1 at zenith (Niell 1996, eq. 4). */
function marini(sinE: number, a: number, b: number, c: number): number {
  return (1 + a / (1 + b / (1 + c))) / (sinE + a / (sinE + b / (sinE + c)));
}

/**
 * Coefficient k of the table, interpolated linearly in |latitude|, constant beyond 15 and 75 deg (Niell 1996,
 * sec. 4). One number at a time: the mapping is evaluated for every satellite of every epoch.
 */
function interpolate(table: readonly (readonly [number, number, number])[], absLatDeg: number, k: 0 | 1 | 2): number {
  if (absLatDeg <= NIELL_LAT_DEG[0]) return table[0][k];
  if (absLatDeg >= NIELL_LAT_DEG[4]) return table[4][k];
  const i = Math.floor((absLatDeg - 15) / 15);
  const f = (absLatDeg - NIELL_LAT_DEG[i]) / 15;
  const lo = table[i], hi = table[i + 1];
  return lo[k] + f * (hi[k] - lo[k]);
}

export interface NiellMapping {
  readonly hydrostatic: number;
  readonly wet: number;
}

/**
 * Niell (1996) hydrostatic and wet mapping functions. `dayOfYear` 1..366 (fractional allowed); the seasonal
 * phase is DOY 28 in the north and shifted by half a year in the south (Niell 1996, eq. 5).
 */
export function niellMapping(latRad: number, heightM: number, elevationRad: number, dayOfYear: number): NiellMapping {
  const absLatDeg = (Math.abs(latRad) * 180) / Math.PI;
  const doy = latRad < 0 ? dayOfYear + 365.25 / 2 : dayOfYear;
  const season = Math.cos((2 * Math.PI * (doy - 28)) / 365.25);
  const a = interpolate(NMF_H_AVG, absLatDeg, 0) - interpolate(NMF_H_AMP, absLatDeg, 0) * season;
  const b = interpolate(NMF_H_AVG, absLatDeg, 1) - interpolate(NMF_H_AMP, absLatDeg, 1) * season;
  const c = interpolate(NMF_H_AVG, absLatDeg, 2) - interpolate(NMF_H_AMP, absLatDeg, 2) * season;
  const sinE = Math.sin(Math.max(elevationRad, MIN_ELEVATION_RAD));
  const h = Math.min(MAX_HEIGHT_M, Math.max(MIN_HEIGHT_M, heightM));
  // height correction dm/dh = 1/sin E - f(E; a_ht, b_ht, c_ht), per km of height (Niell 1996, eq. 6)
  const dmdh = 1 / sinE - marini(sinE, NMF_HT[0], NMF_HT[1], NMF_HT[2]);
  const hydrostatic = marini(sinE, a, b, c) + dmdh * (h / 1000);
  const wet = marini(sinE, interpolate(NMF_W, absLatDeg, 0), interpolate(NMF_W, absLatDeg, 1), interpolate(NMF_W, absLatDeg, 2));
  return { hydrostatic, wet };
}

export interface SlantTroposphere {
  readonly slantM: number;
  readonly zenithHydrostaticM: number;
  readonly zenithWetM: number;
  readonly mapping: NiellMapping;
}

/** Slant delay with its parts: standard atmosphere + Saastamoinen zenith delays + Niell mapping. */
export function slantTroposphere(latRad: number, heightM: number, elevationRad: number, dayOfYear: number): SlantTroposphere {
  const atm = standardAtmosphere(heightM);
  const h = Math.min(MAX_HEIGHT_M, Math.max(MIN_HEIGHT_M, heightM));
  const zenithHydrostaticM = saastamoinenZenithHydrostaticM(atm.pressureHPa, latRad, h);
  const zenithWetM = saastamoinenZenithWetM(atm.temperatureK, atm.waterVapourHPa);
  const mapping = niellMapping(latRad, heightM, elevationRad, dayOfYear);
  return { slantM: zenithHydrostaticM * mapping.hydrostatic + zenithWetM * mapping.wet, zenithHydrostaticM, zenithWetM, mapping };
}

/**
 * The parts of slantTroposphere that depend on the receiver and the day alone (zenith delays, the mapping
 * coefficients at its latitude and season), for the last receiver asked about: an epoch's satellites are
 * modelled one after the other from one receiver, so these are computed once per receiver epoch.
 */
class ReceiverTroposphere {
  latRad = NaN;
  heightM = NaN;
  dayOfYear = NaN;
  zenithHydrostaticM = NaN;
  zenithWetM = NaN;
  hydrostaticA = NaN;
  hydrostaticB = NaN;
  hydrostaticC = NaN;
  wetA = NaN;
  wetB = NaN;
  wetC = NaN;
  clampedHeightM = NaN;

  /** Computes the parts for a receiver and day unless they are the last ones (the same expressions as slantTroposphere and niellMapping). */
  at(latRad: number, heightM: number, dayOfYear: number): void {
    if (latRad === this.latRad && heightM === this.heightM && dayOfYear === this.dayOfYear) return;
    const atm = standardAtmosphere(heightM);
    const h = Math.min(MAX_HEIGHT_M, Math.max(MIN_HEIGHT_M, heightM));
    this.zenithHydrostaticM = saastamoinenZenithHydrostaticM(atm.pressureHPa, latRad, h);
    this.zenithWetM = saastamoinenZenithWetM(atm.temperatureK, atm.waterVapourHPa);
    const absLatDeg = (Math.abs(latRad) * 180) / Math.PI;
    const doy = latRad < 0 ? dayOfYear + 365.25 / 2 : dayOfYear;
    const season = Math.cos((2 * Math.PI * (doy - 28)) / 365.25);
    this.hydrostaticA = interpolate(NMF_H_AVG, absLatDeg, 0) - interpolate(NMF_H_AMP, absLatDeg, 0) * season;
    this.hydrostaticB = interpolate(NMF_H_AVG, absLatDeg, 1) - interpolate(NMF_H_AMP, absLatDeg, 1) * season;
    this.hydrostaticC = interpolate(NMF_H_AVG, absLatDeg, 2) - interpolate(NMF_H_AMP, absLatDeg, 2) * season;
    this.wetA = interpolate(NMF_W, absLatDeg, 0);
    this.wetB = interpolate(NMF_W, absLatDeg, 1);
    this.wetC = interpolate(NMF_W, absLatDeg, 2);
    this.clampedHeightM = h;
    this.latRad = latRad;
    this.heightM = heightM;
    this.dayOfYear = dayOfYear;
  }
}

const lastReceiver = new ReceiverTroposphere();

/**
 * Slant tropospheric delay (m) at a receiver (geodetic latitude rad, height m) for one elevation and day of
 * year: slantTroposphere(...).slantM, the same double, with the receiver's parts kept from the last call.
 */
export function slantTroposphereM(latRad: number, heightM: number, elevationRad: number, dayOfYear: number): number {
  const r = lastReceiver;
  r.at(latRad, heightM, dayOfYear);
  const sinE = Math.sin(Math.max(elevationRad, MIN_ELEVATION_RAD));
  const dmdh = 1 / sinE - marini(sinE, NMF_HT[0], NMF_HT[1], NMF_HT[2]);
  const hydrostatic = marini(sinE, r.hydrostaticA, r.hydrostaticB, r.hydrostaticC) + dmdh * (r.clampedHeightM / 1000);
  const wet = marini(sinE, r.wetA, r.wetB, r.wetC);
  return r.zenithHydrostaticM * hydrostatic + r.zenithWetM * wet;
}
