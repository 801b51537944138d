/**
 * The carrier-phase engine on the real static run (cors-and-rover-2018-277, ../shared/data README) with
 * the rover's (and in one case the base's) observations perturbed in controlled, seeded ways that imitate
 * an antenna carried on foot under trees and beside buildings: cycle slips the receiver did not flag,
 * flagged ones, satellites lost and found again, a short loss of every satellite (a bridge), half-cycle
 * slips with and without the half-cycle bit, and code multipath. Every epoch is solved as moving
 * (dynamics kinematic). Truth: rover-truth.csv rows of fix quality 4 (as carrier-static-run.test.ts).
 *
 * Expectations (common practice for single-frequency RTK acceptance, not fitted to this file): wrong fixes
 * (fixed epochs more than 0.10 m 3-D from the truth, the bound of carrier-static-run.test.ts) at most
 * 0.5 % of the fixed epochs; 95 % of the fixed epochs within 0.05 m horizontally; a fixed share that
 * shows the engine recovers after each perturbation (bounds per case below, with the reason).
 */
import { beforeAll, expect, it } from 'vitest';
import { readFileSync } from 'node:fs';
import { ecefToEnu } from '../packages/core/src/geodesy/index.js';
import { withDefaults } from '../packages/core/src/session/index.js';
import { solveCarrierSession, withCarrierDefaults, type CarrierEpochSolution, type CarrierSummary } from '../packages/core/src/carrier/index.js';
import { readObsStream } from '../packages/core/src/rinex/obs-reader.js';
import type { EcefM, NavData } from '../packages/core/src/gnss/index.js';
import { describeShared, dataPath } from './support/shared.js';
import { corsNav, percentile, roverTruth, RUN } from './support/static-run.js';
import { rng } from './support/random.js';
import {
  applyCodeError, applyFlaggedHalfCycle, applyOutage, applySlip, applyTotalOutage, formatObsText, parseObsText, satelliteAt, spanS, type ObsText,
} from './support/perturb-obs.js';

const ROVER = 'static-run/rover.obs';
const BASE = 'static-run/base.obs';

async function* once(text: string): AsyncIterable<string> {
  yield text;
}

async function solveTexts(rover: string, base: string, nav: NavData): Promise<{ solutions: CarrierEpochSolution[]; summary: CarrierSummary }> {
  const run = await solveCarrierSession(
    async () => ({ rover: await readObsStream('rover.obs', once(rover)), references: [await readObsStream('base.obs', once(base))], nav }),
    withDefaults({ reduceToMark: false }), withCarrierDefaults({ dynamics: 'kinematic' }));
  const solutions: CarrierEpochSolution[] = [];
  for await (const s of run.epochs) solutions.push(s);
  return { solutions, summary: run.summary() };
}

interface FixStats { truthEpochs: number; fixed: number; wrong: number; wrongH5cm: number; h95: number; v95: number; wrongAt: string[] }

/** Fixed epochs against the truth, as carrier-static-run.test.ts (wrong: more than 0.10 m 3-D). */
function fixStats(solutions: readonly CarrierEpochSolution[], truth: Map<number, EcefM>, t0: number): FixStats {
  let truthEpochs = 0, fixed = 0, wrong = 0, wrongH5cm = 0;
  const h: number[] = [], v: number[] = [], wrongAt: string[] = [];
  for (const s of solutions) {
    const t = truth.get(Math.round(s.timeGpsS));
    if (!t) continue;
    truthEpochs++;
    if (s.kind !== 'fixed' || !s.position) continue;
    fixed++;
    const e = ecefToEnu(s.position.ecef, t);
    h.push(Math.hypot(e.e, e.n));
    v.push(Math.abs(e.u));
    if (Math.hypot(e.e, e.n) > 0.05) wrongH5cm++;
    if (Math.hypot(e.e, e.n, e.u) > 0.1) {
      wrong++;
      if (wrongAt.length < 8) wrongAt.push(`${(s.tagGpsS - t0).toFixed(0)} s (${s.forwardKind}/${s.backwardKind}, ratio ${s.ratio.toFixed(1)}, ${s.fixedAmbiguities} fixed) E/N/U ${[e.e, e.n, e.u].map((x) => x.toFixed(3)).join('/')} m`);
    }
  }
  return { truthEpochs, fixed, wrong, wrongH5cm, h95: percentile(h, 0.95) ?? NaN, v95: percentile(v, 0.95) ?? NaN, wrongAt };
}

const fmt = (s: FixStats): string => `truth epochs ${s.truthEpochs}: fixed ${(100 * s.fixed / s.truthEpochs).toFixed(1)} %, H95 ${s.h95.toFixed(3)} m V95 ${s.v95.toFixed(3)} m, wrong (> 0.10 m 3-D) ${s.wrong}, horizontal > 0.05 m ${s.wrongH5cm}`;

/** Draws `count` slip times spread over the span (uniform, seeded). */
function times(r: () => number, count: number, fromS: number, toS: number): number[] {
  const out: number[] = [];
  for (let i = 0; i < count; i++) out.push(fromS + r() * (toS - fromS));
  return out.sort((a, b) => a - b);
}

const SLIP_SIZES = [1, -1, 2, -3, 5, 1000, -1000];

/** Slips on random satellites at random epochs, `perMinute` in all, sizes drawn from SLIP_SIZES. */
function slips(o: ObsText, seed: number, perMinute: number, lli: number): string {
  const r = rng(seed);
  const span = spanS(o);
  const drawn: string[] = [];
  for (const t of times(r, Math.round(perMinute * span / 60), 30, span - 30)) {
    const sat = satelliteAt(o, t, r);
    if (!sat) continue;
    const cycles = SLIP_SIZES[Math.floor(r() * SLIP_SIZES.length)];
    applySlip(o, { sat, tS: t, cycles, lli });
    drawn.push(`${sat}@${t.toFixed(0)}:${cycles}`);
  }
  return `${drawn.length} slips (${drawn.slice(0, 6).join(' ')} ...)`;
}

interface Case {
  readonly name: string;
  /** Least share of the truth epochs fixed, with its reason. */
  readonly minFixedShare: number;
  /** Perturbs the rover's and the base's files (parsed), returning a line saying what it did. */
  readonly perturb: (rover: ObsText, base: ObsText) => string;
}

/** Slips at one epoch on `perEpoch` satellites at once (a canopy), unflagged, at `count` random epochs. */
function slipsTogether(o: ObsText, seed: number, count: number, perEpoch: number): string {
  const r = rng(seed);
  const drawn: string[] = [];
  for (const t of times(r, count, 30, spanS(o) - 30)) {
    const sats = new Set<string>();
    for (let tries = 0; sats.size < perEpoch && tries < 50; tries++) {
      const sat = satelliteAt(o, t, r);
      if (sat) sats.add(sat);
    }
    const sizes: string[] = [];
    for (const sat of sats) {
      const cycles = SLIP_SIZES[Math.floor(r() * SLIP_SIZES.length)];
      applySlip(o, { sat, tS: t, cycles, lli: 0 });
      sizes.push(`${sat}:${cycles}`);
    }
    drawn.push(`@${t.toFixed(0)} ${sizes.join(' ')}`);
  }
  return `${drawn.length} epochs with ${perEpoch} satellites slipping at once (${drawn.slice(0, 2).join('; ')} ...)`;
}

/** Satellite outages of 5 to 60 s at random times, half of them with an unflagged slip on the return. */
function outages(o: ObsText, seed: number, count: number): string {
  const r = rng(seed);
  const drawn: string[] = [];
  for (const t of times(r, count, 30, spanS(o) - 90)) {
    const sat = satelliteAt(o, t, r);
    if (!sat) continue;
    const d = 5 + r() * 55;
    applyOutage(o, sat, t, d);
    const slip = r() < 0.5 ? SLIP_SIZES[Math.floor(r() * SLIP_SIZES.length)] : 0;
    if (slip) applySlip(o, { sat, tS: t + d, cycles: slip, lli: 0 });
    drawn.push(`${sat}@${t.toFixed(0)}+${d.toFixed(0)}${slip ? ':' + slip : ''}`);
  }
  return `${drawn.length} satellite outages (${drawn.slice(0, 5).join(' ')} ...)`;
}

/** Every satellite lost for 3 to 10 s (a bridge), three of them back with an unflagged slip. */
function bridge(o: ObsText, seed: number, tS: number): string {
  const r = rng(seed);
  const d = 3 + r() * 7;
  applyTotalOutage(o, tS, d);
  const back: string[] = [];
  for (let i = 0; i < 3; i++) {
    const sat = satelliteAt(o, tS + d, r);
    const cycles = SLIP_SIZES[Math.floor(r() * SLIP_SIZES.length)];
    if (sat) { applySlip(o, { sat, tS: tS + d, cycles, lli: 0 }); back.push(`${sat}:${cycles}`); }
  }
  return `no epoch for ${d.toFixed(1)} s from ${tS} s, back with slips ${back.join(' ')}`;
}

/**
 * Half-cycle slips: the phase half a cycle off from a random time, with the half-cycle bit set until the
 * receiver resolves it 3 to 30 s later (`flagged`), or unflagged and put right (unflagged) 3 to 30 s later
 * (`resolve`), or never put right.
 */
function halfCycles(o: ObsText, seed: number, count: number, flagged: boolean, resolve: boolean): string {
  const r = rng(seed);
  let n = 0;
  for (const t of times(r, count, 30, spanS(o) - 30)) {
    const sat = satelliteAt(o, t, r);
    const sign = r() < 0.5 ? 0.5 : -0.5, d = 3 + r() * 27;
    if (!sat) continue;
    n++;
    if (flagged) applyFlaggedHalfCycle(o, sat, t, d);
    else {
      applySlip(o, { sat, tS: t, cycles: sign, lli: 0 });
      if (resolve) applySlip(o, { sat, tS: t + d, cycles: -sign, lli: 0 });
    }
  }
  return `${n} half-cycle slips, ${flagged ? 'flagged until resolved' : resolve ? 'unflagged, put right unflagged 3 to 30 s later' : 'unflagged, never put right'}`;
}

/** Code multipath: a few metres to tens of metres on one satellite's C1C for 2 to 22 s, slowly varying. */
function multipath(o: ObsText, seed: number, count: number): string {
  const r = rng(seed);
  let n = 0;
  for (const t of times(r, count, 30, spanS(o) - 30)) {
    const sat = satelliteAt(o, t, r);
    const amp = 3 + r() * 40, period = 5 + r() * 30, sign = r() < 0.5 ? -1 : 1, d = 2 + r() * 20;
    if (!sat) continue;
    n++;
    applyCodeError(o, sat, t, d, (ts) => sign * amp * (0.6 + 0.4 * Math.sin(2 * Math.PI * ts / period)));
  }
  return `${n} code multipath episodes of 3 to 43 m`;
}

// The bounds on the fixed share: the unperturbed run, solved as moving, fixes 98.7 % of the truth epochs
// (carrier-static-run.test.ts asks >= 90 % there). A slip, an outage or a code outlier restarts or disturbs
// one satellite's ambiguity among some twenty, whose others hold the fix: the same 90 % is asked. A bridge
// restarts nothing that the time-differenced test can span; a half-cycle arc is left float (one satellite).
// Half cycles never put right leave arcs that cannot be fixed for the rest of the run (and the test cannot
// see all of them low down): only no wrong fix is asked there.
const CASES: readonly Case[] = [
  { name: 'unperturbed', minFixedShare: 0.9, perturb: () => 'nothing changed' },
  { name: 'rover: unflagged slips (1, a few, 1000 cycles; LLI 0), 4 a minute', minFixedShare: 0.9, perturb: (r) => slips(r, 101, 4, 0) },
  { name: 'rover: 4 satellites slipping at once (unflagged), 10 times', minFixedShare: 0.9, perturb: (r) => slipsTogether(r, 111, 10, 4) },
  { name: 'rover: the same slips with the loss-of-lock bit', minFixedShare: 0.9, perturb: (r) => slips(r, 101, 4, 1) },
  { name: 'rover: satellites lost for 5 to 60 s, half of them back with a slip', minFixedShare: 0.9, perturb: (r) => outages(r, 202, 20) },
  { name: 'rover: every satellite lost for 3 to 10 s (a bridge), twice', minFixedShare: 0.9, perturb: (r) => `${bridge(r, 707, 400)}; ${bridge(r, 708, 900)}` },
  { name: 'rover: half-cycle slips with the half-cycle bit', minFixedShare: 0.9, perturb: (r) => halfCycles(r, 303, 40, true, true) },
  { name: 'rover: half-cycle slips without the bit, put right later', minFixedShare: 0.9, perturb: (r) => halfCycles(r, 404, 40, false, true) },
  { name: 'rover: half-cycle slips without the bit, never put right', minFixedShare: 0, perturb: (r) => halfCycles(r, 405, 10, false, false) },
  { name: 'rover: code multipath on one satellite at a time', minFixedShare: 0.9, perturb: (r) => multipath(r, 505, 30) },
  { name: 'base: unflagged slips, 4 a minute, and satellites lost for 5 to 60 s', minFixedShare: 0.9, perturb: (_r, b) => `${slips(b, 606, 4, 0)}; ${outages(b, 607, 10)}` },
  {
    name: 'rover: all of it at once (slips, outages, a bridge, half cycles put right, multipath)', minFixedShare: 0.85,
    perturb: (r) => [slips(r, 801, 2, 0), outages(r, 802, 10), bridge(r, 803, 600), halfCycles(r, 804, 10, false, true), multipath(r, 805, 15)].join('; '),
  },
];

describeShared('carrier-phase engine on the real static run with perturbations imitating a walk (dynamics kinematic; truth: rover-truth.csv quality 4)', () => {
  let nav: NavData;
  let truth = new Map<number, EcefM>();
  let roverText = '', baseText = '';
  beforeAll(async () => {
    nav = await corsNav();
    truth = roverTruth();
    roverText = readFileSync(dataPath(RUN + ROVER), 'latin1');
    baseText = readFileSync(dataPath(RUN + BASE), 'latin1');
  });

  for (const c of CASES) {
    it(`${c.name}: wrong fixes (> 0.10 m 3-D, or > 0.05 m horizontally) <= 0.5 % of the fixed each, fixed H95 <= 0.05 m, >= ${(100 * c.minFixedShare).toFixed(0)} % of the truth epochs fixed`, async () => {
      const rover = parseObsText(roverText), base = parseObsText(baseText);
      const what = c.perturb(rover, base);
      const { solutions, summary } = await solveTexts(formatObsText(rover), formatObsText(base), nav);
      const st = fixStats(solutions, truth, solutions[0].tagGpsS);
      console.log(`${c.name}: ${what}\n  ${fmt(st)}; arcs started ${JSON.stringify(summary.slips)}; ${summary.notes.filter((n) => /time-differenced|filter:/.test(n)).join(' | ')}${st.wrongAt.length ? '\n  wrong: ' + st.wrongAt.join('\n  wrong: ') : ''}`);
      expect(st.truthEpochs).toBeGreaterThan(1000);
      expect(st.wrong).toBeLessThanOrEqual(0.005 * st.fixed);
      expect(st.wrongH5cm).toBeLessThanOrEqual(0.005 * st.fixed);
      if (st.fixed > 0) expect(st.h95).toBeLessThanOrEqual(0.05);
      expect(st.fixed / st.truthEpochs).toBeGreaterThanOrEqual(c.minFixedShare);
    });
  }
});
