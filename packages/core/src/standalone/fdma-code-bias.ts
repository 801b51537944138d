/**
 * GLONASS FDMA code inter-frequency biases of the receiver, as a variance term of the standalone model.
 *
 * Each GLONASS satellite transmits on its own frequency channel k (G1 = 1602 + 0.5625 k MHz), so the
 * receiver's code delay differs per satellite: the common part goes into the GLONASS clock, the rest
 * does not cancel. These biases are receiver-, firmware- and antenna-dependent, of metres, roughly
 * linear in k for some receivers and not for others (Wanninger 2012, "Carrier-phase inter-frequency
 * biases of GLONASS receivers", J. Geodesy 86:139, for the phase; Shi et al. 2013, "GLONASS
 * pseudorange inter-channel biases and their effects on combined GPS/GLONASS precise point
 * positioning", GPS Solutions 17:439, for the code; both from memory). The standalone model cannot
 * estimate them epoch by epoch, so it treats them as noise.
 *
 * Measured on the glw1 CORS (cors-and-rover-2018-277, hours m and p; test/standalone-real.test.ts):
 * C1 residuals at the published coordinate spread about +-3 m across channels, the C1/P2
 * ionosphere-free ones from -5 m (k = -7) to +3 m (k = +6), about 0.5 m per channel; GPS on the same
 * receiver spreads about +-1.5 m. 1.5 m per band is the order of the C1 spread (common practice:
 * a sigma of the observed bias scatter; not tuned: 3 m would fit glw1 better, DGAR worse); through the
 * combination it becomes 1.5 * sqrt(a^2 + b^2) = 4.4 m with a = f1^2/(f1^2 - f2^2) = 2.53,
 * b = f2^2/(f1^2 - f2^2) = 1.53 (GLONASS G1/G2 = 9/7).
 */

/** Per-band sigma (m) of the GLONASS receiver code inter-frequency bias; see above. */
export const GLONASS_CODE_BIAS_SIGMA_M = 1.5;

/**
 * Variance (m^2) added to a GLONASS row: sigma^2 times the combination's propagation factor
 * (1 for one band, a^2 + b^2 for the ionosphere-free pair; law of propagation of variances).
 */
export function glonassCodeBiasVarianceM2(sigmaPerBandM: number, combinationFactor: number): number {
  return sigmaPerBandM * sigmaPerBandM * combinationFactor;
}
