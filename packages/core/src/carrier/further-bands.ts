/**
 * Carrier phase on further frequencies: which bands beyond the primary one (observables/signals.ts) the
 * carrier engine uses per constellation, which signal of a band one receiver's satellite offers, and the
 * group a rover/reference pair of signals belongs to.
 *
 * Bands (RINEX band digits, RINEX 3.05 5.1): GPS and QZSS L2 then L5, GLONASS G2 (FDMA: the wavelength
 * of each satellite's own channel, GLONASS ICD 5.1 3.3.1.1), Galileo E5a then E5b, BeiDou B3I then B2I
 * (BeiDou's primary band, B1I, is band 2 since RINEX 3.02). SBAS and NavIC keep their single frequency.
 *
 * Signal: per band the pseudorange codes in the order of gnss/obs-codes.ts, the first whose phase (the same
 * band and attribute, RINEX 3.05 5.1: same tracking mode) was recorded too; the phase is what matters here,
 * its code only helps the float solution.
 *
 * Group: between-receiver single differences of one group share a receiver clock (a code one and a phase
 * one, free every epoch: double differences within the group). A group is a constellation, a band, and
 * the pair of signals (rover, reference): the receivers' inter-frequency biases differ per band, and two
 * signals of one band may differ by a quarter cycle (the phase alignment of RINEX 3.01 and later, recorded in
 * SYS / PHASE SHIFT; files written before alignment or by different converters disagree; from memory), which
 * cancels only between satellites of the same pair.
 */
import type { GnssSystem, SatObservations } from '../gnss/index.js';
import { pseudorangePriority } from '../gnss/index.js';
import { SECONDARY_BANDS } from '../observables/index.js';

/** Which frequencies the carrier engine uses: the primary band only, or every band both receivers recorded. */
export type CarrierFrequencies = 'single' | 'all';

/** Bands beyond the primary one, in order of use, per constellation. */
export function furtherBands(system: GnssSystem): readonly string[] {
  return SECONDARY_BANDS[system];
}

function finiteValue(s: SatObservations, code: string): number {
  const i = s.codes.indexOf(code);
  return i < 0 ? NaN : s.values[i];
}

/**
 * Per list of observation codes (one array object per system and file, gnss/obs-types.ts), the candidate
 * pseudorange codes of each further band that have a listed phase of the same attribute, in priority order.
 */
const CANDIDATES = new WeakMap<readonly string[], Map<string, readonly string[]>>();

function candidates(system: GnssSystem, band: string, codes: readonly string[]): readonly string[] {
  let bySystemBand = CANDIDATES.get(codes);
  if (!bySystemBand) CANDIDATES.set(codes, (bySystemBand = new Map()));
  const key = system + band;
  let list = bySystemBand.get(key);
  if (!list) {
    const tried = [...pseudorangePriority(system, band), ...codes.filter((c) => c[0] === 'C' && c[1] === band)];
    list = [...new Set(tried)].filter((c) => codes.includes(c) && codes.includes('L' + c.slice(1)));
    bySystemBand.set(key, list);
  }
  return list;
}

/** Whether a system's code list holds a further band with code and phase (a quick test before bandSignal). */
export function hasFurtherBands(system: GnssSystem, codes: readonly string[]): boolean {
  return furtherBands(system).some((b) => candidates(system, b, codes).length > 0);
}

/**
 * The pseudorange code of a band whose phase was recorded (a valid pseudorange, 1000 to 1,000,000 km, and
 * a listed phase of the same attribute); null when the band has none.
 */
export function bandSignal(system: GnssSystem, band: string, s: SatObservations): string | null {
  for (const c of candidates(system, band, s.codes)) {
    const p = finiteValue(s, c);
    if (p > 1e6 && p < 1e9) return c;
  }
  return null;
}

/** The group of a single difference on a further band: constellation, band and both receivers' signals ('G2:C2W/C2W'). */
export function furtherBandGroup(system: GnssSystem, band: string, roverCode: string, referenceCode: string): string {
  return `${system}${band}:${roverCode}/${referenceCode}`;
}
