/**
 * Baarda's B-method of testing: the global (overall model) test and the w-tests are given the same
 * detection power gamma0 for the same size of error. With the w-test at level alpha0 (one dimension),
 * the non-centrality it detects with power gamma0 is
 *   lambda0 = (N^-1(1 - alpha0/2) + N^-1(gamma0))^2,
 * and the global test with b degrees of freedom gets the level alpha_b for which a chi-square with b
 * degrees of freedom and non-centrality lambda0 exceeds its critical value with probability gamma0.
 * (Baarda, "A testing procedure for use in geodetic networks", Netherlands Geodetic Commission 1968;
 * Teunissen, "Testing theory", Delft 2000, 4.4.) gamma0 = 0.80 is Baarda's choice (common practice); with
 * alpha0 = 0.001 it gives lambda0 = 17.07.
 * The non-central chi-square distribution is the Poisson mixture of central ones (Johnson, Kotz &
 * Balakrishnan, "Continuous Univariate Distributions" vol. 2, 29.1):
 *   F(x; b, lambda) = sum_j e^(-lambda/2) (lambda/2)^j / j! P(b/2 + j, x/2).
 */
import { chiSquareCdf, logGamma, normalQuantile, regularizedGammaP } from './distributions.js';

/** Baarda's usual detection power (common practice). */
export const B_METHOD_POWER = 0.8;

/** Non-centrality lambda0 detected by a w-test at level alpha0 with power gamma0. */
export function bMethodNonCentrality(alpha0: number, gamma0 = B_METHOD_POWER): number {
  return (normalQuantile(1 - alpha0 / 2) + normalQuantile(gamma0)) ** 2;
}

/** CDF of the non-central chi-square distribution with `dof` degrees of freedom and non-centrality lambda. */
export function nonCentralChiSquareCdf(x: number, dof: number, lambda: number): number {
  if (!(x > 0)) return 0;
  const half = lambda / 2;
  // Sum outwards from the Poisson mode so that no weight of consequence is missed.
  const mode = Math.floor(half);
  const weight = (j: number) => Math.exp(-half + j * Math.log(Math.max(half, 1e-300)) - logGamma(j + 1));
  let sum = 0;
  for (let j = mode; j >= 0; j--) {
    const w = weight(j);
    sum += w * regularizedGammaP(dof / 2 + j, x / 2);
    if (w < 1e-16 && j < mode - 5) break;
  }
  for (let j = mode + 1; ; j++) {
    const w = weight(j);
    sum += w * regularizedGammaP(dof / 2 + j, x / 2);
    if (w < 1e-16 || j > mode + 10_000) break;
  }
  return Math.min(1, sum);
}

const levels = new Map<string, number>();

/** Level of the global test with `dof` degrees of freedom under the B-method (cached per level and dof). */
export function bMethodGlobalAlpha(alpha0: number, dof: number, gamma0 = B_METHOD_POWER): number {
  if (dof <= 1) return alpha0;
  const key = `${alpha0}|${dof}|${gamma0}`;
  const hit = levels.get(key);
  if (hit !== undefined) return hit;
  const lambda = bMethodNonCentrality(alpha0, gamma0);
  // The critical value c with P(chi2'(dof, lambda) > c) = gamma0: bisection on the monotone CDF.
  let lo = 0, hi = dof + lambda + 50 * Math.sqrt(2 * (dof + 2 * lambda));
  for (let i = 0; i < 200 && hi - lo > 1e-10 * hi; i++) {
    const mid = 0.5 * (lo + hi);
    if (nonCentralChiSquareCdf(mid, dof, lambda) < 1 - gamma0) lo = mid; else hi = mid;
  }
  const alpha = 1 - chiSquareCdf(0.5 * (lo + hi), dof);
  levels.set(key, alpha);
  return alpha;
}
