/**
 * Observation variances for code pseudoranges.
 *
 * Elevation model sigma^2 = a^2 + b^2 / sin^2(el): common practice, no single source (check-values.md,
 * "Weighting"). Signal-strength model: the SIGMA-epsilon form sigma^2 = C * 10^(-C/N0 / 10)
 * (Hartinger & Brunner 1999, "Variances of GPS phase observations: the SIGMA-epsilon model",
 * GPS Solutions 2(4):35-43, eq. 3), used here as a multiplicative factor relative to a reference C/N0.
 */

export interface ElevationWeightParams {
  /** Elevation-independent part a (m). */
  readonly aM: number;
  /** Elevation-dependent part b (m), divided by sin(el). */
  readonly bM: number;
  /** sin(el) is clamped at sin(minElevationRad) so the variance stays finite at and below the horizon. */
  readonly minElevationRad: number;
  /**
   * Optional signal-strength term: variance multiplied by max(1, 10^((referenceCn0DbHz - cn0)/10))
   * (SIGMA-epsilon slope, Hartinger & Brunner 1999). Undefined = off.
   */
  readonly referenceCn0DbHz?: number;
}

/**
 * Defaults for one receiver's code pseudorange: a = b = 0.3 m (sigma 0.42 m at zenith, 3.5 m at 5 deg),
 * a typical geodetic/mapping-grade code noise+multipath figure: common practice, not from one source.
 * The floor at 5 deg matches the lowest elevations anyone processes.
 */
export const CODE_ELEVATION_WEIGHT_DEFAULTS: ElevationWeightParams = {
  aM: 0.3,
  bM: 0.3,
  minElevationRad: (5 * Math.PI) / 180,
};

/** Default reference C/N0 for the strength factor: 45 dB-Hz, a typical open-sky L1 C/A value (common practice). */
export const DEFAULT_REFERENCE_CN0_DBHZ = 45;

/** sigma^2 = a^2 + b^2 / sin^2(el) (m^2), common practice; optionally times the strength factor when `cn0DbHz` is finite. */
export function elevationVarianceM2(elevationRad: number, params: ElevationWeightParams = CODE_ELEVATION_WEIGHT_DEFAULTS, cn0DbHz = NaN): number {
  const s = Math.sin(Math.max(elevationRad, params.minElevationRad));
  const v = params.aM * params.aM + (params.bM * params.bM) / (s * s);
  if (params.referenceCn0DbHz === undefined || !Number.isFinite(cn0DbHz)) return v;
  return v * strengthVarianceFactor(cn0DbHz, params.referenceCn0DbHz);
}

/**
 * Factor max(1, 10^((C0 - cn0)/10)): the SIGMA-epsilon law sigma^2 ∝ 10^(-cn0/10) (Hartinger & Brunner
 * 1999, eq. 3) normalised at C0. Floored at 1 so strong signals never weigh more than the elevation model
 * allows (multipath does not shrink with C/N0: common practice).
 */
export function strengthVarianceFactor(cn0DbHz: number, referenceCn0DbHz = DEFAULT_REFERENCE_CN0_DBHZ): number {
  return Math.max(1, 10 ** ((referenceCn0DbHz - cn0DbHz) / 10));
}

/** The plain SIGMA-epsilon variance C * 10^(-cn0/10) (m^2, C in m^2 Hz): Hartinger & Brunner 1999, eq. 3. */
export function sigmaEpsilonVarianceM2(cn0DbHz: number, cM2Hz: number): number {
  return cM2Hz * 10 ** (-cn0DbHz / 10);
}

/**
 * Variance of a between-receiver single difference: the sum of both receivers' variances (independent
 * errors; error propagation, e.g. Teunissen "Adjustment theory" 2000, 1.3). Equal elevations -> doubled.
 */
export function singleDifferenceVariance(
  elRoverRad: number,
  elRefRad: number,
  params: ElevationWeightParams = CODE_ELEVATION_WEIGHT_DEFAULTS,
  cn0RoverDbHz = NaN,
  cn0RefDbHz = NaN,
): number {
  return elevationVarianceM2(elRoverRad, params, cn0RoverDbHz) + elevationVarianceM2(elRefRad, params, cn0RefDbHz);
}

