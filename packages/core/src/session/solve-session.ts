/**
 * A differential session: the rover's epochs solved against one or more reference files, in one pass,
 * with bounded memory (reference epochs are kept only while a rover epoch can still use them).
 *
 * Data flow per rover epoch: read -> time-align (rover clock estimated from its own code, reference
 * epochs on their estimated GPS time) -> model (orbits, clocks, atmosphere) -> difference (reference
 * corrections, differencing/reference-corrections.ts) -> solve (positioning/position-fix.ts: WLS for the
 * baseline and one relative clock per constellation, global test, data snooping) -> report (EpochSolution).
 */
import type { EcefM, FrameEpoch, FramedEcef, GnssSystem, SatId } from '../gnss/types.js';
import { satSystem, SYSTEM_NAMES } from '../gnss/types.js';
import type { AntennaOffset, ObsEpoch, ObsHeader, ObsStream } from '../gnss/obs-types.js';
import type { Ephemeris, NavData } from '../gnss/nav-types.js';
import { carrierFrequencyHz } from '../gnss/obs-codes.js';
import { ProcessingError, type WarningSink } from '../errors.js';
import { EphemerisStore, SPEED_OF_LIGHT_MS, type SatelliteAtTransmission } from '../orbit/index.js';
import { satelliteForTag } from '../observables/satellite-for-tag.js';
import { azimuthElevation, ecefDeltaToEnu, ecefToGeodetic, enuToEcefDelta } from '../geodesy/index.js';
import { decimalYearFromGpsS, isoFromSeconds } from '../time/index.js';
import { elevationVarianceM2, type ElevationWeightParams } from '../solve/index.js';
import { solvePositionFix, type LinearRow } from '../solve/position-fix.js';
import { clockSignal } from '../observables/signals.js';
import { signalStrengthDbHz } from '../observables/signal-strength.js';
import { dayOfYear, ionosphereDelayM, troposphereDelayM } from '../observables/atmosphere-model.js';
import { ReferenceCorrections } from '../differencing/reference-corrections.js';
import { GlonassChannelOffsets } from '../differencing/glonass-channel-offsets.js';
import { matchCode, primaryCodes, pseudorangeOf } from '../observables/code-selection.js';
import { solveStandaloneEpoch, type StandaloneContext } from '../standalone/index.js';
import { dopplerVelocity } from '../velocity/index.js';
import { joinReferenceStreams } from './join-references.js';
import { ReceiverSmoother } from './smoothing-stage.js';
import type { SessionOptions } from './options.js';
import type { EpochSolution, RejectionCount, SatelliteResidual, SessionSummary, SolutionKind } from './solution-types.js';

export interface SessionInputs {
  readonly rover: ObsStream;
  readonly references: readonly ObsStream[];
  readonly nav: NavData;
  readonly onWarning?: WarningSink;
}

export interface SessionRun {
  readonly epochs: AsyncIterable<EpochSolution>;
  /** Valid once `epochs` has been consumed. */
  summary(): SessionSummary;
}

const DEG = Math.PI / 180;

function isKnownReceiver(t: string): boolean {
  const s = t.trim().toLowerCase();
  return s !== '' && s !== 'unknown' && s !== 'unk';
}

/** Position of the antenna reference point from a ground mark and ANTENNA: DELTA H/E/N. */
export function markToArp(mark: EcefM, offset: AntennaOffset): EcefM {
  const g = ecefToGeodetic(mark);
  const d = enuToEcefDelta({ e: offset.eastM, n: offset.northM, u: offset.heightM }, g.latRad, g.lonRad);
  return { x: mark.x + d.x, y: mark.y + d.y, z: mark.z + d.z };
}

export function arpToMark(arp: EcefM, offset: AntennaOffset): EcefM {
  const g = ecefToGeodetic(arp);
  const d = enuToEcefDelta({ e: offset.eastM, n: offset.northM, u: offset.heightM }, g.latRad, g.lonRad);
  return { x: arp.x - d.x, y: arp.y - d.y, z: arp.z - d.z };
}

/** Reason text without its numbers, for counting ('below elevation mask (7.1 deg)' -> 'below elevation mask'). */
export function reasonKey(reason: string): string {
  return reason.replace(/\s*\(.*\)\s*$/, '').trim();
}

class Counter {
  private readonly m = new Map<string, number>();
  private readonly keys = new Map<string, string>();
  add(reason: string): void {
    let k = this.keys.get(reason);
    if (k === undefined) {
      k = reasonKey(reason);
      if (this.keys.size < 10_000) this.keys.set(reason, k);
    }
    this.m.set(k, (this.m.get(k) ?? 0) + 1);
  }
  list(): RejectionCount[] {
    return [...this.m].map(([reason, count]) => ({ reason, count })).sort((a, b) => b.count - a.count);
  }
}

function median(v: number[]): number {
  if (v.length === 0) return NaN;
  const s = [...v].sort((a, b) => a - b);
  const m = s.length >> 1;
  return s.length % 2 ? s[m] : 0.5 * (s[m - 1] + s[m]);
}


export async function solveSession(inputs: SessionInputs, options: SessionOptions): Promise<SessionRun> {
  const warn: WarningSink = inputs.onWarning ?? (() => undefined);
  if (inputs.references.length === 0) throw new ProcessingError('no reference observation file was given');
  const store = new EphemerisStore(inputs.nav);
  if (store.satellites().length === 0) throw new ProcessingError('the navigation files hold no usable ephemeris');
  const rover = inputs.rover;
  const refHeader = inputs.references[0].header;
  const notes: string[] = [];

  // Which constellations: the user's choice, limited by the navigation data and the GLONASS policy.
  const navSystems = store.systemsWithEphemeris();
  let systems = options.systems.filter((s) => navSystems.has(s));
  let channelOffsets: GlonassChannelOffsets | null = null;
  const sameReceiver = isKnownReceiver(rover.header.receiverType) &&
    inputs.references.every((r) => r.header.receiverType.trim() === rover.header.receiverType.trim());
  if (systems.includes('R')) {
    if (options.glonass === 'exclude') {
      systems = systems.filter((s) => s !== 'R');
      notes.push('GLONASS excluded by option');
    } else if (options.glonass === 'estimate' || (options.glonass === 'auto' && !sameReceiver)) {
      channelOffsets = new GlonassChannelOffsets();
      notes.push(`GLONASS used with per-channel code offsets estimated from the data: the receivers are not known to match (rover '${rover.header.receiverType.trim() || 'unknown'}', reference '${refHeader.receiverType.trim() || 'unknown'}'), so inter-frequency code biases do not cancel`);
    } else {
      notes.push(sameReceiver ? `GLONASS used: both receivers report type '${rover.header.receiverType.trim()}', so inter-frequency code biases cancel` : 'GLONASS used by option (inter-frequency biases are assumed to cancel)');
    }
  }
  for (const s of options.systems) if (!navSystems.has(s)) notes.push(`${SYSTEM_NAMES[s]} not used: no ephemeris in the navigation files`);
  if (systems.length === 0) throw new ProcessingError(`no navigation data for the constellations asked for (${options.systems.map((s) => SYSTEM_NAMES[s]).join(', ')})`);

  // Reference coordinate and frame.
  let refMark: EcefM;
  let frame: FrameEpoch;
  let refSource: string;
  if (options.reference.position) {
    refMark = options.reference.position.ecef;
    frame = options.reference.position.frame;
    refSource = options.reference.source ?? 'given by the user';
  } else {
    if (!refHeader.approxPosition) throw new ProcessingError(`${inputs.references[0].file}: no reference coordinate given and the file header has no APPROX POSITION XYZ`);
    refMark = refHeader.approxPosition;
    const firstS = rover.header.firstObsGpsS ?? refHeader.firstObsGpsS;
    frame = { name: 'unstated', epochYear: firstS !== null ? Math.round(decimalYearFromGpsS(firstS) * 100) / 100 : NaN };
    refSource = `APPROX POSITION XYZ of ${inputs.references[0].file}`;
    const msg = `reference coordinate taken from the header of ${inputs.references[0].file}: header coordinates can be approximate, and its frame is not stated`;
    notes.push(msg);
    warn({ file: inputs.references[0].file, code: 'header-reference-coordinate', message: msg });
  }
  let refAntenna: AntennaOffset = options.reference.antenna ?? refHeader.antennaOffset;
  let refArp = markToArp(refMark, refAntenna);
  let roverAntenna: AntennaOffset = options.roverAntenna ?? rover.header.antennaOffset;
  let pointName = rover.header.markerName.trim();
  let pendingEvent: 'new-occupation' | 'start-moving' | null = null;

  // Frequency channels: rover header, reference header, then the GLONASS navigation records.
  const glonassChannels = new Map<number, number>(store.glonassChannels());
  for (const h of [refHeader, rover.header]) for (const [slot, k] of h.glonassChannels) glonassChannels.set(slot, k);

  const weighting: ElevationWeightParams = {
    aM: options.weighting.aM,
    bM: options.weighting.bM,
    minElevationRad: 5 * DEG,
    ...(options.weighting.useStrength ? { referenceCn0DbHz: 45 } : {}),
  };
  const maskRad = options.elevationMaskDeg * DEG;
  /** One receiver's code variance: elevation model, times the signal-strength factor when enabled (solve/weights.ts). */
  const codeVarianceM2 = (elRad: number, cn0: number): number => elevationVarianceM2(elRad, weighting, cn0);
  const maxAgeS = options.maxCorrectionAgeS;
  const corrections = new ReferenceCorrections({ store, iono: inputs.nav.ionosphere, systems, glonassChannels });
  const smoothOn = options.smoothing.enabled;
  const roverSmoother = smoothOn ? new ReceiverSmoother(rover.header.intervalS ?? 1, options.smoothing.timeConstantS, systems, glonassChannels, options.smoothing.maxGapS) : null;
  const refSmoother = smoothOn ? new ReceiverSmoother(refHeader.intervalS ?? 1, options.smoothing.timeConstantS, systems, glonassChannels, options.smoothing.maxGapS) : null;
  const standaloneCtx: StandaloneContext = {
    store, iono: inputs.nav.ionosphere, systems: options.systems.filter((s) => navSystems.has(s)), elevationMaskRad: maskRad,
    weighting, frequencyMode: 'auto', glonassChannels,
  };
  const fixOptions = {
    maxIterations: 12, convergenceM: 1e-4,
    alphaGlobal: options.quality.alphaGlobal, alphaLocal: options.quality.alphaLocal,
    minSatellites: options.quality.minSatellites, maxRejections: options.quality.maxRejections,
  };

  const satRejections = new Counter();
  const epochRejections = new Counter();
  const byKind: Record<SolutionKind, number> = { differential: 0, smoothed: 0, standalone: 0, none: 0 };
  let roverEpochs = 0;
  let withoutCorrections = 0;
  let epochsInReach = 0;
  let firstGpsS = NaN, lastGpsS = NaN;
  let refFirst = NaN, refLast = NaN;
  const systemsUsed = new Set<GnssSystem>();

  const refIter = joinReferenceStreams(inputs.references)[Symbol.asyncIterator]();
  let refDone = false;
  const lookaheadS = Math.min(maxAgeS, 35);
  let currentRefHeader: ObsHeader = refHeader;
  async function pullReference(untilGpsS: number): Promise<void> {
    while (!refDone && corrections.latestTimeGpsS <= untilGpsS) {
      const r = await refIter.next();
      if (r.done) { refDone = true; break; }
      const e = r.value.epoch;
      if (r.value.header !== currentRefHeader) {
        // The next reference file: its own antenna record applies from its first epoch.
        const h = r.value.header;
        if (h.markerName.trim() && refHeader.markerName.trim() && h.markerName.trim() !== refHeader.markerName.trim()) {
          warn({ file: r.value.file, code: 'reference-station-changed', message: `reference file ${r.value.file} is of marker '${h.markerName.trim()}', the first of '${refHeader.markerName.trim()}': all reference files must be of one station` });
        }
        const a = h.antennaOffset, b = refAntenna;
        if (!options.reference.antenna && (a.heightM !== b.heightM || a.eastM !== b.eastM || a.northM !== b.northM)) {
          refAntenna = a;
          refArp = markToArp(refMark, refAntenna);
          notes.push(`reference antenna height ${refAntenna.heightM} m from ${r.value.file}`);
        }
        currentRefHeader = h;
      }
      if (e.event) {
        if (e.event.kind === 'new-occupation' || e.event.kind === 'start-moving') {
          throw new ProcessingError(`${r.value.file}:${e.line}: the reference receiver ${e.event.kind === 'start-moving' ? 'starts moving' : 'moves to a new site'} (epoch flag ${e.flag}); a reference must stay on its known point`);
        }
        if (e.event.antennaOffset && !options.reference.antenna) {
          refAntenna = e.event.antennaOffset;
          refArp = markToArp(refMark, refAntenna);
          notes.push(`reference antenna height changed to ${refAntenna.heightM} m at ${isoFromSeconds(e.tagGpsS, ' GPST')} (${r.value.file}:${e.line})`);
        }
        if (e.flag === 1) refSmoother?.reset();
        if (e.sats.length === 0) continue;
      }
      if (e.flag > 1) continue;
      if (Number.isNaN(refFirst)) refFirst = e.tagGpsS;
      refLast = e.tagGpsS;
      const smoothed = refSmoother?.update(e);
      corrections.addEpoch(e, refArp, smoothed);
      // Bounded memory: nothing older than the age limit before the rover's time is kept.
      corrections.prune(untilGpsS - lookaheadS, maxAgeS + 2);
    }
  }

  let lastPosition: EcefM | null = null;
  let lastClockM = NaN;

  const frameOfResult: FrameEpoch = frame;
  const broadcastFrame = (t: number): FrameEpoch => ({ name: 'WGS84 (broadcast orbits)', epochYear: Math.round(decimalYearFromGpsS(t) * 1e4) / 1e4 });

  /** Horizontal speed from the epoch's Doppler observations at the solved position (NaN without Doppler). */
  function speedAt(e: ObsEpoch, at: EcefM, satellites?: ReadonlyMap<SatId, SatelliteAtTransmission>): number {
    const v = dopplerVelocity(e, at, store, { systems, elevationMaskRad: maskRad, glonassChannels, ...(satellites ? { satellites } : {}) });
    return v ? v.speedMS : NaN;
  }

  function noSolutionSatellite(sat: SatId, reason: string): SatelliteResidual {
    return { sat, signal: '', elevationDeg: NaN, azimuthDeg: NaN, residualM: NaN, weight: 0, wTest: NaN, used: false, reason };
  }

  function none(e: ObsEpoch, reason: string, satellites: SatelliteResidual[], ageS = NaN): EpochSolution {
    return {
      tagGpsS: e.tagGpsS, timeGpsS: e.tagGpsS - (Number.isFinite(lastClockM) ? lastClockM / SPEED_OF_LIGHT_MS : 0),
      kind: 'none', reason, pointName, position: null, geodetic: null,
      pointReference: options.reduceToMark ? 'ground-mark' : 'antenna-reference-point',
      baselineEcef: null, baselineEnu: null, relativeClockM: {}, satellitesUsed: 0, dops: null, sigmaEnuM: null,
      quality: null, correctionAgeS: ageS, satellites,
      speedMS: NaN, occupationEvent: pendingEvent, antennaHeightM: roverAntenna.heightM,
    };
  }

  function standaloneOr(e: ObsEpoch, reason: string, satellites: SatelliteResidual[], ageS: number): EpochSolution {
    if (!options.standaloneFallback) return none(e, reason, satellites, ageS);
    const r = solveStandaloneEpoch(e, rover.header, standaloneCtx, lastPosition);
    if (!r.fix.ok) return none(e, `${reason}; standalone failed too: ${r.fix.reason}`, [...r.satellites], ageS);
    const arp = r.fix.positionM;
    const pos = options.reduceToMark ? arpToMark(arp, roverAntenna) : arp;
    const g = ecefToGeodetic(pos);
    const clocks: Partial<Record<GnssSystem, number>> = {};
    for (const [s, c] of r.fix.clocksM) clocks[s] = c;
    return {
      tagGpsS: e.tagGpsS, timeGpsS: e.tagGpsS - (r.fix.clocksM.values().next().value ?? 0) / SPEED_OF_LIGHT_MS,
      kind: 'standalone', reason, pointName,
      position: { ecef: pos, frame: broadcastFrame(e.tagGpsS) }, geodetic: g,
      pointReference: options.reduceToMark ? 'ground-mark' : 'antenna-reference-point',
      baselineEcef: null, baselineEnu: null, relativeClockM: clocks, satellitesUsed: r.fix.used.length,
      dops: r.fix.dops, sigmaEnuM: r.fix.sigmaEnuM,
      quality: { varianceFactor: r.fix.varianceFactor, chiSquare: r.fix.test.statistic, dof: r.fix.test.dof, critical: r.fix.test.critical, passed: r.fix.test.dof > 0 ? r.fix.test.passed : null },
      correctionAgeS: ageS, satellites: r.satellites,
      speedMS: speedAt(e, arp), occupationEvent: pendingEvent, antennaHeightM: roverAntenna.heightM,
    };
  }

  interface Prepared {
    readonly sat: SatId;
    readonly system: GnssSystem;
    readonly code: string;
    readonly codeM: number;
    readonly eph: Ephemeris;
    satPos: EcefM;
    at: SatelliteAtTransmission;
    satClockM: number;
    readonly frequencyHz: number;
    readonly cn0DbHz: number;
    readonly channel: number | undefined;
    correctionM: number;
    ageS: number;
    elevationRefRad: number;
    cn0RefDbHz: number;
  }

  function solveEpoch(e: ObsEpoch, smoothed: Map<SatId, Map<string, number>> | undefined): EpochSolution {
    const nearestS = corrections.nearestEpochS(e.tagGpsS);
    if (nearestS > maxAgeS + 1) {
      withoutCorrections++;
      const why = Number.isFinite(nearestS)
        ? `no reference epoch within the correction age limit (nearest ${Math.round(nearestS)} s, limit ${maxAgeS} s)`
        : 'no reference epoch within the correction age limit (none read near this time)';
      const sats = e.sats.map((x) => noSolutionSatellite(x.sat, why));
      for (const x of sats) satRejections.add(x.reason);
      return standaloneOr(e, why, sats, NaN);
    }
    epochsInReach++;
    const reasons = new Map<SatId, { signal: string; reason: string }>();
    const prepared: Prepared[] = [];
    for (const s of e.sats) {
      const system = satSystem(s.sat);
      if (!systems.includes(system)) {
        reasons.set(s.sat, { signal: '', reason: !options.systems.includes(system) ? 'constellation not selected' : !navSystems.has(system) ? 'no ephemeris for this constellation' : 'GLONASS excluded by option' });
        continue;
      }
      const roverCodes = primaryCodes(system, s);
      if (roverCodes.length === 0) { reasons.set(s.sat, { signal: '', reason: 'no pseudorange on the primary band' }); continue; }
      const sel = store.select(s.sat, e.tagGpsS);
      if (sel.eph === null) {
        reasons.set(s.sat, { signal: roverCodes[0], reason: sel.reason === 'too-old' ? `ephemeris too old (${Math.round((sel.ageS ?? 0) / 60)} min)` : sel.reason === 'unhealthy' ? 'unhealthy ephemeris' : 'no ephemeris' });
        continue;
      }
      const refCodes = corrections.codesNear(s.sat, e.tagGpsS, maxAgeS + 1);
      if (refCodes.size === 0) { reasons.set(s.sat, { signal: roverCodes[0], reason: 'not tracked by the reference' }); continue; }
      const match = matchCode(roverCodes, refCodes);
      if (match.code === null) { reasons.set(s.sat, { signal: roverCodes[0], reason: match.reason }); continue; }
      const code = match.code;
      const codeM = smoothed?.get(s.sat)?.get(code) ?? pseudorangeOf(s, code);
      if (!Number.isFinite(codeM)) { reasons.set(s.sat, { signal: code, reason: 'smoothing filter not ready' }); continue; }
      const at = satelliteForTag(sel.eph, e.tagGpsS, codeM, Number.isFinite(lastClockM) ? lastClockM : 0, null, clockSignal(system, code[1]));
      const k = system === 'R' ? glonassChannels.get(Number(s.sat.slice(1))) : undefined;
      if (system === 'R' && k === undefined && channelOffsets) {
        reasons.set(s.sat, { signal: code, reason: 'no GLONASS frequency channel (in neither header nor navigation file): its code offset cannot be estimated' });
        continue;
      }
      prepared.push({
        sat: s.sat, system, code, codeM, eph: sel.eph, satPos: at.posM, at, satClockM: SPEED_OF_LIGHT_MS * at.clock.offsetS,
        frequencyHz: carrierFrequencyHz(system, code, k), cn0DbHz: signalStrengthDbHz(s, code), channel: k,
        correctionM: NaN, ageS: NaN, elevationRefRad: NaN, cn0RefDbHz: NaN,
      });
    }
    // Time alignment: the rover clock from its own code at the last position, so corrections are taken at
    // the epoch's estimated GPS time rather than at its receiver-time tag.
    const x0 = lastPosition ?? rover.header.approxPosition ?? refArp;
    const clockSamples = prepared.map((p) => p.codeM - Math.hypot(p.satPos.x - x0.x, p.satPos.y - x0.y, p.satPos.z - x0.z) + p.satClockM);
    const clockM = median(clockSamples);
    const timeGpsS = e.tagGpsS - (Number.isFinite(clockM) ? clockM / SPEED_OF_LIGHT_MS : 0);
    let satellitesClockM = Number.isFinite(lastClockM) ? lastClockM : 0;
    /** Redoes the satellites' Earth rotation for a receiver clock (positioning/satellite-for-tag.ts). */
    const recomputeSatellites = (rxClockM: number): void => {
      for (const p of prepared) {
        const at = satelliteForTag(p.eph, e.tagGpsS, p.codeM, rxClockM, null, clockSignal(p.system, p.code[1]));
        p.satPos = at.posM;
        p.at = at;
        p.satClockM = SPEED_OF_LIGHT_MS * at.clock.offsetS;
      }
      satellitesClockM = rxClockM;
    };
    // The clock moved (first epoch, or a millisecond step): redo the Earth rotation with the new estimate.
    if (Number.isFinite(clockM) && Math.abs(clockM - satellitesClockM) > 30) recomputeSatellites(clockM);
    const usable: Prepared[] = [];
    let maxAge = 0;
    for (const p of prepared) {
      const c = corrections.correctionAt(p.sat, p.code, p.eph, timeGpsS, maxAgeS);
      if (!c.ok) { reasons.set(p.sat, { signal: p.code, reason: c.reason }); continue; }
      p.correctionM = c.correctionM; p.ageS = c.ageS; p.elevationRefRad = c.elevationRefRad; p.cn0RefDbHz = c.cn0RefDbHz;
      maxAge = Math.max(maxAge, c.ageS);
      usable.push(p);
    }
    const doy = dayOfYear(e.tagGpsS);
    const geometry = new Map<SatId, { el: number; az: number }>();
    const belowMask = new Set<SatId>();
    const belowMaskRef = new Set<SatId>();
    // Elevation, atmosphere and weights depend on the position only through metres-scale changes of the
    // look angles: they are computed at the first estimate and again only when the estimate has moved
    // by more than 100 m (iterations from a far start).
    interface Look { el: number; az: number; tropoM: number; ionoM: number; varianceM2: number }
    let lookAt: EcefM | null = null;
    const looks = new Map<SatId, Look>();
    const lookOf = (p: Prepared, x: EcefM, g: ReturnType<typeof ecefToGeodetic>): Look => {
      let l = looks.get(p.sat);
      if (l) return l;
      const ae = azimuthElevation(x, p.satPos, g.latRad, g.lonRad);
      const el = ae.elevationRad;
      const above = el >= maskRad;
      l = {
        el, az: ae.azimuthRad,
        tropoM: above ? troposphereDelayM(g, el, doy) : NaN,
        ionoM: above && Number.isFinite(p.frequencyHz) ? ionosphereDelayM(inputs.nav.ionosphere, p.system, g, el, ae.azimuthRad, e.tagGpsS, p.frequencyHz) : 0,
        varianceM2: above ? codeVarianceM2(el, p.cn0DbHz) + codeVarianceM2(Number.isFinite(p.elevationRefRad) ? p.elevationRefRad : el, p.cn0RefDbHz) : NaN,
      };
      looks.set(p.sat, l);
      return l;
    };
    const build = (x: EcefM, excluded: ReadonlySet<SatId>): LinearRow[] => {
      if (lookAt === null || Math.hypot(x.x - lookAt.x, x.y - lookAt.y, x.z - lookAt.z) > 100) { looks.clear(); lookAt = x; }
      const g = ecefToGeodetic(lookAt);
      const rows: LinearRow[] = [];
      belowMask.clear();
      belowMaskRef.clear();
      for (const p of usable) {
        if (excluded.has(p.sat)) continue;
        const dx = p.satPos.x - x.x, dy = p.satPos.y - x.y, dz = p.satPos.z - x.z;
        const range = Math.sqrt(dx * dx + dy * dy + dz * dz);
        const look = lookOf(p, lookAt, g);
        geometry.set(p.sat, { el: look.el, az: look.az });
        if (look.el < maskRad) { belowMask.add(p.sat); continue; }
        if (p.elevationRefRad < maskRad) { belowMaskRef.add(p.sat); continue; }
        const tropo = look.tropoM;
        const iono = look.ionoM;
        const variance = look.varianceM2;
        let channelOffset = 0, inflation = 1;
        if (channelOffsets && p.system === 'R' && p.channel !== undefined) {
          channelOffset = channelOffsets.offset(p.channel);
          inflation = channelOffsets.varianceFactor(p.channel);
        }
        rows.push({
          sat: p.sat, system: p.system, losX: dx / range, losY: dy / range, losZ: dz / range,
          misclosureM: p.codeM - range + p.satClockM - tropo - iono - p.correctionM - channelOffset,
          varianceM2: variance * inflation,
        });
      }
      return rows;
    };
    let fix = usable.length > 0 ? solvePositionFix(build, x0, fixOptions) : null;
    if (fix && fix.ok) {
      // The clock from the code at x0 can be off when x0 is far (first epoch of a long baseline): with the
      // solved clock, redo the satellites once.
      const solvedClockM = fix.clocksM.values().next().value ?? satellitesClockM;
      if (Math.abs(solvedClockM - satellitesClockM) > 30) {
        recomputeSatellites(solvedClockM);
        fix = solvePositionFix(build, fix.positionM, fixOptions);
      }
    }
    const usedBySat = new Map(fix && fix.ok ? fix.used.map((u) => [u.row.sat, u] as const) : []);
    const rejBySat = new Map(fix ? fix.rejected.map((r) => [r.sat, r] as const) : []);
    const satellites: SatelliteResidual[] = [];
    const preparedBySat = new Map(prepared.map((q) => [q.sat, q] as const));
    for (const s of e.sats) {
      const pre = reasons.get(s.sat);
      const p = preparedBySat.get(s.sat);
      const geo = geometry.get(s.sat);
      const u = usedBySat.get(s.sat);
      const rej = rejBySat.get(s.sat);
      const maskReason = belowMask.has(s.sat) && geo ? `below elevation mask (${(geo.el / DEG).toFixed(1)} deg)`
        : belowMaskRef.has(s.sat) && p ? `below elevation mask at the reference (${(p.elevationRefRad / DEG).toFixed(1)} deg)` : undefined;
      const reason = pre?.reason ?? maskReason ?? rej?.reason ?? (u ? '' : fix && !fix.ok ? `no solution (${fix.reason})` : 'not used');
      if (!u) satRejections.add(reason);
      satellites.push({
        sat: s.sat, signal: p?.code ?? pre?.signal ?? '',
        elevationDeg: geo ? geo.el / DEG : NaN, azimuthDeg: geo ? geo.az / DEG : NaN,
        residualM: u ? u.residualM : NaN, weight: u ? 1 / u.row.varianceM2 : 0,
        wTest: u ? u.wTest : rej ? rej.wTest : NaN, used: u !== undefined, reason,
      });
    }
    if (usable.length === 0) {
      return standaloneOr(e, prepared.length === 0 ? 'no usable satellite (see the satellite reasons)' : 'no satellite with a reference correction (see the satellite reasons)', satellites, NaN);
    }
    if (!fix || !fix.ok) return standaloneOr(e, `no differential solution (${fix ? fix.reason : 'no satellites'})`, satellites, maxAge);
    if (fix.dops && fix.dops.pdop > options.quality.maxPdop) {
      const why = `PDOP above the limit (${fix.dops.pdop.toFixed(1)} > ${options.quality.maxPdop})`;
      const unused = satellites.map((x) => (x.used ? { ...x, used: false, weight: 0, reason: `epoch rejected: ${why}` } : x));
      for (const x of satellites) if (x.used) satRejections.add(`epoch rejected: ${why}`);
      return standaloneOr(e, why, unused, maxAge);
    }
    lastPosition = fix.positionM;
    if (channelOffsets) learnChannelOffsets(channelOffsets, build, fix.positionM, new Set(fix.rejected.map((r) => r.sat)), usable);
    const firstClock = fix.clocksM.values().next().value ?? clockM;
    lastClockM = firstClock;
    const arp = fix.positionM;
    const pos = options.reduceToMark ? arpToMark(arp, roverAntenna) : arp;
    const g = ecefToGeodetic(pos);
    // Baseline between like points: ground mark to ground mark, or antenna to antenna with --at-antenna.
    const refPoint = options.reduceToMark ? refMark : refArp;
    const baselineEcef = { x: pos.x - refPoint.x, y: pos.y - refPoint.y, z: pos.z - refPoint.z };
    const gRef = ecefToGeodetic(refMark);
    const baselineEnu = ecefDeltaToEnu(baselineEcef, gRef.latRad, gRef.lonRad);
    const clocks: Partial<Record<GnssSystem, number>> = {};
    for (const [s, c] of fix.clocksM) { clocks[s] = c; systemsUsed.add(s); }
    const position: FramedEcef = { ecef: pos, frame: frameOfResult };
    return {
      tagGpsS: e.tagGpsS, timeGpsS: e.tagGpsS - firstClock / SPEED_OF_LIGHT_MS,
      kind: smoothOn ? 'smoothed' : 'differential',
      reason: fix.test.dof > 0 && !fix.test.passed ? `global test failed after data snooping (${fix.test.statistic.toFixed(1)} > ${fix.test.critical.toFixed(1)})` : '',
      pointName,
      position, geodetic: g, pointReference: options.reduceToMark ? 'ground-mark' : 'antenna-reference-point',
      baselineEcef, baselineEnu, relativeClockM: clocks, satellitesUsed: fix.used.length,
      dops: fix.dops, sigmaEnuM: fix.sigmaEnuM,
      quality: { varianceFactor: fix.varianceFactor, chiSquare: fix.test.statistic, dof: fix.test.dof, critical: fix.test.critical, passed: fix.test.dof > 0 ? fix.test.passed : null },
      correctionAgeS: maxAge, satellites,
      speedMS: speedAt(e, arp, new Map(prepared.map((p) => [p.sat, p.at] as const))), occupationEvent: pendingEvent, antennaHeightM: roverAntenna.heightM,
    };
  }

  /**
   * Channel offsets are learnt against the solution without GLONASS, so that while they are learnt GLONASS
   * cannot pull the position towards its own biases: each GLONASS misclosure at that position, less their
   * mean (the GLONASS relative clock), is one sample of its channel's offset.
   */
  function learnChannelOffsets(offsets: GlonassChannelOffsets, build: (x: EcefM, ex: ReadonlySet<SatId>) => LinearRow[], at: EcefM, rejected: ReadonlySet<SatId>, usable: readonly { sat: SatId; system: GnssSystem; channel: number | undefined }[]): void {
    const glonass = new Set(usable.filter((p) => p.system === 'R').map((p) => p.sat));
    const buildWithoutGlonass = (x: EcefM, ex: ReadonlySet<SatId>) => build(x, new Set([...ex, ...glonass, ...rejected]));
    const withoutGlonass = solvePositionFix(buildWithoutGlonass, at, { ...fixOptions, maxRejections: 0, minSatellites: 4 });
    // Only a fix with redundancy that passes its test may teach the offsets.
    if (!withoutGlonass.ok || withoutGlonass.test.dof < 2 || !withoutGlonass.test.passed) return;
    // Rows at the GLONASS-free position; exclude the non-GLONASS ones and the rejected satellites.
    const excluded = new Set<SatId>([...rejected]);
    for (const p of usable) if (p.system !== 'R') excluded.add(p.sat);
    const rows = build(withoutGlonass.positionM, excluded);
    if (rows.length < 2) return;
    let sw = 0, swy = 0;
    for (const r of rows) { sw += 1 / r.varianceM2; swy += r.misclosureM / r.varianceM2; }
    const clock = swy / sw;
    for (const r of rows) {
      const p = usable.find((q) => q.sat === r.sat);
      if (p?.channel !== undefined) offsets.update(p.channel, r.misclosureM - clock);
    }
  }

  async function* run(): AsyncIterable<EpochSolution> {
    for await (const e of rover.epochs) {
      if (e.event) {
        const ev = e.event;
        if (ev.kind === 'new-occupation') { pointName = (ev.markerName ?? '').trim() || pointName; pendingEvent = 'new-occupation'; }
        if (ev.kind === 'start-moving') { pointName = ''; pendingEvent = 'start-moving'; }
        if (ev.antennaOffset && !options.roverAntenna) roverAntenna = ev.antennaOffset;
        if (e.flag === 1) roverSmoother?.reset();
      }
      if (e.flag !== 0 && e.flag !== 1) continue;
      if (e.sats.length === 0 && e.event) continue;
      roverEpochs++;
      if (Number.isNaN(firstGpsS)) firstGpsS = e.tagGpsS;
      lastGpsS = e.tagGpsS;
      await pullReference(e.tagGpsS + lookaheadS);
      corrections.prune(e.tagGpsS, maxAgeS + 2);
      const smoothed = roverSmoother?.update(e);
      let sol: EpochSolution;
      try {
        sol = e.sats.length === 0 ? none(e, 'no satellites in the epoch', []) : solveEpoch(e, smoothed);
      } catch (err) {
        const msg = err instanceof Error ? err.message : String(err);
        warn({ file: rover.file, line: e.line, code: 'epoch-failed', message: `epoch at line ${e.line} could not be solved: ${msg}` });
        sol = none(e, `could not be solved: ${msg}`, []);
      }
      pendingEvent = null;
      byKind[sol.kind]++;
      if (sol.kind !== 'differential' && sol.kind !== 'smoothed') epochRejections.add(sol.reason || sol.kind);
      yield sol;
    }
    if (roverEpochs > 0 && epochsInReach === 0) {
      const span = (a: number, b: number) => (Number.isNaN(a) ? 'no epochs' : `${isoFromSeconds(a, ' GPST')} to ${isoFromSeconds(b, ' GPST')}`);
      throw new ProcessingError(`the rover and reference observations do not overlap in time (rover ${span(firstGpsS, lastGpsS)}, reference ${span(refFirst, refLast)}, correction age limit ${maxAgeS} s)`);
    }
  }

  return {
    epochs: run(),
    summary: (): SessionSummary => ({
      frame,
      referencePosition: { ecef: refMark, frame },
      referencePositionSource: refSource,
      epochsRover: roverEpochs,
      epochsByKind: { ...byKind },
      epochsWithoutCorrections: withoutCorrections,
      satelliteRejections: satRejections.list(),
      epochRejections: epochRejections.list(),
      systemsUsed: [...systemsUsed],
      notes: [...notes, ...(channelOffsets ? [`GLONASS per-channel code offsets at the end (channel: m): ${JSON.stringify(channelOffsets.snapshot())}`] : []), ...(corrections.unusableEpochs > 0 ? [`${corrections.unusableEpochs} reference epochs had no satellite with an ephemeris and were not used`] : [])],
      firstGpsS, lastGpsS,
    }),
  };
}
