/**
 * A line cursor over text that arrives as chunks with arbitrary boundaries.
 *
 * Chunks are pulled asynchronously, but lines already in the buffer are handed out synchronously:
 * `take()` returns a line, `undefined` when the buffer holds no complete line yet (call `fill()`),
 * or `null` at the end of the text. An `await` per line would cost a microtask per line; this way a
 * reader awaits only at chunk boundaries. CRLF and CR-less final lines are handled; line numbers are
 * 1-based (the number of the line last returned).
 *
 * The observation reader reads bytes instead (byte-lines.ts, whose lines are these); this cursor is
 * the plain text one (textLines), and the reference its tests hold the byte cursor to.
 */
import { InputError } from '../errors.js';
import { lineTooLongReason, MAX_LINE_CHARS } from './header-limits.js';

export class LineCursor {
  private buf = '';
  private pos = 0;
  /** Start of a line that the previous chunks did not finish. */
  private carry = '';
  private ended = false;
  private it: AsyncIterator<string>;
  /** 1-based number of the line most recently returned by take() (0 before the first). */
  lineNumber = 0;
  /** A line put back with unread(): returned again by the next take(). */
  private pending: string | null = null;

  /** `file` names the input in the error for a line over MAX_LINE_CHARS. */
  constructor(source: AsyncIterable<string>, private readonly file = 'the input') {
    this.it = source[Symbol.asyncIterator]();
  }

  /** Next line without its end-of-line; undefined = need fill(); null = end of text. */
  take(): string | null | undefined {
    if (this.pending !== null) {
      const l = this.pending;
      this.pending = null;
      this.lineNumber++;
      return l;
    }
    const buf = this.buf;
    const pos = this.pos;
    const nl = buf.indexOf('\n', pos);
    if (nl < 0) {
      if (!this.ended) return undefined;
      if (pos >= buf.length && this.carry === '') return null;
      this.pos = buf.length;
      this.lineNumber++;
      const last = this.joined(this.carry + buf.slice(pos));
      this.carry = '';
      return last;
    }
    this.pos = nl + 1;
    this.lineNumber++;
    if (this.carry !== '') {
      // a line split across chunks (rare): joined once
      const line = this.joined(this.carry + buf.slice(pos, nl));
      this.carry = '';
      return line;
    }
    const end = nl > pos && buf.charCodeAt(nl - 1) === 13 ? nl - 1 : nl;
    return pos === 0 && end === buf.length ? buf : buf.slice(pos, end);
  }

  /** A line joined from chunks, held to MAX_LINE_CHARS, without a final CR. */
  private joined(line: string): string {
    if (line.length > MAX_LINE_CHARS) throw new InputError(this.file, this.lineNumber, lineTooLongReason(this.lineNumber));
    return line.charCodeAt(line.length - 1) === 13 ? line.slice(0, -1) : line;
  }

  /** Puts the line just taken back, so the next take() returns it again (one line deep). */
  unread(line: string): void {
    this.pending = line;
    this.lineNumber--;
  }

  /** Pulls one more chunk into the buffer. Returns false when the source is exhausted. */
  async fill(): Promise<boolean> {
    if (this.ended) return false;
    const r = await this.it.next();
    if (r.done) {
      this.ended = true;
      return false;
    }
    const chunk = typeof r.value === 'string' ? r.value : String(r.value);
    // The unfinished line is kept aside rather than prepended: a concatenated buffer would be a
    // cons string, slower to search and slice than the chunk itself (common practice for V8).
    const rest = this.pos < this.buf.length ? this.buf.slice(this.pos) : '';
    if (rest.indexOf('\n') >= 0) {
      // fill() called while whole lines were still buffered: keep them in order
      this.buf = this.carry + rest + chunk;
      this.carry = '';
    } else {
      this.carry += rest;
      if (this.carry.length > MAX_LINE_CHARS) throw new InputError(this.file, this.lineNumber + 1, lineTooLongReason(this.lineNumber + 1));
      this.buf = chunk;
    }
    this.pos = 0;
    return true;
  }

  /** Next line, awaiting more chunks as needed; null at the end. */
  async next(): Promise<string | null> {
    for (;;) {
      const l = this.take();
      if (l !== undefined) return l;
      await this.fill();
    }
  }

  /** Stops the source early (e.g. the consumer broke out of a loop). */
  async close(): Promise<void> {
    this.ended = true;
    this.buf = '';
    this.carry = '';
    this.pos = 0;
    if (this.it.return) await this.it.return();
  }
}

/** Async iterable over the lines of the text. */
export async function* textLines(source: AsyncIterable<string>): AsyncIterable<string> {
  const c = new LineCursor(source);
  for (;;) {
    const l = await c.next();
    if (l === null) return;
    yield l;
  }
}

/** Decodes byte chunks as UTF-8 text chunks (multi-byte characters split across chunks are kept whole). */
export async function* decodeUtf8Chunks(bytes: AsyncIterable<Uint8Array>): AsyncIterable<string> {
  const dec = new TextDecoder('utf-8');
  for await (const b of bytes) {
    const s = dec.decode(b, { stream: true });
    if (s.length > 0) yield s;
  }
  const tail = dec.decode();
  if (tail.length > 0) yield tail;
}
