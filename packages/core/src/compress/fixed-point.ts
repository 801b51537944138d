/**
 * Fixed-point text <-> integer helpers for compact RINEX. Compact RINEX stores every value as the
 * integer made of its digits with the decimal point removed (Hatanaka 2008, "A Compression Format and
 * Tools for GNSS Observation Data", Bull. GSI 55, section 3): observations in thousandths (RINEX F14.3),
 * receiver clock offsets in 1e-9 s (RINEX 2 F12.9) or 1e-12 s (RINEX 3 F15.12). Integer arithmetic on
 * these is exact while |value| < 2^53.
 */

const SPACES: string[] = [];
for (let i = 0; i <= 80; i++) SPACES.push(' '.repeat(i));

/** `n` spaces (n <= 80 from a table, longer built). */
export function spaces(n: number): string {
  return n <= 80 ? SPACES[n < 0 ? 0 : n] : ' '.repeat(n);
}

const POW10 = [1, 10, 100, 1000, 1e4, 1e5, 1e6, 1e7, 1e8, 1e9, 1e10, 1e11, 1e12];

/**
 * Formats the integer `units` (value x 10^decimals) as Fortran Fw.d, right-aligned in `width` columns,
 * with a leading '0' before the point (C printf "%w.df" style; common practice of RINEX writers).
 * A value wider than `width` is written in full (it would be '*' in Fortran).
 */
export function formatFixed(units: number, decimals: number, width: number): string {
  const neg = units < 0;
  const a = neg ? -units : units;
  const scale = POW10[decimals];
  let ip = Math.floor(a / scale);
  let fp = a - ip * scale;
  if (fp < 0) {
    ip -= 1;
    fp += scale;
  } else if (fp >= scale) {
    ip += 1;
    fp -= scale;
  }
  let frac = String(fp);
  if (frac.length < decimals) frac = '000000000000'.slice(0, decimals - frac.length) + frac;
  const s = (neg ? '-' : '') + ip + '.' + frac;
  return s.length < width ? spaces(width - s.length) + s : s;
}

/** F14.3 of an integer number of thousandths (the RINEX observation field). */
export function formatObs(thousandths: number): string {
  return formatFixed(thousandths, 3, 14);
}

/** Largest magnitude accepted from a compact RINEX field (exact in a double). */
export const MAX_SAFE_UNITS = Number.MAX_SAFE_INTEGER;

/**
 * Parses a signed decimal integer in s[start, end). Returns NaN when the text is not an integer
 * (empty, stray characters, or more digits than a double holds exactly).
 */
export function parseSignedInt(s: string, start: number, end: number): number {
  let i = start;
  let neg = false;
  if (i < end) {
    const c0 = s.charCodeAt(i);
    if (c0 === 45 /* - */) {
      neg = true;
      i++;
    } else if (c0 === 43 /* + */) {
      i++;
    }
  }
  if (i >= end || end - i > 16) return NaN;
  let v = 0;
  for (; i < end; i++) {
    const d = s.charCodeAt(i) - 48;
    if (d < 0 || d > 9) return NaN;
    v = v * 10 + d;
  }
  if (v > MAX_SAFE_UNITS) return NaN;
  return neg ? -v : v;
}
