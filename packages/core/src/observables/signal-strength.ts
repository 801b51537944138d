/**
 * Signal strength of a code observation on one scale (dB-Hz): the S observation of the same band and
 * attribute when the file has it (RINEX 3 S codes are dB-Hz; RINEX 2.11 S1/S2 are receiver-dependent but
 * written in dB-Hz by practically all receivers: common practice), else the observation's signal-strength
 * digit 1-9 mapped to dB-Hz by the RINEX 3.05 table (strengthToDbHz below).
 */
import type { SatObservations } from '../gnss/index.js';

export function signalStrengthDbHz(s: SatObservations, code: string): number {
  const si = s.codes.indexOf('S' + code.slice(1));
  if (si >= 0) {
    const v = strengthToDbHz(s.values[si], 'dbhz');
    if (Number.isFinite(v)) return v;
  }
  const ci = s.codes.indexOf(code);
  return ci >= 0 && s.ssi[ci] > 0 ? strengthToDbHz(s.ssi[ci], 'rinex2-digit') : NaN;
}

/**
 * RINEX 3.05 signal strength indicator table (section 5.7, section number from memory): digit -> C/N0 range (dB-Hz):
 * 1 < 12, 2 12-17, 3 18-23, 4 24-29, 5 30-35, 6 36-41, 7 42-47, 8 48-53, 9 >= 54.
 * Each digit maps to the middle of its 6 dB band (15, 21, ... 51); the open ends to 9 and 57 (same band
 * width continued: our choice). RINEX 2.11 only says 1 = minimum, 5 = threshold for good S/N, 9 = maximum,
 * so RINEX 2 digits are read with the RINEX 3 table (common practice).
 */
const SSI_DIGIT_DBHZ = [NaN, 9, 15, 21, 27, 33, 39, 45, 51, 57] as const;

/** Put RINEX 2 strength digits and dB-Hz observations on one scale (dB-Hz); NaN for blank/0/out of range. */
export function strengthToDbHz(value: number, source: 'dbhz' | 'rinex2-digit'): number {
  if (!Number.isFinite(value)) return NaN;
  if (source === 'dbhz') return value > 0 ? value : NaN;
  const d = Math.round(value);
  return d >= 1 && d <= 9 && d === value ? SSI_DIGIT_DBHZ[d] : NaN;
}
