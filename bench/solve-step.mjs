// Part 2, solve step alone: the per-epoch iterated WLS + quality control (global test, data snooping)
// replayed on problems captured from an end-to-end run, and the two WLS implementations compared.
//
// Capture (fair to the engine, independent of its internals): each differential EpochSolution gives
// the rover position, every satellite's azimuth/elevation, weight and post-fit residual, and the
// relative clock per constellation. From these the linearised rows are rebuilt exactly:
//   misclosure_i(x) = c_k(i) + v_i + e_i . (x - x_sol),  e_i = unit vector receiver -> satellite,
// which is the engine's linear model (positioning/position-fix.ts) with x_sol as its solution.
// Satellites the engine rejected by data snooping are put back with a blunder of 10 sigma so that
// quality control has the same work to do. The replay starts, like the engine, from the previous
// epoch's position and uses the engine's fix options.
import { median, repeat } from './stats.mjs';

const DEG = Math.PI / 180;
const BLUNDER_SIGMA = 10;

/** Captures one prepared problem from a differential epoch solution (null when not differential). */
export function captureProblem(core, sol) {
  if (sol.kind !== 'differential' && sol.kind !== 'smoothed') return null;
  const xs = sol.position.ecef;
  const g = core.ecefToGeodetic(xs);
  const rows = [];
  let rejected = 0;
  for (const s of sol.satellites) {
    const snooped = !s.used && s.reason.startsWith('rejected by data snooping');
    if (!s.used && !snooped) continue;
    const system = core.satSystem(s.sat);
    const clock = sol.relativeClockM[system];
    if (!Number.isFinite(clock)) continue;
    const el = s.elevationDeg * DEG, az = s.azimuthDeg * DEG;
    // unit vector receiver -> satellite from azimuth/elevation (ENU), rotated to ECEF
    const e = core.enuToEcefDelta({ e: Math.sin(az) * Math.cos(el), n: Math.cos(az) * Math.cos(el), u: Math.sin(el) }, g.latRad, g.lonRad);
    const varianceM2 = s.used ? 1 / s.weight : core.elevationVarianceM2(el, { aM: 0.3, bM: 0.3, minElevationRad: 5 * DEG });
    const v = s.used ? s.residualM : BLUNDER_SIGMA * Math.sqrt(varianceM2);
    if (snooped) rejected++;
    rows.push({ sat: s.sat, system, losX: e.x, losY: e.y, losZ: e.z, base: clock + v, varianceM2 });
  }
  return { xs, rows, used: sol.satellitesUsed, rejected };
}

/** The captured rows as the engine's RowBuilder at position x. */
function rowBuilder(p) {
  return (x, excluded) => {
    const dx = x.x - p.xs.x, dy = x.y - p.xs.y, dz = x.z - p.xs.z;
    const out = [];
    for (const r of p.rows) {
      if (excluded.has(r.sat)) continue;
      out.push({ sat: r.sat, system: r.system, losX: r.losX, losY: r.losY, losZ: r.losZ, misclosureM: r.base + r.losX * dx + r.losY * dy + r.losZ * dz, varianceM2: r.varianceM2 });
    }
    return out;
  };
}

/** The rows at x_sol as one linear WLS problem: unknowns dx, dy, dz and one clock per constellation. */
export function wlsProblem(p) {
  const systems = [...new Set(p.rows.map((r) => r.system))];
  const m = p.rows.length, n = 3 + systems.length;
  const design = new Float64Array(m * n), misclosure = new Float64Array(m), variances = new Float64Array(m);
  p.rows.forEach((r, i) => {
    design[i * n] = -r.losX; design[i * n + 1] = -r.losY; design[i * n + 2] = -r.losZ;
    design[i * n + 3 + systems.indexOf(r.system)] = 1;
    misclosure[i] = r.base; variances[i] = r.varianceM2;
  });
  return { design, m, n, misclosure, variances };
}

/** Random problems: m satellites above 10 deg, n = 4 or 5 unknowns, elevation-dependent variances. */
export function randomProblems(count, seed = 1) {
  let s = seed >>> 0;
  const rnd = () => ((s = (Math.imul(s, 1664525) + 1013904223) >>> 0) / 2 ** 32); // LCG, Numerical Recipes 7.1
  const out = [];
  for (let k = 0; k < count; k++) {
    const clocks = rnd() < 0.5 ? 1 : 2;
    const m = 6 + Math.floor(rnd() * 15), n = 3 + clocks;
    const design = new Float64Array(m * n), misclosure = new Float64Array(m), variances = new Float64Array(m);
    for (let i = 0; i < m; i++) {
      const el = (10 + 80 * rnd()) * DEG, az = 2 * Math.PI * rnd();
      design[i * n] = -Math.sin(az) * Math.cos(el); design[i * n + 1] = -Math.cos(az) * Math.cos(el); design[i * n + 2] = -Math.sin(el);
      design[i * n + 3 + (i % clocks)] = 1;
      const sd = Math.sqrt(0.09 + 0.09 / Math.sin(el) ** 2);
      variances[i] = sd * sd;
      misclosure[i] = 3 * (rnd() - 0.5) + sd * (rnd() + rnd() + rnd() - 1.5) * 2;
    }
    out.push({ design, m, n, misclosure, variances });
  }
  return out;
}

const FIX_OPTIONS = { maxIterations: 12, convergenceM: 1e-4, alphaGlobal: 0.001, alphaLocal: 0.001, minSatellites: 5, maxRejections: 3 };

/** Times the replayed per-epoch solve + QC and the WLS implementations. */
export async function benchSolveStep(core, problems) {
  const builders = problems.map(rowBuilder);
  const starts = problems.map((p, i) => (i > 0 ? problems[i - 1].xs : { x: p.xs.x + 5, y: p.xs.y + 5, z: p.xs.z + 5 }));
  // Agreement of the replay with the engine (same satellites kept, same position to < 1 mm).
  let agree = 0, maxDiffM = 0, iterations = 0;
  problems.forEach((p, i) => {
    const f = core.solvePositionFix(builders[i], starts[i], FIX_OPTIONS);
    if (!f.ok) return;
    iterations += f.iterations;
    const d = Math.hypot(f.positionM.x - p.xs.x, f.positionM.y - p.xs.y, f.positionM.z - p.xs.z);
    maxDiffM = Math.max(maxDiffM, d);
    if (f.used.length === p.used && d < 1e-3) agree++;
  });
  const fixAll = () => { let k = 0; for (let i = 0; i < builders.length; i++) if (core.solvePositionFix(builders[i], starts[i], FIX_OPTIONS).ok) k++; return k; };
  const fix = await repeat(fixAll, { minRuns: 5, minTotalMs: 2000 });

  const linear = problems.map(wlsProblem);
  const qcWith = (solver) => () => { let k = 0; for (const q of linear) if (core.qualityControlLoop(q, { alphaGlobal: 0.001, alphaLocal: 0.001, maxRemovals: 3, minObservations: 5, solver }).solution.ok) k++; return k; };
  const qcSmall = await repeat(qcWith(core.solveWeightedLeastSquaresSmall), { minRuns: 5, minTotalMs: 1500 });
  const qcMl = await repeat(qcWith(core.solveWeightedLeastSquares), { minRuns: 3, minTotalMs: 1500 });

  const random = randomProblems(20000);
  let maxDx = 0;
  for (const q of random.slice(0, 2000)) {
    const a = core.solveWeightedLeastSquaresSmall(q.design, q.m, q.n, q.misclosure, q.variances);
    const b = core.solveWeightedLeastSquares(q.design, q.m, q.n, q.misclosure, q.variances);
    if (a.ok && b.ok) for (let j = 0; j < q.n; j++) maxDx = Math.max(maxDx, Math.abs(a.x[j] - b.x[j]));
  }
  const solveAll = (solver) => () => { let k = 0; for (const q of random) if (solver(q.design, q.m, q.n, q.misclosure, q.variances).ok) k++; return k; };
  const rawSmall = await repeat(solveAll(core.solveWeightedLeastSquaresSmall), { minRuns: 5, minTotalMs: 1500 });
  const rawMl = await repeat(solveAll(core.solveWeightedLeastSquares), { minRuns: 3, minTotalMs: 1500 });
  const rate = (count, r) => count / r.medianMs * 1000;
  return {
    epochs: problems.length,
    meanSats: problems.reduce((a, p) => a + p.rows.length, 0) / problems.length,
    snoopedEpochs: problems.filter((p) => p.rejected > 0).length,
    replayAgreement: agree / problems.length,
    replayMaxDiffM: maxDiffM,
    meanIterations: iterations / problems.length,
    fixEpochsPerS: rate(problems.length, fix),
    qcSmallEpochsPerS: rate(linear.length, qcSmall),
    qcMlEpochsPerS: rate(linear.length, qcMl),
    randomProblems: random.length,
    randomMeanM: median(random.map((q) => q.m)),
    wlsSmallPerS: rate(random.length, rawSmall),
    wlsMlPerS: rate(random.length, rawMl),
    wlsMaxDiffM: maxDx,
  };
}
