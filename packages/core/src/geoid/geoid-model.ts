/**
 * Geoid models: orthometric height H = h - N (ellipsoidal height minus geoid undulation), e.g.
 * Hofmann-Wellenhof & Moritz, "Physical Geodesy" (2006), eq. 4-46 (H ~ h - N, neglecting the
 * deflection of the vertical: sub-mm).
 */
export interface GeoidModel {
  readonly name: string;
  /** What the resulting heights are relative to, e.g. 'EGM96 geoid' or the user's vertical datum. */
  readonly heightReference: string;
  /** Geoid undulation N in metres above the ellipsoid at geodetic latitude/longitude in degrees. */
  undulationM(latDeg: number, lonDeg: number): number;
}

/** H = h - N. */
export function orthometricHeightM(model: GeoidModel, latDeg: number, lonDeg: number, ellipsoidalHeightM: number): number {
  return ellipsoidalHeightM - model.undulationM(latDeg, lonDeg);
}

/** h = H + N. */
export function ellipsoidalHeightM(model: GeoidModel, latDeg: number, lonDeg: number, orthometricHeightM: number): number {
  return orthometricHeightM + model.undulationM(latDeg, lonDeg);
}
