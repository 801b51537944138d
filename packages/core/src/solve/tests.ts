/**
 * Statistical testing of a least-squares solution (the DIA procedure: detection, identification,
 * adaptation). Global (overall model) test: v^T P v / sigma0^2 ~ chi2(m - n) under H0, one-sided at level
 * alpha (Teunissen, "Testing theory", Delft 2000, 3.2; Koch 1999, 4.3). Data snooping: normalised residual
 * w_i = v_i / (sigma0 * sqrt(Qvv_ii)) ~ N(0, 1) under H0 (Baarda, "A testing procedure for use in geodetic
 * networks", 1968; Teunissen 2000, 4.2, w-test for a diagonal Qyy), critical value k = N^-1(1 - alpha/2).
 */
import { chiSquareQuantile, normalQuantile } from './distributions.js';
import { solveWeightedLeastSquaresSmall } from './wls.js';
import type { WlsProblem, WlsResult, WlsSolution, WlsSolver } from './wls.js';

export interface GlobalTestResult {
  /** v^T P v / sigma0_apriori^2. */
  readonly statistic: number;
  readonly dof: number;
  /** chi2 quantile at 1 - alpha; NaN when dof == 0. */
  readonly critical: number;
  /** H0 accepted (statistic <= critical). True when dof == 0: nothing can be tested. */
  readonly passed: boolean;
}

/** Quantiles are needed once per (level, dof) but asked for every epoch: remembered. */
const chiSquareCritical = new Map<string, number>();
const normalCritical = new Map<number, number>();

function chiSquareCriticalValue(alpha: number, dof: number): number {
  const key = `${alpha}|${dof}`;
  let v = chiSquareCritical.get(key);
  if (v === undefined) { v = chiSquareQuantile(1 - alpha, dof); chiSquareCritical.set(key, v); }
  return v;
}

function normalCriticalValue(alpha: number): number {
  let v = normalCritical.get(alpha);
  if (v === undefined) { v = normalQuantile(1 - alpha / 2); normalCritical.set(alpha, v); }
  return v;
}

/** Overall model test (Teunissen 2000, 3.2): reject H0 when v'Pv / sigma0^2 > chi2_{1-alpha}(dof). */
export function globalTest(vtpv: number, dof: number, alpha: number, sigma0Apriori = 1): GlobalTestResult {
  const statistic = vtpv / (sigma0Apriori * sigma0Apriori);
  if (dof <= 0) return { statistic, dof, critical: NaN, passed: true };
  const critical = chiSquareCriticalValue(alpha, dof);
  return { statistic, dof, critical, passed: statistic <= critical };
}

/**
 * Normalised residuals w_i = v_i / (sigma0 sqrt(Qvv_ii)) (Baarda 1968). Observations with no redundancy
 * (Qvv_ii <= 1e-10 Qyy_ii: the residual is zero whatever the error) get NaN: they cannot be tested.
 */
export function normalisedResiduals(s: WlsSolution, variances: Float64Array, sigma0Apriori = 1): Float64Array {
  const w = new Float64Array(s.m);
  for (let i = 0; i < s.m; i++) {
    const q = s.qvvDiag[i];
    w[i] = q > 1e-10 * variances[i] ? s.residuals[i] / (sigma0Apriori * Math.sqrt(q)) : NaN;
  }
  return w;
}

export interface DataSnoopingResult {
  /** Index (in the solved problem) of the largest |w|, -1 when none is testable. */
  readonly index: number;
  readonly w: number;
  /** k = N^-1(1 - alpha/2), e.g. 3.29 for alpha 0.001. */
  readonly critical: number;
  readonly rejected: boolean;
}

/** Baarda's w-test on every observation; returns the largest |w| and whether it exceeds k (Teunissen 2000, 4.2). */
export function dataSnooping(s: WlsSolution, variances: Float64Array, alpha: number, sigma0Apriori = 1): DataSnoopingResult {
  const w = normalisedResiduals(s, variances, sigma0Apriori);
  const critical = normalCriticalValue(alpha);
  let index = -1;
  let best = -1;
  for (let i = 0; i < w.length; i++) {
    const a = Math.abs(w[i]);
    if (a > best) { best = a; index = i; }
  }
  const wi = index >= 0 ? w[index] : NaN;
  return { index, w: wi, critical, rejected: index >= 0 && best > critical };
}

export interface QualityControlOptions {
  /** Level of the global test; default 0.01 (common practice). */
  readonly alphaGlobal?: number;
  /** Level of each w-test; default 0.001 -> k = 3.29 (Baarda's usual choice, common practice). */
  readonly alphaLocal?: number;
  /** A-priori sigma0 (1 when the variances are absolute). */
  readonly sigma0Apriori?: number;
  /** Never go below this many observations; default n + 1 (keeps one redundancy to test). */
  readonly minObservations?: number;
  /** Upper bound on removals; default unlimited. */
  readonly maxRemovals?: number;
  /** Solver; default solveWeightedLeastSquaresSmall. */
  readonly solver?: WlsSolver;
}

export interface RemovedObservation {
  /** Row index in the original problem. */
  readonly index: number;
  readonly w: number;
  readonly reason: string;
}

export interface QualityControlResult {
  /** Final solution; its rows are the original rows listed in keptIndices. */
  readonly solution: WlsResult;
  readonly keptIndices: Int32Array;
  readonly removed: readonly RemovedObservation[];
  /** Final global test; null when the final solve failed. */
  readonly globalTest: GlobalTestResult | null;
  /** The final solution passed the global test. */
  readonly accepted: boolean;
}

function subProblem(p: WlsProblem, rows: Int32Array): WlsProblem {
  const m = rows.length;
  const n = p.n;
  const design = new Float64Array(m * n);
  const misclosure = new Float64Array(m);
  const variances = new Float64Array(m);
  for (let i = 0; i < m; i++) {
    const r = rows[i];
    design.set(p.design.subarray(r * n, r * n + n), i * n);
    misclosure[i] = p.misclosure[r];
    variances[i] = p.variances[r];
  }
  return { design, m, n, misclosure, variances };
}

/**
 * Iterated DIA (Teunissen 2000, 4.4): solve; global test; while it fails and m - n >= 2 and m - 1 >=
 * minObservations, remove the observation with the largest |w| when it exceeds k, and solve again.
 */
export function qualityControlLoop(problem: WlsProblem, opts: QualityControlOptions = {}): QualityControlResult {
  const alphaGlobal = opts.alphaGlobal ?? 0.01;
  const alphaLocal = opts.alphaLocal ?? 0.001;
  const sigma0 = opts.sigma0Apriori ?? 1;
  const minObs = opts.minObservations ?? problem.n + 1;
  const maxRemovals = opts.maxRemovals ?? Infinity;
  const solve = opts.solver ?? solveWeightedLeastSquaresSmall;
  let kept = Int32Array.from({ length: problem.m }, (_, i) => i);
  const removed: RemovedObservation[] = [];
  for (;;) {
    const sub = kept.length === problem.m ? problem : subProblem(problem, kept);
    const solution = solve(sub.design, sub.m, sub.n, sub.misclosure, sub.variances);
    if (!solution.ok) return { solution, keptIndices: kept, removed, globalTest: null, accepted: false };
    const gt = globalTest(solution.vtpv, solution.dof, alphaGlobal, sigma0);
    const done = (accepted: boolean): QualityControlResult => ({ solution, keptIndices: kept, removed, globalTest: gt, accepted });
    if (gt.passed) return done(true);
    if (solution.dof < 2 || sub.m - 1 < minObs || removed.length >= maxRemovals) return done(false);
    const snoop = dataSnooping(solution, sub.variances, alphaLocal, sigma0);
    if (!snoop.rejected) return done(false);
    const original = kept[snoop.index];
    removed.push({
      index: original,
      w: snoop.w,
      reason:
        `global test failed (v'Pv ${gt.statistic.toFixed(2)} > chi2(${1 - alphaGlobal}, ${gt.dof}) = ${gt.critical.toFixed(2)}); ` +
        `largest normalised residual w = ${snoop.w.toFixed(2)} beyond k = ${snoop.critical.toFixed(2)}: observation removed`,
    });
    kept = kept.filter((_, i) => i !== snoop.index);
  }
}
