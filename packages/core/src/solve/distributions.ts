/**
 * Distribution functions for the statistical tests: log-gamma, regularised incomplete gamma P and Q,
 * chi-square CDF and quantile, standard normal CDF and quantile.
 * Sources: Press et al., "Numerical Recipes" 3rd ed. (2007), 6.1 (Lanczos log-gamma) and 6.2 (incomplete
 * gamma by series and Lentz continued fraction); Abramowitz & Stegun (1964) 26.4.19 (chi-square CDF =
 * P(k/2, x/2)), 26.4.17 (Wilson–Hilferty start), 7.1.2/6.5.17 (erfc(x) = Q(1/2, x^2)); P. J. Acklam,
 * "An algorithm for computing the inverse normal cumulative distribution function" (2003, rel. error
 * 1.15e-9) refined by one Halley step to full double precision.
 */

/** Lanczos coefficients, g = 7, n = 9 (Lanczos 1964 via Numerical Recipes 6.1 / Godfrey's table; from memory, checked in tests against exact factorials and Gamma(1/2)). */
const LANCZOS_G = 7;
const LANCZOS = [
  0.99999999999980993, 676.5203681218851, -1259.1392167224028, 771.32342877765313, -176.61502916214059,
  12.507343278686905, -0.13857109526572012, 9.9843695780195716e-6, 1.5056327351493116e-7,
] as const;

/** ln Gamma(x) for x > 0 (Lanczos approximation; reflection for x < 0.5, A&S 6.1.17). */
export function logGamma(x: number): number {
  if (!(x > 0)) return NaN;
  if (x < 0.5) return Math.log(Math.PI / Math.sin(Math.PI * x)) - logGamma(1 - x);
  const z = x - 1;
  let a = LANCZOS[0];
  for (let i = 1; i < LANCZOS.length; i++) a += LANCZOS[i] / (z + i);
  const t = z + LANCZOS_G + 0.5;
  return 0.5 * Math.log(2 * Math.PI) + (z + 0.5) * Math.log(t) - t + Math.log(a);
}

const EPS = 1e-15;
const FPMIN = 1e-300;
const MAX_ITER = 10_000;

/** Regularised lower incomplete gamma P(a, x) (Numerical Recipes 6.2, eq. 6.2.5 series / 6.2.7 fraction). */
export function regularizedGammaP(a: number, x: number): number {
  if (!(a > 0) || Number.isNaN(x)) return NaN;
  if (x <= 0) return 0;
  if (x === Infinity) return 1;
  return x < a + 1 ? gammaSeries(a, x) : 1 - gammaContinuedFraction(a, x);
}

/** Regularised upper incomplete gamma Q(a, x) = 1 - P(a, x), computed directly in the tail (NR 6.2). */
export function regularizedGammaQ(a: number, x: number): number {
  if (!(a > 0) || Number.isNaN(x)) return NaN;
  if (x <= 0) return 1;
  if (x === Infinity) return 0;
  return x < a + 1 ? 1 - gammaSeries(a, x) : gammaContinuedFraction(a, x);
}

function gammaSeries(a: number, x: number): number {
  let ap = a;
  let del = 1 / a;
  let sum = del;
  for (let i = 0; i < MAX_ITER; i++) {
    ap += 1;
    del *= x / ap;
    sum += del;
    if (Math.abs(del) < Math.abs(sum) * EPS) break;
  }
  return sum * Math.exp(-x + a * Math.log(x) - logGamma(a));
}

function gammaContinuedFraction(a: number, x: number): number {
  // Modified Lentz evaluation of the continued fraction (NR 5.2, 6.2.7)
  let b = x + 1 - a;
  let c = 1 / FPMIN;
  let d = 1 / b;
  let h = d;
  for (let i = 1; i < MAX_ITER; i++) {
    const an = -i * (i - a);
    b += 2;
    d = an * d + b;
    if (Math.abs(d) < FPMIN) d = FPMIN;
    c = b + an / c;
    if (Math.abs(c) < FPMIN) c = FPMIN;
    d = 1 / d;
    const del = d * c;
    h *= del;
    if (Math.abs(del - 1) < EPS) break;
  }
  return Math.exp(-x + a * Math.log(x) - logGamma(a)) * h;
}

/** Chi-square CDF with k degrees of freedom: P(k/2, x/2) (A&S 26.4.19). */
export function chiSquareCdf(x: number, dof: number): number {
  return regularizedGammaP(dof / 2, x / 2);
}

/** Chi-square density (A&S 26.4.1). */
function chiSquarePdf(x: number, dof: number): number {
  if (x <= 0) return 0;
  const a = dof / 2;
  return Math.exp((a - 1) * Math.log(x) - x / 2 - a * Math.LN2 - logGamma(a));
}

/** Chi-square quantile: x with chiSquareCdf(x, dof) = p, 0 < p < 1 (Newton on the CDF inside a bisection bracket). */
export function chiSquareQuantile(p: number, dof: number): number {
  if (!(dof > 0)) throw new RangeError(`chiSquareQuantile: dof ${dof} must be > 0`);
  if (!(p >= 0 && p <= 1)) throw new RangeError(`chiSquareQuantile: p ${p} must be in [0, 1]`);
  if (p === 0) return 0;
  if (p === 1) return Infinity;
  // Wilson–Hilferty start (A&S 26.4.17)
  const z = normalQuantile(p);
  const h = 2 / (9 * dof);
  let x = Math.max(dof * (1 - h + z * Math.sqrt(h)) ** 3, 1e-8);
  let lo = 0;
  let hi = Math.max(2 * x, dof + 10);
  while (chiSquareCdf(hi, dof) < p) hi *= 2;
  for (let i = 0; i < 200; i++) {
    const f = chiSquareCdf(x, dof) - p;
    if (f < 0) lo = x; else hi = x;
    const pdf = chiSquarePdf(x, dof);
    let next = pdf > 0 ? x - f / pdf : NaN;
    if (!(next > lo && next < hi)) next = 0.5 * (lo + hi);
    if (Math.abs(next - x) <= 1e-14 * Math.max(1, x)) return next;
    x = next;
  }
  return x;
}

/** Standard normal CDF: Phi(x) = erfc(-x / sqrt 2) / 2, with erfc(t) = Q(1/2, t^2) (A&S 7.1.2, 6.5.17). */
export function normalCdf(x: number): number {
  const t = -x / Math.SQRT2;
  const erfc = t >= 0 ? regularizedGammaQ(0.5, t * t) : 1 + regularizedGammaP(0.5, t * t);
  return 0.5 * erfc;
}

// Acklam (2003) rational approximation coefficients (from memory; checked in tests against table quantiles).
const A = [-3.969683028665376e1, 2.209460984245205e2, -2.759285104469687e2, 1.38357751867269e2, -3.066479806614716e1, 2.506628277459239] as const;
const B = [-5.447609879822406e1, 1.615858368580409e2, -1.556989798598866e2, 6.680131188771972e1, -1.328068155288572e1] as const;
const C = [-7.784894002430293e-3, -3.223964580411365e-1, -2.400758277161838, -2.549671058254570, 4.374664141464968, 2.938163982698783] as const;
const D = [7.784695709041462e-3, 3.224671290700398e-1, 2.445134137142996, 3.754408661907416] as const;
const P_LOW = 0.02425;

/** Standard normal quantile (inverse CDF), Acklam (2003) + one Halley refinement step. */
export function normalQuantile(p: number): number {
  if (!(p >= 0 && p <= 1)) throw new RangeError(`normalQuantile: p ${p} must be in [0, 1]`);
  if (p === 0) return -Infinity;
  if (p === 1) return Infinity;
  let x: number;
  if (p < P_LOW) {
    const q = Math.sqrt(-2 * Math.log(p));
    x = (((((C[0] * q + C[1]) * q + C[2]) * q + C[3]) * q + C[4]) * q + C[5]) / ((((D[0] * q + D[1]) * q + D[2]) * q + D[3]) * q + 1);
  } else if (p <= 1 - P_LOW) {
    const q = p - 0.5;
    const r = q * q;
    x = ((((((A[0] * r + A[1]) * r + A[2]) * r + A[3]) * r + A[4]) * r + A[5]) * q) / (((((B[0] * r + B[1]) * r + B[2]) * r + B[3]) * r + B[4]) * r + 1);
  } else {
    const q = Math.sqrt(-2 * Math.log(1 - p));
    x = -(((((C[0] * q + C[1]) * q + C[2]) * q + C[3]) * q + C[4]) * q + C[5]) / ((((D[0] * q + D[1]) * q + D[2]) * q + D[3]) * q + 1);
  }
  // Halley step on Phi(x) - p (Acklam 2003, "refinement")
  const e = p > 0.5 ? -(normalCdf(-x) - (1 - p)) : normalCdf(x) - p;
  const u = e * Math.sqrt(2 * Math.PI) * Math.exp((x * x) / 2);
  return x - u / (1 + (x * u) / 2);
}
