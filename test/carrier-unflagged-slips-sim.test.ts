/**
 * Simulator and carrier-phase engine, one frequency, with the rover's slips left unflagged (its
 * loss-of-lock bits cleared): SELF-CONSISTENCY tests with known integers. The simulator shares the orbit
 * model with the engine, so these prove that the time-differenced slip test (time-differenced-slips.ts)
 * finds slips the receiver did not report, with the Doppler and code-minus-phase tests seeing only the
 * large ones; the outside check of its false alarms is the real static run (carrier-static-run.test.ts).
 */
import { describe, expect, it } from 'vitest';
import { simulateScenario, exampleScenarioSpec, type SimulatedScenario } from '../packages/sim/src/index.js';
import { withDefaults } from '../packages/core/src/session/index.js';
import { solveCarrierSession, withCarrierDefaults, type CarrierEpochSolution, type CarrierOptions, type CarrierSummary } from '../packages/core/src/carrier/index.js';
import { ecefToEnu } from '../packages/core/src/geodesy/index.js';
import type { ObsEpoch, ObsHeader, ObsStream } from '../packages/core/src/rinex/obs-types.js';
import { percentile } from './support/static-run.js';

function stream(file: string, header: ObsHeader, epochs: () => Iterable<ObsEpoch>): ObsStream {
  return { file, header, epochs: (async function* () { yield* epochs(); })() };
}

/** Known integers: each receiver's L1/E1 ambiguity per satellite and epoch tag, as the simulator drew them. */
class TrueAmbiguities {
  private readonly bySat = new Map<string, { tags: number[]; n: number[] }>();
  record = (tagGpsS: number, sat: string, n1: number): void => {
    let e = this.bySat.get(sat);
    if (!e) this.bySat.set(sat, (e = { tags: [], n: [] }));
    e.tags.push(tagGpsS); e.n.push(n1);
  };
  at(sat: string, tGpsS: number): number {
    const e = this.bySat.get(sat);
    if (!e) return NaN;
    let lo = 0, hi = e.tags.length - 1, best = -1;
    while (lo <= hi) { const m = (lo + hi) >> 1; if (e.tags[m]! <= tGpsS + 1e-3) { best = m; lo = m + 1; } else hi = m - 1; }
    return best < 0 ? NaN : e.n[best]!;
  }
}

interface Solved { sols: CarrierEpochSolution[]; summary: CarrierSummary; fixes: number; wrongFixes: string[] }

/** Solves a session on L1/E1 alone with the rover's loss-of-lock bits cleared; every fixed integer checked. */
async function solveUnflagged(sim: SimulatedScenario, carrier: Partial<CarrierOptions>): Promise<Solved> {
  const rover = new TrueAmbiguities(), reference = new TrueAmbiguities();
  let fixes = 0;
  const wrongFixes: string[] = [];
  const roverEpochs = (): Iterable<ObsEpoch> => [...sim.rover.epochs(rover.record)].map((e) => ({ ...e, sats: e.sats.map((x) => ({ ...x, lli: new Uint8Array(x.lli.length) })) }));
  const run = await solveCarrierSession(async () => ({
    rover: stream('rover', sim.roverHeader, roverEpochs),
    references: [stream('reference', sim.referenceHeader, () => sim.reference.epochs(reference.record))],
    nav: sim.nav,
    onFixedAmbiguities: ({ pass, tagGpsS, ambiguities }) => {
      const t = sim.truth.roverTrueTime(tagGpsS);
      for (const a of ambiguities) {
        fixes++;
        const sd = (sat: string) => rover.at(sat, tagGpsS) - reference.at(sat, t);
        const truth = sd(a.sat) - sd(a.pivot);
        if (a.cycles !== truth) wrongFixes.push(`${pass} ${tagGpsS}: ${a.sat}-${a.pivot} fixed ${a.cycles}, true ${truth}`);
      }
    },
  }), withDefaults({ reference: { position: { ecef: sim.truth.referenceMark, frame: sim.truth.frame } }, reduceToMark: false }), withCarrierDefaults({ frequencies: 'single', ...carrier }));
  const sols: CarrierEpochSolution[] = [];
  for await (const s of run.epochs) sols.push(s);
  return { sols, summary: run.summary(), fixes, wrongFixes };
}

function errors(sim: SimulatedScenario, sols: readonly CarrierEpochSolution[]): { fixed: number; errorsM: number[] } {
  const errorsM: number[] = [];
  for (const s of sols) {
    if (s.kind !== 'fixed' || !s.position) continue;
    const e = ecefToEnu(s.position.ecef, sim.truth.roverAt(sim.truth.roverTrueTime(s.tagGpsS)));
    errorsM.push(Math.hypot(e.e, e.n, e.u));
  }
  return { fixed: errorsM.length, errorsM };
}

// A short baseline's errors with frequent slips and gaps, multipath off (as carrier-dual-frequency-sim.test.ts).
const ERRORS = {
  orbit: true, satClock: true, rxClock: true, codeNoise: true, phaseNoise: true,
  iono: { klobucharScale: 1, gradientMPerKm: 0.001, waveLengthKm: 200, waveAzimuthDeg: 30, wavePeriodS: 1800 },
  tropo: { zenithWetSigmaM: 0, minPeriodS: 1800, maxPeriodS: 3600 },
  slips: { roverPerSatHour: 20, referencePerSatHour: 2, maxCycles: 30 },
  gaps: true,
} as const;

describe('simulator + carrier-phase engine, L1 alone, rover slips unflagged (self-consistency, every fixed integer checked)', () => {
  for (const seed of [22, 23, 24, 25, 26]) {
    it(`seed ${seed}, occupation, walk, occupation: wrong integers <= 0.1 % of those fixed, every fixed epoch within 0.03 m, 95 % within 0.02 m, >= 80 % fixed`, async () => {
      const base = exampleScenarioSpec(ERRORS, seed);
      const sim = simulateScenario({ ...base, rover: { ...base.rover, dualFrequency: true } });
      const r = await solveUnflagged(sim, {});
      const { fixed, errorsM } = errors(sim, r.sols);
      const worst = Math.max(0, ...errorsM);
      const td = r.summary.notes.find((n) => /time-differenced/.test(n)) ?? '';
      console.log(`seed ${seed}: wrong integers ${r.wrongFixes.length} of ${r.fixes}; ${fixed}/${r.sols.length} fixed, 95 % ${(percentile(errorsM, 0.95) ?? NaN).toFixed(4)} m, worst ${worst.toFixed(4)} m; ${td}; arcs ${JSON.stringify(r.summary.slips.rover)} ${r.wrongFixes.slice(0, 3).join('; ')}`);
      expect(r.wrongFixes.length).toBeLessThanOrEqual(0.001 * r.fixes);
      expect(worst).toBeLessThanOrEqual(0.03);
      expect(percentile(errorsM, 0.95)).toBeLessThanOrEqual(0.02);
      expect(fixed / r.sols.length).toBeGreaterThanOrEqual(0.8);
    });
  }

  // Slips of one cycle each: below the Doppler test's limit (1.2 cycles at 1 Hz, arc-tracker.ts), so only
  // the time-differenced test can see them.
  for (const seed of [27, 28]) {
    it(`seed ${seed}, slips of one cycle only: wrong integers <= 0.1 % of those fixed, every fixed epoch within 0.03 m, >= 80 % fixed`, async () => {
      const base = exampleScenarioSpec({ ...ERRORS, slips: { ...ERRORS.slips, maxCycles: 1 } }, seed);
      const sim = simulateScenario({ ...base, rover: { ...base.rover, dualFrequency: true } });
      const r = await solveUnflagged(sim, {});
      const { fixed, errorsM } = errors(sim, r.sols);
      const worst = Math.max(0, ...errorsM);
      const td = r.summary.notes.find((n) => /time-differenced/.test(n)) ?? '';
      console.log(`seed ${seed}, one-cycle slips: wrong integers ${r.wrongFixes.length} of ${r.fixes}; ${fixed}/${r.sols.length} fixed, 95 % ${(percentile(errorsM, 0.95) ?? NaN).toFixed(4)} m, worst ${worst.toFixed(4)} m; ${td}; arcs ${JSON.stringify(r.summary.slips.rover)} ${r.wrongFixes.slice(0, 3).join('; ')}`);
      expect(r.wrongFixes.length).toBeLessThanOrEqual(0.001 * r.fixes);
      expect(worst).toBeLessThanOrEqual(0.03);
      expect(fixed / r.sols.length).toBeGreaterThanOrEqual(0.8);
    });
  }
});
