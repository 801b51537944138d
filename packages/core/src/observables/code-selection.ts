/**
 * Per-satellite choice of the code pseudorange for a between-receiver difference: the same code type on
 * both sides (C1C against C1W/P1 leaves a satellite-dependent bias of decimetres, the P1-C1 differential
 * code bias), chosen in the per-system priority order of rinex/obs-codes.ts.
 */
import type { GnssSystem } from '../gnss/index.js';
import type { SatObservations } from '../gnss/index.js';
import { pseudorangePriority } from '../gnss/index.js';
import { PRIMARY_BAND } from './signals.js';

/** Whether a value can be a pseudorange (m): blank fields are NaN, zero or absurd values are not ranges. */
function isPseudorangeM(v: number): boolean {
  return v > 1e6 && v < 1e9;
}

export function pseudorangeOf(s: SatObservations, code: string): number {
  const i = s.codes.indexOf(code);
  if (i < 0) return NaN;
  const v = s.values[i];
  return isPseudorangeM(v) ? v : NaN;
}

/** The pseudorange (m) at a slot of the satellite's code list (primaryCodeSlots), NaN when blank or absurd. */
export function pseudorangeAt(s: SatObservations, slot: CodeSlot): number {
  const v = s.values[slot.index];
  return isPseudorangeM(v) ? v : NaN;
}

/** A pseudorange code of a file's code list and its index there (the first, as pseudorangeOf finds it). */
export interface CodeSlot {
  readonly code: string;
  readonly index: number;
}

/**
 * The primary-band pseudorange codes of a code list in priority order (pseudorangePriority, then the
 * band's other codes in file order), made once per list and system: a file's satellites of one system
 * share one list (SatObservations.codes), and this is asked for every satellite of every epoch.
 */
const primarySlotsByList = new WeakMap<readonly string[], Map<GnssSystem, readonly CodeSlot[]>>();

export function primaryCodeSlots(system: GnssSystem, codes: readonly string[]): readonly CodeSlot[] {
  let bySystem = primarySlotsByList.get(codes);
  if (!bySystem) { bySystem = new Map(); primarySlotsByList.set(codes, bySystem); }
  let slots = bySystem.get(system);
  if (!slots) {
    const band = PRIMARY_BAND[system];
    const list: CodeSlot[] = [];
    for (const c of pseudorangePriority(system, band)) {
      const index = codes.indexOf(c);
      if (index >= 0) list.push({ code: c, index });
    }
    for (let i = 0; i < codes.length; i++) {
      const c = codes[i];
      if (c[0] === 'C' && c[1] === band && !list.some((x) => x.code === c)) list.push({ code: c, index: i });
    }
    slots = list;
    bySystem.set(system, slots);
  }
  return slots;
}

/** Codes of the primary band present (finite) at one receiver, in priority order. */
export function primaryCodes(system: GnssSystem, s: SatObservations): string[] {
  const out: string[] = [];
  for (const slot of primaryCodeSlots(system, s.codes)) {
    if (isPseudorangeM(s.values[slot.index])) out.push(slot.code);
  }
  return out;
}

export type CodeMatch = { readonly code: string } | { readonly code: null; readonly reason: string };

/** The first code in the rover's priority order that the reference has too. */
export function matchCode(roverCodes: readonly string[], referenceCodes: ReadonlySet<string> | readonly string[]): CodeMatch {
  const isSet = referenceCodes instanceof Set;
  for (const c of roverCodes) if (isSet ? referenceCodes.has(c) : (referenceCodes as readonly string[]).includes(c)) return { code: c };
  const ref = referenceCodes instanceof Set ? [...referenceCodes] : [...(referenceCodes as readonly string[])];
  return { code: null, reason: `no common code type (rover ${roverCodes.join('/') || 'none'}, reference ${ref.join('/') || 'none'})` };
}
