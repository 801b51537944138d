/**
 * The code epoch solver: one rover epoch's single differences (raw or carrier-smoothed code) solved by
 * iterated weighted least squares for the baseline and one relative clock per constellation, with the
 * global test and data snooping (solve/position-fix.ts); a standalone fix instead when asked for and no
 * differential one is possible.
 */
import type { EcefM, ObsEpoch, ObsHeader, SatId, CodeValuesBySat } from '../gnss/index.js';
import { solvePositionFix, type FixOptions, type PositionFix, type Rejection, type RowOutcome, type SatelliteResidual } from '../solve/index.js';
import { SingleDifferenceEpoch, type DifferencingContext } from '../differencing/index.js';
import { solveStandaloneEpoch, type StandaloneContext } from '../standalone/index.js';
import type { EpochSolution, SolutionKind } from './solution-types.js';
import { differentialRecord, noSolution, noSolutionSatellite, standaloneRecord, type RecordContext } from './epoch-records.js';
import type { SessionTally } from './session-tally.js';
import type { CodeOffsetSurvey } from './code-offsets.js';

const DEG = Math.PI / 180;

export interface CodeSolverContext {
  readonly differencing: DifferencingContext;
  readonly records: RecordContext;
  readonly tally: SessionTally;
  readonly fixOptions: FixOptions;
  readonly maxPdop: number;
  readonly kind: SolutionKind;
  readonly roverHeader: ObsHeader;
  /** Null: no standalone fallback. */
  readonly standalone: StandaloneContext | null;
  /** Rover speed (m/s) from Doppler, reusing the satellites already computed. */
  readonly speed: { speedAt(e: ObsEpoch, arpM: EcefM, sd: SingleDifferenceEpoch): number };
  /** Samples the satellites' code offsets from the epochs' fixes (reported only). */
  readonly offsetSurvey?: CodeOffsetSurvey;
}

/** A standalone fix when allowed, else no solution, with the reason the differential one failed. */
export function standaloneOr(ctx: CodeSolverContext, e: ObsEpoch, reason: string, satellites: SatelliteResidual[], ageS: number): EpochSolution {
  if (!ctx.standalone) return noSolution(ctx.records, e, reason, satellites, ageS);
  const r = solveStandaloneEpoch(e, ctx.roverHeader, ctx.standalone, ctx.records.rover.lastPosition);
  if (!r.fix.ok) return noSolution(ctx.records, e, `${reason}; standalone failed too: ${r.fix.reason}`, [...r.satellites], ageS);
  return standaloneRecord(ctx.records, e, r.fix, reason, r.satellites, ageS);
}

/** Solves the single differences at `start` and, when the solved clock moved the Earth rotation, once more. */
export function fixSingleDifferences(sd: SingleDifferenceEpoch, start: EcefM, opts: FixOptions): PositionFix | ReturnType<typeof solvePositionFix> | null {
  const build = (x: EcefM, ex: ReadonlySet<SatId>) => sd.rowsAt(x, ex);
  let fix = sd.usable.length > 0 ? solvePositionFix(build, start, opts) : null;
  if (fix && fix.ok) {
    // The clock from the code at the start can be off when the start is far (first epoch of a long
    // baseline): with the solved clock, redo the satellites once.
    const solvedClockM = fix.clocksM.values().next().value ?? sd.clockUsedM;
    if (Math.abs(solvedClockM - sd.clockUsedM) > 30) {
      sd.recomputeSatellites(solvedClockM);
      fix = solvePositionFix(build, fix.positionM, opts);
    }
  }
  return fix;
}

/** The outcome of a satellite's row in a fix (the last listed), or undefined. */
function usedOf(used: readonly RowOutcome[], sat: SatId): RowOutcome | undefined {
  for (let i = used.length - 1; i >= 0; i--) if (used[i].row.sat === sat) return used[i];
  return undefined;
}

/** A satellite's rejection in a fix (the last listed), or undefined. */
function rejectionOf(rejected: readonly Rejection[], sat: SatId): Rejection | undefined {
  for (let i = rejected.length - 1; i >= 0; i--) if (rejected[i].sat === sat) return rejected[i];
  return undefined;
}

/** Every satellite of the epoch with its residual or the reason it was not used. */
function satelliteList(ctx: CodeSolverContext, e: ObsEpoch, sd: SingleDifferenceEpoch, fix: ReturnType<typeof solvePositionFix> | null): SatelliteResidual[] {
  // A dozen satellites: looked up by scanning (the last one listed wins, as in a Map), no Map per epoch.
  const used = fix && fix.ok ? fix.used : null;
  const rejected = fix ? fix.rejected : null;
  const out: SatelliteResidual[] = [];
  for (const s of e.sats) {
    const pre = sd.reasons.get(s.sat);
    const p = sd.preparedOf(s.sat);
    const geo = sd.geometry.get(s.sat);
    const u = used !== null ? usedOf(used, s.sat) : undefined;
    const rej = rejected !== null ? rejectionOf(rejected, s.sat) : undefined;
    const maskReason = sd.belowMask.has(s.sat) && geo ? `below elevation mask (${(geo.el / DEG).toFixed(1)} deg)`
      : sd.belowMaskRef.has(s.sat) && p ? `below elevation mask at the reference (${(p.elevationRefRad / DEG).toFixed(1)} deg)` : undefined;
    const reason = pre?.reason ?? maskReason ?? rej?.reason ?? (u ? '' : fix && !fix.ok ? `no solution (${fix.reason})` : 'not used');
    if (!u) ctx.tally.satRejections.add(reason);
    out.push({
      sat: s.sat, signal: p?.code ?? pre?.signal ?? '',
      elevationDeg: geo ? geo.el / DEG : NaN, azimuthDeg: geo ? geo.az / DEG : NaN,
      residualM: u ? u.residualM : NaN, weight: u ? 1 / u.row.varianceM2 : 0,
      wTest: u ? u.wTest : rej ? rej.wTest : NaN, used: u !== undefined, reason,
    });
  }
  return out;
}

/** One rover epoch solved from its single differences. */
export function solveCodeEpoch(
  ctx: CodeSolverContext, e: ObsEpoch, smoothed: CodeValuesBySat | undefined,
  smoothedFactors: CodeValuesBySat | undefined, refArp: EcefM,
): EpochSolution {
  const d = ctx.differencing;
  const nearestS = d.corrections.nearestEpochS(e.tagGpsS);
  if (nearestS > d.maxAgeS + 1) {
    ctx.tally.withoutCorrections++;
    const why = Number.isFinite(nearestS)
      ? `no reference epoch within the correction age limit (nearest ${Math.round(nearestS)} s, limit ${d.maxAgeS} s)`
      : 'no reference epoch within the correction age limit (none read near this time)';
    const sats = e.sats.map((x) => noSolutionSatellite(x.sat, why));
    for (const x of sats) ctx.tally.satRejections.add(x.reason);
    return standaloneOr(ctx, e, why, sats, NaN);
  }
  ctx.tally.epochsInReach++;
  const rover = ctx.records.rover;
  const start = rover.lastPosition ?? ctx.roverHeader.approxPosition ?? refArp;
  const sd = new SingleDifferenceEpoch(e, d, smoothed, smoothedFactors, start, rover.lastClockM);
  const fix = fixSingleDifferences(sd, start, ctx.fixOptions);
  if (fix) ctx.offsetSurvey?.learnSatellites(e.tagGpsS, fix);
  const satellites = satelliteList(ctx, e, sd, fix);
  if (sd.usable.length === 0) {
    return standaloneOr(ctx, e, sd.prepared.length === 0 ? 'no usable satellite (see the satellite reasons)' : 'no satellite with a reference correction (see the satellite reasons)', satellites, NaN);
  }
  if (!fix || !fix.ok) return standaloneOr(ctx, e, `no differential solution (${fix ? fix.reason : 'no satellites'})`, satellites, sd.maxAgeS);
  if (fix.dops && fix.dops.pdop > ctx.maxPdop) {
    const why = `PDOP above the limit (${fix.dops.pdop.toFixed(1)} > ${ctx.maxPdop})`;
    const unused = satellites.map((x) => (x.used ? { ...x, used: false, weight: 0, reason: `epoch rejected: ${why}` } : x));
    for (const x of satellites) if (x.used) ctx.tally.satRejections.add(`epoch rejected: ${why}`);
    return standaloneOr(ctx, e, why, unused, sd.maxAgeS);
  }
  rover.lastPosition = fix.positionM;
  rover.lastClockM = fix.clocksM.values().next().value ?? sd.codeClockM;
  for (const s of fix.clocksM.keys()) ctx.tally.systemsUsed.add(s);
  return differentialRecord(ctx.records, e, fix, ctx.kind, refArp, satellites, sd.maxAgeS, ctx.speed.speedAt(e, fix.positionM, sd), sd.referenceClockM);
}
