/**
 * Which signal to use per constellation, and the clock/group-delay reference that goes with it.
 * Single-frequency work uses each system's open L1-band (or, for NavIC, L5) signal; the second band is
 * used for the ionosphere-free combination in standalone mode.
 */
import type { GnssSystem } from '../gnss/index.js';
import type { SignalKind } from '../orbit/index.js';

/** RINEX band digit of the single-frequency signal per system (BeiDou B1I is band 2 since RINEX 3.02). */
export const PRIMARY_BAND: Readonly<Record<GnssSystem, string>> = { G: '1', R: '1', E: '1', C: '2', J: '1', S: '1', I: '5' };

/** Second bands tried in order for the ionosphere-free combination (GPS L2, GLONASS G2, Galileo E5a then E5b, BeiDou B3I then B2I). */
export const SECONDARY_BANDS: Readonly<Record<GnssSystem, readonly string[]>> = {
  G: ['2', '5'], R: ['2'], E: ['5', '7'], C: ['6', '7'], J: ['2', '5'], S: [], I: [],
};

/** The broadcast clock/group-delay convention for a system and band (see orbit/clock.ts). */
export function clockSignal(system: GnssSystem, band: string): SignalKind | undefined {
  switch (system) {
    case 'G': case 'J': return band === '1' ? 'L1' : band === '2' ? 'L2' : band === '5' ? 'L5' : undefined;
    case 'E': return band === '1' ? 'E1' : band === '5' ? 'E5a' : band === '7' ? 'E5b' : undefined;
    case 'C': return band === '2' ? 'B1I' : band === '7' ? 'B2I' : band === '6' ? 'B3I' : undefined;
    case 'R': return band === '1' ? 'G1' : band === '2' ? 'G2' : undefined;
    case 'I': return band === '5' ? 'L5' : undefined;
    case 'S': return undefined;
  }
}
