/**
 * Partial ambiguity fixing: the full set is tried first; when it fails the ratio test, the least
 * trustworthy ambiguity (the caller's order: lowest elevation or largest variance first) is left float
 * and the rest tried again, down to a minimum number of fixed ambiguities (the partial ambiguity
 * resolution of Teunissen, Joosten & Tiberius 1999, "A comparison of TCAR, CIR and LAMBDA GNSS ambiguity
 * resolution", ION GPS 1999, with the subset chosen by precision).
 *
 * The ratio test (second-best over best squared norm, Euler & Schaffrin 1991) with a fixed threshold of 3
 * is common practice; it is a heuristic, not a test with a known failure rate.
 */
import { lambdaSearch } from './lambda.js';

export interface PartialFixOptions {
  /** Ratio test threshold (default 3, common practice). */
  readonly ratioThreshold: number;
  /** Fewest ambiguities a fix may hold (a fix of fewer is refused). */
  readonly minFixed: number;
  /** Least bootstrapped success rate of the subset (formal; 0 to test the ratio alone). */
  readonly minSuccessRate?: number;
}

export interface PartialFix {
  /** Indices (into the float vector given) of the fixed ambiguities, in the order given. */
  readonly indices: number[];
  /** Their integer values. */
  readonly integers: Float64Array;
  readonly ratio: number;
  /** Squared norm of the best candidate. */
  readonly bestNorm: number;
  readonly successRate: number;
}

export interface PartialFixFailure {
  readonly indices: [];
  /** Best ratio met (NaN when no search could run). */
  readonly ratio: number;
}

/**
 * a: float ambiguities (n); q: their covariance (n*n, row-major); dropOrder: indices in the order they
 * are to be left float (first = least trustworthy).
 */
export function fixPartially(a: Float64Array, q: Float64Array, n: number, dropOrder: readonly number[], options: PartialFixOptions): PartialFix | PartialFixFailure {
  let keep = Array.from({ length: n }, (_, i) => i);
  let bestRatio = NaN;
  let dropAt = 0;
  while (keep.length >= options.minFixed && keep.length > 0) {
    const m = keep.length;
    const sa = new Float64Array(m);
    const sq = new Float64Array(m * m);
    for (let i = 0; i < m; i++) {
      sa[i] = a[keep[i]];
      for (let j = 0; j < m; j++) sq[i * m + j] = q[keep[i] * n + keep[j]];
    }
    const r = lambdaSearch(sa, sq, m);
    if (r) {
      if (!(r.ratio <= bestRatio)) bestRatio = Number.isNaN(bestRatio) ? r.ratio : Math.max(bestRatio, r.ratio);
      if (r.ratio >= options.ratioThreshold && r.successRate >= (options.minSuccessRate ?? 0)) {
        return { indices: keep, integers: r.best, ratio: r.ratio, bestNorm: r.bestNorm, successRate: r.successRate };
      }
    }
    // Leave the next least trustworthy ambiguity float.
    while (dropAt < dropOrder.length && !keep.includes(dropOrder[dropAt])) dropAt++;
    if (dropAt >= dropOrder.length) break;
    const drop = dropOrder[dropAt++];
    keep = keep.filter((i) => i !== drop);
  }
  return { indices: [], ratio: bestRatio };
}
