/**
 * The lines of a navigation text, read chunk by chunk with a bounded header: header lines after the
 * first MAX_NAV_HEADER_LINES (up to END OF HEADER) are counted and dropped, and a line longer than
 * MAX_LINE_CHARS stops reading with one sentence. Line ends LF, CRLF or CR; a leading U+FEFF is dropped.
 */
import { FormatError, InputError } from '../errors.js';
import { lineTooLongReason, MAX_LINE_CHARS, MAX_NAV_HEADER_LINES } from './header-limits.js';

export interface NavLines {
  readonly lines: string[];
  /** Header lines dropped just before END OF HEADER (so line numbers from there on are index + 1 + this). */
  readonly droppedHeaderLines: number;
}

const LINE_END = /\r\n|\n|\r/g;

export async function collectNavLines(file: string, text: AsyncIterable<string>): Promise<NavLines> {
  const lines: string[] = [];
  let dropped = 0;
  let inHeader = true;
  let carry = '';
  let first = true;
  /** The previous chunk ended with CR: a LF opening the next one belongs to that line end. */
  let pendingCr = false;
  const push = (line: string): void => {
    if (inHeader) {
      const isEnd = line.length > 60 && line.substring(60).trim() === 'END OF HEADER';
      if (isEnd) inHeader = false;
      else if (lines.length >= MAX_NAV_HEADER_LINES) { dropped++; return; }
    }
    lines.push(line);
  };
  for await (const chunk of text) {
    if (typeof chunk !== 'string') {
      throw new FormatError(file, 0, 'expected decompressed text, got binary chunks (decompress the file first)');
    }
    let s = chunk;
    if (first && s.length > 0) {
      first = false;
      if (s.charCodeAt(0) === 0xfeff) s = s.substring(1);
    }
    if (pendingCr && s.charCodeAt(0) === 10) s = s.substring(1);
    pendingCr = false;
    let start = 0;
    LINE_END.lastIndex = 0;
    for (let m = LINE_END.exec(s); m !== null; m = LINE_END.exec(s)) {
      const piece = s.substring(start, m.index);
      push(carry === '' ? piece : carry + piece);
      carry = '';
      start = m.index + m[0].length;
      if (m[0] === '\r' && start === s.length) pendingCr = true;
    }
    if (start < s.length) {
      carry = carry + s.substring(start);
      if (carry.length > MAX_LINE_CHARS) {
        const n = lines.length + dropped + 1;
        throw new InputError(file, n, lineTooLongReason(n));
      }
    }
  }
  if (carry !== '') push(carry);
  return { lines, droppedHeaderLines: dropped };
}
