/**
 * The signals the simulator records and their carriers. RINEX 3 observation codes (RINEX 3.04 section
 * 5.1, table 4): GPS C1C/L1C/D1C/S1C (L1 C/A), C1W, C2W/L2W/D2W/S2W (L1 and L2 P(Y), semi-codeless);
 * Galileo C1C/L1C/D1C/S1C (E1 C, pilot).
 */
import type { SignalKind } from '@refdelta/core';
import { FREQ_L1_HZ, FREQ_L2_HZ } from '@refdelta/core';

export type Band = 1 | 2;

export const CARRIER_HZ: Readonly<Record<Band, number>> = { 1: FREQ_L1_HZ, 2: FREQ_L2_HZ };

/** Single-frequency codes of both systems (what a low-cost receiver logs). */
export const SINGLE_FREQUENCY_CODES: readonly string[] = ['C1C', 'L1C', 'D1C', 'S1C'];
/** A CORS-like GPS list: L1 C/A plus L1/L2 P(Y). */
export const GPS_DUAL_FREQUENCY_CODES: readonly string[] = ['C1C', 'L1C', 'D1C', 'S1C', 'C1W', 'C2W', 'L2W', 'D2W', 'S2W'];

export interface CodeInfo {
  readonly kind: 'C' | 'L' | 'D' | 'S';
  readonly band: Band;
}

export function codeInfo(code: string): CodeInfo {
  const kind = code[0] as CodeInfo['kind'];
  const band = code[1] === '2' ? 2 : 1;
  return { kind, band };
}

/** The broadcast clock's signal for a code (orbit/clock.ts): which group delay applies. */
export function clockSignal(system: 'G' | 'E', band: Band): SignalKind {
  if (system === 'E') return 'E1';
  return band === 2 ? 'L2' : 'L1';
}
