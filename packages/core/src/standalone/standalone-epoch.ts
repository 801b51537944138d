/**
 * Standalone (single-receiver) positioning of one epoch: the comparison point for the differential
 * solution. Per satellite: the broadcast orbit and clock at the transmission time (with Earth rotation),
 * the relativistic and group-delay terms, Saastamoinen/Niell troposphere, and either the ionosphere-free
 * code combination (two bands present) or the L1-band code with the Klobuchar model. One receiver clock
 * per constellation. Model: P = rho + c dt_r - c dt_sv + T + I + e (Misra & Enge 2011, eq. 5.8).
 * Ionosphere-free combination: P_IF = (f1^2 P1 - f2^2 P2) / (f1^2 - f2^2) (IS-GPS-200 20.3.3.3.3.3).
 * Galileo pairs E1 with E5b for an I/NAV clock and with E5a for an F/NAV clock (OS SIS ICD 5.1.5).
 * GLONASS rows carry an extra variance for the receiver's FDMA code inter-frequency biases (fdma-code-bias.ts).
 */
import type { EcefM, GnssSystem, SatId } from '../gnss/index.js';
import { satSystem } from '../gnss/index.js';
import type { ObsEpoch, ObsHeader, SatObservations } from '../gnss/index.js';
import type { Ephemeris, IonosphereCoefficients, KeplerEphemeris } from '../gnss/index.js';
import { chooseCode, carrierFrequencyHz } from '../gnss/index.js';
import { EphemerisStore, isGalileoFnav, SPEED_OF_LIGHT_MS, type SignalKind } from '../orbit/index.js';
import { satelliteForTag, signalStrengthDbHz } from '../observables/index.js';
import { azimuthElevation, ecefToGeodetic } from '../geodesy/index.js';
import { elevationVarianceM2, type ElevationWeightParams } from '../solve/index.js';
import { solvePositionFix, DEFAULT_FIX_OPTIONS, type FixOptions, type LinearRow, type PositionFix, type FixFailure } from '../solve/index.js';
import { PRIMARY_BAND, SECONDARY_BANDS, clockSignal } from '../observables/index.js';
import { codeMisclosureM, dayOfYear, lookFrom, type ReceiverLook } from '../observables/index.js';
import type { SatelliteResidual } from '../solve/index.js';
import { GLONASS_CODE_BIAS_SIGMA_M, glonassCodeBiasVarianceM2 } from './fdma-code-bias.js';

export type StandaloneMode = 'ionosphere-free' | 'single-frequency';

export interface StandaloneContext {
  readonly store: EphemerisStore;
  readonly iono: IonosphereCoefficients;
  readonly systems: readonly GnssSystem[];
  readonly elevationMaskRad: number;
  readonly weighting: ElevationWeightParams;
  /** 'auto': ionosphere-free where a satellite has two bands, else single-frequency with Klobuchar. */
  readonly frequencyMode: 'auto' | 'single';
  /** GLONASS slot -> frequency channel (header GLONASS SLOT / FRQ #, else from the navigation data). */
  readonly glonassChannels: ReadonlyMap<number, number>;
  readonly fix?: FixOptions;
  /**
   * Standard deviation (m) of the receiver's GLONASS code inter-frequency bias per band, added to the
   * variance of each GLONASS row (propagated through the ionosphere-free combination). Default
   * GLONASS_CODE_BIAS_SIGMA_M; 0 turns it off.
   */
  readonly glonassCodeBiasSigmaM?: number;
}

export interface StandaloneEpochResult {
  readonly fix: PositionFix | FixFailure;
  readonly modeBySystem: ReadonlyMap<GnssSystem, StandaloneMode>;
  readonly satellites: readonly SatelliteResidual[];
}

interface PreparedSat {
  readonly sat: SatId;
  readonly system: GnssSystem;
  readonly signal: string;
  readonly mode: StandaloneMode;
  readonly codeM: number;
  readonly satPos: EcefM;
  /** c * satellite clock (m), group delay and relativistic term included. */
  readonly satClockM: number;
  /** Frequency of the signal the ionosphere model is scaled to (NaN for ionosphere-free). */
  readonly frequencyHz: number;
  readonly cn0DbHz: number;
  /** Variance inflation of the combination relative to one code. */
  readonly noiseFactor: number;
  /** Variance of receiver biases that do not cancel in the constellation clock (GLONASS FDMA), m^2. */
  readonly biasVarianceM2: number;
}

function valueOf(s: SatObservations, code: string): number {
  const i = s.codes.indexOf(code);
  return i < 0 ? NaN : s.values[i];
}

function glonassChannel(sat: SatId, ctx: StandaloneContext): number | undefined {
  return ctx.glonassChannels.get(Number(sat.slice(1)));
}

function availablePseudoranges(s: SatObservations): string[] {
  const out: string[] = [];
  for (let i = 0; i < s.codes.length; i++) if (s.codes[i][0] === 'C' && Number.isFinite(s.values[i]) && s.values[i] > 1e6) out.push(s.codes[i]);
  return out;
}

/**
 * Galileo second band for the ionosphere-free pair with a record's clock: E5b goes with the I/NAV clock
 * (E1/E5b reference) and E5a with the F/NAV clock (E1/E5a reference), Galileo OS SIS ICD 5.1.5. `clock`:
 * the message whose record is needed, null when neither band was tracked.
 */
function galileoPair(eph: KeplerEphemeris, avail: readonly string[]): { clock: 'INAV' | 'FNAV' | null } {
  const has5 = chooseCode('E', avail, '5') !== null, has7 = chooseCode('E', avail, '7') !== null;
  if (isGalileoFnav(eph)) return { clock: has5 ? 'FNAV' : has7 ? 'INAV' : null };
  return { clock: has7 ? 'INAV' : has5 ? 'FNAV' : null };
}

/**
 * Code observable, satellite position and clock of one satellite: the single-band code c1 (c2 null) or
 * the ionosphere-free combination of c1 and c2 (mode 'single-frequency' when c2's frequency or value is missing).
 */
function prepareSat(
  s: SatObservations, system: GnssSystem, c1: string, c2: string | null, eph: Ephemeris, k: number | undefined,
  tagGpsS: number, header: ObsHeader, ctx: StandaloneContext, receiverClockM: number,
): PreparedSat {
  const p1 = valueOf(s, c1);
  const f1 = carrierFrequencyHz(system, c1, k);
  let mode: StandaloneMode = 'single-frequency';
  let codeM = p1;
  let signalKind: SignalKind | undefined = clockSignal(system, c1[1]);
  let extraBiasM = 0;
  let noiseFactor = 1;
  let signal = c1;
  if (c2 !== null) {
    const f2 = carrierFrequencyHz(system, c2, k);
    const p2 = valueOf(s, c2);
    if (Number.isFinite(f1) && Number.isFinite(f2) && Number.isFinite(p2)) {
      const g1 = f1 * f1, g2 = f2 * f2;
      codeM = (g1 * p1 - g2 * p2) / (g1 - g2);
      noiseFactor = (g1 * g1 + g2 * g2) / ((g1 - g2) * (g1 - g2));
      mode = 'ionosphere-free';
      signal = `${c1}+${c2}`;
      if (system === 'G' || system === 'J') signalKind = c1 === 'C1C' || c1 === 'C1W' ? 'L1L2-IF' : signalKind;
      if (system === 'E') signalKind = c2[1] === '5' ? 'E1E5a-IF' : 'E1E5b-IF';
      if (system === 'C' && eph.kind === 'kepler') {
        // BeiDou clocks refer to B3I; B1I is late by TGD1, B2I by TGD2 (BeiDou ICD B1I 5.2.4.10), so the
        // combination a P1 - b P2 (a = g1/(g1-g2), b = g2/(g1-g2)) is late by c (a TGD1 - b TGD2); B3I: TGD 0.
        signalKind = 'B3I';
        const tgd2S = c2[1] === '7' && Number.isFinite(eph.tgd2S) ? eph.tgd2S : 0;
        extraBiasM = SPEED_OF_LIGHT_MS * ((g1 / (g1 - g2)) * eph.tgdS - (g2 / (g1 - g2)) * tgd2S);
      }
      if (system === 'R') signalKind = 'G1';
    }
  }
  const at = satelliteForTag(eph, tagGpsS, codeM, receiverClockM, null, signalKind);
  return {
    sat: s.sat, system, signal, mode, codeM: codeM - extraBiasM,
    satPos: at.posM, satClockM: SPEED_OF_LIGHT_MS * at.clock.offsetS,
    frequencyHz: mode === 'single-frequency' ? f1 : NaN,
    cn0DbHz: signalStrengthDbHz(s, c1), noiseFactor,
    // Independent per-band biases propagate like the noise (a^2 + b^2 for the combination, 1 for one band).
    biasVarianceM2: system === 'R' ? glonassCodeBiasVarianceM2(ctx.glonassCodeBiasSigmaM ?? GLONASS_CODE_BIAS_SIGMA_M, noiseFactor) : 0,
  };
}

/**
 * Solves one epoch standalone. `x0`: a starting position (previous fix or header), else the Earth's centre.
 * Satellite positions need the receiver clock for the Earth rotation during the flight
 * (positioning/satellite-for-tag.ts): a first solve assumes `clockHintM` (default 0); when the clock found
 * differs by more than 30 m (0.1 us), the epoch is solved again with it.
 */
export function solveStandaloneEpoch(epoch: ObsEpoch, header: ObsHeader, ctx: StandaloneContext, x0: EcefM | null, clockHintM = 0): StandaloneEpochResult {
  const first = solveWithClock(epoch, header, ctx, x0, clockHintM);
  if (!first.fix.ok) return first;
  const clockM = first.fix.clocksM.values().next().value ?? clockHintM;
  if (Math.abs(clockM - clockHintM) <= 30) return first;
  return solveWithClock(epoch, header, ctx, first.fix.positionM, clockM);
}

function solveWithClock(epoch: ObsEpoch, header: ObsHeader, ctx: StandaloneContext, x0: EcefM | null, receiverClockM: number): StandaloneEpochResult {
  const reasons = new Map<SatId, { signal: string; reason: string }>();
  const prepared: PreparedSat[] = [];
  const candidates: { dual: PreparedSat | null; single: () => PreparedSat }[] = [];
  const modeBySystem = new Map<GnssSystem, StandaloneMode>();
  for (const s of epoch.sats) {
    const system = satSystem(s.sat);
    if (!ctx.systems.includes(system)) { reasons.set(s.sat, { signal: '', reason: 'constellation not selected' }); continue; }
    const avail = availablePseudoranges(s);
    const c1 = chooseCode(system, avail, PRIMARY_BAND[system]);
    let sel = ctx.store.select(s.sat, epoch.tagGpsS);
    if (sel.eph === null) {
      reasons.set(s.sat, { signal: c1 ?? '', reason: sel.reason === 'too-old' ? `ephemeris too old (${Math.round((sel.ageS ?? 0) / 60)} min)` : sel.reason === 'unhealthy' ? 'unhealthy ephemeris' : 'no ephemeris' });
      continue;
    }
    if (c1 === null) { reasons.set(s.sat, { signal: '', reason: 'no pseudorange on the primary band' }); continue; }
    let c2: string | null = null;
    if (ctx.frequencyMode === 'auto') {
      for (const band of SECONDARY_BANDS[system]) { c2 = chooseCode(system, avail, band); if (c2) break; }
    }
    if (system === 'E' && c2 !== null && sel.eph !== null && sel.eph.kind === 'kepler') {
      // The Galileo clock is referred to E1/E5b (I/NAV) or E1/E5a (F/NAV) (OS SIS ICD 5.1.5): pair the
      // second band with the record's message, taking the other message's record when only its band was tracked.
      const want = galileoPair(sel.eph, avail);
      if (want.clock !== null && (want.clock === 'FNAV') !== isGalileoFnav(sel.eph)) {
        const other = ctx.store.select(s.sat, epoch.tagGpsS, { galileoClock: want.clock });
        if (other.eph !== null && other.eph.kind === 'kepler' && (want.clock === 'FNAV') === isGalileoFnav(other.eph)) sel = other;
      }
      c2 = sel.eph !== null && sel.eph.kind === 'kepler' ? chooseCode('E', avail, isGalileoFnav(sel.eph) ? '5' : '7') : null;
    }
    if (sel.eph === null) { reasons.set(s.sat, { signal: c1, reason: 'no ephemeris' }); continue; }
    const eph = sel.eph;
    const k = system === 'R' ? glonassChannel(s.sat, ctx) : undefined;
    const single = (): PreparedSat => prepareSat(s, system, c1, null, eph, k, epoch.tagGpsS, header, ctx, receiverClockM);
    const dual = c2 !== null ? prepareSat(s, system, c1, c2, eph, k, epoch.tagGpsS, header, ctx, receiverClockM) : null;
    candidates.push({ dual: dual !== null && dual.mode === 'ionosphere-free' ? dual : null, single });
  }
  // One mode per constellation and epoch: ionosphere-free when at least two of its satellites have both
  // bands (a constellation clock then stays determined), the satellites lacking the second band being
  // left out; else every satellite single-frequency. Mixing both in one clock would merge the receiver's
  // ionosphere-free and single-band code biases, and a single-band row with the ionosphere model's
  // error would outweigh the noisier combination (common practice: one observable per clock).
  const dualCount = new Map<GnssSystem, number>();
  for (const c of candidates) if (c.dual) dualCount.set(c.dual.system, (dualCount.get(c.dual.system) ?? 0) + 1);
  for (const c of candidates) {
    if (c.dual !== null && (dualCount.get(c.dual.system) ?? 0) >= 2) { prepared.push(c.dual); continue; }
    const sf = c.single();
    if ((dualCount.get(sf.system) ?? 0) >= 2) {
      reasons.set(sf.sat, { signal: sf.signal, reason: 'no second-band pseudorange (its constellation is solved ionosphere-free)' });
      continue;
    }
    prepared.push(sf);
  }
  for (const p of prepared) if (!modeBySystem.has(p.system) || p.mode === 'single-frequency') modeBySystem.set(p.system, p.mode);
  const doy = dayOfYear(epoch.tagGpsS);
  const geometry = new Map<SatId, { el: number; az: number; variance: number }>();
  const maskReasons = new Map<SatId, string>();
  const build = (x: EcefM, excluded: ReadonlySet<SatId>): LinearRow[] => {
    const rows: LinearRow[] = [];
    const nearSurface = Math.hypot(x.x, x.y, x.z) > 6.0e6;
    const g = ecefToGeodetic(x);
    maskReasons.clear();
    for (const p of prepared) {
      if (excluded.has(p.sat)) continue;
      const dx = p.satPos.x - x.x, dy = p.satPos.y - x.y, dz = p.satPos.z - x.z;
      const range = Math.sqrt(dx * dx + dy * dy + dz * dz);
      // Far from the surface (the first iterations from the Earth's centre) there is no sky: no mask, no atmosphere.
      let look: ReceiverLook = { elevationRad: Math.PI / 2, azimuthRad: 0, troposphereM: 0, ionosphereM: 0 };
      if (nearSurface) {
        // Ionosphere-free rows carry no ionosphere: the model is asked for none (frequency NaN).
        look = lookFrom(x, g, p.satPos, p.system, p.mode === 'single-frequency' ? p.frequencyHz : NaN, ctx.iono, epoch.tagGpsS, doy, ctx.elevationMaskRad);
        if (look.elevationRad < ctx.elevationMaskRad) {
          maskReasons.set(p.sat, `below elevation mask (${(look.elevationRad * 180 / Math.PI).toFixed(1)} deg)`);
          geometry.set(p.sat, { el: look.elevationRad, az: look.azimuthRad, variance: NaN });
          continue;
        }
      }
      const el = look.elevationRad, az = look.azimuthRad;
      const variance = elevationVarianceM2(el, ctx.weighting, p.cn0DbHz) * p.noiseFactor + p.biasVarianceM2;
      geometry.set(p.sat, { el, az, variance });
      rows.push({
        sat: p.sat, system: p.system, losX: dx / range, losY: dy / range, losZ: dz / range,
        misclosureM: codeMisclosureM(p.codeM, range, p.satClockM, look), varianceM2: variance,
      });
    }
    return rows;
  };
  const start = x0 ?? { x: 0, y: 0, z: 0 };
  const fix = solvePositionFix(build, start, ctx.fix ?? DEFAULT_FIX_OPTIONS);
  const satellites: SatelliteResidual[] = [];
  const usedBySat = new Map(fix.ok ? fix.used.map((u) => [u.row.sat, u] as const) : []);
  const rejBySat = new Map(fix.rejected.map((r) => [r.sat, r] as const));
  for (const s of epoch.sats) {
    const pre = reasons.get(s.sat);
    const p = prepared.find((q) => q.sat === s.sat);
    const geo = geometry.get(s.sat);
    const u = usedBySat.get(s.sat);
    const rej = rejBySat.get(s.sat);
    const reason = pre?.reason ?? maskReasons.get(s.sat) ?? rej?.reason ?? (u ? '' : fix.ok ? 'not used' : `no solution: ${fix.reason}`);
    satellites.push({
      sat: s.sat,
      signal: p?.signal ?? pre?.signal ?? '',
      elevationDeg: geo ? (geo.el * 180) / Math.PI : NaN,
      azimuthDeg: geo ? (geo.az * 180) / Math.PI : NaN,
      residualM: u ? u.residualM : NaN,
      weight: u ? 1 / u.row.varianceM2 : 0,
      wTest: u ? u.wTest : rej ? rej.wTest : NaN,
      used: u !== undefined,
      reason,
    });
  }
  return { fix, modeBySystem, satellites };
}
