/**
 * The F14.3 fast path against the platform's parseFloat (ECMA-262 StringToNumber: correctly rounded);
 * the one-pass reading of an observation line from bytes against the field-by-field reading.
 */
import { describe, expect, it } from 'vitest';
import fc from 'fast-check';
import { digitInBytes, fieldState, NOT_USUAL_LAYOUT, parseF14p3, parseF14p3Bytes, parseFixed, parseObsLineBytes } from './obs-fields.js';
import { PADDING_BYTES } from './byte-lines.js';

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

describe('parseObsLineBytes (one pass over an observation line)', () => {
  const LF = 10;
  const CR = 13;
  /** A field of 16 columns: F14.3 in the usual layout or another, LLI and SSI blank or digits. */
  const fieldArb = fc.oneof(
    fc.tuple(fc.integer({ min: -999_999_999_999, max: 9_999_999_999_999 }), fc.constantFrom(' ', '0', '1', '7'), fc.constantFrom(' ', '5', '9'))
      .map(([milli, lli, ssi]) => (milli / 1000).toFixed(3).padStart(14, ' ').slice(-14) + lli + ssi),
    fc.constantFrom('                ', '               1', '    123.4       ', '  1.2345678E+3 1', '          .125  ', '   12a4567.890  ', '  -  12.000    ', '        +1.000  ', '    12.345  x   '),
    fc.constantFrom('1234567890.123 1', '1234567890.123  ', '  12 45678.901  ', '  !2345678.901  ', '  )2345678.901  ', '  -2345678.901 1', '  0000000.000  ', '\u00b0081726354.000  ', '9\u00b081726354.000  ', ' \u00b01726354.000  '),
    // blanks then digits up to the point in column 11, one column possibly replaced by a byte next to
    // a blank or a digit; three fraction columns mostly digits
    fc.tuple(fc.integer({ min: 0, max: 10 }), fc.nat(9), fc.constantFrom('', '', '-', '!', ')', '/', ':', ' ', '0', '\u00b0'),
      fc.string({ minLength: 3, maxLength: 3, unit: fc.constantFrom('0', '7', '9', '0', '7', '9', ' ', '/', ':') }), fc.constantFrom('  ', ' 1', '9 '))
      .map(([blanks, at, odd, frac, flags]) => {
        const int = ' '.repeat(blanks) + '9081726354'.slice(blanks);
        return [int.slice(0, at) + (odd || int[at]) + int.slice(at + 1), frac, flags];
      })
      .map(([int, frac, flags]) => `${int}.${frac}${flags}`),
  );
  const lineArb = fc.tuple(fc.array(fieldArb, { maxLength: 6 }), fc.nat(17), fc.constantFrom('\n', '\r\n', '  \n', '  \r\n', '\r \n', 'junk\n'));

  /**
   * Reads the line with parseObsLineBytes and, when it reads it, checks its fields and end against the
   * field-by-field reading of the reader's span path. Returns whether it read the line.
   */
  function readsAsSpan(text: string, nCodes: number): boolean {
    const b = new Uint8Array(text.length + PADDING_BYTES);
    for (let i = 0; i < text.length; i++) b[i] = text.charCodeAt(i);
    const values = new Float64Array(nCodes).fill(NaN), lli = new Uint8Array(nCodes), ssi = new Uint8Array(nCodes);
    const nl = parseObsLineBytes(b, new DataView(b.buffer), 0, 0, nCodes, values, lli, ssi, null);
    if (nl < 0) return false;
    // the line's end: its '\n', or the CR of CR LF (left out of the line as the line readers leave it)
    const lf = text.indexOf('\n');
    expect(nl).toBe(text.charCodeAt(lf - 1) === CR ? lf - 1 : lf);
    expect(b[nl] === LF || (b[nl] === CR && b[nl + 1] === LF)).toBe(true);
    // the reader's span path: parseF14p3Bytes (parseFixedIn on the text otherwise) and digitInBytes
    for (let k = 0, c = 0; k < nCodes; k++, c += 16) {
      if (c >= nl) {
        expect(values[k]).toBeNaN();
        continue;
      }
      fieldState.bad = false;
      let v = parseF14p3Bytes(b, c, nl);
      if (v === NOT_USUAL_LAYOUT) v = parseFixed(text.slice(0, nl), c, c + 14);
      expect(fieldState.bad).toBe(false);
      expect(Object.is(values[k], v)).toBe(true);
      expect(lli[k]).toBe(digitInBytes(b, c + 14, nl));
      expect(ssi[k]).toBe(digitInBytes(b, c + 15, nl));
    }
    return true;
  }

  it('property: when it reads a line, its fields and end are those of the field-by-field reading of the line', () => {
    fc.assert(fc.property(lineArb, fc.integer({ min: 1, max: 6 }), ([fields, cut, end], nCodes) => {
      const text = fields.join('');
      readsAsSpan(text.slice(0, Math.max(0, text.length - (cut % 17))) + end, nCodes);
    }), { numRuns: 3000 });
  });

  it('property: one field, any layout: read as the span reading reads it, or left to it', () => {
    fc.assert(fc.property(fieldArb, fc.constantFrom('\n', '\r\n'), (field, end) => {
      readsAsSpan(field + end, 1);
    }), { numRuns: 5000 });
  });

  it('property: fields in the usual layout are all read in one pass', () => {
    const usual = fc.tuple(fc.integer({ min: -99_999_999_999, max: 9_999_999_999_999 }), fc.constantFrom(' ', '0', '9'), fc.constantFrom(' ', '1', '9'))
      .map(([milli, lli, ssi]) => (milli / 1000).toFixed(3).padStart(14, ' ') + lli + ssi);
    fc.assert(fc.property(fc.array(fc.oneof(usual, fc.constant(' '.repeat(16))), { minLength: 1, maxLength: 6 }), fc.constantFrom('\n', '\r\n'), (fields, end) => {
      expect(readsAsSpan(fields.join('') + end, fields.length)).toBe(true);
    }), { numRuns: 1000 });
  });

  it('reads a line of a real file (dgar0100.24o, RINEX 2.11) and leaves other layouts to the span reading', () => {
    const bytesOf = (s: string): [Uint8Array, DataView] => { const b = new Uint8Array(s.length + PADDING_BYTES); for (let i = 0; i < s.length; i++) b[i] = s.charCodeAt(i); return [b, new DataView(b.buffer)]; };
    const values = new Float64Array(5).fill(NaN), lli = new Uint8Array(5), ssi = new Uint8Array(5);
    const line = '  23646991.774 6 124265862.78706  96830576.53603  23646993.808 3  23646991.323 3\n';
    expect(parseObsLineBytes(...bytesOf(line), 0, 0, 5, values, lli, ssi, null)).toBe(80);
    expect([...values]).toEqual([23646991.774, 124265862.787, 96830576.536, 23646993.808, 23646991.323]);
    expect([...lli]).toEqual([0, 0, 0, 0, 0]);
    expect([...ssi]).toEqual([6, 6, 3, 3, 3]);
    expect(parseObsLineBytes(...bytesOf(line.replace('\n', '\r\n')), 0, 0, 5, values, lli, ssi, null)).toBe(80);
    expect(parseObsLineBytes(...bytesOf('  23646991.774 6\r\n'), 0, 0, 5, values, lli, ssi, null)).toBe(16);
    expect(parseObsLineBytes(...bytesOf('  23646991.774\r\n'), 0, 0, 5, values, lli, ssi, null)).toBe(14);
    // a lone CR (a line end only for some sources) and a CR last in the buffer are left to the span reading
    for (const other of ['  1.2345678E+3\n', '  23646991.774 6\r', '  23646991.774 6\r  23646991.774 6\n', '   12a4567.890\n', '  23646991.774 6']) {
      expect(parseObsLineBytes(...bytesOf(other), 0, 0, 5, values, lli, ssi, null)).toBe(-1);
    }
  });
});
