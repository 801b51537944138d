/** Bounds shared by every text reader (RINEX, compact RINEX, CSV, JSON). */

/**
 * Longest text line read, in characters. RINEX lines are at most 80 characters, except RINEX 3/4
 * observation records (3 + 16 per type: a few hundred); our CSV and JSON inputs are small. A longer line
 * means the file is not what it claims to be, and holding it would exhaust memory.
 */
export const MAX_LINE_CHARS = 1 << 20;

/** The sentence for a line over MAX_LINE_CHARS. */
export function lineTooLongReason(lineNo: number): string {
  return `line ${lineNo} is longer than ${MAX_LINE_CHARS.toLocaleString('en-US')} characters (the longest line read; RINEX lines hold at most a few hundred): the file is damaged or not a text file of the expected kind`;
}

