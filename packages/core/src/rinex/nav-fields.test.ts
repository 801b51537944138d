import { describe, expect, it } from 'vitest';
import { epochRinex2, epochRinex3, NavRecordProblem, parseFortranReal, realAt } from './nav-fields.js';
import { d19, formatFortranReal } from './nav-format.js';

describe('Fortran real fields (RINEX 2.11 table A4 / 3.04 table A6: D19.12)', () => {
  it('reads D, d and E exponents', () => {
    // value read from glw1277m.18n line 8 (RINEX 2.10, 'D' exponent)
    expect(parseFortranReal('-6.565647199750D-04')).toBe(-6.56564719975e-4);
    // value read from brdc0100.24n line 9 (leading '0.' mantissa)
    expect(parseFortranReal(' 0.165692064911D-03')).toBe(0.165692064911e-3);
    expect(parseFortranReal('1.5d+01')).toBe(15);
    // value read from BRDC00IGS_R_20240100000_01D_MN.rnx line 96 ('E' exponent)
    expect(parseFortranReal(' 1.656920649111E-04')).toBe(1.656920649111e-4);
  });

  it('blank -> NaN, garbage -> undefined (not a silent number)', () => {
    expect(parseFortranReal('                   ')).toBeNaN();
    expect(parseFortranReal('1.0E')).toBeUndefined();
    expect(parseFortranReal('0x10')).toBeUndefined();
    expect(parseFortranReal('Infinity')).toBeUndefined();
    expect(parseFortranReal('1.2.3')).toBeUndefined();
  });

  it('cuts fields by column, so touching negative numbers separate', () => {
    // line read from glw1277m.18n line 11 (PRN 25 BROADCAST ORBIT - 3: negative values touch their neighbours)
    const line = '    3.672000000000D+05-2.607703208923D-08-8.170360475509D-01-1.247972249985D-07';
    // RINEX 2: 3X,4D19.12 -> fields start in columns 4, 23, 42, 61 (0-based 3, 22, 41, 60)
    expect(realAt(line, 3, 19, 11)).toBe(3.672e5);
    expect(realAt(line, 22, 19, 11)).toBe(-2.607703208923e-8);
    expect(realAt(line, 41, 19, 11)).toBe(-8.170360475509e-1);
    expect(realAt(line, 60, 19, 11)).toBe(-1.247972249985e-7);
    expect(realAt(line, 79, 19, 11)).toBeNaN(); // beyond a short line
    // read with RINEX 3 columns the first field would swallow the next value's sign: reported, not misread
    expect(() => realAt(line, 4, 19, 11)).toThrow(NavRecordProblem);
  });

  it('names the line and columns of a garbled field', () => {
    try {
      realAt('    3.67200000000xD+05', 4, 19, 42);
      expect.unreachable();
    } catch (e) {
      expect(e).toBeInstanceOf(NavRecordProblem);
      expect((e as NavRecordProblem).line).toBe(42);
      expect((e as NavRecordProblem).message).toContain('columns 5-23');
    }
  });
});

describe('record epochs', () => {
  it('RINEX 2: two-digit year (80-99 -> 19xx, else 20xx, RINEX 2.11 section 6.5) and F5.1 seconds', () => {
    // epoch read from glw1277m.18n line 8
    expect(epochRinex2('25 18 10 04 06 00  0.0-6.565647199750D-04', 8)).toEqual({ year: 2018, month: 10, day: 4, hour: 6, minute: 0, second: 0 });
    // brdc0100.24n line 9: single-digit fields with I2 blanks
    expect(epochRinex2(' 1 24  1 10  0  0  0.0 0.165692064911D-03', 9)).toEqual({ year: 2024, month: 1, day: 10, hour: 0, minute: 0, second: 0 });
  });

  it('RINEX 3: four-digit year', () => {
    // epoch read from BRDC00IGS_R_20240100000_01D_MN.rnx line 97324
    expect(epochRinex3('S21 2024 01 09 23 59 12 0.000000000000E+00', 97324)).toEqual({ year: 2024, month: 1, day: 9, hour: 23, minute: 59, second: 12 });
  });

  it('rejects an impossible date with a NavRecordProblem', () => {
    expect(() => epochRinex3('G01 2024 13 09 23 59 12', 5)).toThrow(NavRecordProblem);
    expect(() => epochRinex3('G01 20x4 01 09 23 59 12', 5)).toThrow(NavRecordProblem);
  });
});

describe('D19.12 output (RINEX 3.04 table A6)', () => {
  it('prints as IGS files print', () => {
    // BRDC00IGS_R_20240100000_01D_MN.rnx lines 96 and 99
    expect(d19(1.656920649111e-4)).toBe(' 1.656920649111E-04');
    expect(d19(-7.82310962677e-8)).toBe('-7.823109626770E-08');
    expect(d19(259200)).toBe(' 2.592000000000E+05');
    expect(d19(0)).toBe(' 0.000000000000E+00');
    expect(d19(NaN)).toBe(' '.repeat(19));
    expect(formatFortranReal(2.2352e-8, 12, 4)).toBe('  2.2352E-08'); // BRDC line 83, D12.4
  });
});
