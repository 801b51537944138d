/**
 * CSV text of rows of string cells, one '\n'-terminated line per row. A cell holding a comma, a double
 * quote, CR or LF is quoted and its quotes doubled (RFC 4180, 2); every other cell is written as it is.
 * These are the bytes csv-stringify gives with { record_delimiter: 'unix' } for string cells, by a
 * plain join: the output builders call this for every row of a run.
 */

/** True when the cell needs quotes: it holds ',', '"', '\n' or '\r'. */
function needsQuotes(cell: string): boolean {
  for (let i = 0; i < cell.length; i++) {
    const c = cell.charCodeAt(i);
    if (c === 44 || c === 34 || c === 10 || c === 13) return true;
  }
  return false;
}

/** One cell as written: null and undefined as an empty cell, quoted when needed. */
export function csvCell(cell: string | null | undefined): string {
  if (cell === null || cell === undefined) return '';
  return needsQuotes(cell) ? `"${cell.replaceAll('"', '""')}"` : cell;
}

/** One row without its '\n'. Array.prototype.join (null and undefined as '') is several times a cell-by-cell concatenation. */
function rowText(row: readonly (string | null | undefined)[]): string {
  for (let i = 0; i < row.length; i++) {
    const cell = row[i];
    if (cell !== null && cell !== undefined && needsQuotes(cell)) return row.map(csvCell).join(',');
  }
  return row.join(',');
}

/** One row as a line with its '\n'. */
export function csvLine(row: readonly (string | null | undefined)[]): string {
  return rowText(row) + '\n';
}

/** Rows as CSV text ('' for no rows). */
export function csvLines(rows: readonly (readonly (string | null | undefined)[])[]): string {
  if (rows.length === 0) return '';
  const lines = new Array<string>(rows.length);
  for (let i = 0; i < rows.length; i++) lines[i] = rowText(rows[i]!);
  return lines.join('\n') + '\n';
}
