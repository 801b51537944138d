import { describe, expect, it } from 'vitest';
import {
  carrierFrequencyHz, chooseCode, companionCodes, glonassG1FrequencyHz, glonassG2FrequencyHz, normaliseBeidouCode,
  rinex2CodeList, rinex2ToRinex3Code,
} from './obs-codes.js';

describe('observation codes', () => {
  it('maps RINEX 2 codes per the documented table', () => {
    expect(rinex2CodeList('G', ['C1', 'P1', 'L1', 'P2', 'L2', 'C2', 'C5', 'S1', 'D1'])).toEqual(['C1C', 'C1W', 'L1C', 'C2W', 'L2W', 'C2L', 'C5Q', 'S1C', 'D1C']);
    expect(rinex2CodeList('R', ['C1', 'P1', 'P2', 'L2', 'C2'])).toEqual(['C1C', 'C1P', 'C2P', 'L2P', 'C2C']);
    expect(rinex2ToRinex3Code('E', 'C1')).toBe('C1X');
    expect(rinex2ToRinex3Code('S', 'C5')).toBe('C5I');
  });

  it('keeps a mapped list unique (BeiDou C1 and C2 both B1I)', () => {
    const l = rinex2CodeList('C', ['C1', 'C2']);
    expect(new Set(l).size).toBe(2);
    expect(l[0]).toBe('C2I');
  });

  it('renames RINEX 3.01 BeiDou band 1 to band 2 (RINEX 3.02 section 5.12) only before 3.02', () => {
    expect(normaliseBeidouCode('C1I', 3.01)).toBe('C2I');
    expect(normaliseBeidouCode('C1P', 3.04)).toBe('C1P');
  });

  it('chooses pseudoranges by priority and finds companions', () => {
    expect(chooseCode('G', ['C1W', 'C1C', 'L1C'], '1')).toBe('C1C');
    expect(chooseCode('G', ['C1W', 'L1C'], '1')).toBe('C1W');
    expect(chooseCode('E', ['C1X', 'C5Q'], '1')).toBe('C1X');
    expect(chooseCode('C', ['C2I', 'C7I'], '2')).toBe('C2I');
    expect(chooseCode('R', ['C1P'], '2')).toBeNull();
    expect(companionCodes('C1C', ['C1C', 'L1C', 'D1C', 'S1C'])).toEqual({ phase: 'L1C', doppler: 'D1C', strength: 'S1C' });
    expect(companionCodes('C1W', ['C1W', 'L1C', 'S1C'])).toEqual({ phase: 'L1C', doppler: null, strength: 'S1C' });
  });

  it('carrier frequencies', () => {
    // IS-GPS-200 3.3.1.1 / IS-GPS-705: L1 1575.42, L2 1227.60, L5 1176.45 MHz (check-values.md constants table)
    expect(carrierFrequencyHz('G', 'C1C')).toBe(1575.42e6);
    expect(carrierFrequencyHz('G', 'L2W')).toBe(1227.6e6);
    expect(carrierFrequencyHz('J', 'C5Q')).toBe(1176.45e6);
    // BeiDou ICD B1I: 1561.098 MHz; Galileo OS SIS ICD: E5b 1207.14 MHz
    expect(carrierFrequencyHz('C', 'C2I')).toBe(1561.098e6);
    expect(carrierFrequencyHz('E', 'C7Q')).toBe(1207.14e6);
    // GLONASS ICD 3.3.1.1: k = -7 -> 1598.0625 MHz and 1242.9375 MHz; k = 6 -> 1605.375 and 1248.625 MHz
    expect(glonassG1FrequencyHz(-7)).toBe(1598.0625e6);
    expect(glonassG2FrequencyHz(-7)).toBe(1242.9375e6);
    expect(carrierFrequencyHz('R', 'L1C', 6)).toBe(1605.375e6);
    expect(carrierFrequencyHz('R', 'L2P', 6)).toBe(1248.625e6);
    expect(Number.isNaN(carrierFrequencyHz('R', 'C1C'))).toBe(true);
  });
});
