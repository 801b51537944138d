/**
 * Observation codes: RINEX 2 -> RINEX 3 mapping, BeiDou 3.01 -> 3.02 band renaming, the choice of a
 * pseudorange code per system and band, its companion phase/Doppler/strength codes, and carrier
 * frequencies.
 *
 * Sources: RINEX 2.11 (IGS/RTCM, 2012) 5.1 and 10.1 (observation types); RINEX 3.05 (IGS/RTCM, 2020)
 * 5.1 tables 4-10 (observation codes per system and frequency); RINEX 3.02 (2013) 5.12 (BeiDou B1
 * written as band 2); IS-GPS-200 3.3.1.1 and IS-GPS-705 (L1/L2/L5); Galileo OS SIS ICD 2.3 (E1, E5a,
 * E5b, E5, E6); BeiDou ICD B1I 4.2 / B3I / B1C / B2a; GLONASS ICD 3.3.1.1 (FDMA L1/L2); QZSS IS-QZSS;
 * IRNSS SPS ICD (L5, S band).
 */
import type { GnssSystem } from './types.js';
import { SPEED_OF_LIGHT_MS } from './constants.js';

/**
 * RINEX 2 code -> RINEX 3 code, per system. The attribute (third character) is not in RINEX 2, so a
 * choice is made (documented here; "common practice" = what converters usually write):
 *
 * | RINEX 2 | GPS / QZSS | GLONASS | Galileo | SBAS | BeiDou (2.12-style) | why |
 * |---|---|---|---|---|---|---|
 * | C1 | C1C | C1C | C1X | C1C | C2I | C/A (GPS, GLO, SBAS); Galileo E1 B+C combined tracking (common practice) |
 * | P1 | C1W | C1P | -   | -   | -   | GPS P(Y) tracked semi-codeless under A/S (RINEX 3.05 table 4 note: W = Z-tracking); GLONASS P |
 * | L1 D1 S1 | L1C D1C S1C | L1C D1C S1C | L1X D1X S1X | L1C D1C S1C | L2I D2I S2I | L1 phase is carried by C/A tracking (common practice) |
 * | C2 | C2L (QZSS C2L) | C2C | -   | -   | C2I | GPS 2.11 "C2" = L2C; receivers track the CL (pilot) code (common practice; X would also do) |
 * | P2 | C2W | C2P | -   | -   | -   | GPS L2 P(Y) semi-codeless; GLONASS P |
 * | L2 D2 S2 | L2W D2W S2W | L2P D2P S2P | -   | -   | L2I ...  | geodetic L2 phase tracked with P(Y)/P (common practice) |
 * | C5 L5 D5 S5 | C5Q L5Q D5Q S5Q | - | C5Q L5Q D5Q S5Q | C5I L5I D5I S5I | - | pilot Q for GPS/QZSS/Galileo L5/E5a; SBAS L5 I (RINEX 3.05 table 8) |
 * | C6 L6 D6 S6 | J: C6X ... | - | C6X ... | - | C6I ... | Galileo E6 B+C; BeiDou B3I |
 * | C7 L7 D7 S7 | - | - | C7Q ... | - | C7I ... | Galileo E5b pilot; BeiDou B2I |
 * | C8 L8 D8 S8 | - | - | C8Q ... | - | - | Galileo E5 AltBOC pilot |
 *
 * RINEX 2 BeiDou codes are from memory (RINEX 2.12 draft, band 1 = B1I there).
 */
const R2_ATTRIBUTE: Readonly<Partial<Record<GnssSystem, Readonly<Record<string, string>>>>> = {
  // key: RINEX 2 type letter + band digit (C/P distinguished); value: RINEX 3 band + attribute
  G: { C1: '1C', P1: '1W', L1: '1C', D1: '1C', S1: '1C', C2: '2L', P2: '2W', L2: '2W', D2: '2W', S2: '2W', C5: '5Q', L5: '5Q', D5: '5Q', S5: '5Q' },
  J: { C1: '1C', L1: '1C', D1: '1C', S1: '1C', C2: '2L', L2: '2L', D2: '2L', S2: '2L', C5: '5Q', L5: '5Q', D5: '5Q', S5: '5Q', C6: '6X', L6: '6X', D6: '6X', S6: '6X' },
  R: { C1: '1C', P1: '1P', L1: '1C', D1: '1C', S1: '1C', C2: '2C', P2: '2P', L2: '2P', D2: '2P', S2: '2P' },
  E: { C1: '1X', L1: '1X', D1: '1X', S1: '1X', C5: '5Q', L5: '5Q', D5: '5Q', S5: '5Q', C6: '6X', L6: '6X', D6: '6X', S6: '6X', C7: '7Q', L7: '7Q', D7: '7Q', S7: '7Q', C8: '8Q', L8: '8Q', D8: '8Q', S8: '8Q' },
  S: { C1: '1C', L1: '1C', D1: '1C', S1: '1C', C5: '5I', L5: '5I', D5: '5I', S5: '5I' },
  C: { C1: '2I', L1: '2I', D1: '2I', S1: '2I', C2: '2I', L2: '2I', D2: '2I', S2: '2I', C6: '6I', L6: '6I', D6: '6I', S6: '6I', C7: '7I', L7: '7I', D7: '7I', S7: '7I' },
};

/**
 * RINEX 2 observation code -> RINEX 3 code for a system (table above). Unknown codes keep their two
 * characters plus 'X' (RINEX 3.05 uses X for "combined/unspecified"), so nothing is dropped.
 */
export function rinex2ToRinex3Code(system: GnssSystem, code2: string): string {
  const c = code2.trim().toUpperCase();
  const table = R2_ATTRIBUTE[system] ?? R2_ATTRIBUTE.G!;
  const m = table[c];
  const type = c[0] === 'P' ? 'C' : c[0];
  if (m !== undefined) return type + m;
  if (c.length === 2) return type + c[1] + (c[0] === 'P' ? 'P' : 'X');
  return c;
}

/** Attributes tried, in order, when two RINEX 2 codes of a list map to the same RINEX 3 code. */
const DEDUPE_ATTRIBUTES = ['X', 'P', 'Y', 'Z', 'Q', 'I', 'L', 'S', 'W', 'C'];

/**
 * Maps a RINEX 2 code list for one system, keeping codes unique: a RINEX 2 list may hold two codes
 * that the table sends to one RINEX 3 code (e.g. 2.12-style BeiDou C1 and C2, both B1I); the later one
 * gets the first free attribute of DEDUPE_ATTRIBUTES (common practice: X = unspecified/combined).
 */
export function rinex2CodeList(system: GnssSystem, codes2: readonly string[]): string[] {
  const out: string[] = [];
  for (const c2 of codes2) {
    let c3 = rinex2ToRinex3Code(system, c2);
    if (out.includes(c3) && c3.length === 3) {
      const alt = DEDUPE_ATTRIBUTES.map((a) => c3.slice(0, 2) + a).find((x) => !out.includes(x));
      c3 = alt ?? c3;
    }
    out.push(c3);
  }
  return out;
}

/**
 * RINEX 3.00/3.01 wrote BeiDou B1I as band 1 ('C1I', 'L1I'...); RINEX 3.02 5.12 renamed it band 2.
 * For files older than 3.02 every BeiDou band-1 code is renamed to band 2; 3.02+ band 1 is B1C.
 */
export function normaliseBeidouCode(code: string, version: number): string {
  if (version < 3.02 && code.length === 3 && code[1] === '1') return code[0] + '2' + code[2];
  return code;
}

/**
 * Pseudorange codes in order of preference per system and band (first available wins). Civil open
 * signals first, then the semi-codeless / encrypted-tracked ones, then combined tracking (common
 * practice: prefer the code whose satellite biases are broadcast — GPS TGD refers to L1 C/A and P(Y),
 * IS-GPS-200 20.3.3.3.3.2; Galileo BGD to E1 C/B, OS SIS ICD 5.1.5; BeiDou TGD1 to B1I, ICD 5.2.4.10).
 */
export const PSEUDORANGE_PRIORITY: Readonly<Partial<Record<GnssSystem, Readonly<Record<string, readonly string[]>>>>> = {
  G: { '1': ['C1C', 'C1W', 'C1P', 'C1X', 'C1L', 'C1S', 'C1Y', 'C1M'], '2': ['C2W', 'C2P', 'C2L', 'C2X', 'C2S', 'C2C', 'C2D', 'C2Y', 'C2M'], '5': ['C5Q', 'C5X', 'C5I'] },
  R: { '1': ['C1C', 'C1P'], '2': ['C2C', 'C2P'], '3': ['C3Q', 'C3X', 'C3I'], '4': ['C4A', 'C4B', 'C4X'], '6': ['C6A', 'C6B', 'C6X'] },
  E: { '1': ['C1C', 'C1X', 'C1B', 'C1A', 'C1Z'], '5': ['C5Q', 'C5X', 'C5I'], '7': ['C7Q', 'C7X', 'C7I'], '8': ['C8Q', 'C8X', 'C8I'], '6': ['C6C', 'C6X', 'C6B', 'C6A', 'C6Z'] },
  C: { '2': ['C2I', 'C2X', 'C2Q'], '1': ['C1P', 'C1X', 'C1D', 'C1A'], '5': ['C5P', 'C5X', 'C5D'], '7': ['C7I', 'C7X', 'C7Q', 'C7D', 'C7P', 'C7Z'], '8': ['C8P', 'C8X', 'C8D'], '6': ['C6I', 'C6X', 'C6Q', 'C6A'] },
  J: { '1': ['C1C', 'C1X', 'C1L', 'C1S', 'C1Z', 'C1E'], '2': ['C2L', 'C2X', 'C2S'], '5': ['C5Q', 'C5X', 'C5I', 'C5P', 'C5D', 'C5Z'], '6': ['C6L', 'C6X', 'C6S', 'C6E', 'C6Z'] },
  S: { '1': ['C1C'], '5': ['C5I', 'C5Q', 'C5X'] },
  I: { '5': ['C5A', 'C5B', 'C5C', 'C5X'], '9': ['C9A', 'C9B', 'C9C', 'C9X'], '1': ['C1D', 'C1P', 'C1X'] },
};

/** Preference list of pseudorange codes for a system and RINEX band digit ('1', '2', '5'...); empty when none. */
export function pseudorangePriority(system: GnssSystem, band: string): readonly string[] {
  return PSEUDORANGE_PRIORITY[system]?.[band] ?? [];
}

/**
 * The preferred pseudorange code among `available` for a system and band, or null. Codes of that band
 * not in the priority list are taken last, in file order.
 */
export function chooseCode(system: GnssSystem, available: readonly string[], band: string): string | null {
  for (const c of pseudorangePriority(system, band)) if (available.includes(c)) return c;
  for (const c of available) if (c.length === 3 && c[0] === 'C' && c[1] === band) return c;
  return null;
}

export interface CompanionCodes {
  readonly phase: string | null;
  readonly doppler: string | null;
  readonly strength: string | null;
}

/**
 * Carrier phase, Doppler and strength codes that go with a pseudorange code: the same band and
 * attribute first (RINEX 3.05 5.1: same tracking mode), else another attribute of the same band in
 * file order (common practice: RINEX 2 files mapped 'P1' to C1W while 'L1' became L1C).
 */
export function companionCodes(pseudorangeCode: string, available: readonly string[]): CompanionCodes {
  const pick = (type: string): string | null => {
    const exact = type + pseudorangeCode.slice(1);
    if (available.includes(exact)) return exact;
    for (const c of available) if (c.length === 3 && c[0] === type && c[1] === pseudorangeCode[1]) return c;
    return null;
  };
  return { phase: pick('L'), doppler: pick('D'), strength: pick('S') };
}

/** Band digit -> carrier frequency (Hz) for CDMA signals. */
const CDMA_FREQUENCY_HZ: Readonly<Partial<Record<GnssSystem, Readonly<Record<string, number>>>>> = {
  // IS-GPS-200 3.3.1.1 (L1 1575.42, L2 1227.60 MHz), IS-GPS-705 3.3.1.1 (L5 1176.45 MHz)
  G: { '1': 1575.42e6, '2': 1227.6e6, '5': 1176.45e6 },
  // Galileo OS SIS ICD table 2: E1 1575.42, E5a 1176.45, E5b 1207.14, E5 1191.795, E6 1278.75 MHz
  E: { '1': 1575.42e6, '5': 1176.45e6, '7': 1207.14e6, '8': 1191.795e6, '6': 1278.75e6 },
  // BeiDou ICDs: B1C 1575.42, B1I 1561.098, B2a 1176.45, B2b/B2I 1207.14, B2a+b 1191.795, B3I 1268.52 MHz
  C: { '1': 1575.42e6, '2': 1561.098e6, '5': 1176.45e6, '7': 1207.14e6, '8': 1191.795e6, '6': 1268.52e6 },
  // IS-QZSS-PNT: L1 1575.42, L2 1227.60, L5 1176.45, L6 1278.75 MHz
  J: { '1': 1575.42e6, '2': 1227.6e6, '5': 1176.45e6, '6': 1278.75e6 },
  // SBAS L1 and L5 (RTCA DO-229; RINEX 3.05 table 8)
  S: { '1': 1575.42e6, '5': 1176.45e6 },
  // IRNSS SPS ICD: L5 1176.45 MHz, S 2492.028 MHz; L1 1575.42 MHz (NavIC L1 SPS ICD)
  I: { '5': 1176.45e6, '9': 2492.028e6, '1': 1575.42e6 },
  // GLONASS CDMA: L3OC 1202.025 MHz (GLONASS CDMA ICD L3 2016); G1a 1600.995, G2a 1248.06 MHz (RINEX 3.05 table 6)
  R: { '3': 1202.025e6, '4': 1600.995e6, '6': 1248.06e6 },
};

/** GLONASS FDMA G1 carrier for channel k: 1602 MHz + k * 0.5625 MHz (GLONASS ICD 5.1 ed. 2008, 3.3.1.1). */
export function glonassG1FrequencyHz(channelK: number): number {
  return 1602e6 + channelK * 0.5625e6;
}

/** GLONASS FDMA G2 carrier for channel k: 1246 MHz + k * 0.4375 MHz (GLONASS ICD 5.1, 3.3.1.1). */
export function glonassG2FrequencyHz(channelK: number): number {
  return 1246e6 + channelK * 0.4375e6;
}

/**
 * Carrier frequency (Hz) of an observation code ('C1C', 'L5Q'...) for a system. GLONASS bands 1 and 2
 * are FDMA and need the satellite's channel k (GLONASS SLOT / FRQ #); NaN when unknown.
 */
export function carrierFrequencyHz(system: GnssSystem, code: string, glonassChannelK?: number): number {
  const band = code.length >= 2 ? code[1] : '';
  if (system === 'R' && (band === '1' || band === '2')) {
    if (glonassChannelK === undefined || !Number.isFinite(glonassChannelK)) return NaN;
    return band === '1' ? glonassG1FrequencyHz(glonassChannelK) : glonassG2FrequencyHz(glonassChannelK);
  }
  return CDMA_FREQUENCY_HZ[system]?.[band] ?? NaN;
}


/** Carrier wavelength (m) = c / f; NaN when the frequency is unknown. */
export function carrierWavelengthM(system: GnssSystem, code: string, glonassChannelK?: number): number {
  return SPEED_OF_LIGHT_MS / carrierFrequencyHz(system, code, glonassChannelK);
}
