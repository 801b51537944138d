/**
 * Simulator and carrier-phase engine, one frequency, with the rover's slips left unflagged (its
 * loss-of-lock bits cleared): SELF-CONSISTENCY tests with known integers. The simulator shares the orbit
 * model with the engine, so these prove that the time-differenced slip test (time-differenced-slips.ts)
 * finds slips the receiver did not report, with the Doppler and code-minus-phase tests seeing only the
 * large ones; the outside check of its false alarms is the real static run (carrier-static-run.test.ts).
 */
import { solveWithKnownIntegers, SHORT_BASELINE_ERRORS } from './support/known-integers.js';
import { describe, expect, it } from 'vitest';
import { simulateScenario, exampleScenarioSpec, type SimulatedScenario } from '../packages/sim/src/index.js';
import type { CarrierEpochSolution, CarrierOptions } from '../packages/core/src/carrier/index.js';
import { ecefToEnu } from '../packages/core/src/geodesy/index.js';
import { percentile } from './support/static-run.js';

/** Solves a session on L1/E1 alone with the rover's loss-of-lock bits cleared; every fixed integer checked. */
async function solveUnflagged(sim: SimulatedScenario, carrier: Partial<CarrierOptions>) {
  const r = await solveWithKnownIntegers(sim, { carrier: { frequencies: 'single', ...carrier }, unflagged: true });
  return { ...r, fixes: r.fixes.total };
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
const ERRORS = SHORT_BASELINE_ERRORS;

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
