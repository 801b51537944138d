/**
 * Fortran-style fixed-width number formatting for RINEX navigation output: D19.12 data fields
 * (RINEX 3.04 table A6: 4X,4D19.12, written with 'E' as RINEX 3 allows) and D12.4 header fields
 * (table A5 IONOSPHERIC CORR), D17.10 / D16.9 (TIME SYSTEM CORR).
 */
import { ProcessingError } from '../errors.js';

/**
 * `v` in Fortran Dw.d layout with 'E': sign or blank, one digit, point, `decimals` digits, 'E', sign, two
 * exponent digits; left-padded to `width`. NaN -> blanks (a field not given). Magnitudes below 1e-99
 * print as zero (a two-digit exponent cannot hold them).
 */
export function formatFortranReal(v: number, width: number, decimals: number): string {
  if (Number.isNaN(v)) return ' '.repeat(width);
  if (!Number.isFinite(v) || Math.abs(v) >= 9.9999e99) {
    throw new ProcessingError(`cannot write ${v} in a RINEX D${width}.${decimals} field`);
  }
  const neg = v < 0 || Object.is(v, -0);
  const a = Math.abs(v) < 1e-99 ? 0 : Math.abs(v);
  const [mant, expText] = a.toExponential(decimals).split('e') as [string, string];
  const exp = Number(expText);
  const text = `${neg ? '-' : ''}${mant}E${exp < 0 ? '-' : '+'}${String(Math.abs(exp)).padStart(2, '0')}`;
  return text.padStart(width, ' ');
}

/** D19.12 data field. */
export function d19(v: number): string {
  return formatFortranReal(v, 19, 12);
}

/** Right-justified integer in `width` columns (Fortran Iw). */
export function fortranInt(v: number, width: number): string {
  return String(Math.round(v)).padStart(width, ' ');
}

/** Header line: 60 columns of content then the label (RINEX 3.04 section 5.1). */
export function headerLine(content: string, label: string): string {
  return content.padEnd(60, ' ').substring(0, 60) + label;
}
