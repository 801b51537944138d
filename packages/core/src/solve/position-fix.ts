/**
 * One epoch's position fix by iterated (Gauss-Newton) weighted least squares on linearised ranges,
 * shared by the standalone and the differential solutions:
 *   y_i = -e_i . dx + c_k(i) + v_i,  e_i the receiver-to-satellite unit vector, c_k the clock of the
 *   satellite's constellation (one unknown per constellation),
 * iterated from x0 until the update is below a millimetre, then tested (global chi-square test) and
 * cleaned by data snooping (Baarda w-test), re-iterating after each removal.
 * Sources: linearised pseudorange model, Misra & Enge (2011) 6.1.1; testing, Teunissen (2000) 4.4
 * (see solve/tests.ts).
 */
import type { EcefM, EnuM, GnssSystem, SatId } from '../gnss/index.js';
import { ecefToGeodetic } from '../geodesy/index.js';
import {
  bMethodGlobalAlpha, choleskyInPlace, choleskyInverse, dataSnooping, globalTest, solveWeightedLeastSquaresSmall,
  type Dop, type GlobalTestResult, type WlsSolution,
} from './index.js';

import type { LinearRow } from '../observables/index.js';
export type { LinearRow };

/** Builds the linearised rows at a position (called once per iteration). */
export type RowBuilder = (positionM: EcefM, excluded: ReadonlySet<SatId>) => LinearRow[];

export interface FixOptions {
  readonly maxIterations: number;
  /** Iteration stops when the position update is below this (m). */
  readonly convergenceM: number;
  /** Level of the global test; ignored when `bMethod` is set. */
  readonly alphaGlobal: number;
  /** Level of each w-test. */
  readonly alphaLocal: number;
  /** Baarda's B-method: the global test's level follows from alphaLocal and each epoch's dof (b-method.ts). */
  readonly bMethod?: boolean;
  /** Minimum satellites kept (never removes below this). */
  readonly minSatellites: number;
  readonly maxRejections: number;
}

/** No GNSS satellite used here is closer than this to a receiver on the Earth (MEO at zenith: ~20,000 km). */
const MIN_SATELLITE_RANGE_M = 1.9e7;

export const DEFAULT_FIX_OPTIONS: FixOptions = {
  maxIterations: 12,
  convergenceM: 1e-3,
  alphaGlobal: 0.001,
  alphaLocal: 0.001,
  minSatellites: 5,
  maxRejections: 3,
};

export interface RowOutcome {
  readonly row: LinearRow;
  /** Post-fit residual (m). */
  readonly residualM: number;
  readonly wTest: number;
}

export interface Rejection {
  readonly sat: SatId;
  readonly reason: string;
  readonly wTest: number;
}

export interface PositionFix {
  readonly ok: true;
  readonly positionM: EcefM;
  /** Clock per constellation (m), in the order of `systems`. */
  readonly clocksM: ReadonlyMap<GnssSystem, number>;
  readonly systems: readonly GnssSystem[];
  readonly used: readonly RowOutcome[];
  readonly rejected: readonly Rejection[];
  /** Covariance of the position (3x3, ECEF, row-major, a-priori scale). */
  readonly positionCovM2: Float64Array;
  readonly sigmaEnuM: EnuM;
  readonly dops: Dop | null;
  readonly test: GlobalTestResult;
  readonly varianceFactor: number;
  readonly iterations: number;
}

export interface FixFailure {
  readonly ok: false;
  readonly reason: string;
  readonly rejected: readonly Rejection[];
}

interface Assembled {
  readonly rows: LinearRow[];
  readonly systems: GnssSystem[];
  readonly solution: WlsSolution;
  readonly variances: Float64Array;
}

function assembleAndSolve(rows: LinearRow[]): Assembled | string {
  const systems: GnssSystem[] = [];
  for (const r of rows) if (!systems.includes(r.system)) systems.push(r.system);
  const n = 3 + systems.length;
  const m = rows.length;
  if (m < n) return `${m} satellites for ${n} unknowns`;
  const design = new Float64Array(m * n);
  const y = new Float64Array(m);
  const variances = new Float64Array(m);
  for (let i = 0; i < m; i++) {
    const r = rows[i];
    design[i * n] = -r.losX;
    design[i * n + 1] = -r.losY;
    design[i * n + 2] = -r.losZ;
    design[i * n + 3 + systems.indexOf(r.system)] = 1;
    y[i] = r.misclosureM;
    variances[i] = r.varianceM2;
  }
  const s = solveWeightedLeastSquaresSmall(design, m, n, y, variances);
  if (!s.ok) return `geometry does not determine the position (${s.detail})`;
  return { rows, systems, solution: s, variances };
}

/** Drops constellations with a single satellite: its clock absorbs it entirely (no position information). */
function pruneLoneSystems(rows: LinearRow[], rejected: Rejection[]): LinearRow[] {
  // Counting by system letter (at most seven): no allocation when nothing is dropped.
  let lone = '';
  for (let i = 0; i < rows.length; i++) {
    const sys = rows[i].system;
    let c = 0;
    for (let j = 0; j < rows.length && c < 2; j++) if (rows[j].system === sys) c++;
    if (c < 2 && !lone.includes(sys)) lone += sys;
  }
  if (lone === '') return rows;
  const out: LinearRow[] = [];
  for (const r of rows) {
    if (lone.includes(r.system)) rejected.push({ sat: r.sat, reason: 'only satellite of its constellation (its clock absorbs it)', wTest: NaN });
    else out.push(r);
  }
  return out;
}

/** ECEF -> ENU rotation at (lat, lon), row-major 3x3 (e.g. Misra & Enge 2011, eq. 2.16). */
function enuRotation(latRad: number, lonRad: number): number[] {
  const sl = Math.sin(latRad), cl = Math.cos(latRad), so = Math.sin(lonRad), co = Math.cos(lonRad);
  return [-so, co, 0, -sl * co, -sl * so, cl, cl * co, cl * so, sl];
}

/** sqrt of the diagonal of R C R^T for a 3x3 ECEF covariance C. */
function enuSigma(cov: ArrayLike<number>, R: readonly number[], stride = 3): EnuM {
  const out = [0, 0, 0];
  for (let a = 0; a < 3; a++) {
    let v = 0;
    for (let j = 0; j < 3; j++) for (let k = 0; k < 3; k++) v += R[a * 3 + j] * cov[j * stride + k] * R[a * 3 + k];
    out[a] = Math.sqrt(Math.max(0, v));
  }
  return { e: out[0], n: out[1], u: out[2] };
}

/**
 * DOPs of the final geometry with unit weights, from the same design as the solve: Q = (G^T G)^-1 in
 * ECEF, its position block rotated to ENU (the same quantities as solve/dop.ts, which a test compares).
 */
function unitWeightDops(a: Assembled, n: number, R: readonly number[]): Dop | null {
  const m = a.rows.length;
  const normal = new Float64Array(n * n);
  for (let i = 0; i < m; i++) {
    const r = a.rows[i];
    const g0 = -r.losX, g1 = -r.losY, g2 = -r.losZ, c = 3 + a.systems.indexOf(r.system);
    normal[0] += g0 * g0; normal[n] += g1 * g0; normal[n + 1] += g1 * g1;
    normal[2 * n] += g2 * g0; normal[2 * n + 1] += g2 * g1; normal[2 * n + 2] += g2 * g2;
    normal[c * n] += g0; normal[c * n + 1] += g1; normal[c * n + 2] += g2; normal[c * n + c] += 1;
  }
  if (!choleskyInPlace(normal, n)) return null;
  const q = choleskyInverse(normal, n);
  let trace = 0;
  for (let j = 0; j < n; j++) trace += q[j * n + j];
  const enu = enuSigma(q, R, n);
  return {
    gdop: Math.sqrt(trace),
    pdop: Math.sqrt(enu.e * enu.e + enu.n * enu.n + enu.u * enu.u),
    hdop: Math.hypot(enu.e, enu.n),
    vdop: enu.u,
    tdop: Math.sqrt(q[3 * n + 3]),
  };
}

/**
 * Iterates to convergence from x0, then tests and snoops. `build` is called at each new estimate with the
 * set of satellites removed so far.
 */
export function solvePositionFix(build: RowBuilder, x0: EcefM, opts: FixOptions = DEFAULT_FIX_OPTIONS): PositionFix | FixFailure {
  const excluded = new Set<SatId>();
  // Data-snooping removals accumulate over rounds; lone-constellation drops are those of the last build.
  const snooped: Rejection[] = [];
  let lone: Rejection[] = [];
  const rejectedNow = (): Rejection[] => [...snooped, ...lone];
  let x = x0;
  let iterations = 0;
  for (let round = 0; round <= opts.maxRejections; round++) {
    let last: Assembled | null = null;
    for (let it = 0; it < opts.maxIterations; it++) {
      iterations++;
      lone = [];
      const rows = pruneLoneSystems(build(x, excluded), lone);
      if (rows.length < opts.minSatellites) {
        return { ok: false, reason: `too few satellites (${rows.length}, minimum ${opts.minSatellites})`, rejected: rejectedNow() };
      }
      const a = assembleAndSolve(rows);
      if (typeof a === 'string') return { ok: false, reason: a, rejected: rejectedNow() };
      const dx = a.solution.x;
      x = { x: x.x + dx[0], y: x.y + dx[1], z: x.z + dx[2] };
      last = a;
      // Converged when the step is small, or when the linearisation error of the step, |dx|^2 / (2 rho)
      // with rho >= 19,000 km for GNSS satellites, is below the tolerance: the solve just made is then the
      // exact one at the new position (its residuals and clocks hold there too).
      const step = Math.hypot(dx[0], dx[1], dx[2]);
      if (step < opts.convergenceM || (step * step) / (2 * MIN_SATELLITE_RANGE_M) < opts.convergenceM) break;
      if (it === opts.maxIterations - 1) return { ok: false, reason: 'iteration did not converge', rejected: rejectedNow() };
    }
    if (last === null) return { ok: false, reason: 'no iteration', rejected: rejectedNow() };
    const s = last.solution;
    const test = globalTest(s.vtpv, s.dof, opts.bMethod ? bMethodGlobalAlpha(opts.alphaLocal, s.dof) : opts.alphaGlobal);
    const canRemove = !test.passed && s.dof >= 2 && last.rows.length - 1 >= opts.minSatellites && round < opts.maxRejections;
    if (canRemove) {
      const snoop = dataSnooping(s, last.variances, opts.alphaLocal);
      if (snoop.rejected && snoop.index >= 0) {
        const sat = last.rows[snoop.index].sat;
        excluded.add(sat);
        snooped.push({ sat, reason: `rejected by data snooping (w = ${snoop.w.toFixed(1)}, critical ${snoop.critical.toFixed(2)})`, wTest: snoop.w });
        continue;
      }
    }
    return finish(last, x, test, iterations, rejectedNow());
  }
  return { ok: false, reason: 'quality control did not settle', rejected: rejectedNow() };
}

function finish(a: Assembled, x: EcefM, test: GlobalTestResult, iterations: number, rejected: Rejection[]): PositionFix {
  const s = a.solution;
  const n = s.n;
  const snoopAll = dataSnoopingValues(s, a.variances);
  // Built by push, not Array.prototype.map: the builtin's result array and the one of map inlined in optimised
  // code differ in elements kind, and the readers of `used` were deoptimised ("wrong map") once finish() was.
  const used: RowOutcome[] = [];
  for (let i = 0; i < a.rows.length; i++) used.push({ row: a.rows[i], residualM: s.residuals[i], wTest: snoopAll[i] });
  const cov = new Float64Array(9);
  for (let j = 0; j < 3; j++) for (let k = 0; k < 3; k++) cov[j * 3 + k] = s.qxx[j * n + k];
  const clocksM = new Map<GnssSystem, number>();
  a.systems.forEach((sys, k) => clocksM.set(sys, s.x[3 + k]));
  const g = ecefToGeodetic(x);
  const R = enuRotation(g.latRad, g.lonRad);
  const dops = unitWeightDops(a, n, R);
  return {
    ok: true,
    positionM: x,
    clocksM,
    systems: a.systems,
    used,
    rejected,
    positionCovM2: cov,
    sigmaEnuM: enuSigma(cov, R),
    dops,
    test,
    varianceFactor: s.sigma0Sq,
    iterations,
  };
}

function dataSnoopingValues(s: WlsSolution, variances: Float64Array): Float64Array {
  const w = new Float64Array(s.m);
  for (let i = 0; i < s.m; i++) {
    const q = s.qvvDiag[i];
    w[i] = q > 1e-10 * variances[i] ? s.residuals[i] / Math.sqrt(q) : NaN;
  }
  return w;
}
