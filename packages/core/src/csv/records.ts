/**
 * The CSV files of our own formats (control marks, points, occupation windows): comma-separated,
 * RFC 4180 quoting, '#' comment lines and blank lines skipped, line numbers kept for error messages.
 */

/** Splits one CSV line; double-quoted fields may contain commas ("" is a literal quote). */
export function splitCsvLine(line: string): string[] {
  const out: string[] = [];
  let cur = '';
  let quoted = false;
  for (let i = 0; i < line.length; i++) {
    const c = line[i]!;
    if (quoted) {
      if (c === '"' && line[i + 1] === '"') { cur += '"'; i++; }
      else if (c === '"') quoted = false;
      else cur += c;
    } else if (c === '"') quoted = true;
    else if (c === ',') { out.push(cur.trim()); cur = ''; }
    else cur += c;
  }
  out.push(cur.trim());
  return out;
}

/** The data records of a text (header row included), with their 1-based line numbers. */
export function csvRecords(text: string): Array<{ readonly lineNo: number; readonly fields: string[] }> {
  const out: Array<{ lineNo: number; fields: string[] }> = [];
  const lines = text.split(/\r?\n/);
  for (let i = 0; i < lines.length; i++) {
    const raw = lines[i]!.trim();
    if (raw === '' || raw.startsWith('#')) continue;
    out.push({ lineNo: i + 1, fields: splitCsvLine(raw) });
  }
  return out;
}
