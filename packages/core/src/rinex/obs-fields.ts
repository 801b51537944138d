/**
 * Fixed-column number parsing on charCodeAt, without substring + parseFloat (the reader's hot path).
 * A field is blank (-> NaN), a decimal number (Fortran F/I edit descriptors, RINEX 3.05 section 3),
 * or, rarely, has an exponent (E or D, Fortran): then parseFloat on the slice is used.
 * A field that is none of these sets `fieldState.bad` (the caller reports the line).
 */

/** Set to true by a parse of a garbled field; the caller clears it before a record and checks after. */
export const fieldState = { bad: false };

const POW10 = [1, 1e1, 1e2, 1e3, 1e4, 1e5, 1e6, 1e7, 1e8, 1e9, 1e10, 1e11, 1e12, 1e13, 1e14, 1e15, 1e16];

/**
 * Number in columns [start, end) (0-based, end exclusive, clipped to the line). Blank -> NaN.
 * The mantissa is accumulated as an integer and divided once by a power of ten, which gives the
 * correctly rounded double (both exact when below 2^53), the same as parseFloat.
 */
export function parseFixed(line: string, start: number, end: number): number {
  return parseFixedIn(line, start, line.length < end ? line.length : end);
}

/** parseFixed on columns [start, end) of `s` where `end` is already clipped to the end of the line. */
export function parseFixedIn(s: string, start: number, end: number): number {
  const n = end;
  let i = start;
  while (i < n && s.charCodeAt(i) === 32) i++;
  if (i >= n) return NaN;
  let neg = false;
  let c = s.charCodeAt(i);
  if (c === 45) { neg = true; i++; } else if (c === 43) i++;
  let mant = 0;
  let digits = 0;
  let frac = 0;
  let seenDot = false;
  for (; i < n; i++) {
    c = s.charCodeAt(i);
    if (c >= 48 && c <= 57) {
      mant = mant * 10 + (c - 48);
      digits++;
      if (seenDot) frac++;
    } else if (c === 46 && !seenDot) {
      seenDot = true;
    } else break;
  }
  if (i < n) {
    if (c === 69 || c === 101 || c === 68 || c === 100) return parseSlow(s, start, n);
    // trailing blanks are allowed, anything else is garbage
    for (; i < n; i++) {
      if (s.charCodeAt(i) !== 32) { fieldState.bad = true; return NaN; }
    }
  }
  if (digits === 0) { fieldState.bad = true; return NaN; }
  if (digits > 15) return parseSlow(s, start, n);
  const v = frac === 0 ? mant : mant / POW10[frac]!;
  return neg ? -v : v;
}

/**
 * An observation field F14.3 at columns [c, c+14) (RINEX 3.05 table A3, RINEX 2.11 table A2): the
 * usual layout, digits right-aligned with the point in the 11th column, is read here in one pass;
 * anything else (blank, other layout, short line) goes to parseFixed, which gives the same value.
 * mant / 1000 with both exact is the correctly rounded value of the decimal text, as parseFloat gives.
 */
export function parseF14p3(line: string, c: number): number {
  return parseF14p3In(line, c, line.length);
}

/**
 * parseF14p3 on a line that ends at `end` (exclusive) inside `s` (a chunk holding many lines); the
 * observation reader parses the same fields from bytes (parseF14p3Bytes). The rare layouts (ten integer
 * digits, no digit before the point, other characters) go to parseFixedIn, which gives the same value.
 */
export function parseF14p3In(s: string, c: number, end: number): number {
  const point = c + 10;
  if (end < c + 14 || s.charCodeAt(point) !== 46) return parseFixedIn(s, c, end < c + 14 ? end : c + 14);
  let i = c;
  let ch = s.charCodeAt(i);
  while (ch === 32) ch = s.charCodeAt(++i); // the point ends the blanks at the latest
  const neg = ch === 45;
  if (neg) ch = s.charCodeAt(++i);
  if (point - i > 9 || i === point) return parseFixedIn(s, c, c + 14);
  // at most 9 integer digits: 32-bit integer arithmetic (common practice: int32 adds are cheaper than
  // double multiply-adds in V8)
  let mant = 0;
  for (; i < point; ch = s.charCodeAt(++i)) {
    const d = (ch - 48) | 0;
    if (d < 0 || d > 9) return parseFixedIn(s, c, c + 14);
    mant = (mant * 10 + d) | 0;
  }
  const d1 = s.charCodeAt(point + 1) - 48, d2 = s.charCodeAt(point + 2) - 48, d3 = s.charCodeAt(point + 3) - 48;
  if (d1 < 0 || d1 > 9 || d2 < 0 || d2 > 9 || d3 < 0 || d3 > 9) return parseFixedIn(s, c, c + 14);
  // value * 1000 as an integer below 2^53 (exact in a double), divided once by 1000: the correctly
  // rounded double of the decimal text, as parseFloat gives (ECMA-262 7.1.4.1.1, IEEE 754 division).
  const v = (mant * 1000 + (d1 * 100 + d2 * 10 + d3)) / 1000;
  return neg ? -v : v;
}

function parseSlow(line: string, start: number, end: number): number {
  const s = line.slice(start, end).trim().replace(/[dD]/, 'E');
  if (!/^[+-]?(\d+\.?\d*|\.\d+)([eE][+-]?\d+)?$/.test(s)) { fieldState.bad = true; return NaN; }
  return parseFloat(s);
}

/** Integer in columns [start, end); blank -> NaN; garbage sets fieldState.bad. */
export function parseIntField(line: string, start: number, end: number): number {
  const n = line.length < end ? line.length : end;
  let i = start;
  while (i < n && line.charCodeAt(i) === 32) i++;
  if (i >= n) return NaN;
  let neg = false;
  let c = line.charCodeAt(i);
  if (c === 45) { neg = true; i++; } else if (c === 43) i++;
  let v = 0;
  let digits = 0;
  for (; i < n; i++) {
    c = line.charCodeAt(i);
    if (c >= 48 && c <= 57) { v = v * 10 + (c - 48); digits++; } else break;
  }
  for (; i < n; i++) if (line.charCodeAt(i) !== 32) { fieldState.bad = true; return NaN; }
  if (digits === 0) { fieldState.bad = true; return NaN; }
  return neg ? -v : v;
}

/** Columns [start, end) trimmed (header text fields). */
export function textField(line: string, start: number, end: number): string {
  return line.slice(start, end).trim();
}

/*
 * The same fields read from bytes (a line of a Uint8Array, see byte-lines.ts). Only the usual layouts
 * are read here; anything else is left to the text functions above on the field's characters, so both
 * give the same values and the same garbled fields.
 */

const LF = 10;
const CR = 13;
const BLANK = 32;
const MINUS = 45;
const POINT = 46;

/** What parseF14p3Bytes returns for a field not in the usual layout (no field reads as -Infinity). */
export const NOT_USUAL_LAYOUT = -Infinity;

/**
 * parseF14p3In on bytes: the field F14.3 at b[c, c+14) of a line ending at `end`, when it is in the
 * usual layout (right-aligned digits, the point in the 11th column, at most 9 integer digits);
 * NOT_USUAL_LAYOUT otherwise (blank, short, exponent, garbled: parse its text with parseFixedIn).
 */
export function parseF14p3Bytes(b: Uint8Array, c: number, end: number): number {
  return end < c + 14 ? NOT_USUAL_LAYOUT : f14p3At(b, c);
}

/** The single digit (LLI, SSI, flag) at `col` of a line ending at `end` (exclusive): 0 blank or absent; -1 not a digit. */
export function digitInBytes(b: Uint8Array, col: number, end: number): number {
  if (col >= end) return 0;
  const c = b[col]!;
  if (c === BLANK) return 0;
  if (c >= 48 && c <= 57) return c - 48;
  return -1;
}

/**
 * An observation line in the usual layout read in one pass, its end found on the way: fields
 * [from, to) from column `c` on, 16 columns each (F14.3, LLI I1, SSI I1: RINEX 3.05 table A3, RINEX 2.11
 * table A2), each either a value in the usual layout (see parseF14p3Bytes) or 14 blank columns, with
 * blank or digit flags; the line may end ('\n' or CR LF) before a field or after its value or LLI. The
 * fields are written to values/lli/ssi (value divided by div[k] when div is given) and the position of
 * the line's end (its '\n', or the CR of CR LF) is returned. -1 when the line is anything else (a lone
 * CR, another layout, garbled, the buffer ends): then read it as a span with parseF14p3Bytes and
 * digitInBytes, which give the same values for the fields written here. `view` is a DataView of `b`'s
 * bytes (byte-lines.ts ByteLineCursor.view). Needs 16 readable bytes after any position before the
 * line's end (byte-lines.ts PADDING_BYTES). The line must end within or right after field `to - 1`: a
 * line with more columns returns -1 and is read as a span, which gives the same values.
 *
 * The columns are read two or four at a time through the DataView (little-endian: the first column in
 * the low byte) and looked up in tables (COLUMN_PAIRS, FLAG_DIGIT): no branch on the number of leading
 * blanks, which varies from field to field, and fewer loads than column by column (in V8 a DataView
 * load of 2 or 4 bytes costs about what a Uint8Array load of one does: over the observation lines of
 * dgar0100.24o and BELE00BRA 2024-01-10 alone, about a third less time than the column by column
 * reading, node 20, measured on this machine). A negative value takes the column by column reading
 * (f14p3At).
 *
 * The value reading is written in this function, which makes it larger than V8 inlines (about 900
 * bytes of bytecode; node 20 inlines up to 460, --max-inlined-bytecode-size): it is compiled on its own,
 * and the reader's loops that call it (obs-reader.ts sats2, sats3) keep their small calls inlined
 * (ObsSlab.sat, ByteLineCursor.tookLine), which this function inlined into them crowded out (seen with
 * --trace-turbo-inlining; the whole reader on dgar0100.24o about 5 % faster for it).
 */
export function parseObsLineBytes(
  b: Uint8Array, view: DataView, c: number, from: number, to: number, values: Float64Array, lli: Uint8Array, ssi: Uint8Array,
  div: Float64Array | null,
): number {
  for (let k = from; k < to; k++, c += 16) {
    const cols1to2 = view.getUint16(c, true);
    // '\n' and CR are the only bytes below 14 a line of the usual layout holds (one test for both)
    if ((cols1to2 & 0xff) <= CR) return lineEndAt(b, c);
    const cols11to12 = view.getUint16(c + 10, true), cols13to16 = view.getInt32(c + 12, true);
    let v: number;
    if ((cols11to12 & 0xff) === POINT) {
      // F14.3 without a sign: columns 1-10 blanks then digits, the point in column 11, three digits in
      // columns 12-14 (RINEX 3.05 table A3, RINEX 2.11 table A2), read by pairs of columns. Ten blanks
      // read as 0 before the point, as parseFixedIn reads them, and ten integer digits are read too:
      // value * 1000 is then below 10^13, still an exact integer in a double, so the value is the one
      // parseFixedIn gives (see parseF14p3Bytes). Written here rather than in a function of its own:
      // see the function comment on inlining.
      const p0 = COLUMN_PAIRS[cols1to2]!, p1 = COLUMN_PAIRS[view.getUint16(c + 2, true)]!, p2 = COLUMN_PAIRS[view.getUint16(c + 4, true)]!;
      const p3 = COLUMN_PAIRS[view.getUint16(c + 6, true)]!, p4 = COLUMN_PAIRS[view.getUint16(c + 8, true)]!;
      const frac12 = DIGIT[cols11to12 >> 8]!, frac34 = COLUMN_PAIRS[cols13to16 & 0xffff]!;
      // every pair valid (no sign bit); after a pair that holds a digit only pairs of two digits (the
      // blanks lead: HOLDS_DIGIT shifted onto NOT_TWO_DIGITS of the next pair); the fraction digits
      const bad = ((p0 | p1 | p2 | p3 | p4 | frac12 | frac34) & BAD_PAIR) |
        ((((p0 >> 1) & p1) | ((p1 >> 1) & p2) | ((p2 >> 1) & p3) | ((p3 >> 1) & p4) | frac34) & NOT_TWO_DIGITS);
      if (bad === 0) {
        // value * 1000 as an integer: integer digits 1-6, then digits 7-10 and the fraction (each part
        // exact), divided once by 1000: the value parseF14p3In gives (see there)
        const high = ((p0 & 0xff) * 100 + (p1 & 0xff)) * 100 + (p2 & 0xff);
        const low = ((p3 & 0xff) * 100 + (p4 & 0xff)) * 1000 + frac12 * 100 + (frac34 & 0xff);
        v = (high * 1e7 + low) / 1000;
      } else {
        // a sign, or another layout: column by column
        v = f14p3At(b, c);
        if (v === NOT_USUAL_LAYOUT) return -1;
      }
    } else if (
      cols1to2 === BLANK2 && view.getInt32(c + 2, true) === BLANK4 && view.getInt32(c + 6, true) === BLANK4 &&
      cols11to12 === BLANK2 && (cols13to16 & 0xffff) === BLANK2
    ) {
      v = NaN; // 14 blank columns: a blank field
    } else return -1;
    values[k] = div !== null ? v / div[k]! : v;
    const a = FLAG_DIGIT[(cols13to16 >> 16) & 0xff]!;
    if (a < 0) {
      if (a !== LINE_END) return -1;
      lli[k] = 0;
      ssi[k] = 0;
      return lineEndAt(b, c + 14);
    }
    lli[k] = a;
    const s = FLAG_DIGIT[cols13to16 >>> 24]!;
    if (s < 0) {
      if (s !== LINE_END) return -1;
      ssi[k] = 0;
      return lineEndAt(b, c + 15);
    }
    ssi[k] = s;
  }
  return lineEndAt(b, c);
}

/** Two blanks as a 16-bit word; four as a 32-bit one. */
const BLANK2 = 0x2020;
const BLANK4 = 0x20202020;

/** FLAG_DIGIT entries other than a digit's value: a line end ('\n' or CR), any byte not a flag. */
const LINE_END = -2;
const NOT_A_FLAG = -1;
/** A flag column (LLI, SSI: I1) by byte: a digit's value, 0 for a blank, LINE_END, NOT_A_FLAG. */
const FLAG_DIGIT = new Int8Array(256).fill(NOT_A_FLAG);
FLAG_DIGIT[BLANK] = 0;
FLAG_DIGIT[LF] = LINE_END;
FLAG_DIGIT[CR] = LINE_END;
/** A fraction column by byte: a digit's value, -1 for anything else. */
const DIGIT = new Int8Array(256).fill(-1);
for (let d = 0; d < 10; d++) FLAG_DIGIT[48 + d] = DIGIT[48 + d] = d;

/** COLUMN_PAIRS bits beside the value (0-99, low byte): the pair is not two digits; it holds a digit. */
const NOT_TWO_DIGITS = 0x100;
const HOLDS_DIGIT = 0x200;
/** A COLUMN_PAIRS entry for a pair that is none of blank-blank, blank-digit, digit-digit (negative). */
const BAD_PAIR = -0x8000;
/**
 * Two columns of a number right-aligned in blanks, by their 16-bit word (first column in the low
 * byte): two blanks read 0, blank-digit the digit, digit-digit their two-digit value, with the bits
 * NOT_TWO_DIGITS and HOLDS_DIGIT; BAD_PAIR for anything else (a digit then a blank too). 128 KiB,
 * made at load.
 */
const COLUMN_PAIRS = new Int16Array(1 << 16).fill(BAD_PAIR);
COLUMN_PAIRS[BLANK2] = NOT_TWO_DIGITS;
for (let first = 0; first < 10; first++) {
  COLUMN_PAIRS[((48 + first) << 8) | BLANK] = first | NOT_TWO_DIGITS | HOLDS_DIGIT;
  for (let second = 0; second < 10; second++) COLUMN_PAIRS[((48 + second) << 8) | (48 + first)] = (10 * first + second) | HOLDS_DIGIT;
}

/**
 * The F14.3 field at b[c, c+14) in the usual layout (see parseF14p3Bytes) column by column, the line
 * known to hold all 14 columns or to end inside them (its end fails the layout); NOT_USUAL_LAYOUT otherwise.
 */
function f14p3At(b: Uint8Array, c: number): number {
  const point = c + 10;
  if (b[point] !== POINT) return NOT_USUAL_LAYOUT;
  let i = c;
  let ch = b[i]!;
  while (ch === BLANK) ch = b[++i]!; // the point ends the blanks at the latest
  const neg = ch === MINUS;
  if (neg) ch = b[++i]!;
  if (point - i > 9 || i === point) return NOT_USUAL_LAYOUT;
  let mant = 0;
  for (; i < point; ch = b[++i]!) {
    const d = (ch - 48) | 0;
    if (d < 0 || d > 9) return NOT_USUAL_LAYOUT;
    mant = (mant * 10 + d) | 0;
  }
  const d1 = b[point + 1]! - 48, d2 = b[point + 2]! - 48, d3 = b[point + 3]! - 48;
  if (d1 < 0 || d1 > 9 || d2 < 0 || d2 > 9 || d3 < 0 || d3 > 9) return NOT_USUAL_LAYOUT;
  // integer thousandths divided once by 1000: the value parseF14p3In gives (see there)
  const v = (mant * 1000 + (d1 * 100 + d2 * 10 + d3)) / 1000;
  return neg ? -v : v;
}

/**
 * `i` when a line ends at b[i]: '\n', or CR LF (the CR is left out of the line, as byte-lines.ts and
 * text-lines.ts leave it); -1 otherwise (a lone CR, whose meaning depends on the source, is left to the
 * span reading). The LF after a CR is read from the buffer, whose zero padding is no LF: a CR last in
 * the buffer is no line end here.
 */
function lineEndAt(b: Uint8Array, i: number): number {
  const ch = b[i]!;
  return ch === LF || (ch === CR && b[i + 1] === LF) ? i : -1;
}

/**
 * parseFixedIn on bytes[start, end) (end already clipped to the line). A field with an exponent or more
 * than 15 digits returns NOT_USUAL_LAYOUT (parse its text with parseFixedIn, which reads it with
 * parseFloat); everything else gives parseFixedIn's value and sets fieldState.bad as it does.
 */
export function parseFixedBytes(b: Uint8Array, start: number, end: number): number {
  const n = end;
  let i = start;
  while (i < n && b[i] === BLANK) i++;
  if (i >= n) return NaN;
  let neg = false;
  let c = b[i]!;
  if (c === MINUS) { neg = true; i++; } else if (c === 43) i++;
  let mant = 0;
  let digits = 0;
  let frac = 0;
  let seenDot = false;
  for (; i < n; i++) {
    c = b[i]!;
    if (c >= 48 && c <= 57) {
      mant = mant * 10 + (c - 48);
      digits++;
      if (seenDot) frac++;
    } else if (c === POINT && !seenDot) {
      seenDot = true;
    } else break;
  }
  if (i < n) {
    if (c === 69 || c === 101 || c === 68 || c === 100) return NOT_USUAL_LAYOUT;
    for (; i < n; i++) {
      if (b[i] !== BLANK) { fieldState.bad = true; return NaN; }
    }
  }
  if (digits === 0) { fieldState.bad = true; return NaN; }
  if (digits > 15) return NOT_USUAL_LAYOUT;
  const v = frac === 0 ? mant : mant / POW10[frac]!;
  return neg ? -v : v;
}

/** parseIntField on bytes[start, end) (end already clipped to the line): blank -> NaN; garbage sets fieldState.bad. */
export function parseIntBytes(b: Uint8Array, start: number, end: number): number {
  const n = end;
  let i = start;
  while (i < n && b[i] === BLANK) i++;
  if (i >= n) return NaN;
  let neg = false;
  let c = b[i]!;
  if (c === MINUS) { neg = true; i++; } else if (c === 43) i++;
  let v = 0;
  let digits = 0;
  for (; i < n; i++) {
    c = b[i]!;
    if (c >= 48 && c <= 57) { v = v * 10 + (c - 48); digits++; } else break;
  }
  for (; i < n; i++) if (b[i] !== BLANK) { fieldState.bad = true; return NaN; }
  if (digits === 0) { fieldState.bad = true; return NaN; }
  return neg ? -v : v;
}
