/**
 * Observation epochs of one simulated receiver, generated on the fly (bounded memory: a 24 h, 1 Hz
 * session streams through without being held).
 *
 * Model (per satellite s, carrier k with wavelength lambda_k, true reception time t, transmission time
 * t_tx from the light-time solution; Hofmann-Wellenhof et al., "GNSS", 2008, eqs. 5.1-5.3, and
 * IS-GPS-200 20.3.3.3.3 for the satellite clock):
 *   tag = t + dt_rx(t)                                    (receiver time, as raw receivers tag epochs)
 *   P_k = rho + c (dt_rx - dt_s,k) + I_k + T + e_P + M + F
 *   L_k = (rho + c (dt_rx' - dt_s,k) - I_k + T + e_L + m) / lambda_k + N_k          (cycles)
 *   D_k = -(d rho/dt + c (d dt_rx/dt - d dt_s/dt)) / lambda_k + e_D                   (Hz)
 * with I_k = I_1 (f_1/f_k)^2 (first-order ionosphere: the phase advances by what the code is delayed:
 * code-carrier divergence), dt_s,k the broadcast clock for the signal (group delay included) plus the
 * clock error, dt_rx' the clock seen by the phase (continuous or stepping with the code, per profile),
 * N_k an integer that changes at each cycle slip and each re-acquisition (LLI bit 0 set then: RINEX 3.04
 * 5.7), M / m code / carrier multipath, F a faulty-satellite step. The antenna phase centre is the ARP.
 * C/N0 grows linearly with sin(elevation) between the profile's horizon and zenith values (common
 * practice); the signal strength digit is floor(C/N0 / 6) clamped to 1..9 (RINEX 3.04 5.7 table).
 */
import type { EcefM, SatId } from '@refdelta/core';
import type { HeaderEvent, ObsEpoch, SatObservations } from '@refdelta/core';
import { LLI_LOST_LOCK } from '@refdelta/core';
import { azimuthElevation, ecefToGeodetic } from '@refdelta/core';
import { calendarFromSeconds, daysFromCivil } from '@refdelta/core';
import type { ReceiverProfile, ResolvedErrors } from './errors.js';
import type { IonoTruth } from './iono-truth.js';
import type { TropoTruth } from './tropo-truth.js';
import type { ReceiverClock } from './receiver-clock.js';
import type { TrueSky } from './true-sky.js';
import { C_MS } from './true-sky.js';
import { Rng } from './rng.js';
import { sumOfSinusoids, type SlowProcess } from './slow-process.js';
import { poissonWindows, windowAt, type Window } from './event-plan.js';
import { CARRIER_HZ, carrierHz, clockSignal, codeInfo, type Band, type SimSystem } from './signals.js';

/** Elevation mask (rad): 5 deg (common practice for recording). */
export const RECORDING_MASK_RAD = (5 * Math.PI) / 180;

export interface ReceiverSetup {
  /** 'reference' or 'rover': names the random streams. */
  readonly role: 'reference' | 'rover';
  readonly seed: number | string;
  readonly sky: TrueSky;
  readonly profile: ReceiverProfile;
  readonly errors: ResolvedErrors;
  readonly iono: IonoTruth | null;
  readonly tropo: TropoTruth | null;
  readonly clock: ReceiverClock;
  /** ARP and its velocity at true GPS time. */
  positionAt(tGpsS: number): EcefM;
  velocityAt(tGpsS: number): EcefM;
  /** Epoch tags (receiver time): first, interval, count. */
  readonly firstTagGpsS: number;
  readonly intervalS: number;
  readonly epochCount: number;
  /** Codes per system, the same arrays as in the header (shared, not copied). */
  readonly codes: Readonly<Partial<Record<SimSystem, readonly string[]>>>;
  /** GLONASS slot -> frequency channel k (needed when codes.R is given). */
  readonly glonassChannels?: ReadonlyMap<number, number>;
  /**
   * GLONASS inter-channel biases of this receiver (m per channel number k, code and phase): a property of
   * the receiver's design, the same for receivers of one type (scenario.ts draws them from the type).
   */
  readonly glonassBiasMPerChannel?: { readonly code: number; readonly phase: number };
  /** Event epochs (flags 2, 3) to emit just before the data epoch with this tag index. */
  readonly eventsBefore?: ReadonlyMap<number, readonly HeaderEvent[]>;
}

interface TrackState {
  /** Integer ambiguity per band (cycles). */
  n1: number;
  n2: number;
  /** Set on the first epoch after (re)acquisition or a slip. */
  lli: boolean;
}

const SYSTEM_ORDER: Readonly<Record<string, number>> = { G: 0, E: 1, R: 2 };

function satOrder(a: SatId, b: SatId): number {
  const sa = SYSTEM_ORDER[a[0]!]!, sb = SYSTEM_ORDER[b[0]!]!;
  return sa - sb || (a < b ? -1 : a > b ? 1 : 0);
}

/** Day of year (1-based, fractional) of a GPS instant on the GPS calendar. */
function dayOfYear(tGpsS: number): number {
  const c = calendarFromSeconds(tGpsS);
  const jan1 = daysFromCivil(c.year, 1, 1);
  const d = daysFromCivil(c.year, c.month, c.day);
  return d - jan1 + 1 + (c.hour + c.minute / 60 + c.second / 3600) / 24;
}

/** Generates the receiver's epochs; iterate as often as wanted (each pass restarts every random stream). */
export class ReceiverSimulation {
  readonly epochGaps: readonly Window[];
  readonly dropouts: readonly Window[];
  readonly faults: readonly Window[];
  readonly lastTagGpsS: number;
  private readonly sats: SatId[];

  constructor(private readonly setup: ReceiverSetup) {
    const s = setup;
    const e = s.errors;
    const t0 = s.firstTagGpsS;
    const t1 = s.firstTagGpsS + (s.epochCount - 1) * s.intervalS;
    this.lastTagGpsS = t1;
    const rng = new Rng(s.seed, 'plan', s.role);
    const gapsHere = e.gaps !== null && (e.gaps.receivers === 'both' || s.role === 'rover');
    // Keep the first and last minute free so TIME OF FIRST/LAST OBS hold.
    this.epochGaps = gapsHere ? poissonWindows(rng, e.gaps!.epochGapsPerHour, t0 + 60, t1 - 60, e.gaps!.epochGapMinS, e.gaps!.epochGapMaxS) : [];
    this.dropouts = gapsHere ? poissonWindows(rng, e.gaps!.dropoutsPerHour, t0, t1, e.gaps!.dropoutMinS, e.gaps!.dropoutMaxS) : [];
    this.faults = e.faults !== null && s.role === 'rover'
      ? poissonWindows(rng, e.faults.perHour, t0, t1, e.faults.durationS, e.faults.durationS, e.faults.minStepM, e.faults.maxStepM)
      : [];
    this.sats = s.sky.satellites().filter((x) => s.codes[x[0] as SimSystem] !== undefined).sort(satOrder);
  }

  /** Whole epochs in a logging gap are not emitted. */
  isGapTag(tagGpsS: number): boolean {
    return windowAt(this.epochGaps, tagGpsS) >= 0;
  }

  /**
   * The epochs (data epochs with flag 0, and event epochs with flags 2/3 where the plan says). `trueAmbiguities`,
   * when given, is told the integer ambiguity (cycles) of each satellite's L1 and L2 phase at every data epoch:
   * the known integers of self-consistency tests.
   */
  *epochs(trueAmbiguities?: (tagGpsS: number, sat: SatId, n1Cycles: number, n2Cycles: number) => void): Generator<ObsEpoch> {
    const s = this.setup;
    const e = s.errors;
    const role = s.role;
    const noise = new Rng(s.seed, 'noise', role);
    const slipRng = new Rng(s.seed, 'slips', role);
    const ambRng = new Rng(s.seed, 'ambiguity', role);
    const slipPerEpoch = e.slips === null ? 0 : ((role === 'rover' ? e.slips.roverPerSatHour : e.slips.referencePerSatHour) * s.intervalS) / 3600;
    const mpOn = e.multipath !== null && (e.multipath.receivers === 'both' || role === 'rover');
    const multipath = new Map<SatId, SlowProcess>();
    const tracks = new Map<SatId, TrackState>();
    const dropoutSat = new Map<number, SatId>();
    const faultSat = new Map<number, SatId>();
    const p = s.profile;
    const lambda1 = C_MS / CARRIER_HZ[1];
    const lambda2 = C_MS / CARRIER_HZ[2];

    for (let k = 0; k < s.epochCount; k++) {
      const tag = s.firstTagGpsS + k * s.intervalS;
      const evs = s.eventsBefore?.get(k);
      if (evs !== undefined) {
        for (const ev of evs) {
          yield { tagGpsS: tag, flag: ev.kind === 'start-moving' ? 2 : 3, receiverClockOffsetS: null, line: 0, sats: [], event: ev };
        }
      }
      if (this.isGapTag(tag)) continue;
      // True reception time: tag = t + dt_rx(t), solved by fixed-point iteration (dt_rx < 1 ms, slowly varying).
      let t = tag;
      for (let i = 0; i < 3; i++) t = tag - s.clock.codeOffsetS(t);
      // The code clock term is taken as tag - t (an exact difference), so P = c (tag - t_tx,sat) holds to the
      // last bit whatever the fixed-point residual (doubles near 1.4e9 s resolve only 0.24 us).
      const dtCode = tag - t;
      const dtPhase = dtCode + (s.clock.phaseOffsetS(t) - s.clock.codeOffsetS(t));
      const dtDrift = s.clock.driftSS(t);
      const rx = s.positionAt(t);
      const rxVel = s.velocityAt(t);
      const g = ecefToGeodetic(rx);
      const doy = s.tropo !== null ? dayOfYear(t) : 0;

      // Satellites in view (above the mask) this epoch.
      const inView: { sat: SatId; lt: ReturnType<TrueSky['lightTime']>; elRad: number; azRad: number }[] = [];
      for (const sat of this.sats) {
        const lt = s.sky.lightTime(sat, rx, rxVel, t);
        const ae = azimuthElevation(rx, lt.satPosM, g.latRad, g.lonRad);
        if (ae.elevationRad < RECORDING_MASK_RAD) { tracks.delete(sat); continue; }
        inView.push({ sat, lt, elRad: ae.elevationRad, azRad: ae.azimuthRad });
      }
      const dIdx = windowAt(this.dropouts, tag);
      if (dIdx >= 0 && !dropoutSat.has(dIdx) && inView.length > 0) {
        dropoutSat.set(dIdx, inView[Math.floor(this.dropouts[dIdx]!.pick * inView.length)]!.sat);
      }
      const fIdx = windowAt(this.faults, tag);
      if (fIdx >= 0 && !faultSat.has(fIdx) && inView.length > 0) {
        faultSat.set(fIdx, inView[Math.floor(this.faults[fIdx]!.pick * inView.length)]!.sat);
      }
      const lostSat = dIdx >= 0 ? dropoutSat.get(dIdx) : undefined;
      const faultySat = fIdx >= 0 ? faultSat.get(fIdx) : undefined;

      const out: SatObservations[] = [];
      for (const v of inView) {
        const sat = v.sat;
        if (sat === lostSat) { tracks.delete(sat); continue; }
        const system = sat[0] as SimSystem;
        const codes = s.codes[system]!;
        // GLONASS: the satellite's own carriers (FDMA) and the receiver's inter-channel biases.
        const glonassK = system === 'R' ? s.glonassChannels?.get(Number(sat.slice(1))) ?? NaN : 0;
        const lambdaSat1 = system === 'R' ? C_MS / carrierHz('R', 1, glonassK) : lambda1;
        const lambdaSat2 = system === 'R' ? C_MS / carrierHz('R', 2, glonassK) : lambda2;
        const ionoScale2 = system === 'R' ? (CARRIER_HZ[1] / carrierHz('R', 2, glonassK)) ** 2 : (CARRIER_HZ[1] / CARRIER_HZ[2]) ** 2;
        const ionoScale1 = system === 'R' ? (CARRIER_HZ[1] / carrierHz('R', 1, glonassK)) ** 2 : 1;
        const icbCodeM = system === 'R' ? (s.glonassBiasMPerChannel?.code ?? 0) * glonassK : 0;
        const icbPhaseM = system === 'R' ? (s.glonassBiasMPerChannel?.phase ?? 0) * glonassK : 0;
        let tr = tracks.get(sat);
        if (tr === undefined) {
          // (Re)acquisition: fresh ambiguities (arbitrary integers, as receivers start their phase count).
          tr = { n1: ambRng.int(-5_000_000, 5_000_000), n2: ambRng.int(-5_000_000, 5_000_000), lli: true };
          tracks.set(sat, tr);
        } else if (slipPerEpoch > 0 && slipRng.uniform() < slipPerEpoch) {
          const max = e.slips!.maxCycles;
          tr.n1 += slipRng.sign() * slipRng.int(1, max);
          tr.n2 += slipRng.sign() * slipRng.int(1, max);
          tr.lli = true;
        }
        const sinEl = Math.sin(v.elRad);
        const rho = v.lt.rangeM;
        const iono1 = s.iono !== null ? s.iono.slantDelayL1M(g.latRad, g.lonRad, v.elRad, v.azRad, t) : 0;
        const tropo = s.tropo !== null ? s.tropo.slantDelayM(g.latRad, g.heightM, v.elRad, doy, t) : 0;
        let mp = 0;
        if (mpOn) {
          let proc = multipath.get(sat);
          if (proc === undefined) {
            const r = new Rng(s.seed, 'multipath', role, sat);
            const amp = r.between(e.multipath!.minAmplitudeM, e.multipath!.maxAmplitudeM);
            proc = sumOfSinusoids(r, amp / Math.SQRT2, e.multipath!.minPeriodS, e.multipath!.maxPeriodS);
            multipath.set(sat, proc);
          }
          const cosEl = Math.cos(v.elRad);
          mp = proc.at(t) * cosEl * cosEl;
        }
        const fault = sat === faultySat ? this.faults[fIdx]!.value : 0;
        const codeSigma = p.codeNoiseAM + p.codeNoiseBM / sinEl;
        const phaseSigma = (p.phaseNoiseM * (1 + 1 / sinEl)) / 2;
        const cn0 = p.cn0HorizonDbHz + (p.cn0ZenithDbHz - p.cn0HorizonDbHz) * sinEl;
        const cn0Noisy = e.codeNoise ? cn0 + 0.7 * noise.normal() : cn0;
        const cn0Written = Math.round(cn0Noisy * 4) / 4;
        const ssi = Math.min(9, Math.max(1, Math.floor(cn0Written / 6)));
        const satDrift = s.sky.clockDriftSS(sat, v.lt.txGpsS);
        const satClock: Record<Band, number> = {
          1: s.sky.clockOffsetS(sat, v.lt.txGpsS, clockSignal(system, 1)),
          2: codes.some((x) => x[1] === '2') ? s.sky.clockOffsetS(sat, v.lt.txGpsS, clockSignal(system, 2)) : 0,
        };

        const values = new Float64Array(codes.length);
        const lli = new Uint8Array(codes.length);
        const ssiArr = new Uint8Array(codes.length);
        for (let c = 0; c < codes.length; c++) {
          const info = codeInfo(codes[c]!);
          const band = info.band;
          const lambda = band === 1 ? lambdaSat1 : lambdaSat2;
          const ionoK = band === 1 ? (system === 'R' ? iono1 * ionoScale1 : iono1) : iono1 * ionoScale2;
          switch (info.kind) {
            case 'C': {
              const n = e.codeNoise ? codeSigma * noise.normal() : 0;
              values[c] = rho + C_MS * (dtCode - satClock[band]) + ionoK + tropo + n + mp + fault + icbCodeM;
              ssiArr[c] = ssi;
              break;
            }
            case 'L': {
              const n = e.phaseNoise ? phaseSigma * noise.normal() : 0;
              const mpL = mp * (e.multipath?.phaseFraction ?? 0);
              values[c] = (rho + C_MS * (dtPhase - satClock[band]) - ionoK + tropo + n + mpL + icbPhaseM) / lambda + (band === 1 ? tr.n1 : tr.n2);
              lli[c] = tr.lli ? LLI_LOST_LOCK : 0;
              ssiArr[c] = ssi;
              break;
            }
            case 'D': {
              const n = e.codeNoise ? p.dopplerNoiseHz * noise.normal() : 0;
              values[c] = -(v.lt.rangeRateMS + C_MS * (dtDrift - satDrift)) / lambda + n;
              ssiArr[c] = ssi;
              break;
            }
            case 'S':
              values[c] = band === 1 ? cn0Written : Math.round((cn0Written - 6) * 4) / 4; // L2 P(Y) semi-codeless: weaker (common practice)
              break;
          }
        }
        tr.lli = false;
        trueAmbiguities?.(tag, sat, tr.n1, tr.n2);
        out.push({ sat, codes, values, lli, ssi: ssiArr });
      }
      yield { tagGpsS: tag, flag: 0, receiverClockOffsetS: null, line: 0, sats: out, event: null };
    }
  }
}
