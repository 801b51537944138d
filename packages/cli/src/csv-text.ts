/**
 * The one place CSV text is produced: RFC 4180 quoting (csv-stringify), LF record ends, and every cell
 * made inert against spreadsheet formula injection (inertCell in the core).
 */
import { stringify } from 'csv-stringify/sync';
import { inertRows } from '@refdelta/core';

export function csvText(rows: readonly (readonly string[])[]): string {
  return rows.length ? stringify(inertRows(rows), { record_delimiter: 'unix' }) : '';
}
