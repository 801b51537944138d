/**
 * Simulator and carrier-phase engine with dual-frequency receivers (GPS L1 + L2 P(Y) at both ends):
 * SELF-CONSISTENCY tests with known integers. The simulator shares the orbit model with the engine and its
 * L2 phase carries the same slips as L1, so these prove the algebra of the further band (its own arcs,
 * clocks and ambiguities, the ionosphere state), not the physics; the outside checks of the further bands
 * are the real zero baselines (carrier-dual-frequency-real.test.ts).
 */
import { describe, expect, it } from 'vitest';
import { simulateScenario, exampleScenarioSpec, type ScenarioSpec, type SimulatedScenario } from '../packages/sim/src/index.js';
import { withDefaults } from '../packages/core/src/session/index.js';
import { solveCarrierSession, withCarrierDefaults, type CarrierEpochSolution, type CarrierOptions, type CarrierSummary } from '../packages/core/src/carrier/index.js';
import { ecefToEnu } from '../packages/core/src/geodesy/index.js';
import type { ObsEpoch, ObsHeader, ObsStream } from '../packages/core/src/rinex/obs-types.js';

function stream(file: string, header: ObsHeader, epochs: () => Iterable<ObsEpoch>): ObsStream {
  return { file, header, epochs: (async function* () { yield* epochs(); })() };
}

async function solveSim(sim: SimulatedScenario, carrier: Partial<CarrierOptions>): Promise<{ sols: CarrierEpochSolution[]; summary: CarrierSummary }> {
  const run = await solveCarrierSession(async () => ({
    rover: stream('rover', sim.roverHeader, () => sim.roverEpochs()),
    references: [stream('reference', sim.referenceHeader, () => sim.referenceEpochs())],
    nav: sim.nav,
  }), withDefaults({ reference: { position: { ecef: sim.truth.referenceMark, frame: sim.truth.frame } }, reduceToMark: false }), withCarrierDefaults(carrier));
  const sols: CarrierEpochSolution[] = [];
  for await (const s of run.epochs) sols.push(s);
  return { sols, summary: run.summary() };
}

function check(sim: SimulatedScenario, sols: readonly CarrierEpochSolution[]): { fixed: number; worstM: number; firstForwardFix: number } {
  let fixed = 0, worst = 0, firstForwardFix = -1;
  sols.forEach((s, i) => {
    if (s.forwardKind === 'fixed' && firstForwardFix < 0) firstForwardFix = i + 1;
    if (s.kind !== 'fixed' || !s.position) return;
    fixed++;
    const e = ecefToEnu(s.position.ecef, sim.truth.roverAt(sim.truth.roverTrueTime(s.tagGpsS)));
    worst = Math.max(worst, Math.hypot(e.e, e.n, e.u));
  });
  return { fixed, worstM: worst, firstForwardFix };
}

// As carrier-sim.test.ts: a short baseline's errors with frequent slips (on both bands) and gaps, multipath off.
const ERRORS = {
  orbit: true, satClock: true, rxClock: true, codeNoise: true, phaseNoise: true,
  iono: { klobucharScale: 1, gradientMPerKm: 0.001, waveLengthKm: 200, waveAzimuthDeg: 30, wavePeriodS: 1800 },
  tropo: { zenithWetSigmaM: 0, minPeriodS: 1800, maxPeriodS: 3600 },
  slips: { roverPerSatHour: 20, referencePerSatHour: 2, maxCycles: 30 },
  gaps: true,
} as const;

describe('simulator + carrier-phase engine, dual-frequency receivers (self-consistency, known integers)', () => {
  it('a static point with slips on both bands: every fixed epoch within 0.01 m, >= 90 % fixed, the first forward fix no later than with L1 alone; L2 phase residuals at the fixed solution at the millimetre level', async () => {
    const base = exampleScenarioSpec(ERRORS, 21);
    const spec: ScenarioSpec = { ...base, rover: { ...base.rover, dualFrequency: true, plan: [{ kind: 'static', point: 'A', durationS: 480, antennaHeightM: 1.5 }] } };
    const sim = simulateScenario(spec);
    const dual = await solveSim(sim, { dynamics: 'static' });
    const single = await solveSim(sim, { dynamics: 'static', frequencies: 'single' });
    const d = check(sim, dual.sols), s = check(sim, single.sols);
    const l2 = dual.sols.filter((x) => x.kind === 'fixed').flatMap((x) => x.satellites.filter((r) => r.used && r.signal === 'L2W').map((r) => Math.abs(r.residualM)));
    l2.sort((a, b) => a - b);
    console.log(`static, L1+L2: ${d.fixed}/${dual.sols.length} fixed, worst ${d.worstM.toFixed(4)} m, first forward fix at epoch ${d.firstForwardFix} (L1 alone: ${s.fixed} fixed, first forward fix at epoch ${s.firstForwardFix}); L2W residual rows ${l2.length}, 95 % ${l2[Math.floor(0.95 * (l2.length - 1))]?.toFixed(4)} m; ${dual.summary.notes.join(' | ')}`);
    expect(d.worstM).toBeLessThanOrEqual(0.01);
    expect(d.fixed / dual.sols.length).toBeGreaterThanOrEqual(0.9);
    expect(d.firstForwardFix).toBeGreaterThan(0);
    expect(d.firstForwardFix).toBeLessThanOrEqual(s.firstForwardFix);
    expect(l2.length).toBeGreaterThan(1000);
    expect(l2.every(Number.isFinite)).toBe(true);
    // Phase noise 3 mm per receiver at zenith (the simulator's), growing at low elevation: 95 % within 2 cm.
    expect(l2[Math.floor(0.95 * (l2.length - 1))]).toBeLessThanOrEqual(0.02);
  });

  it('the rover\'s slips left unflagged (loss-of-lock bits cleared): the geometry-free test and the restart of every band of a slipped satellite keep every fix within 0.03 m, >= 90 % fixed (L1 alone printed for contrast)', async () => {
    const base = exampleScenarioSpec(ERRORS, 22);
    const sim = simulateScenario({ ...base, rover: { ...base.rover, dualFrequency: true } });
    const unflagged: SimulatedScenario = { ...sim, roverEpochs: () => [...sim.roverEpochs()].map((e) => ({ ...e, sats: e.sats.map((x) => ({ ...x, lli: new Uint8Array(x.lli.length) })) })) };
    // One session, not a guarantee: with other seeds some unflagged slips still pass (one cycle on each band
    // moves GF by 5.4 cm, at the limit, and Doppler sees less than its 1.2-cycle limit), and the filter's
    // innovation test does not catch them either; fixes then go wrong by centimetres.
    const dual = await solveSim(unflagged, {});
    const single = await solveSim(unflagged, { frequencies: 'single' });
    const d = check(sim, dual.sols), s1 = check(sim, single.sols);
    console.log(`unflagged slips, L1+L2: ${d.fixed}/${dual.sols.length} fixed, worst ${d.worstM.toFixed(4)} m; L1 alone: ${s1.fixed} fixed, worst ${s1.worstM.toFixed(4)} m; ${dual.summary.notes.filter((n) => /geometry-free/.test(n)).join('')}`);
    expect(d.worstM).toBeLessThanOrEqual(0.03);
    expect(d.fixed / dual.sols.length).toBeGreaterThanOrEqual(0.9);
  });

  it('a moving rover (occupation, walk, occupation) with slips on both bands: every fix within 0.03 m, >= 90 % fixed', async () => {
    const base = exampleScenarioSpec(ERRORS, 22);
    const sim = simulateScenario({ ...base, rover: { ...base.rover, dualFrequency: true } });
    const { sols, summary } = await solveSim(sim, {});
    const c = check(sim, sols);
    console.log(`moving, L1+L2: ${c.fixed}/${sols.length} fixed, worst ${c.worstM.toFixed(4)} m, first forward fix at epoch ${c.firstForwardFix}; slips ${JSON.stringify(summary.slips)}`);
    expect(c.worstM).toBeLessThanOrEqual(0.03);
    expect(c.fixed / sols.length).toBeGreaterThanOrEqual(0.9);
  });
});
