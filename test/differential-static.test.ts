/**
 * Acceptance of the differential engine on real data: the static run of cors-and-rover-2018-277
 * (../shared/data, README there). Truth: the rover's own carrier-phase fixed solution (quality 4),
 * centimetre-level relative to the base's header coordinate. Bounds are the engine's
 * accuracy targets; the figures are printed so they can be quoted.
 */
import { beforeAll, expect, it } from 'vitest';
import { ecefToEnu } from '../packages/core/src/geodesy/index.js';
import { solveSession, withDefaults, type EpochSolution, type SessionOptions, type SessionSummary } from '../packages/core/src/session/index.js';
import type { NavData } from '../packages/core/src/gnss/nav-types.js';
import { describeShared } from './support/shared.js';
import { corsNav, errorStats, fmt, openObs, roverTruth } from './support/static-run.js';

async function solve(rover: string, references: string[], nav: NavData, opts: Partial<SessionOptions>): Promise<{ solutions: EpochSolution[]; notes: readonly string[]; codeOffsets: SessionSummary['codeOffsets'] }> {
  const reopen = async () => ({ rover: await openObs(rover), references: await Promise.all(references.map(openObs)) });
  const run = await solveSession({ rover: await openObs(rover), references: await Promise.all(references.map(openObs)), nav, reopen }, withDefaults(opts));
  const solutions: EpochSolution[] = [];
  for await (const s of run.epochs) solutions.push(s);
  return { solutions, notes: run.summary().notes, codeOffsets: run.summary().codeOffsets };
}

const BASE = 'static-run/base.obs';
const ROVER = 'static-run/rover.obs';
const CORS = ['reference/glw1277m.18o', 'reference/glw1277n.18o'];
const smooth = { smoothing: { enabled: true, timeConstantS: 100, maxGapS: 30 } };

describeShared('differential engine on the real static run (cors-and-rover-2018-277)', () => {
  let nav: NavData;
  let truth = new Map<number, { x: number; y: number; z: number }>();
  const truthAt = (s: EpochSolution) => truth.get(Math.round(s.timeGpsS));
  beforeAll(async () => { nav = await corsNav(); truth = roverTruth(); });

  it('rover against base, default options (code): median <= 0.9 m, 95 % <= 2.0 m, vertical 95 % <= 4.0 m, >= 95 % solved; not worse than GPS alone', async () => {
    const { solutions, codeOffsets } = await solve(ROVER, [BASE], nav, {});
    const st = errorStats(solutions, truthAt);
    const gps = errorStats((await solve(ROVER, [BASE], nav, { systems: ['G'] })).solutions, truthAt);
    console.log(`rover vs base, code: ${fmt(st)}`);
    console.log(`rover vs base, code, GPS alone: ${fmt(gps)}`);
    expect(st.compared).toBeGreaterThan(1000);
    expect(st.solved / st.epochs).toBeGreaterThanOrEqual(0.95);
    expect(st.h50).toBeLessThanOrEqual(0.9);
    expect(st.h95).toBeLessThanOrEqual(2.0);
    expect(st.v95).toBeLessThanOrEqual(4.0);
    expect(st.h50).toBeLessThanOrEqual(1.05 * gps.h50);
    // GLONASS channel offsets, learnt over the whole session, reported with their precision.
    const channels = codeOffsets.filter((c) => c.key.startsWith('R channel'));
    expect(channels.length).toBeGreaterThanOrEqual(6);
    expect(channels.every((c) => c.applied && c.sigmaM > 0 && c.sigmaM < 1.5)).toBe(true);
  });

  it('rover against base, carrier-smoothed forwards and backwards (100 s, the default time constant): horizontal 95 % <= 1.0 m', async () => {
    const { solutions } = await solve(ROVER, [BASE], nav, smooth);
    const st = errorStats(solutions, truthAt);
    console.log(`rover vs base, smoothed: ${fmt(st)}`);
    expect(solutions.every((s) => s.kind === 'smoothed' || s.kind === 'none')).toBe(true);
    expect(st.h95).toBeLessThanOrEqual(1.0);
  });

  it('rover against the CORS (196 m), mean offset removed: 95 % <= 2.0 m code, <= 1.3 m smoothed; closure within 0.5 m', async () => {
    const code = await solve(ROVER, CORS, nav, {});
    const sm = await solve(ROVER, CORS, nav, smooth);
    const stCode = errorStats(code.solutions, truthAt);
    const stSmooth = errorStats(sm.solutions, truthAt);
    console.log(`rover vs CORS, code: ${fmt(stCode)}`);
    console.log(`rover vs CORS, smoothed: ${fmt(stSmooth)}`);
    console.log(`notes: ${code.notes.join(' | ')}`);
    expect(stCode.solved / stCode.epochs).toBeGreaterThanOrEqual(0.95);
    expect(stCode.h95Demeaned).toBeLessThanOrEqual(2.0);
    expect(stSmooth.h95Demeaned).toBeLessThanOrEqual(1.3);
    // Closure: mean(rover vs CORS) - mean(rover vs base) must equal mean(base vs CORS), the base
    // coordinate's own error, so constant biases cannot hide behind the mean removal.
    const rb = errorStats((await solve(ROVER, [BASE], nav, {})).solutions, truthAt);
    const baseCors = await solve(BASE, CORS, nav, {});
    const baseHeader = (await openObs(BASE)).header.approxPosition!;
    const bc = errorStats(baseCors.solutions, () => baseHeader);
    const dE = stCode.meanEnu[0] - rb.meanEnu[0] - bc.meanEnu[0];
    const dN = stCode.meanEnu[1] - rb.meanEnu[1] - bc.meanEnu[1];
    console.log(`base vs CORS: mean offset E/N/U ${bc.meanEnu.map((x) => x.toFixed(2)).join('/')} m (the base header coordinate's own error); closure ${Math.hypot(dE, dN).toFixed(2)} m horizontal`);
    expect(Math.hypot(dE, dN)).toBeLessThanOrEqual(0.5);
    // The base coordinate is good to a few metres only (README): the offset found must be metres, not tens.
    expect(Math.hypot(bc.meanEnu[0], bc.meanEnu[1])).toBeLessThan(5);
  });

  it('every rover epoch is reported: solved or with a reason', async () => {
    const { solutions } = await solve(ROVER, [BASE], nav, {});
    const rover = await openObs(ROVER);
    let n = 0;
    for await (const e of rover.epochs) if ((e.flag === 0 || e.flag === 1) && e.sats.length > 0) n++;
    expect(solutions.length).toBe(n);
    for (const s of solutions) if (s.kind === 'none') expect(s.reason).not.toBe('');
    for (const s of solutions) for (const sat of s.satellites) if (!sat.used) expect(sat.reason).not.toBe('');
    // ENU baseline is consistent with the ECEF one (geodesy check at the reference).
    const s = solutions.find((x) => x.baselineEcef)!;
    const ref = (await openObs(BASE)).header.approxPosition!;
    const enu = ecefToEnu({ x: ref.x + s.baselineEcef!.x, y: ref.y + s.baselineEcef!.y, z: ref.z + s.baselineEcef!.z }, ref);
    expect(enu.e).toBeCloseTo(s.baselineEnu!.e, 6);
  });
});
