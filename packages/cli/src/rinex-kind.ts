/**
 * What a file is, by its content: the first line of its (decompressed) text is a RINEX
 * "RINEX VERSION / TYPE" record whose file type (column 21) says observation ('O'), navigation
 * ('N', or the RINEX 2 system-specific 'G' GLONASS, 'H' SBAS, 'L'/'E' Galileo, 'J' QZSS ... navigation
 * files) or something else ('M' meteorological, 'C' clock). RINEX 2.11 table A1, RINEX 3.05 table A1,
 * RINEX 4.00 table A1 (columns 1-9 version, 21 type, 61-80 label; table numbers from memory).
 */
import { openTextFile } from './node-io.js';

export type RinexKind = 'observation' | 'navigation' | 'other';

const LABEL = 'RINEX VERSION / TYPE';
const NAV_TYPES = new Set(['N', 'G', 'H', 'L', 'E', 'B', 'J', 'Q', 'I']);

/** The kind of a RINEX first line (a line that is not a RINEX first line is 'other'). */
export function rinexKindOfFirstLine(line: string): RinexKind {
  const l = line.replace(/\r$/, '');
  if (l.slice(60, 80).trim() !== LABEL) return 'other';
  const type = l.charAt(20).toUpperCase();
  if (type === 'O') return 'observation';
  return NAV_TYPES.has(type) ? 'navigation' : 'other';
}

/** The kind of a file by content (any encoding the decompression stage reads); unreadable files are 'other'. */
export async function rinexKindOfFile(path: string): Promise<RinexKind> {
  try {
    const t = await openTextFile(path, () => {});
    let head = '';
    for await (const chunk of t.text) {
      head += chunk;
      if (head.includes('\n') || head.length > 4096) break;
    }
    return rinexKindOfFirstLine(head.split('\n')[0] ?? '');
  } catch {
    return 'other';
  }
}

/** File names that announce an observation file (RINEX 2 .yyo/.yyd, RINEX 3/4 long names, .obs/.rnx/.crx), possibly compressed. */
export function looksLikeObservationName(name: string): boolean {
  const n = name.replace(/\.(gz|z)$/i, '');
  return /\.(obs|crx|\d\d[od])$/i.test(n) || /_MO\.(rnx|crx)$/i.test(n) || (/\.rnx$/i.test(n) && !/_[A-Z]N\.rnx$/i.test(n));
}
