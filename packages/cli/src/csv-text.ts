/**
 * The one place CSV text is produced: RFC 4180 quoting and LF record ends (csv-lines.ts: the bytes of
 * csv-stringify by a plain join), every cell made inert against spreadsheet formula injection
 * (inertCell in the core).
 */
import { inertRows } from '@refdelta/core';
import { csvLines } from './csv-lines.js';

export function csvText(rows: readonly (readonly string[])[]): string {
  return csvLines(inertRows(rows));
}
