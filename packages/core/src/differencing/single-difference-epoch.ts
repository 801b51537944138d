/**
 * One rover epoch turned into between-receiver single differences of code, ready for an epoch solver.
 *
 * Per satellite: the rover's code (smoothed when smoothing is on) matched to a code the reference tracks,
 * the satellite at transmission for the rover's epoch (observables/satellite-for-tag.ts), and the reference
 * correction interpolated to the epoch's estimated GPS time (reference-corrections.ts). The linearised rows
 *   y^s = P_rov^s - rho_rov^s + c dt^s - T_rov - I_rov - C^s(t) - b^s
 * (b^s: a session-constant between-receiver code offset, code-offsets.ts) are built at any trial position
 * by `rowsAt`, with the look angles, atmosphere and weights cached per satellite (they change with the
 * position only through metres-scale changes of the look angles).
 * Source of the model: Misra & Enge (2011) 7.1, eqs. 7.3-7.6 (see reference-corrections.ts).
 */
import type { EcefM, GeodeticRad, GnssSystem, SatId, CodeValuesBySat } from '../gnss/index.js';
import { carrierFrequencyHz, satSystem, type Ephemeris, type IonosphereCoefficients, type ObsEpoch } from '../gnss/index.js';
import { SPEED_OF_LIGHT_MS, type EphemerisStore, type SatelliteAtTransmission } from '../orbit/index.js';
import { ecefToGeodetic } from '../geodesy/index.js';
import {
  clockSignal, codeMisclosureM, dayOfYear, lookFrom, matchCode, primaryCodes, pseudorangeOf, satelliteForTag, signalStrengthDbHz, type LinearRow, type ReceiverLook,
} from '../observables/index.js';
import type { Bracket, ReferenceCorrections } from './reference-corrections.js';

/** A session-constant code offset of one satellite's single difference, and how far to trust it. */
export interface CodeOffsetSource {
  /** Offset (m) removed from the satellite's single difference. */
  offsetM(sat: SatId, system: GnssSystem, channel: number | undefined): number;
  /** Variance (m^2) added to the row for the offset's own uncertainty. */
  offsetVarianceM2(sat: SatId, system: GnssSystem, channel: number | undefined): number;
  /** Multiplier of the row variance (1: none). */
  varianceFactor(sat: SatId, system: GnssSystem, channel: number | undefined): number;
  /** GLONASS satellites without a known frequency channel cannot be used. */
  readonly needsGlonassChannel: boolean;
}

export interface DifferencingContext {
  readonly store: EphemerisStore;
  /** Constellations in use. */
  readonly systems: readonly GnssSystem[];
  /** Why a satellite of a constellation not in use is left out. */
  readonly leftOut: { reasonFor(system: GnssSystem): string };
  readonly corrections: ReferenceCorrections;
  readonly iono: IonosphereCoefficients;
  readonly glonassChannels: ReadonlyMap<number, number>;
  readonly maskRad: number;
  readonly maxAgeS: number;
  /** One receiver's code variance (m^2) at an elevation and signal strength (solve/weights.ts). */
  readonly codeVariance: { varianceM2(elevationRad: number, cn0DbHz: number): number };
  readonly offsets: CodeOffsetSource | null;
}

/** One satellite's single difference before linearisation. */
export interface SingleDifference {
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
  /** Variance factors of the rover's and the reference's code relative to one raw code (smoothing). */
  readonly varianceFactorRover: number;
  varianceFactorRef: number;
}

interface Look { look: ReceiverLook; el: number; az: number; varianceM2: number }

function median(v: number[]): number {
  if (v.length === 0) return NaN;
  const s = [...v].sort((a, b) => a - b);
  const m = s.length >> 1;
  return s.length % 2 ? s[m] : 0.5 * (s[m - 1] + s[m]);
}

/** Why a satellite has no code in common with the reference (SingleDifferenceEpoch.prepare). */
function noCommonCodeReason(corrections: ReferenceCorrections, sat: SatId, roverCodes: readonly string[], tagGpsS: number, maxAgeS: number, bracket: Bracket): string {
  const refCodes = corrections.codesNear(sat, tagGpsS, maxAgeS, bracket);
  if (refCodes.size === 0) return 'not tracked by the reference';
  const match = matchCode(roverCodes, refCodes);
  return match.code === null ? match.reason : 'no common code type';
}

/** Receiver clocks of an epoch's satellites (m), sorted for their median: kept from epoch to epoch. */
let clockSamples = new Float64Array(64);

/**
 * Median receiver clock (m) from the code at x0: P - |sat - x0| + c dt_sv over the satellites, as
 * median() of those values would give it (sorted as numbers; with a NaN among them, median() itself).
 */
function codeClockMedianM(prepared: readonly SingleDifference[], x0: EcefM): number {
  const n = prepared.length;
  if (n === 0) return NaN;
  if (n > clockSamples.length) clockSamples = new Float64Array(2 * n);
  const v = clockSamples;
  for (let i = 0; i < n; i++) {
    const p = prepared[i];
    const x = p.codeM - Math.hypot(p.satPos.x - x0.x, p.satPos.y - x0.y, p.satPos.z - x0.z) + p.satClockM;
    // A NaN has no place in a numeric order: median()'s own sort decides where it goes.
    if (Number.isNaN(x)) return median(prepared.map((q) => q.codeM - Math.hypot(q.satPos.x - x0.x, q.satPos.y - x0.y, q.satPos.z - x0.z) + q.satClockM));
    v[i] = x;
  }
  const s = v.subarray(0, n).sort();
  const m = n >> 1;
  return n % 2 ? s[m] : 0.5 * (s[m - 1] + s[m]);
}

export class SingleDifferenceEpoch {
  /** Satellites with a code, an ephemeris and a reference tracking the same code. */
  readonly prepared: SingleDifference[] = [];
  /** Those of `prepared` with a reference correction at the epoch's time. */
  readonly usable: SingleDifference[] = [];
  /** Why a satellite of the epoch is not in `usable` (with the signal it was tried on). */
  readonly reasons = new Map<SatId, { signal: string; reason: string }>();
  /** Look angles of the last `rowsAt` call, and who fell below a mask there. */
  readonly geometry = new Map<SatId, { el: number; az: number }>();
  readonly belowMask = new Set<SatId>();
  readonly belowMaskRef = new Set<SatId>();
  /** Receiver clock (m) from the code at the start position, median over satellites. */
  readonly codeClockM: number;
  /** Estimated GPS time of the epoch (tag less that clock). */
  readonly timeGpsS: number;
  /** Largest age of the corrections used (s). */
  readonly maxAgeS: number;
  /** The reference receiver's clock (m) at the epoch's time, from the bracketing reference epochs. */
  readonly referenceClockM: number;
  private satellitesClockM: number;
  private lookAt: EcefM | null = null;
  private lookGeodetic: GeodeticRad | null = null;
  private readonly looks = new Map<SatId, Look>();
  private readonly doy: number;

  constructor(
    readonly epoch: ObsEpoch,
    private readonly ctx: DifferencingContext,
    smoothed: CodeValuesBySat | undefined,
    private readonly smoothedFactors: CodeValuesBySat | undefined,
    startM: EcefM,
    previousClockM: number,
  ) {
    this.doy = dayOfYear(epoch.tagGpsS);
    this.satellitesClockM = Number.isFinite(previousClockM) ? previousClockM : 0;
    const tagBracket = ctx.corrections.bracketAt(epoch.tagGpsS, ctx.maxAgeS + 1);
    for (const s of epoch.sats) this.prepare(s, smoothed, tagBracket);
    // Time alignment: the rover clock from its own code at the start position, so corrections are taken
    // at the epoch's estimated GPS time rather than at its receiver-time tag.
    const x0 = startM;
    this.codeClockM = codeClockMedianM(this.prepared, x0);
    this.timeGpsS = epoch.tagGpsS - (Number.isFinite(this.codeClockM) ? this.codeClockM / SPEED_OF_LIGHT_MS : 0);
    // The clock moved (first epoch, or a millisecond step): redo the Earth rotation with the new estimate.
    if (Number.isFinite(this.codeClockM) && Math.abs(this.codeClockM - this.satellitesClockM) > 30) this.recomputeSatellites(this.codeClockM);
    let maxAge = 0;
    const bracket = ctx.corrections.bracketAt(this.timeGpsS, ctx.maxAgeS);
    this.referenceClockM = ctx.corrections.clockAt(this.timeGpsS, bracket);
    for (const p of this.prepared) {
      const c = ctx.corrections.correctionAt(p.sat, p.code, p.eph, this.timeGpsS, ctx.maxAgeS, bracket);
      if (!c.ok) { this.reasons.set(p.sat, { signal: p.code, reason: c.reason }); continue; }
      p.correctionM = c.correctionM; p.ageS = c.ageS; p.elevationRefRad = c.elevationRefRad; p.cn0RefDbHz = c.cn0RefDbHz; p.varianceFactorRef = c.varianceFactorRef;
      maxAge = Math.max(maxAge, c.ageS);
      this.usable.push(p);
    }
    this.maxAgeS = maxAge;
  }

  private prepare(s: ObsEpoch['sats'][number], smoothed: CodeValuesBySat | undefined, bracket: Bracket): void {
    const ctx = this.ctx;
    const system = satSystem(s.sat);
    if (!ctx.systems.includes(system)) { this.reasons.set(s.sat, { signal: '', reason: ctx.leftOut.reasonFor(system) }); return; }
    const roverCodes = primaryCodes(system, s);
    if (roverCodes.length === 0) { this.reasons.set(s.sat, { signal: '', reason: 'no pseudorange on the primary band' }); return; }
    const tag = this.epoch.tagGpsS;
    const sel = ctx.store.select(s.sat, tag);
    if (sel.eph === null) {
      this.reasons.set(s.sat, { signal: roverCodes[0], reason: sel.reason === 'too-old' ? `ephemeris too old (${Math.round((sel.ageS ?? 0) / 60)} min)` : sel.reason === 'unhealthy' ? 'unhealthy ephemeris' : 'no ephemeris' });
      return;
    }
    // The reference's codes as a set (and the match as an object) only to say why there is no common one.
    const code = ctx.corrections.commonCode(s.sat, roverCodes, tag, ctx.maxAgeS + 1, bracket);
    if (code === null) { this.reasons.set(s.sat, { signal: roverCodes[0], reason: noCommonCodeReason(ctx.corrections, s.sat, roverCodes, tag, ctx.maxAgeS + 1, bracket) }); return; }
    const codeM = smoothed?.get(s.sat)?.get(code) ?? pseudorangeOf(s, code);
    if (!Number.isFinite(codeM)) { this.reasons.set(s.sat, { signal: code, reason: 'smoothing filter not ready' }); return; }
    const at = satelliteForTag(sel.eph, tag, codeM, this.satellitesClockM, null, clockSignal(system, code[1]));
    const k = system === 'R' ? ctx.glonassChannels.get(Number(s.sat.slice(1))) : undefined;
    if (system === 'R' && k === undefined && ctx.offsets?.needsGlonassChannel) {
      this.reasons.set(s.sat, { signal: code, reason: 'no GLONASS frequency channel (in neither header nor navigation file): its code offset cannot be estimated' });
      return;
    }
    this.prepared.push({
      sat: s.sat, system, code, codeM, eph: sel.eph, satPos: at.posM, at, satClockM: SPEED_OF_LIGHT_MS * at.clock.offsetS,
      frequencyHz: carrierFrequencyHz(system, code, k), cn0DbHz: signalStrengthDbHz(s, code), channel: k,
      correctionM: NaN, ageS: NaN, elevationRefRad: NaN, cn0RefDbHz: NaN,
      varianceFactorRover: smoothed?.get(s.sat)?.has(code) ? this.smoothedFactors?.get(s.sat)?.get(code) ?? 1 : 1, varianceFactorRef: 1,
    });
  }

  /** Redoes the satellites' Earth rotation for a receiver clock (m). */
  recomputeSatellites(rxClockM: number): void {
    for (const p of this.prepared) {
      const at = satelliteForTag(p.eph, this.epoch.tagGpsS, p.codeM, rxClockM, null, clockSignal(p.system, p.code[1]));
      p.satPos = at.posM;
      p.at = at;
      p.satClockM = SPEED_OF_LIGHT_MS * at.clock.offsetS;
    }
    this.satellitesClockM = rxClockM;
  }

  /** The satellite at transmission of a prepared satellite (the last one listed, as a Map of `prepared` would give), or undefined. */
  get(sat: SatId): SatelliteAtTransmission | undefined {
    const prepared = this.prepared;
    for (let i = prepared.length - 1; i >= 0; i--) if (prepared[i].sat === sat) return prepared[i].at;
    return undefined;
  }

  /** The prepared single difference of a satellite (the last one listed, as a Map of `prepared` would give), or undefined. */
  preparedOf(sat: SatId): SingleDifference | undefined {
    const prepared = this.prepared;
    for (let i = prepared.length - 1; i >= 0; i--) if (prepared[i].sat === sat) return prepared[i];
    return undefined;
  }

  /** The clock (m) the satellites' Earth rotation was last computed with. */
  get clockUsedM(): number {
    return this.satellitesClockM;
  }

  private lookOf(p: SingleDifference): Look {
    let l = this.looks.get(p.sat);
    if (l) return l;
    const look = lookFrom(this.lookAt!, this.lookGeodetic!, p.satPos, p.system, p.frequencyHz, this.ctx.iono, this.epoch.tagGpsS, this.doy, this.ctx.maskRad);
    const el = look.elevationRad;
    const v = this.ctx.codeVariance;
    l = {
      look, el, az: look.azimuthRad,
      varianceM2: el >= this.ctx.maskRad ? v.varianceM2(el, p.cn0DbHz) * p.varianceFactorRover + v.varianceM2(Number.isFinite(p.elevationRefRad) ? p.elevationRefRad : el, p.cn0RefDbHz) * p.varianceFactorRef : NaN,
    };
    this.looks.set(p.sat, l);
    return l;
  }

  /** Linearised rows at a trial rover antenna position, leaving out `excluded` and satellites below a mask. */
  rowsAt(x: EcefM, excluded: ReadonlySet<SatId>): LinearRow[] {
    const lookAt = this.lookAt;
    if (lookAt === null || Math.hypot(x.x - lookAt.x, x.y - lookAt.y, x.z - lookAt.z) > 100) {
      this.looks.clear();
      this.lookAt = x;
      this.lookGeodetic = ecefToGeodetic(x);
    }
    const rows: LinearRow[] = [];
    const maskRad = this.ctx.maskRad;
    const offsets = this.ctx.offsets;
    // Clearing a set makes it a new table: only when it holds something.
    if (this.belowMask.size > 0) this.belowMask.clear();
    if (this.belowMaskRef.size > 0) this.belowMaskRef.clear();
    for (const p of this.usable) {
      if (excluded.has(p.sat)) continue;
      const dx = p.satPos.x - x.x, dy = p.satPos.y - x.y, dz = p.satPos.z - x.z;
      const range = Math.sqrt(dx * dx + dy * dy + dz * dz);
      const look = this.lookOf(p);
      this.geometry.set(p.sat, look);
      if (look.el < maskRad) { this.belowMask.add(p.sat); continue; }
      if (p.elevationRefRad < maskRad) { this.belowMaskRef.add(p.sat); continue; }
      let offsetM = 0, extraM2 = 0, factor = 1;
      if (offsets) {
        offsetM = offsets.offsetM(p.sat, p.system, p.channel);
        extraM2 = offsets.offsetVarianceM2(p.sat, p.system, p.channel);
        factor = offsets.varianceFactor(p.sat, p.system, p.channel);
      }
      rows.push({
        sat: p.sat, system: p.system, losX: dx / range, losY: dy / range, losZ: dz / range,
        misclosureM: codeMisclosureM(p.codeM, range, p.satClockM, look.look) - p.correctionM - offsetM,
        varianceM2: look.varianceM2 * factor + extraM2,
      });
    }
    return rows;
  }
}
