/**
 * Simulator and engine together. These are SELF-CONSISTENCY tests: the simulator shares the orbit model
 * with the code under test, so they prove the algebra (differencing, time alignment, solving), not the
 * physics. The outside checks of the engine are the real-data tests (differential-static, standalone-real).
 */
import { describe, expect, it } from 'vitest';
import { simulateScenario, exampleScenarioSpec, type ScenarioSpec, type SimulatedScenario } from '../packages/sim/src/index.js';
import { solveSession, withDefaults, type EpochSolution, type SessionOptions } from '../packages/core/src/session/index.js';
import { solveStandaloneEpoch } from '../packages/core/src/standalone/index.js';
import { EphemerisStore } from '../packages/core/src/orbit/index.js';
import { ecefToEnu } from '../packages/core/src/geodesy/index.js';
import type { ObsEpoch, ObsHeader, ObsStream } from '../packages/core/src/gnss/obs-types.js';
import { percentile } from './support/static-run.js';

function stream(file: string, header: ObsHeader, epochs: () => Iterable<ObsEpoch>): ObsStream {
  return { file, header, epochs: (async function* () { yield* epochs(); })() };
}

async function solveSim(sim: SimulatedScenario, opts: Partial<SessionOptions> = {}): Promise<EpochSolution[]> {
  const run = await solveSession({
    rover: stream('rover', sim.roverHeader, () => sim.roverEpochs()),
    references: [stream('reference', sim.referenceHeader, () => sim.referenceEpochs())],
    nav: sim.nav,
  }, withDefaults({ reference: { position: { ecef: sim.truth.referenceMark, frame: sim.truth.frame } }, reduceToMark: false, ...opts }));
  const out: EpochSolution[] = [];
  for await (const s of run.epochs) out.push(s);
  return out;
}

/** Horizontal and vertical errors of the ARP solutions against the simulated truth at the true epoch time. */
function errors(sim: SimulatedScenario, sols: readonly EpochSolution[]): { h: number[]; v: number[]; solved: number } {
  const h: number[] = [], v: number[] = [];
  for (const s of sols) {
    if (!s.position) continue;
    const t = sim.truth.roverAt(sim.truth.roverTrueTime(s.tagGpsS));
    const e = ecefToEnu(s.position.ecef, t);
    h.push(Math.hypot(e.e, e.n));
    v.push(Math.abs(e.u));
  }
  return { h, v, solved: h.length };
}

const farSpec = (km: number, errors: ScenarioSpec['errors']): ScenarioSpec => {
  const base = exampleScenarioSpec(errors, 11);
  return { ...base, durationS: 400, rover: { ...base.rover, plan: [{ kind: 'static', point: 'A', durationS: 300, antennaHeightM: 1.5 }] }, points: { A: { e: km * 1000 * 0.8, n: km * 1000 * 0.6, u: 5 } } };
};

describe('simulator + differential engine (self-consistency)', () => {
  it('with every error switched off, the baseline is recovered to millimetres', async () => {
    const sim = simulateScenario(exampleScenarioSpec({}, 3));
    const sols = await solveSim(sim);
    const e = errors(sim, sols);
    expect(e.solved).toBe(sols.length);
    expect(Math.max(...e.h)).toBeLessThan(0.005);
    expect(Math.max(...e.v)).toBeLessThan(0.01);
  });

  it('common-mode errors (orbit, satellite clock, ionosphere without gradient, troposphere, receiver clocks with jumps) cancel to millimetres', async () => {
    const sim = simulateScenario(exampleScenarioSpec({
      orbit: true, satClock: true, rxClock: true,
      iono: { klobucharScale: 1.3, gradientMPerKm: 0, waveLengthKm: 1e9, waveAzimuthDeg: 0, wavePeriodS: 1e9 },
      tropo: { zenithWetSigmaM: 0, minPeriodS: 1800, maxPeriodS: 3600 },
    }, 4));
    const e = errors(sim, await solveSim(sim));
    // The ~600 m baseline leaves the orbit error times baseline/range (1 m * 0.6 km / 20000 km = 0.03 mm)
    // and the ionosphere's geometry change over 600 m: well under a centimetre.
    expect(percentile(e.h, 0.95)).toBeLessThan(0.01);
    expect(percentile(e.v, 0.95)).toBeLessThan(0.02);
  });

  it('the standalone error is metres while the carrier-smoothed differential one is decimetres (orbit, clocks, atmosphere, code noise)', async () => {
    const errs = { orbit: true, satClock: true, iono: true, tropo: true, rxClock: true, codeNoise: true, phaseNoise: true } as const;
    const sim = simulateScenario(exampleScenarioSpec(errs, 5));
    const dif = errors(sim, await solveSim(sim, { smoothing: { enabled: true, timeConstantS: 100, maxGapS: 30 } }));
    const store = new EphemerisStore(sim.nav);
    const sa: number[] = [];
    let x0 = null as null | { x: number; y: number; z: number };
    for (const ep of sim.roverEpochs()) {
      if (ep.sats.length === 0 || ep.flag > 1) continue;
      const r = solveStandaloneEpoch(ep, sim.roverHeader, { store, iono: sim.nav.ionosphere, systems: ['G', 'E'], elevationMaskRad: 0.17, weighting: { aM: 0.25, bM: 0.5, minElevationRad: 0.087 }, frequencyMode: 'single', glonassChannels: new Map() }, x0);
      if (!r.fix.ok) continue;
      x0 = r.fix.positionM;
      const e = ecefToEnu(r.fix.positionM, sim.truth.roverAt(sim.truth.roverTrueTime(ep.tagGpsS)));
      sa.push(Math.hypot(e.e, e.n));
    }
    const dif95 = percentile(dif.h, 0.95), sa95 = percentile(sa, 0.95), saMed = percentile(sa, 0.5);
    console.log(`simulated: standalone H50 ${saMed.toFixed(2)} m H95 ${sa95.toFixed(2)} m; differential H95 ${dif95.toFixed(2)} m`);
    expect(saMed).toBeGreaterThan(1);
    expect(dif95).toBeLessThan(0.6);
    expect(sa95).toBeGreaterThan(4 * dif95);
  });

  it('ionosphere decorrelation grows the error with baseline length', async () => {
    const iono = { iono: { klobucharScale: 1.5, gradientMPerKm: 0.004, waveLengthKm: 1500, waveAzimuthDeg: 150, wavePeriodS: 3 * 3600 } } as const;
    const near = errors(simulateScenario(farSpec(1, iono)), await solveSim(simulateScenario(farSpec(1, iono))));
    const farSim = simulateScenario(farSpec(80, iono));
    const far = errors(farSim, await solveSim(farSim));
    const n95 = percentile(near.h, 0.95), f95 = percentile(far.h, 0.95);
    console.log(`ionosphere gradient 4 mm/km: H95 ${n95.toFixed(3)} m at 1 km, ${f95.toFixed(3)} m at 80 km`);
    expect(f95).toBeGreaterThan(5 * n95);
    expect(f95).toBeGreaterThan(0.05);
  });

  it('the differential troposphere of a large height difference is modelled, not assumed zero', async () => {
    // Rover 900 m above the reference: the zenith tropospheric delays differ by about 0.25 m (Saastamoinen
    // with a standard atmosphere, check-values.md #7 formula), which left unmodelled would push the height
    // by decimetres. The simulator's true troposphere follows the same model (self-consistency).
    const base = exampleScenarioSpec({ tropo: { zenithWetSigmaM: 0, minPeriodS: 1800, maxPeriodS: 3600 } }, 12);
    const spec: ScenarioSpec = { ...base, durationS: 300, rover: { ...base.rover, plan: [{ kind: 'static', point: 'A', durationS: 200, antennaHeightM: 1.5 }] }, points: { A: { e: 3000, n: 2000, u: 900 } } };
    const sim = simulateScenario(spec);
    const sols = await solveSim(sim);
    const ups: number[] = [];
    for (const s of sols) {
      if (!s.position) continue;
      ups.push(ecefToEnu(s.position.ecef, sim.truth.roverAt(sim.truth.roverTrueTime(s.tagGpsS))).u);
    }
    const meanUp = ups.reduce((a, b) => a + b, 0) / ups.length;
    expect(ups.length).toBeGreaterThan(100);
    expect(Math.abs(meanUp)).toBeLessThan(0.02);
  });

  it('a faulty satellite is found by data snooping and reported', async () => {
    const sim = simulateScenario(exampleScenarioSpec({ codeNoise: true, faults: { perHour: 40, minStepM: 30, maxStepM: 50, durationS: 60 } }, 6));
    expect(sim.rover.faults.length).toBeGreaterThan(0);
    const sols = await solveSim(sim);
    const rejected = sols.flatMap((s) => s.satellites.filter((x) => x.reason.startsWith('rejected by data snooping')));
    expect(rejected.length).toBeGreaterThan(10);
    const e = errors(sim, sols);
    expect(percentile(e.h, 0.95)).toBeLessThan(1.0);
  });
});
