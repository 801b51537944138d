/**
 * Character-wise differencing used by compact RINEX for epoch lines and LLI/SSI flag strings.
 * Source: Hatanaka 2008, "A Compression Format and Tools for GNSS Observation Data" (Bull. GSI 55),
 * section 3 (and the "Compact RINEX format" description, v1.0 / v3.0): in the difference text a
 * space means "same character as before", '&' means "now a space", any other character replaces
 * the old one; the result is as long as the longer of the two.
 */

const SPACE = 32;
const AMP = 38;

/** Applies a compact RINEX text difference to the previous line. */
export function applyTextDiff(previous: string, diff: string): string {
  const n = Math.max(previous.length, diff.length);
  const codes = new Array<number>(n);
  for (let i = 0; i < n; i++) {
    const d = i < diff.length ? diff.charCodeAt(i) : SPACE;
    if (d === SPACE) codes[i] = i < previous.length ? previous.charCodeAt(i) : SPACE;
    else codes[i] = d === AMP ? SPACE : d;
  }
  return String.fromCharCode(...codes);
}

/**
 * Applies a flag difference in place to `flags` (character codes, LLI and SSI for each observation).
 * Returns false when the difference is longer than the flag string or holds a character that is
 * neither a digit, a space nor '&' (a damaged record).
 */
export function applyFlagDiff(flags: Uint8Array, diff: string): boolean {
  if (diff.length > flags.length) return false;
  for (let i = 0; i < diff.length; i++) {
    const d = diff.charCodeAt(i);
    if (d === SPACE) continue;
    if (d === AMP) flags[i] = SPACE;
    else if (d >= 48 && d <= 57) flags[i] = d;
    else return false;
  }
  return true;
}
