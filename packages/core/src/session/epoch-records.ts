/**
 * EpochSolution records: the one shape every epoch solver hands out (no solution, standalone, differential
 * code), each coordinate with its frame and epoch, each unused satellite with its reason.
 */
import type { EcefM, FrameEpoch, GnssSystem, ObsEpoch, SatId } from '../gnss/index.js';
import { SPEED_OF_LIGHT_MS } from '../gnss/index.js';
import { decimalYearFromGpsS } from '../time/index.js';
import { arpToMark, ecefDeltaToEnu, ecefToGeodetic } from '../geodesy/index.js';
import type { PositionFix, SatelliteResidual } from '../solve/index.js';
import type { EpochSolution, SolutionKind } from './solution-types.js';
import type { RoverState } from './rover-state.js';

/** What the records need from the session. */
export interface RecordContext {
  readonly rover: RoverState;
  readonly reduceToMark: boolean;
  readonly frame: FrameEpoch;
  readonly refMark: EcefM;
  readonly speed: RoverSpeed;
}

/** Rover speed over ground (m/s) from Doppler at a position; NaN without Doppler. */
export interface RoverSpeed {
  speedAt(e: ObsEpoch, arpM: EcefM): number;
}

export function noSolutionSatellite(sat: SatId, reason: string): SatelliteResidual {
  return { sat, signal: '', elevationDeg: NaN, azimuthDeg: NaN, residualM: NaN, weight: 0, wTest: NaN, used: false, reason };
}

export function noSolution(ctx: RecordContext, e: ObsEpoch, reason: string, satellites: SatelliteResidual[], ageS = NaN): EpochSolution {
  const clk = ctx.rover.lastClockM;
  return {
    tagGpsS: e.tagGpsS, timeGpsS: e.tagGpsS - (Number.isFinite(clk) ? clk / SPEED_OF_LIGHT_MS : 0),
    kind: 'none', reason, pointName: ctx.rover.pointName, position: null, geodetic: null,
    pointReference: ctx.reduceToMark ? 'ground-mark' : 'antenna-reference-point',
    baselineEcef: null, baselineEnu: null, relativeClockM: {}, satellitesUsed: 0, dops: null, sigmaEnuM: null,
    quality: null, correctionAgeS: ageS, satellites,
    speedMS: NaN, occupationEvent: ctx.rover.pendingEvent, antennaHeightM: ctx.rover.antenna.heightM,
  };
}

/** The broadcast orbits' frame at an epoch: standalone positions are in it, not in the reference's frame. */
export function broadcastFrame(tGpsS: number): FrameEpoch {
  return { name: 'WGS84 (broadcast orbits)', epochYear: Math.round(decimalYearFromGpsS(tGpsS) * 1e4) / 1e4 };
}

function qualityOf(fix: PositionFix): EpochSolution['quality'] {
  return { varianceFactor: fix.varianceFactor, chiSquare: fix.test.statistic, dof: fix.test.dof, critical: fix.test.critical, passed: fix.test.dof > 0 ? fix.test.passed : null };
}

/** Per constellation, the solved clock less `minusM` (the reference's clock: rover minus reference). */
function clocksOf(fix: PositionFix, minusM: number): Partial<Record<GnssSystem, number>> {
  const clocks: Partial<Record<GnssSystem, number>> = {};
  for (const [s, c] of fix.clocksM) clocks[s] = c - minusM;
  return clocks;
}

/** A standalone fix (the rover alone, broadcast orbits' frame). */
export function standaloneRecord(ctx: RecordContext, e: ObsEpoch, fix: PositionFix, reason: string, satellites: readonly SatelliteResidual[], ageS: number): EpochSolution {
  const arp = fix.positionM;
  const pos = ctx.reduceToMark ? arpToMark(arp, ctx.rover.antenna) : arp;
  return {
    tagGpsS: e.tagGpsS, timeGpsS: e.tagGpsS - (fix.clocksM.values().next().value ?? 0) / SPEED_OF_LIGHT_MS,
    kind: 'standalone', reason, pointName: ctx.rover.pointName,
    position: { ecef: pos, frame: broadcastFrame(e.tagGpsS) }, geodetic: ecefToGeodetic(pos),
    pointReference: ctx.reduceToMark ? 'ground-mark' : 'antenna-reference-point',
    // No reference: there is no relative clock to report.
    baselineEcef: null, baselineEnu: null, relativeClockM: {}, satellitesUsed: fix.used.length,
    dops: fix.dops, sigmaEnuM: fix.sigmaEnuM, quality: qualityOf(fix),
    correctionAgeS: ageS, satellites,
    speedMS: ctx.speed.speedAt(e, arp), occupationEvent: ctx.rover.pendingEvent, antennaHeightM: ctx.rover.antenna.heightM,
  };
}

/** A differential fix, with the baseline between like points (mark to mark, or ARP to ARP). */
export function differentialRecord(
  ctx: RecordContext, e: ObsEpoch, fix: PositionFix, kind: SolutionKind, refArp: EcefM, satellites: readonly SatelliteResidual[], ageS: number, speedMS: number,
  referenceClockM: number,
): EpochSolution {
  const arp = fix.positionM;
  const pos = ctx.reduceToMark ? arpToMark(arp, ctx.rover.antenna) : arp;
  const refPoint = ctx.reduceToMark ? ctx.refMark : refArp;
  const baselineEcef = { x: pos.x - refPoint.x, y: pos.y - refPoint.y, z: pos.z - refPoint.z };
  const gRef = ecefToGeodetic(ctx.refMark);
  const firstClock = fix.clocksM.values().next().value ?? 0;
  return {
    tagGpsS: e.tagGpsS, timeGpsS: e.tagGpsS - firstClock / SPEED_OF_LIGHT_MS,
    kind,
    reason: fix.test.dof > 0 && !fix.test.passed ? `global test failed after data snooping (${fix.test.statistic.toFixed(1)} > ${fix.test.critical.toFixed(1)})` : '',
    pointName: ctx.rover.pointName,
    position: { ecef: pos, frame: ctx.frame }, geodetic: ecefToGeodetic(pos),
    pointReference: ctx.reduceToMark ? 'ground-mark' : 'antenna-reference-point',
    baselineEcef, baselineEnu: ecefDeltaToEnu(baselineEcef, gRef.latRad, gRef.lonRad),
    relativeClockM: clocksOf(fix, Number.isFinite(referenceClockM) ? referenceClockM : 0), satellitesUsed: fix.used.length,
    dops: fix.dops, sigmaEnuM: fix.sigmaEnuM, quality: qualityOf(fix),
    correctionAgeS: ageS, satellites, speedMS,
    occupationEvent: ctx.rover.pendingEvent, antennaHeightM: ctx.rover.antenna.heightM,
  };
}
