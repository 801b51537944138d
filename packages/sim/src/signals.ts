/**
 * The signals the simulator records and their carriers. RINEX 3 observation codes (RINEX 3.04 section
 * 5.1, table 4): GPS C1C/L1C/D1C/S1C (L1 C/A), C1W, C2W/L2W/D2W/S2W (L1 and L2 P(Y), semi-codeless);
 * Galileo C1C/L1C/D1C/S1C (E1 C, pilot); GLONASS C1C/L1C/D1C/S1C (G1 C/A), C2P/L2P/D2P/S2P (G2 P).
 */
import type { SignalKind } from '@refdelta/core';
import { FREQ_L1_HZ, FREQ_L2_HZ, glonassG1FrequencyHz, glonassG2FrequencyHz } from '@refdelta/core';

export type Band = 1 | 2;
export type SimSystem = 'G' | 'E' | 'R';

export const CARRIER_HZ: Readonly<Record<Band, number>> = { 1: FREQ_L1_HZ, 2: FREQ_L2_HZ };

/**
 * Carrier frequency (Hz) of a band: GPS/Galileo L1/E1 and L2; GLONASS FDMA from the satellite's frequency
 * channel k (GLONASS ICD 5.1 3.3.1.1: G1 = 1602 MHz + k 0.5625 MHz, G2 = 1246 MHz + k 0.4375 MHz).
 */
export function carrierHz(system: SimSystem, band: Band, glonassChannel: number): number {
  if (system === 'R') return band === 1 ? glonassG1FrequencyHz(glonassChannel) : glonassG2FrequencyHz(glonassChannel);
  return CARRIER_HZ[band];
}

/** Single-frequency codes of every system (what a low-cost receiver logs). */
export const SINGLE_FREQUENCY_CODES: readonly string[] = ['C1C', 'L1C', 'D1C', 'S1C'];
/** A CORS-like GPS list: L1 C/A plus L1/L2 P(Y). */
export const GPS_DUAL_FREQUENCY_CODES: readonly string[] = ['C1C', 'L1C', 'D1C', 'S1C', 'C1W', 'C2W', 'L2W', 'D2W', 'S2W'];
/** A CORS-like GLONASS list: G1 C/A plus G2 P. */
export const GLONASS_DUAL_FREQUENCY_CODES: readonly string[] = ['C1C', 'L1C', 'D1C', 'S1C', 'C2P', 'L2P', 'D2P', 'S2P'];

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
export function clockSignal(system: SimSystem, band: Band): SignalKind {
  if (system === 'E') return 'E1';
  if (system === 'R') return band === 2 ? 'G2' : 'G1';
  return band === 2 ? 'L2' : 'L1';
}
