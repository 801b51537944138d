/**
 * Reference-station corrections, kept over a sliding window of reference epochs.
 *
 * At each reference epoch k and satellite s with code type c, with the reference antenna at its known
 * position X_ref (known coordinate + antenna offset):
 *   C_k^s = P_ref^s - rho_ref^s + c dt^s - T_ref - I_ref - c dt_ref,k
 * where rho_ref is the geometric range to the broadcast satellite position at transmission (with Earth
 * rotation), dt^s the broadcast satellite clock, T and I the a-priori troposphere and ionosphere models at
 * the reference, and dt_ref,k the reference receiver clock of that epoch (robust median over satellites).
 * Removing the receiver clock first makes C smooth in time even when the receiver clock jumps by
 * milliseconds, so C can be interpolated linearly to the rover's epoch. At the rover,
 *   y^s = P_rov^s - rho_rov^s + c dt^s - T_rov - I_rov - C^s(t_rov)
 * is the between-receiver single difference P_rov - P_ref reduced by the modelled geometry: the satellite
 * clock, and the orbit, ionosphere and troposphere errors common to both receivers, cancel (e.g. Misra &
 * Enge 2011, 7.1, eqs. 7.3-7.6; RTCM 10402.3 pseudorange correction definition). The same broadcast issue
 * is used on both sides: corrections are computed per issue on demand and cached, so a change of issue is
 * never interpolated across.
 */
import type { EcefM, Ephemeris, GeodeticRad, GnssSystem, IonosphereCoefficients, ObsEpoch, SatId, CodeValuesBySat } from '../gnss/index.js';
import { carrierFrequencyHz, satSystem } from '../gnss/index.js';
import { EphemerisStore, SPEED_OF_LIGHT_MS } from '../orbit/index.js';
import { ecefToGeodetic } from '../geodesy/index.js';
import { clockSignal, codeMisclosureM, dayOfYear, lookFrom, primaryCodeSlots, pseudorangeAt, satelliteForTag, signalStrengthDbHz } from '../observables/index.js';

export interface ReferenceSatellite {
  /** Pseudorange (m) per code type of the primary band (smoothed when smoothing is on). */
  readonly codes: Map<string, number>;
  readonly cn0DbHz: number;
  /** Variance of the code relative to one raw code (< 1 when smoothed). */
  readonly varianceFactor: number;
}

export interface ReferenceEpoch {
  readonly tagGpsS: number;
  /** Estimated GPS time of the epoch (tag minus the receiver clock). */
  readonly timeGpsS: number;
  /** Reference receiver clock (m) removed from every correction of this epoch. */
  readonly clockM: number;
  readonly sats: ReadonlyMap<SatId, ReferenceSatellite>;
  readonly arpM: EcefM;
  readonly geodetic: GeodeticRad;
  /** Corrections computed so far, per broadcast record (the store's one object per issue) and code. */
  readonly cache: Map<Ephemeris, Map<string, CorrectionValue>>;
}

export interface CorrectionValue {
  readonly correctionM: number;
  readonly elevationRad: number;
}

export interface InterpolatedCorrection {
  readonly ok: true;
  readonly correctionM: number;
  /** Largest distance in time to a reference epoch used (s). */
  readonly ageS: number;
  readonly elevationRefRad: number;
  readonly cn0RefDbHz: number;
  /** Variance factor of the reference code used (smoothing). */
  readonly varianceFactorRef: number;
}

export interface CorrectionFailure {
  readonly ok: false;
  readonly reason: string;
}

/** The reference epochs around a rover epoch (ReferenceCorrections.bracketAt). */
export interface Bracket {
  readonly before: ReferenceEpoch | null;
  readonly after: ReferenceEpoch | null;
}

export interface ReferenceContext {
  readonly store: EphemerisStore;
  readonly iono: IonosphereCoefficients;
  readonly systems: readonly GnssSystem[];
  readonly glonassChannels: ReadonlyMap<number, number>;
}


/** A reference satellite's first primary code of an epoch, with the issue it is modelled with. */
interface FirstCode { readonly sat: SatId; readonly system: GnssSystem; readonly code: string; readonly p: number; readonly eph: Ephemeris }

/** A first code modelled at the reference: residual (receiver clock not removed) and elevation. */
interface ModelledCode { readonly sat: SatId; readonly code: string; readonly eph: Ephemeris; readonly m: { residualM: number; elevationRad: number } }

function cacheCorrection(cache: Map<Ephemeris, Map<string, CorrectionValue>>, eph: Ephemeris, code: string, v: CorrectionValue): void {
  let byCode = cache.get(eph);
  if (!byCode) { byCode = new Map(); cache.set(eph, byCode); }
  byCode.set(code, v);
}

/** The codes a reference epoch holds for a satellite, added to `out`. */
function addCodesOf(e: ReferenceEpoch | null, sat: SatId, out: Set<string>): void {
  const rs = e?.sats.get(sat);
  if (rs) for (const c of rs.codes.keys()) out.add(c);
}

function median(v: number[]): number {
  if (v.length === 0) return NaN;
  const s = [...v].sort((a, b) => a - b);
  const m = s.length >> 1;
  return s.length % 2 ? s[m] : 0.5 * (s[m - 1] + s[m]);
}

export class ReferenceCorrections {
  private readonly epochs: ReferenceEpoch[] = [];
  /** Epochs dropped because no clock could be estimated (no satellite with an ephemeris). */
  unusableEpochs = 0;
  private lastClockM = NaN;

  /** The reference antenna's geodetic coordinates, kept while it stays where it is (every epoch, as a rule). */
  private lastArpM: EcefM = { x: NaN, y: NaN, z: NaN };
  private lastGeodetic: GeodeticRad | null = null;

  constructor(private readonly ctx: ReferenceContext) {}

  private geodeticOf(arpM: EcefM): GeodeticRad {
    const last = this.lastArpM;
    if (this.lastGeodetic !== null && arpM.x === last.x && arpM.y === last.y && arpM.z === last.z) return this.lastGeodetic;
    this.lastArpM = { x: arpM.x, y: arpM.y, z: arpM.z };
    this.lastGeodetic = ecefToGeodetic(arpM);
    return this.lastGeodetic;
  }

  get size(): number {
    return this.epochs.length;
  }

  get latestTimeGpsS(): number {
    return this.epochs.length ? this.epochs[this.epochs.length - 1].timeGpsS : -Infinity;
  }

  /**
   * Adds one reference epoch. `codesOverride` gives smoothed pseudoranges (sat -> code -> m) when
   * carrier smoothing is on. Returns false when no receiver clock could be estimated.
   */
  addEpoch(epoch: ObsEpoch, arpM: EcefM, codesOverride?: CodeValuesBySat, cn0Override?: ReadonlyMap<SatId, number>, factorsOverride?: CodeValuesBySat): boolean {
    const geodetic = this.geodeticOf(arpM);
    const sats = new Map<SatId, ReferenceSatellite>();
    const doy = dayOfYear(epoch.tagGpsS);
    // The receiver clock enters the Earth-rotation term (positioning/satellite-for-tag.ts): model with the
    // previous epoch's clock, and again with the new one when it moved by more than 30 m (a step).
    const guessM = Number.isFinite(this.lastClockM) ? this.lastClockM : 0;
    const modelled: ModelledCode[] = [];
    const firsts: FirstCode[] = [];
    for (const s of epoch.sats) {
      const system = satSystem(s.sat);
      if (!this.ctx.systems.includes(system)) continue;
      const codes = new Map<string, number>();
      const over = codesOverride?.get(s.sat);
      for (const slot of primaryCodeSlots(system, s.codes)) {
        const raw = pseudorangeAt(s, slot);
        if (!Number.isFinite(raw)) continue;
        const v = over?.get(slot.code) ?? raw;
        if (Number.isFinite(v)) codes.set(slot.code, v);
      }
      if (codes.size === 0) continue;
      const first = codes.keys().next().value as string;
      sats.set(s.sat, { codes, cn0DbHz: cn0Override?.get(s.sat) ?? signalStrengthDbHz(s, first), varianceFactor: factorsOverride?.get(s.sat)?.get(first) ?? 1 });
      const sel = this.ctx.store.select(s.sat, epoch.tagGpsS);
      if (sel.eph === null) continue;
      firsts.push({ sat: s.sat, system, code: first, p: codes.get(first)!, eph: sel.eph });
    }
    let clockM = this.modelFirsts(firsts, modelled, epoch.tagGpsS, guessM, arpM, geodetic, doy);
    if (Number.isFinite(clockM) && Math.abs(clockM - guessM) > 30) clockM = this.modelFirsts(firsts, modelled, epoch.tagGpsS, clockM, arpM, geodetic, doy);
    if (!Number.isFinite(clockM)) {
      this.unusableEpochs++;
      return false;
    }
    this.lastClockM = clockM;
    // The corrections of the issue in use now are already computed: keep them.
    const cache = new Map<Ephemeris, Map<string, CorrectionValue>>();
    for (const x of modelled) cacheCorrection(cache, x.eph, x.code, { correctionM: x.m.residualM - clockM, elevationRad: x.m.elevationRad });
    this.epochs.push({
      tagGpsS: epoch.tagGpsS,
      timeGpsS: epoch.tagGpsS - clockM / SPEED_OF_LIGHT_MS,
      clockM, sats, arpM, geodetic, cache,
    });
    return true;
  }

  /**
   * Models each satellite's first code with a receiver clock guess into `modelled` (emptied first) and
   * returns the median residual over satellites above 0.1 rad: the receiver clock (m). A method rather
   * than a closure made per epoch, so its optimised code is kept from epoch to epoch.
   */
  private modelFirsts(
    firsts: readonly FirstCode[], modelled: ModelledCode[], tagGpsS: number, clockGuessM: number, arpM: EcefM, geodetic: GeodeticRad, doy: number,
  ): number {
    modelled.length = 0;
    const samples: number[] = [];
    for (const f of firsts) {
      const m = this.model(f.eph, f.sat, f.system, f.code, f.p, tagGpsS, clockGuessM, arpM, geodetic, doy);
      if (m === null) continue;
      modelled.push({ sat: f.sat, code: f.code, eph: f.eph, m });
      if (m.elevationRad > 0.1) samples.push(m.residualM);
    }
    return median(samples);
  }

  /** P - rho + c dt_sv - T - I at the reference (m), receiver clock not removed; null if not computable. */
  private model(eph: Ephemeris, sat: SatId, system: GnssSystem, code: string, pseudorangeM: number, tagGpsS: number, clockM: number, arpM: EcefM, geodetic: GeodeticRad, doy: number): { residualM: number; elevationRad: number } | null {
    const at = satelliteForTag(eph, tagGpsS, pseudorangeM, clockM, arpM, clockSignal(system, code[1]));
    const k = system === 'R' ? this.ctx.glonassChannels.get(Number(sat.slice(1))) : undefined;
    const look = lookFrom(arpM, geodetic, at.posM, system, carrierFrequencyHz(system, code, k), this.ctx.iono, tagGpsS, doy, 0);
    if (look.elevationRad < 0) return null;
    const residualM = codeMisclosureM(pseudorangeM, at.rangeM ?? NaN, SPEED_OF_LIGHT_MS * at.clock.offsetS, look);
    return Number.isFinite(residualM) ? { residualM, elevationRad: look.elevationRad } : null;
  }

  private correctionOf(e: ReferenceEpoch, sat: SatId, code: string, eph: Ephemeris): CorrectionValue | null {
    const hit = e.cache.get(eph)?.get(code);
    if (hit) return hit;
    const rs = e.sats.get(sat);
    const p = rs?.codes.get(code);
    if (p === undefined) return null;
    const system = satSystem(sat);
    const m = this.model(eph, sat, system, code, p, e.tagGpsS, e.clockM, e.arpM, e.geodetic, dayOfYear(e.tagGpsS));
    if (m === null) return null;
    const v = { correctionM: m.residualM - e.clockM, elevationRad: m.elevationRad };
    cacheCorrection(e.cache, eph, code, v);
    return v;
  }

  /** Distance in time (s) from t to the nearest reference epoch held; Infinity when none. */
  nearestEpochS(tGpsS: number): number {
    let best = Infinity;
    for (const e of this.epochs) best = Math.min(best, Math.abs(e.timeGpsS - tGpsS));
    return best;
  }

  /**
   * The reference epochs bracketing t: the latest at or before t and the earliest after it, each within
   * maxAgeS (null where there is none). All satellites of a rover epoch are corrected from this one pair,
   * so the reference clock error of each reference epoch enters every satellite with the same weight and
   * goes into the relative clock instead of into the position.
   */
  bracketAt(tGpsS: number, maxAgeS: number): Bracket {
    const ep = this.epochs;
    let lo = 0, hi = ep.length;
    while (lo < hi) {
      const mid = (lo + hi) >> 1;
      if (ep[mid].timeGpsS <= tGpsS + 1e-3) lo = mid + 1; else hi = mid;
    }
    const before = lo > 0 && tGpsS - ep[lo - 1].timeGpsS <= maxAgeS ? ep[lo - 1] : null;
    const after = lo < ep.length && ep[lo].timeGpsS - tGpsS <= maxAgeS ? ep[lo] : null;
    return { before, after };
  }

  /** The reference receiver clock (m) at GPS time t, interpolated between the bracketing epochs (NaN without). */
  clockAt(tGpsS: number, bracket: Bracket): number {
    const { before, after } = bracket;
    const first = before !== null ? before : after;
    if (first === null) return NaN;
    // Read on every path: a bracket of one epoch, first met late in a run, needs no new type feedback.
    const firstClockM = first.clockM;
    if (before !== null && after !== null && after.timeGpsS > before.timeGpsS) {
      const w = (tGpsS - before.timeGpsS) / (after.timeGpsS - before.timeGpsS);
      return firstClockM + w * (after.clockM - firstClockM);
    }
    return firstClockM;
  }

  /** Codes the reference has for a satellite near a time: from the bracketing epochs, else from the nearest epochs holding it. */
  codesNear(sat: SatId, tGpsS: number, maxAgeS: number, bracket?: Bracket): Set<string> {
    const out = new Set<string>();
    const b = bracket ?? this.bracketAt(tGpsS, maxAgeS);
    addCodesOf(b.before, sat, out);
    addCodesOf(b.after, sat, out);
    if (out.size > 0) return out;
    for (const e of this.epochs) {
      if (Math.abs(e.timeGpsS - tGpsS) > maxAgeS) continue;
      const rs = e.sats.get(sat);
      if (rs) for (const c of rs.codes.keys()) out.add(c);
    }
    return out;
  }

  /**
   * The first of `roverCodes` that codesNear(sat, t, maxAgeS, bracket) holds, without building that set
   * (matchCode's choice); null when there is none (codesNear and matchCode then say why).
   */
  commonCode(sat: SatId, roverCodes: readonly string[], tGpsS: number, maxAgeS: number, bracket: Bracket): string | null {
    // A satellite held by an epoch has at least one code (addEpoch), so the bracket's set is empty exactly
    // when neither bracketing epoch holds the satellite.
    const before = bracket.before?.sats.get(sat);
    const after = bracket.after?.sats.get(sat);
    if (before !== undefined || after !== undefined) {
      for (const c of roverCodes) if (before?.codes.has(c) || after?.codes.has(c)) return c;
      return null;
    }
    for (const c of roverCodes) {
      for (const e of this.epochs) {
        if (Math.abs(e.timeGpsS - tGpsS) > maxAgeS) continue;
        if (e.sats.get(sat)?.codes.has(c)) return c;
      }
    }
    return null;
  }

  /**
   * The correction for (sat, code, issue) at GPS time t: linear interpolation between the bracketing
   * reference epochs (bracketAt) when both hold the satellite, the one that does when only one does, and
   * otherwise between the nearest epochs before and after t that hold it; no epoch farther than maxAgeS.
   */
  correctionAt(sat: SatId, code: string, eph: Ephemeris, tGpsS: number, maxAgeS: number, bracket?: Bracket): InterpolatedCorrection | CorrectionFailure {
    let before: ReferenceEpoch | null = null;
    let after: ReferenceEpoch | null = null;
    let seen = false;
    const b = bracket ?? this.bracketAt(tGpsS, maxAgeS);
    if (b.before?.sats.get(sat)?.codes.has(code)) before = b.before;
    if (b.after?.sats.get(sat)?.codes.has(code)) after = b.after;
    if (before === null && after === null) {
      for (let i = this.epochs.length - 1; i >= 0; i--) {
        const e = this.epochs[i];
        if (e.timeGpsS > tGpsS + 1e-3) continue;
        if (tGpsS - e.timeGpsS > maxAgeS) break;
        const rs = e.sats.get(sat);
        if (rs) seen = true;
        if (rs?.codes.has(code)) { before = e; break; }
      }
      for (let i = 0; i < this.epochs.length; i++) {
        const e = this.epochs[i];
        if (e.timeGpsS <= tGpsS + 1e-3) continue;
        if (e.timeGpsS - tGpsS > maxAgeS) break;
        const rs = e.sats.get(sat);
        if (rs) seen = true;
        if (rs?.codes.has(code)) { after = e; break; }
      }
    }
    if (before === null && after === null) {
      return { ok: false, reason: seen ? `reference has no ${code} for this satellite` : 'not tracked by the reference within the correction age limit' };
    }
    const cb = before ? this.correctionOf(before, sat, code, eph) : null;
    const ca = after ? this.correctionOf(after, sat, code, eph) : null;
    const refSat = (before ?? after)!.sats.get(sat)!;
    const cn0 = refSat.cn0DbHz;
    const varianceFactorRef = refSat.varianceFactor;
    if (cb && ca && before && after) {
      const span = after.timeGpsS - before.timeGpsS;
      const w = span > 0 ? (tGpsS - before.timeGpsS) / span : 0;
      return {
        ok: true,
        correctionM: cb.correctionM + w * (ca.correctionM - cb.correctionM),
        ageS: Math.max(tGpsS - before.timeGpsS, after.timeGpsS - tGpsS),
        elevationRefRad: cb.elevationRad,
        cn0RefDbHz: cn0,
        varianceFactorRef,
      };
    }
    const one = cb ?? ca;
    const e = cb ? before! : after!;
    if (!one) return { ok: false, reason: 'satellite below the reference horizon' };
    return { ok: true, correctionM: one.correctionM, ageS: Math.abs(tGpsS - e.timeGpsS), elevationRefRad: one.elevationRad, cn0RefDbHz: cn0, varianceFactorRef };
  }

  /** Drops reference epochs that can no longer serve a rover epoch at or after t. Keeps one before the window. */
  prune(tGpsS: number, maxAgeS: number): void {
    let drop = 0;
    while (drop + 1 < this.epochs.length && this.epochs[drop + 1].timeGpsS < tGpsS - maxAgeS) drop++;
    if (drop > 0) this.epochs.splice(0, drop);
  }
}
