/**
 * A slip test that works on one frequency and needs no solution: the time-differenced between-receiver
 * single differences of phase of one epoch against the previous, fitted by least squares with
 *   TD_i = -u_i . d + c_g + e_i,
 * d the change (3-vector, m) of the rover's position less its linearisation point between the two epochs,
 * c_g the change of the relative receiver clock of clock group g (one per SatelliteInfo.group). The
 * reference's and the rover's positions, the satellite clocks and orbits cancel or are modelled in the
 * records (epoch-records.ts); over one interval the troposphere and ionosphere change by millimetres on a
 * short baseline. A whole-cycle jump of one single difference is a bias in one observation of this model:
 * found by data snooping (Baarda 1968, Netherlands Geodetic Commission, Publications on Geodesy 2(5); the
 * w-test on time-differenced phase as in e.g. Teunissen & Montenbruck 2017, Springer Handbook of GNSS,
 * 20.2 and 24.3): the observation with the largest |w| is taken out while it fails, then the fit is redone.
 * Since the double differences are formed within each clock group, it is the same as testing the
 * time-differenced double differences against the change of geometry, the pivot needing no choice.
 *
 * Noise: each single difference has the filter's variance (float-filter.ts, singleDifferenceVarianceM2),
 * twice that for a difference of two epochs (white phase noise; multipath changes little in a second).
 * An observation is declared slipped when both
 *  - |w| > 4.42: a two-sided false-alarm rate of 1e-5 per test under that noise model (Baarda's alpha0 of
 *    0.001 would give some 800 false alarms in a day of 1 Hz data with ten satellites); and
 *  - the estimated jump e_i / r_i (r_i the redundancy number; Baarda's estimate of the bias) is at least a
 *    quarter of a cycle: slips are whole cycles, or half cycles (a phase-locked loop that locks half a cycle
 *    off, the receiver flagging it or not), so the jump is rounded to the nearest half cycle, and one
 *    nearer zero than half a cycle is noise the model did not foresee (multipath, an interpolated reference
 *    phase), not a slip. The jump's standard deviation (sigma_i / sqrt(r_i)) is some 0.05 cycle on L1 high
 *    up, 0.1 cycle low down: a half-cycle slip is then found whatever the noise's sign, where a floor of
 *    half a cycle missed about every other one.
 * Where the reference's values of the two epochs come from different reference epochs held across a gap
 * in its logging, the caller tests the rover's phase alone with this floor, and the single differences
 * with a floor of half a cycle (solve-carrier-session.ts, restartTimeDifferencedSlips).
 * The estimated jumps are given too: an odd number of half cycles leaves the new arc's ambiguity
 * half-integer (the caller does not fix it).
 * When no further observation can be pointed at, what is left is put to the global test (the sum of the
 * squared residuals over their variances against chi-square at SLIP_GLOBAL_ALPHA, the w-test's rate: the
 * detection step of Baarda's detection-identification-adaptation, Teunissen 2000, Testing theory, Delft
 * University Press): several slips at one epoch (a canopy over the antenna) can hide one another from the
 * w-tests, whose one-outlier model then points at unslipped satellites, and a failing global test says so
 * (`verdict.unexplained`: the caller can vouch for none of the arcs tested).
 * At least two degrees of freedom must remain for a test (one can detect but not point at the outlier).
 */
import { normalQuantile } from '../solve/distributions.js';
import { globalTest } from '../solve/tests.js';

export interface TimeDifferencedPhase {
  /** Phase single difference at this epoch minus the previous one, both reduced by the model (m). */
  readonly changeM: number;
  /** Unit vector from the rover to the satellite (ECEF) at this epoch. */
  readonly ux: number;
  readonly uy: number;
  readonly uz: number;
  /** Clock group (SatelliteInfo.group). */
  readonly group: string;
  /** Variance of the change (m^2). */
  readonly varianceM2: number;
  readonly wavelengthM: number;
}

/** Two-sided critical value of the w-test at a false-alarm rate of 1e-5 per test (file comment). */
export const SLIP_W_CRITICAL = normalQuantile(1 - 0.5e-5);
/**
 * False-alarm rate of the global test of what is left (file comment): the w-test's, per epoch. Not the
 * B-method's coupled level (solve/b-method.ts), which for 5 to 15 degrees of freedom is 30 to 550 times
 * larger (3e-4 to 5.5e-3): a failing global test here restarts every arc tested, so its false alarms are held to the
 * rate of the w-tests' (about one a day at 1 Hz) rather than matched to their power.
 */
export const SLIP_GLOBAL_ALPHA = 1e-5;

/** The smallest jump declared a slip (cycles): half way to the smallest slip, half a cycle (file comment). */
export const SLIP_MIN_CYCLES = 0.25;
/**
 * The floor of the single differences where the reference epochs held differ between the two epochs: the
 * change of the errors the reference carries over its logging gap is not in the noise model (file comment).
 */
export const SLIP_MIN_CYCLES_REFERENCE_SWITCH = 0.5;

/**
 * Indices (into `obs`) of the time-differenced single differences that jumped (file comment), in the order
 * they were found; when `jumpsM` is given, the estimated jump of each (m, e_i / r_i at the fit that found
 * it) is pushed to it in the same order; `minCycles`: the floor of a jump (SLIP_MIN_CYCLES, or
 * SLIP_MIN_CYCLES_REFERENCE_SWITCH); `verdict`: told whether the global test of what is left failed (file
 * comment). Fewer than 3 + groups + 2 observations: none can be tested.
 */
export function findTimeDifferencedSlips(obs: readonly TimeDifferencedPhase[], jumpsM?: number[], minCycles = SLIP_MIN_CYCLES, verdict?: { unexplained: boolean }): number[] {
  // Plain loops and arrays built by push (not map or forEach): one array shape at each use for the
  // optimised code of this function, called every epoch.
  const active: number[] = [];
  for (let i = 0; i < obs.length; i++) active.push(i);
  const slipped: number[] = [];
  for (;;) {
    // The clock groups, in order of first appearance.
    const groups: string[] = [];
    for (const i of active) if (!groups.includes(obs[i].group)) groups.push(obs[i].group);
    const nu = 3 + groups.length;
    if (active.length - nu < 2) return slipped;
    // Normal equations N = A' W A, b = A' W y.
    const n = new Float64Array(nu * nu), b = new Float64Array(nu);
    const rows: Float64Array[] = [];
    for (const i of active) {
      const o = obs[i];
      const a = new Float64Array(nu);
      a[0] = -o.ux; a[1] = -o.uy; a[2] = -o.uz; a[3 + groups.indexOf(o.group)] = 1;
      rows.push(a);
    }
    for (let r = 0; r < active.length; r++) {
      const i = active[r];
      const a = rows[r], w = 1 / obs[i].varianceM2;
      for (let p = 0; p < nu; p++) {
        if (a[p] === 0) continue;
        b[p] += a[p] * w * obs[i].changeM;
        for (let q = 0; q < nu; q++) n[p * nu + q] += a[p] * w * a[q];
      }
    }
    const inv = invertSymmetric(n, nu);
    if (!inv) return slipped;
    const x = new Float64Array(nu);
    for (let p = 0; p < nu; p++) for (let q = 0; q < nu; q++) x[p] += inv[p * nu + q] * b[q];
    // Residuals, their variances Q_e = Q_y - A N^-1 A', the w-test and the estimated jump.
    let worst = -1, worstW = 0, worstJumpM = 0, weightedSquaresSum = 0;
    for (let r = 0; r < active.length; r++) {
      const a = rows[r], o = obs[active[r]];
      let fit = 0, qa = 0;
      for (let p = 0; p < nu; p++) {
        if (a[p] === 0) continue;
        fit += a[p] * x[p];
        for (let q = 0; q < nu; q++) qa += a[p] * inv[p * nu + q] * a[q];
      }
      const e = o.changeM - fit;
      weightedSquaresSum += (e * e) / o.varianceM2;
      const qe = o.varianceM2 - qa;
      const redundancy = qe / o.varianceM2;
      if (!(redundancy > 0.01)) continue;
      const w = Math.abs(e) / Math.sqrt(qe);
      if (w > SLIP_W_CRITICAL && Math.abs(e / redundancy) >= minCycles * o.wavelengthM && w > worstW) { worst = r; worstW = w; worstJumpM = e / redundancy; }
    }
    if (worst < 0) {
      if (verdict) verdict.unexplained = !globalTest(weightedSquaresSum, active.length - nu, SLIP_GLOBAL_ALPHA).passed;
      return slipped;
    }
    slipped.push(active[worst]);
    if (jumpsM) jumpsM.push(worstJumpM);
    active.splice(worst, 1);
  }
}

/** Inverse of a small symmetric positive-definite matrix (Gauss-Jordan with pivoting); null when singular. */
function invertSymmetric(m: Float64Array, n: number): Float64Array | null {
  const a = Float64Array.from(m);
  const inv = new Float64Array(n * n);
  for (let i = 0; i < n; i++) inv[i * n + i] = 1;
  let scale = 0;
  for (let i = 0; i < n; i++) scale = Math.max(scale, Math.abs(a[i * n + i]));
  for (let c = 0; c < n; c++) {
    let p = c;
    for (let r = c + 1; r < n; r++) if (Math.abs(a[r * n + c]) > Math.abs(a[p * n + c])) p = r;
    if (!(Math.abs(a[p * n + c]) > 1e-12 * scale)) return null;
    if (p !== c) for (let k = 0; k < n; k++) {
      [a[c * n + k], a[p * n + k]] = [a[p * n + k], a[c * n + k]];
      [inv[c * n + k], inv[p * n + k]] = [inv[p * n + k], inv[c * n + k]];
    }
    const d = 1 / a[c * n + c];
    for (let k = 0; k < n; k++) { a[c * n + k] *= d; inv[c * n + k] *= d; }
    for (let r = 0; r < n; r++) {
      if (r === c) continue;
      const f = a[r * n + c];
      if (f === 0) continue;
      for (let k = 0; k < n; k++) { a[r * n + k] -= f * a[c * n + k]; inv[r * n + k] -= f * inv[c * n + k]; }
    }
  }
  return inv;
}
