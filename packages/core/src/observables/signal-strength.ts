/**
 * Signal strength of a code observation on one scale (dB-Hz): the S observation of the same band and
 * attribute when the file has it (RINEX 3 S codes are dB-Hz; RINEX 2.11 S1/S2 are receiver-dependent but
 * written in dB-Hz by practically all receivers: common practice), else the observation's signal-strength
 * digit 1-9 mapped to dB-Hz by the RINEX 3.05 table (solve/weights.ts strengthToDbHz).
 */
import type { SatObservations } from '../gnss/obs-types.js';
import { strengthToDbHz } from '../solve/index.js';

export function signalStrengthDbHz(s: SatObservations, code: string): number {
  const si = s.codes.indexOf('S' + code.slice(1));
  if (si >= 0) {
    const v = strengthToDbHz(s.values[si], 'dbhz');
    if (Number.isFinite(v)) return v;
  }
  const ci = s.codes.indexOf(code);
  return ci >= 0 && s.ssi[ci] > 0 ? strengthToDbHz(s.ssi[ci], 'rinex2-digit') : NaN;
}
