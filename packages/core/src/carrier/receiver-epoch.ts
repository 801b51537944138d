/**
 * One receiver's epoch made ready for differencing: per satellite the primary band's code and phase (and,
 * when asked, those of further bands: further-bands.ts) with the satellite at transmission, its broadcast clock, and the receiver clock estimated from the code, so
 * that geometry is computed at the epoch's estimated GPS time, not at its receiver-time tag
 * (IS-GPS-200 20.3.3.4.3.3.2; see positioning/satellite-for-tag.ts).
 */
import type { EcefM, GnssSystem, SatId } from '../gnss/index.js';
import { satSystem } from '../gnss/index.js';
import type { ObsEpoch, SatObservations } from '../gnss/index.js';
import type { Ephemeris } from '../gnss/index.js';
import { carrierWavelengthM, pseudorangePriority } from '../gnss/index.js';
import { EphemerisStore, SPEED_OF_LIGHT_MS } from '../orbit/index.js';
import { satelliteForTag } from '../observables/index.js';
import { clockSignal, PRIMARY_BAND } from '../observables/index.js';
import { bandSignal, furtherBands, hasFurtherBands, type CarrierFrequencies } from './further-bands.js';

/** One signal of a satellite: code, phase and their companions on one band. */
export interface ReceiverSignal {
  /** RINEX band digit. */
  readonly band: string;
  readonly code: string;
  readonly codeM: number;
  /** Carrier phase (cycles), NaN when blank. */
  readonly phaseCycles: number;
  readonly dopplerHz: number;
  readonly lli: number;
  readonly cn0DbHz: number;
  readonly wavelengthM: number;
}

export interface ReceiverSat extends ReceiverSignal {
  readonly sat: SatId;
  readonly system: GnssSystem;
  /** Signals on further bands with phase (further-bands.ts); empty unless asked for. */
  readonly more: readonly ReceiverSignal[];
  eph: Ephemeris;
  /** Satellite at transmission in the ECEF frame of the receive time (m). */
  posM: EcefM;
  /** Broadcast satellite clock offset times c (m). */
  satClockM: number;
}

export interface ReceiverEpoch {
  readonly tagGpsS: number;
  /** Estimated GPS time of the epoch. */
  readonly timeGpsS: number;
  /** Receiver clock offset times c (m) from the code at the given position. */
  readonly clockM: number;
  readonly sats: ReceiverSat[];
  /** Every satellite the file's epoch lists, of the systems read (also those not in `sats`: no signal, no ephemeris). */
  readonly listed: SatId[];
}

export interface ReceiverContext {
  readonly store: EphemerisStore;
  readonly systems: readonly GnssSystem[];
  readonly glonassChannels: ReadonlyMap<number, number>;
  /** Read the further bands' signals too (default: the primary band only). */
  readonly frequencies?: CarrierFrequencies;
}

function value(s: SatObservations, code: string): number {
  const i = s.codes.indexOf(code);
  return i < 0 ? NaN : s.values[i];
}

function lliOf(s: SatObservations, code: string): number {
  const i = s.codes.indexOf(code);
  return i < 0 ? 0 : s.lli[i];
}

/** A candidate pseudorange code and where it and its companions (same band and attribute) are in a list of observation codes (-1: not listed). */
interface SignalSlots {
  readonly code: string;
  readonly codeIndex: number;
  readonly phaseIndex: number;
  readonly dopplerIndex: number;
  readonly strengthIndex: number;
}

/**
 * Per list of observation codes (one array object per system and file, gnss/obs-types.ts) and system: the
 * primary band's pseudorange codes in the order chooseSignal tries them (priority order of
 * rinex/obs-codes.ts, then the band's other codes in file order), with their slots. Found once per list,
 * not per satellite and epoch.
 */
const PRIMARY_CANDIDATES = new WeakMap<readonly string[], Map<GnssSystem, readonly SignalSlots[]>>();

function primaryCandidates(system: GnssSystem, codes: readonly string[]): readonly SignalSlots[] {
  let bySystem = PRIMARY_CANDIDATES.get(codes);
  if (!bySystem) PRIMARY_CANDIDATES.set(codes, (bySystem = new Map()));
  let list = bySystem.get(system);
  if (!list) {
    const band = PRIMARY_BAND[system];
    const tried = [...pseudorangePriority(system, band), ...codes.filter((c) => c[0] === 'C' && c[1] === band)];
    list = tried.map((c) => {
      const tail = c.slice(1);
      return { code: c, codeIndex: codes.indexOf(c), phaseIndex: codes.indexOf('L' + tail), dopplerIndex: codes.indexOf('D' + tail), strengthIndex: codes.indexOf('S' + tail) };
    });
    bySystem.set(system, list);
  }
  return list;
}

function valueAt(s: SatObservations, i: number): number {
  return i < 0 ? NaN : s.values[i];
}

/** The first code of the primary band with both a pseudorange and a phase, else with a pseudorange (primaryCandidates' order). */
function chooseSignal(system: GnssSystem, s: SatObservations): SignalSlots | null {
  const tried = primaryCandidates(system, s.codes);
  for (const c of tried) {
    const p = valueAt(s, c.codeIndex);
    if (p > 1e6 && p < 1e9 && c.phaseIndex >= 0) return c;
  }
  for (const c of tried) {
    const p = valueAt(s, c.codeIndex);
    if (p > 1e6 && p < 1e9) return c;
  }
  return null;
}

const NO_SIGNALS: readonly ReceiverSignal[] = [];

function signalOf(s: SatObservations, band: string, code: string, wavelengthM: number): ReceiverSignal {
  const tail = code.slice(1);
  const phase = value(s, 'L' + tail);
  return {
    band, code, codeM: value(s, code),
    phaseCycles: Number.isFinite(phase) && phase !== 0 ? phase : NaN,
    dopplerHz: value(s, 'D' + tail), lli: lliOf(s, 'L' + tail), cn0DbHz: value(s, 'S' + tail), wavelengthM,
  };
}

function median(v: number[]): number {
  if (v.length === 0) return NaN;
  const s = [...v].sort((a, b) => a - b);
  const m = s.length >> 1;
  return s.length % 2 ? s[m] : 0.5 * (s[m - 1] + s[m]);
}

/** Satellite position and clock for a receiver clock estimate (Earth rotation over the true flight time). */
export function placeSatellite(s: ReceiverSat, tagGpsS: number, clockM: number): void {
  const at = satelliteForTag(s.eph, tagGpsS, s.codeM, clockM, null, clockSignal(s.system, s.code[1]));
  s.posM = at.posM;
  s.satClockM = SPEED_OF_LIGHT_MS * at.clock.offsetS;
}

/**
 * The receiver clock (m): the median code residual of the satellites placed for the clock `clk` (m) at the
 * position `atM`.
 */
function receiverClockM(sats: readonly ReceiverSat[], tagGpsS: number, atM: EcefM, clk: number): number {
  const samples: number[] = [];
  for (const s of sats) {
    placeSatellite(s, tagGpsS, clk);
    samples.push(s.codeM - Math.hypot(s.posM.x - atM.x, s.posM.y - atM.y, s.posM.z - atM.z) + s.satClockM);
  }
  return median(samples);
}

/**
 * Prepares an epoch at an approximate position (within a few km: the clock is a median of code
 * residuals). `clockGuessM` is the previous epoch's clock (0 at first).
 */
export function prepareReceiverEpoch(e: ObsEpoch, ctx: ReceiverContext, atM: EcefM, clockGuessM: number): ReceiverEpoch {
  const sats: ReceiverSat[] = [];
  const listed: SatId[] = [];
  for (const s of e.sats) {
    const system = satSystem(s.sat);
    if (!ctx.systems.includes(system)) continue;
    listed.push(s.sat);
    const sig = chooseSignal(system, s);
    if (sig === null) continue;
    const code = sig.code;
    const k = system === 'R' ? ctx.glonassChannels.get(Number(s.sat.slice(1))) : undefined;
    const wavelengthM = carrierWavelengthM(system, code, k);
    if (!Number.isFinite(wavelengthM)) continue;
    const sel = ctx.store.select(s.sat, e.tagGpsS);
    if (sel.eph === null) continue;
    let more: readonly ReceiverSignal[] = NO_SIGNALS;
    if (ctx.frequencies === 'all' && hasFurtherBands(system, s.codes)) {
      const found: ReceiverSignal[] = [];
      for (const band of furtherBands(system)) {
        const c = bandSignal(system, band, s);
        const w = c === null ? NaN : carrierWavelengthM(system, c, k);
        if (c !== null && Number.isFinite(w)) found.push(signalOf(s, band, c, w));
      }
      if (found.length) more = found;
    }
    const phase = valueAt(s, sig.phaseIndex);
    sats.push({
      sat: s.sat, system, band: code[1], code, codeM: valueAt(s, sig.codeIndex),
      phaseCycles: Number.isFinite(phase) && phase !== 0 ? phase : NaN,
      dopplerHz: valueAt(s, sig.dopplerIndex), lli: sig.phaseIndex < 0 ? 0 : s.lli[sig.phaseIndex], cn0DbHz: valueAt(s, sig.strengthIndex),
      wavelengthM, more, eph: sel.eph, posM: atM, satClockM: 0,
    });
  }
  const guess = Number.isFinite(clockGuessM) ? clockGuessM : 0;
  let clockM = receiverClockM(sats, e.tagGpsS, atM, guess);
  // A clock far from the guess (first epoch, a millisecond step): redo the Earth rotation with it.
  if (Number.isFinite(clockM) && Math.abs(clockM - guess) > 30) clockM = receiverClockM(sats, e.tagGpsS, atM, clockM);
  const timeGpsS = e.tagGpsS - (Number.isFinite(clockM) ? clockM / SPEED_OF_LIGHT_MS : 0);
  return { tagGpsS: e.tagGpsS, timeGpsS, clockM, sats, listed };
}
