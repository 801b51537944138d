/**
 * Fixed-column field reading for RINEX navigation files. RINEX writes the broadcast orbit values as
 * Fortran D19.12 fields in fixed columns (RINEX 2.11 table A4: 3X,4D19.12; RINEX 3.04 table A6:
 * 4X,4D19.12), so fields are cut by column, never split on spaces: values may touch
 * ("-1.2D-08-3.4D-09") and blank fields mean "not given".
 */
import type { CalendarTime } from '../time/index.js';

/** A problem inside one record: the reader turns it into a Warning naming the file and line and skips the record. */
export class NavRecordProblem extends Error {
  override readonly name = 'NavRecordProblem';
  constructor(
    /** 1-based line number in the file. */
    readonly line: number,
    readonly code: string,
    message: string,
  ) {
    super(message);
  }
}

/** Fortran real: optional sign, digits with an optional point, optional exponent with D, d, E or e (ISO 1539 10.7.2). */
const FORTRAN_REAL = /^[+-]?(?:\d+\.?\d*|\.\d+)(?:[EeDd][+-]?\d+)?$/;

/**
 * Parses one Fortran real field. Blank -> NaN (a field not given); garbage -> undefined (the caller reports it).
 */
export function parseFortranReal(text: string): number | undefined {
  const s = text.trim();
  if (s === '') return NaN;
  if (!FORTRAN_REAL.test(s)) return undefined;
  return Number(s.replace(/[Dd]/, 'E'));
}

/** 10^k, exact in a double for k <= 22. */
const EXACT_POW10 = Array.from({ length: 23 }, (_, k) => Number(`1e${k}`));

/**
 * The Fortran real in columns [start, end) of `text` read by character codes, blanks around it allowed;
 * null when the field is anything else (blank, other whitespace, garbage, or digits beyond the exact
 * range below): the caller then uses parseFortranReal, which gives the value or the verdict.
 * The mantissa digits as an integer M < 2^53 and the decimal exponent e with |e| <= 22 are both exact
 * doubles, so M * 10^e or M / 10^-e is one correctly rounded IEEE 754 operation: the value Number()
 * gives for the text (ECMA-262 7.1.4.1.1; Clinger, "How to read floating point numbers accurately", 1990).
 */
export function fortranRealIn(text: string, start: number, end: number): number | null {
  let i = start;
  while (i < end && text.charCodeAt(i) === 32) i++;
  let last = end;
  while (last > i && text.charCodeAt(last - 1) === 32) last--;
  if (i >= last) return null;
  let c = text.charCodeAt(i);
  const neg = c === 45;
  if (c === 45 || c === 43) c = text.charCodeAt(++i);
  let m = 0, digits = 0, fraction = 0, seenPoint = false;
  for (; i < last; c = text.charCodeAt(++i)) {
    if (c >= 48 && c <= 57) {
      m = m * 10 + (c - 48);
      digits++;
      if (seenPoint) fraction++;
    } else if (c === 46 && !seenPoint) seenPoint = true;
    else break;
  }
  if (digits === 0) return null;
  let exponent = 0;
  if (i < last) {
    // E, e, D or d, then an optional sign and at least one digit.
    if (c !== 69 && c !== 101 && c !== 68 && c !== 100) return null;
    c = text.charCodeAt(++i);
    const negExp = c === 45;
    if (c === 45 || c === 43) c = text.charCodeAt(++i);
    if (i >= last) return null;
    for (; i < last; c = text.charCodeAt(++i)) {
      if (c < 48 || c > 57 || exponent > 1000) return null;
      exponent = exponent * 10 + (c - 48);
    }
    if (negExp) exponent = -exponent;
  }
  const e = exponent - fraction;
  if (m >= 9007199254740992 || e > 22 || e < -22) return null;
  const v = e >= 0 ? m * EXACT_POW10[e]! : m / EXACT_POW10[-e]!;
  return neg ? -v : v;
}

/**
 * Reads the real in columns [start, start + width) of `text` (0-based); NaN when blank or beyond the end of
 * a short line. Throws NavRecordProblem naming the line when the field holds something that is not a number.
 */
export function realAt(text: string, start: number, width: number, lineNo: number): number {
  if (start >= text.length) return NaN;
  const fast = fortranRealIn(text, start, Math.min(text.length, start + width));
  if (fast !== null) return fast;
  const v = parseFortranReal(text.substring(start, start + width));
  if (v === undefined) {
    throw new NavRecordProblem(
      lineNo,
      'bad-number',
      `expected a number (Fortran D${width}.x) in columns ${start + 1}-${start + width}, found '${text.substring(start, start + width).trim()}'`,
    );
  }
  return v;
}

/** Integer field in fixed columns; NaN when blank. Throws NavRecordProblem on garbage. */
export function intAt(text: string, start: number, width: number, lineNo: number, what: string): number {
  const s = text.substring(start, start + width).trim();
  if (s === '') return NaN;
  if (!/^[+-]?\d+$/.test(s)) {
    throw new NavRecordProblem(lineNo, 'bad-number', `expected an integer ${what} in columns ${start + 1}-${start + width}, found '${s}'`);
  }
  return Number(s);
}

/** Checks a calendar reading read from a record's epoch field; throws NavRecordProblem when it is not a date. */
function checkCalendar(c: CalendarTime, lineNo: number): CalendarTime {
  const ok =
    Number.isInteger(c.year) && c.year >= 1980 && c.year <= 2200 &&
    Number.isInteger(c.month) && c.month >= 1 && c.month <= 12 &&
    Number.isInteger(c.day) && c.day >= 1 && c.day <= 31 &&
    Number.isInteger(c.hour) && c.hour >= 0 && c.hour <= 23 &&
    Number.isInteger(c.minute) && c.minute >= 0 && c.minute <= 59 &&
    Number.isFinite(c.second) && c.second >= 0 && c.second < 61;
  if (!ok) {
    throw new NavRecordProblem(lineNo, 'bad-epoch', `expected an epoch 'year month day hour minute second', found an impossible date`);
  }
  return c;
}

/**
 * RINEX 3/4 record epoch: A1,I2.2,1X,I4,5(1X,I2.2) (RINEX 3.04 table A6 'SV / EPOCH / SV CLK'):
 * year in columns 5-8, month 10-11, day 13-14, hour 16-17, minute 19-20, second 21-23.
 */
export function epochRinex3(text: string, lineNo: number, offset = 4): CalendarTime {
  const year = intAt(text, offset, 4, lineNo, 'year');
  const month = intAt(text, offset + 5, 2, lineNo, 'month');
  const day = intAt(text, offset + 8, 2, lineNo, 'day');
  const hour = intAt(text, offset + 11, 2, lineNo, 'hour');
  const minute = intAt(text, offset + 14, 2, lineNo, 'minute');
  const second = intAt(text, offset + 17, 2, lineNo, 'second');
  return checkCalendar({ year, month, day, hour, minute, second }, lineNo);
}

/**
 * RINEX 2 record epoch: I2,5(1X,I2),F5.1 (RINEX 2.11 table A4 'PRN / EPOCH / SV CLK'): two-digit year
 * in columns 4-5 (80-99 -> 19xx, 00-79 -> 20xx, RINEX 2.11 section 6.5), then month, day, hour, minute,
 * and seconds F5.1 in columns 18-22.
 */
export function epochRinex2(text: string, lineNo: number): CalendarTime {
  const yy = intAt(text, 2, 3, lineNo, 'year');
  const month = intAt(text, 5, 3, lineNo, 'month');
  const day = intAt(text, 8, 3, lineNo, 'day');
  const hour = intAt(text, 11, 3, lineNo, 'hour');
  const minute = intAt(text, 14, 3, lineNo, 'minute');
  const second = realAt(text, 17, 5, lineNo);
  const year = yy < 80 ? 2000 + yy : yy < 100 ? 1900 + yy : yy;
  return checkCalendar({ year, month, day, hour, minute, second }, lineNo);
}
