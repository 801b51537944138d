/**
 * A single-receiver session: every rover epoch solved on its own (standalone-epoch.ts: broadcast orbits
 * and clocks, Klobuchar or the ionosphere-free combination, Saastamoinen/Niell), with no reference
 * receiver. Positions are in the frame of the broadcast orbits ('WGS84 (broadcast orbits)' at the epoch
 * of observation: the GPS ICD defines the broadcast ephemerides in WGS 84, IS-GPS-200 20.3.3.4.3) and
 * every solution says so; its accuracy is that of standalone positioning (metres), not of differences.
 * Occupation events (flags 2 and 3) and antenna records are followed as in a differential session.
 */
import type { EcefM, FrameEpoch, GnssSystem } from '../gnss/index.js';
import { SYSTEM_NAMES } from '../gnss/index.js';
import type { AntennaOffset, ObsStream } from '../gnss/index.js';
import type { NavData } from '../gnss/index.js';
import { ProcessingError, type WarningSink } from '../errors.js';
import { EphemerisStore, SPEED_OF_LIGHT_MS } from '../orbit/index.js';
import { ecefToGeodetic, enuToEcefDelta } from '../geodesy/index.js';
import { decimalYearFromGpsS } from '../time/index.js';
import { dopplerVelocity } from '../velocity/index.js';
import type { ElevationWeightParams } from '../solve/index.js';
import type { SessionOptions } from '../session/options.js';
import type { EpochSolution, SessionSummary, SolutionKind } from '../session/solution-types.js';
import { solveStandaloneEpoch, type StandaloneContext } from './standalone-epoch.js';

const DEG = Math.PI / 180;

/** The ground mark below an antenna reference point: ARP minus ANTENNA: DELTA H/E/N in the local frame (as the differential session). */
function markBelow(arp: EcefM, offset: AntennaOffset): EcefM {
  const g = ecefToGeodetic(arp);
  const d = enuToEcefDelta({ e: offset.eastM, n: offset.northM, u: offset.heightM }, g.latRad, g.lonRad);
  return { x: arp.x - d.x, y: arp.y - d.y, z: arp.z - d.z };
}

/** The frame label of standalone positions at an instant (decimal year to 1e-4, about an hour). */
export function broadcastOrbitFrame(tGpsS: number): FrameEpoch {
  return { name: 'WGS84 (broadcast orbits)', epochYear: Math.round(decimalYearFromGpsS(tGpsS) * 1e4) / 1e4 };
}

export interface StandaloneSessionInputs {
  readonly rover: ObsStream;
  readonly nav: NavData;
  readonly onWarning?: WarningSink;
}

export interface StandaloneSessionRun {
  readonly epochs: AsyncIterable<EpochSolution>;
  /** Valid once `epochs` has been consumed; referencePosition is the first position (there is no reference). */
  summary(): SessionSummary;
}

/** Options used: systems, elevation mask, weighting, quality, reduceToMark, roverAntenna. */
export function solveStandaloneSession(inputs: StandaloneSessionInputs, options: Omit<SessionOptions, 'reference'>): StandaloneSessionRun {
  const warn: WarningSink = inputs.onWarning ?? (() => undefined);
  const store = new EphemerisStore(inputs.nav);
  if (store.satellites().length === 0) throw new ProcessingError('the navigation files hold no usable ephemeris');
  const rover = inputs.rover;
  const navSystems = store.systemsWithEphemeris();
  const systems = options.systems.filter((s) => navSystems.has(s));
  if (systems.length === 0) throw new ProcessingError(`no navigation data for the constellations asked for (${options.systems.map((s) => SYSTEM_NAMES[s]).join(', ')})`);
  const notes: string[] = ['single-receiver (standalone) positions: no reference receiver; positions in the frame of the broadcast orbits, metre-level accuracy'];
  for (const s of options.systems) if (!navSystems.has(s)) notes.push(`${SYSTEM_NAMES[s]} not used: no ephemeris in the navigation files`);
  const glonassChannels = new Map<number, number>(store.glonassChannels());
  for (const [slot, k] of rover.header.glonassChannels) glonassChannels.set(slot, k);
  const weighting: ElevationWeightParams = {
    aM: options.weighting.aM, bM: options.weighting.bM, minElevationRad: 5 * DEG,
    ...(options.weighting.useStrength ? { referenceCn0DbHz: 45 } : {}),
  };
  const maskRad = options.elevationMaskDeg * DEG;
  const ctx: StandaloneContext = { store, iono: inputs.nav.ionosphere, systems, elevationMaskRad: maskRad, weighting, frequencyMode: 'auto', glonassChannels };
  const reference: PointRef = options.reduceToMark ? 'ground-mark' : 'antenna-reference-point';
  let roverAntenna: AntennaOffset = options.roverAntenna ?? rover.header.antennaOffset;
  let pointName = rover.header.markerName.trim();
  let pendingEvent: 'new-occupation' | 'start-moving' | null = null;
  const byKind: Record<SolutionKind, number> = { differential: 0, smoothed: 0, standalone: 0, fixed: 0, float: 0, none: 0 };
  const rejections = new Map<string, number>();
  const used = new Set<GnssSystem>();
  let epochs = 0, firstGpsS = NaN, lastGpsS = NaN;
  let last: EcefM | null = null;
  let firstPosition: EcefM | null = null;

  async function* run(): AsyncIterable<EpochSolution> {
    for await (const e of rover.epochs) {
      if (e.event) {
        const ev = e.event;
        if (ev.kind === 'new-occupation') { pointName = (ev.markerName ?? '').trim() || pointName; pendingEvent = 'new-occupation'; }
        if (ev.kind === 'start-moving') { pointName = ''; pendingEvent = 'start-moving'; }
        if (ev.antennaOffset && !options.roverAntenna) roverAntenna = ev.antennaOffset;
      }
      if (e.flag !== 0 && e.flag !== 1) continue;
      if (e.sats.length === 0 && e.event) continue;
      epochs++;
      if (Number.isNaN(firstGpsS)) firstGpsS = e.tagGpsS;
      lastGpsS = e.tagGpsS;
      let sol: EpochSolution;
      const base = {
        tagGpsS: e.tagGpsS, pointName, pointReference: reference, baselineEcef: null, baselineEnu: null,
        correctionAgeS: NaN, occupationEvent: pendingEvent, antennaHeightM: roverAntenna.heightM,
      } as const;
      let r;
      try {
        r = e.sats.length === 0 ? null : solveStandaloneEpoch(e, rover.header, ctx, last);
      } catch (err) {
        const msg = err instanceof Error ? err.message : String(err);
        warn({ file: rover.file, line: e.line, code: 'epoch-failed', message: `epoch at line ${e.line} could not be solved: ${msg}` });
        r = null;
      }
      if (!r || !r.fix.ok) {
        const reason = !r ? 'no satellites in the epoch' : r.fix.ok ? '' : `no standalone solution (${r.fix.reason})`;
        sol = { ...base, timeGpsS: e.tagGpsS, kind: 'none', reason, position: null, geodetic: null, relativeClockM: {}, satellitesUsed: 0, dops: null, sigmaEnuM: null, quality: null, satellites: r ? [...r.satellites] : [], speedMS: NaN };
        rejections.set(reason, (rejections.get(reason) ?? 0) + 1);
      } else {
        const arp = r.fix.positionM;
        last = arp;
        const pos = options.reduceToMark ? markBelow(arp, roverAntenna) : arp;
        firstPosition ??= pos;
        const clocks: Partial<Record<GnssSystem, number>> = {};
        for (const [s, c] of r.fix.clocksM) { clocks[s] = c; used.add(s); }
        const v = dopplerVelocity(e, arp, store, { systems, elevationMaskRad: maskRad, glonassChannels });
        sol = {
          ...base, timeGpsS: e.tagGpsS - (r.fix.clocksM.values().next().value ?? 0) / SPEED_OF_LIGHT_MS,
          kind: 'standalone', reason: '', position: { ecef: pos, frame: broadcastOrbitFrame(e.tagGpsS) }, geodetic: ecefToGeodetic(pos),
          relativeClockM: clocks, satellitesUsed: r.fix.used.length, dops: r.fix.dops, sigmaEnuM: r.fix.sigmaEnuM,
          quality: { varianceFactor: r.fix.varianceFactor, chiSquare: r.fix.test.statistic, dof: r.fix.test.dof, critical: r.fix.test.critical, passed: r.fix.test.dof > 0 ? r.fix.test.passed : null },
          satellites: r.satellites, speedMS: v ? v.speedMS : NaN,
        };
      }
      pendingEvent = null;
      byKind[sol.kind]++;
      yield sol;
    }
  }

  return {
    epochs: run(),
    summary: (): SessionSummary => {
      const frame = broadcastOrbitFrame(Number.isNaN(firstGpsS) ? 0 : (firstGpsS + lastGpsS) / 2);
      return {
        frame,
        referencePosition: { ecef: firstPosition ?? { x: 0, y: 0, z: 0 }, frame },
        referencePositionSource: 'none: single-receiver (standalone) session',
        epochsRover: epochs, epochsByKind: { ...byKind }, epochsWithoutCorrections: 0,
        satelliteRejections: [], epochRejections: [...rejections.entries()].map(([reason, count]) => ({ reason, count })).sort((a, b) => b.count - a.count),
        systemsUsed: [...used], notes, firstGpsS, lastGpsS, codeOffsets: [], passes: 1,
      };
    },
  };
}

type PointRef = 'ground-mark' | 'antenna-reference-point';
