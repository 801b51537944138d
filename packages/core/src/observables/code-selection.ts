/**
 * Per-satellite choice of the code pseudorange for a between-receiver difference: the same code type on
 * both sides (C1C against C1W/P1 leaves a satellite-dependent bias of decimetres, the P1-C1 differential
 * code bias), chosen in the per-system priority order of rinex/obs-codes.ts.
 */
import type { GnssSystem } from '../gnss/index.js';
import type { SatObservations } from '../gnss/index.js';
import { pseudorangePriority } from '../gnss/index.js';
import { PRIMARY_BAND } from './signals.js';

export function pseudorangeOf(s: SatObservations, code: string): number {
  const i = s.codes.indexOf(code);
  if (i < 0) return NaN;
  const v = s.values[i];
  return v > 1e6 && v < 1e9 ? v : NaN;
}

/** Codes of the primary band present (finite) at one receiver, in priority order. */
export function primaryCodes(system: GnssSystem, s: SatObservations): string[] {
  const band = PRIMARY_BAND[system];
  const out: string[] = [];
  for (const c of pseudorangePriority(system, band)) if (Number.isFinite(pseudorangeOf(s, c))) out.push(c);
  for (let i = 0; i < s.codes.length; i++) {
    const c = s.codes[i];
    if (c[0] === 'C' && c[1] === band && !out.includes(c) && Number.isFinite(pseudorangeOf(s, c))) out.push(c);
  }
  return out;
}

export type CodeMatch = { readonly code: string } | { readonly code: null; readonly reason: string };

/** The first code in the rover's priority order that the reference has too. */
export function matchCode(roverCodes: readonly string[], referenceCodes: ReadonlySet<string> | readonly string[]): CodeMatch {
  const has = (c: string) => (referenceCodes instanceof Set ? referenceCodes.has(c) : (referenceCodes as readonly string[]).includes(c));
  for (const c of roverCodes) if (has(c)) return { code: c };
  const ref = referenceCodes instanceof Set ? [...referenceCodes] : [...(referenceCodes as readonly string[])];
  return { code: null, reason: `no common code type (rover ${roverCodes.join('/') || 'none'}, reference ${ref.join('/') || 'none'})` };
}
