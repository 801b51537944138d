/** The F14.3 fast path against the platform's parseFloat (ECMA-262 StringToNumber: correctly rounded). */
import { describe, expect, it } from 'vitest';
import fc from 'fast-check';
import { fieldState, parseF14p3, parseFixed } from './obs-fields.js';

/** Fortran F14.3 (RINEX 3.05 table A3): right-aligned in 14 columns, 3 decimals. */
const f14p3 = (v: number) => v.toFixed(3).padStart(14, ' ');

describe('parseF14p3', () => {
  it('equals parseFloat on F14.3 text, positive and negative, embedded in a line', () => {
    fc.assert(
      fc.property(fc.integer({ min: -999_999_999_999, max: 9_999_999_999_999 }), fc.integer({ min: 0, max: 20 }), (milli, pad) => {
        const field = f14p3(milli / 1000);
        if (field.length !== 14) return;
        const line = ' '.repeat(pad) + field + '17';
        fieldState.bad = false;
        const v = parseF14p3(line, pad);
        expect(fieldState.bad).toBe(false);
        expect(Object.is(v, parseFloat(field))).toBe(true);
      }),
      { numRuns: 3000 },
    );
  });

  it('falls back to the general field parser for other layouts, blanks and garbage', () => {
    // values read from /work/shared/data/single-station/dgar0100.24o (line 44): ' 136067513.47906'
    expect(parseF14p3('  25892769.769 6 136067513.47906', 16)).toBe(136067513.479);
    for (const field of ['              ', '    123.4     ', '  1.2345678E+3', '       -0.5000', '          .125']) {
      fieldState.bad = false;
      const fast = parseF14p3(field, 0);
      const badFast = fieldState.bad;
      fieldState.bad = false;
      expect(Object.is(fast, parseFixed(field, 0, 14))).toBe(true);
      expect(badFast).toBe(fieldState.bad);
    }
    fieldState.bad = false;
    expect(parseF14p3('   12a4567.890', 0)).toBeNaN();
    expect(fieldState.bad).toBe(true);
    // a short line (trailing fields omitted, RINEX 3.05 5.3.4) gives NaN, not garbage
    fieldState.bad = false;
    expect(parseF14p3('  12.5', 0)).toBe(12.5);
    expect(parseF14p3('', 0)).toBeNaN();
    expect(fieldState.bad).toBe(false);
  });
});
