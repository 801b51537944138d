/**
 * Reads, from RINEX observation header lines, what the compact RINEX decoder needs: the RINEX
 * version and the number of observation types (per system for RINEX 3/4).
 * RINEX 2.11 table A1 '# / TYPES OF OBSERV' (count in columns 1-6); RINEX 3.05 / 4.00 table A2
 * 'SYS / # / OBS TYPES' (system letter in column 1, count in columns 4-6; continuation lines have a
 * blank column 1).
 */

/** Key used for the single RINEX 2 observation list. */
export const ALL_SYSTEMS_KEY = '*';

export interface ObsTypeCounts {
  /** RINEX version from 'RINEX VERSION / TYPE', NaN until seen. */
  version: number;
  /** Observation types per system letter (RINEX 3/4) or under '*' (RINEX 2). */
  readonly counts: Map<string, number>;
}

export function newObsTypeCounts(): ObsTypeCounts {
  return { version: NaN, counts: new Map() };
}

/** Header label: columns 61-80 (RINEX 2.11 section 5.1 / RINEX 3.05 section 5.1). */
export function headerLabel(line: string): string {
  return line.length > 60 ? line.slice(60).trimEnd() : '';
}

/** Updates `into` from one header line; returns the label read. */
export function readHeaderLine(line: string, into: ObsTypeCounts): string {
  const label = headerLabel(line);
  if (label === 'RINEX VERSION / TYPE') {
    into.version = Number(line.slice(0, 9));
  } else if (label === '# / TYPES OF OBSERV') {
    const n = line.slice(0, 6).trim();
    if (n !== '') setCount(into, ALL_SYSTEMS_KEY, Number(n));
  } else if (label === 'SYS / # / OBS TYPES') {
    const sys = line.charAt(0);
    if (sys !== ' ' && sys !== '') setCount(into, sys, Number(line.slice(3, 6)));
  }
  return label;
}

/** A count that is not a whole number 0..999 (I6 / I3 fields) is ignored: the system stays unknown. */
function setCount(into: ObsTypeCounts, key: string, n: number): void {
  if (Number.isInteger(n) && n >= 0 && n <= 999) into.counts.set(key, n);
}
