/**
 * Acceptance of the carrier-phase engine on real data: the static run of cors-and-rover-2018-277
 * (../shared/data, README there). Truth: the rover's own real-time carrier-phase fixed solution
 * (rover-truth.csv rows of fix quality 4), relative to the base's header coordinate, positions at the
 * antenna. Bounds are the engine's acceptance targets; the figures are printed so they can be quoted.
 */
import { beforeAll, expect, it } from 'vitest';
import { ecefToEnu } from '../packages/core/src/geodesy/index.js';
import { withDefaults, type SessionOptions } from '../packages/core/src/session/index.js';
import { solveCarrierSession, withCarrierDefaults, type CarrierEpochSolution, type CarrierOptions, type CarrierSummary } from '../packages/core/src/carrier/index.js';
import type { NavData } from '../packages/core/src/rinex/nav-types.js';
import type { EcefM } from '../packages/core/src/types.js';
import { describeShared } from './support/shared.js';
import { corsNav, openObs, percentile, roverTruth } from './support/static-run.js';

async function solve(rover: string, references: string[], nav: NavData, opts: Partial<SessionOptions> = {}, carrier: Partial<CarrierOptions> = {}): Promise<{ solutions: CarrierEpochSolution[]; summary: CarrierSummary }> {
  const run = await solveCarrierSession(
    async () => ({ rover: await openObs(rover), references: await Promise.all(references.map(openObs)), nav }),
    withDefaults({ reduceToMark: false, ...opts }), withCarrierDefaults(carrier));
  const solutions: CarrierEpochSolution[] = [];
  for await (const s of run.epochs) solutions.push(s);
  return { solutions, summary: run.summary() };
}

const BASE = 'static-run/base.obs';
const ROVER = 'static-run/rover.obs';
const CORS = ['reference/glw1277m.18o', 'reference/glw1277n.18o'];
const CORS_XYZ: EcefM = { x: 3774050.9626, y: -601852.6734, z: 5089350.3688 };

interface FixStats { truthEpochs: number; fixed: number; forwardFixed: number; h95: number; v95: number; wrong: number; fixedCompared: number }

function fixStats(solutions: readonly CarrierEpochSolution[], truth: Map<number, EcefM>): FixStats {
  let truthEpochs = 0, fixed = 0, forwardFixed = 0, wrong = 0;
  const h: number[] = [], v: number[] = [];
  for (const s of solutions) {
    const t = truth.get(Math.round(s.timeGpsS));
    if (!t) continue;
    truthEpochs++;
    if (s.forwardKind === 'fixed') forwardFixed++;
    if (s.kind !== 'fixed' || !s.position) continue;
    fixed++;
    const e = ecefToEnu(s.position.ecef, t);
    h.push(Math.hypot(e.e, e.n));
    v.push(Math.abs(e.u));
    if (Math.hypot(e.e, e.n, e.u) > 0.1) wrong++;
  }
  return { truthEpochs, fixed, forwardFixed, h95: percentile(h, 0.95), v95: percentile(v, 0.95), wrong, fixedCompared: h.length };
}

const fmt = (s: FixStats) => `truth epochs ${s.truthEpochs}: fixed ${(100 * s.fixed / s.truthEpochs).toFixed(1)} % (forward alone ${(100 * s.forwardFixed / s.truthEpochs).toFixed(1)} %), fixed H95 ${s.h95.toFixed(3)} m V95 ${s.v95.toFixed(3)} m, wrong (> 0.10 m) ${s.wrong}`;

describeShared('carrier-phase engine on the real static run (cors-and-rover-2018-277; truth: rover-truth.csv quality 4)', () => {
  let nav: NavData;
  let truth = new Map<number, EcefM>();
  beforeAll(async () => { nav = await corsNav(); truth = roverTruth(); });

  it('rover against base: >= 95 % fixed (>= 90 % forward alone), H95 <= 0.03 m, V95 <= 0.05 m, wrong fixes <= 0.5 %', async () => {
    const { solutions, summary } = await solve(ROVER, [BASE], nav);
    const st = fixStats(solutions, truth);
    console.log(`rover vs base, carrier phase: ${fmt(st)}`);
    console.log(`passes: forward ${JSON.stringify(summary.forward)} backward ${JSON.stringify(summary.backward)} combined ${JSON.stringify(summary.combined)}; slips ${JSON.stringify(summary.slips)}; ${summary.notes.join(' | ')}`);
    expect(st.truthEpochs).toBeGreaterThan(1000);
    expect(st.fixed / st.truthEpochs).toBeGreaterThanOrEqual(0.95);
    expect(st.forwardFixed / st.truthEpochs).toBeGreaterThanOrEqual(0.90);
    expect(st.h95).toBeLessThanOrEqual(0.03);
    expect(st.v95).toBeLessThanOrEqual(0.05);
    expect(st.wrong / st.fixed).toBeLessThanOrEqual(0.005);
  });
});
