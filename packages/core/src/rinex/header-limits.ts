/**
 * Bounds on what a header reader keeps, so a damaged or hostile header (millions of COMMENT lines,
 * an absurd count of observation types) cannot exhaust memory. Real headers hold tens of comments and
 * at most a few dozen observation types per system.
 */

/** COMMENT records kept per header (or per event's header records); the rest are counted. */
export const MAX_HEADER_COMMENTS = 1000;
/** Unrecognised header records kept verbatim (written back by the observation writer); the rest are counted. */
export const MAX_OTHER_HEADER_RECORDS = 1000;
/** Header lines kept by the navigation reader before END OF HEADER; later ones are counted and skipped. */
export const MAX_NAV_HEADER_LINES = 10000;
/**
 * Observation types per system: RINEX 3.05 table A2 gives the count as I3 (at most 999). RINEX 2.11
 * defines 26 types (table A1 notes) in an I6 field: more than 99 cannot be a RINEX 2 file (common practice
 * bound, well above every defined type).
 */
export const MAX_OBS_TYPES_RINEX3 = 999;
export const MAX_OBS_TYPES_RINEX2 = 99;
export { lineTooLongReason, MAX_LINE_CHARS } from '../text-limits.js';
/** The warning text for records dropped over a bound. */
export function droppedRecordsMessage(count: number, what: string, kept: number): string {
  return `the header holds ${(count + kept).toLocaleString('en-US')} ${what}: the first ${kept.toLocaleString('en-US')} are kept, ${count.toLocaleString('en-US')} more were read and dropped`;
}
