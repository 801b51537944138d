/**
 * Spreadsheet formula injection: a cell whose text starts with = + - @ (or a tab or carriage return,
 * which some spreadsheets skip before looking for those) is run as a formula when the CSV is opened.
 * The usual defence (OWASP "CSV Injection", common practice) is a leading apostrophe, which spreadsheets
 * show as text. Numbers (e.g. -12.5, +3, -1.2e-5) are left as they are.
 */

const NUMBER = /^[+-]?(\d+(\.\d*)?|\.\d+)([eE][+-]?\d+)?$/;

/** The cell as written to CSV: inert text when it could be read as a formula, else unchanged. */
export function inertCell(cell: string): string {
  if (cell === '') return cell;
  const c = cell.charCodeAt(0);
  // = + - @ TAB CR
  if (c !== 61 && c !== 43 && c !== 45 && c !== 64 && c !== 9 && c !== 13) return cell;
  if (NUMBER.test(cell)) return cell;
  return `'${cell}`;
}

/**
 * Every cell of every row made inert (see inertCell). A row none of whose cells changes (the usual
 * numeric row) is handed back as it is, not copied: the output builders call this for every row of a run.
 */
export function inertRows(rows: readonly (readonly string[])[]): (readonly string[])[] {
  const out = new Array<readonly string[]>(rows.length);
  for (let i = 0; i < rows.length; i++) out[i] = inertRow(rows[i]);
  return out;
}

function inertRow(row: readonly string[]): readonly string[] {
  for (let j = 0; j < row.length; j++) {
    const c = row[j];
    if (typeof c !== 'string' || inertCell(c) !== c) return row.map((x) => inertCell(String(x)));
  }
  return row;
}
