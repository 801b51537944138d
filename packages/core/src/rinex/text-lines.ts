/**
 * A line cursor over text that arrives as chunks with arbitrary boundaries.
 *
 * Chunks are pulled asynchronously, but lines already in the buffer are handed out synchronously:
 * `take()` returns a line, `undefined` when the buffer holds no complete line yet (call `fill()`),
 * or `null` at the end of the text. An `await` per line would cost a microtask per line; this way a
 * reader awaits only at chunk boundaries. CRLF and CR-less final lines are handled; line numbers are
 * 1-based (the number of the line last returned).
 *
 * Hot loops use `takeSpan()` instead: the line is then `src` from `lineStart` to `lineEnd` (end
 * exclusive, CR removed), read with charCodeAt on the chunk itself, and no line string is made.
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
  /** A line put back with unread() / unreadSpan(): returned again by the next take() or takeSpan(). */
  private pending = false;
  private pendingSrc = '';
  private pendingStart = 0;
  private pendingEnd = 0;
  /** The line last returned by takeSpan(): src.slice(lineStart, lineEnd). */
  src = '';
  lineStart = 0;
  lineEnd = 0;

  /** `file` names the input in the error for a line over MAX_LINE_CHARS. */
  constructor(source: AsyncIterable<string>, private readonly file = 'the input') {
    this.it = source[Symbol.asyncIterator]();
  }

  /**
   * Next line as a span of `src` (see the class comment), without making a string.
   * Returns SPAN_LINE (a line is in src/lineStart/lineEnd), SPAN_FILL (call fill()) or SPAN_END.
   */
  takeSpan(): number {
    if (this.pending) {
      this.pending = false;
      this.src = this.pendingSrc;
      this.lineStart = this.pendingStart;
      this.lineEnd = this.pendingEnd;
      this.pendingSrc = '';
      this.lineNumber++;
      return SPAN_LINE;
    }
    const buf = this.buf;
    const pos = this.pos;
    const nl = buf.indexOf('\n', pos);
    if (nl < 0) {
      if (!this.ended) return SPAN_FILL;
      if (pos >= buf.length && this.carry === '') return SPAN_END;
      this.pos = buf.length;
      this.lineNumber++;
      this.spanOfJoined(this.carry + buf.slice(pos));
      this.carry = '';
      return SPAN_LINE;
    }
    this.pos = nl + 1;
    this.lineNumber++;
    if (this.carry !== '') {
      // a line split across chunks (rare): joined once
      this.spanOfJoined(this.carry + buf.slice(pos, nl));
      this.carry = '';
      return SPAN_LINE;
    }
    this.src = buf;
    this.lineStart = pos;
    this.lineEnd = nl > pos && buf.charCodeAt(nl - 1) === 13 ? nl - 1 : nl;
    return SPAN_LINE;
  }

  private spanOfJoined(line: string): void {
    if (line.length > MAX_LINE_CHARS) throw new InputError(this.file, this.lineNumber, lineTooLongReason(this.lineNumber));
    this.src = line;
    this.lineStart = 0;
    this.lineEnd = line.charCodeAt(line.length - 1) === 13 ? line.length - 1 : line.length;
  }

  /** Next line without its end-of-line; undefined = need fill(); null = end of text. */
  take(): string | null | undefined {
    const r = this.takeSpan();
    if (r === SPAN_LINE) return this.lineStart === 0 && this.lineEnd === this.src.length ? this.src : this.src.slice(this.lineStart, this.lineEnd);
    return r === SPAN_FILL ? undefined : null;
  }

  /** The line last returned by takeSpan() as a string. */
  spanText(): string {
    return this.src.slice(this.lineStart, this.lineEnd);
  }

  /** Puts the line just taken back, so the next take() returns it again (one line deep). */
  unread(line: string): void {
    this.pending = true;
    this.pendingSrc = line;
    this.pendingStart = 0;
    this.pendingEnd = line.length;
    this.lineNumber--;
  }

  /** Puts the span just taken back (one line deep), like unread(). */
  unreadSpan(): void {
    this.pending = true;
    this.pendingSrc = this.src;
    this.pendingStart = this.lineStart;
    this.pendingEnd = this.lineEnd;
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

  /**
   * True when at least `chars` characters are buffered after the current position in one string (or
   * the text is over), so a synchronous parser can take that many without waiting.
   */
  hasAhead(chars: number): boolean {
    return this.carry === '' && (this.ended || this.buf.length - this.pos >= chars);
  }

  /** Characters buffered after the current position (in the current string). */
  ahead(): number {
    return this.buf.length - this.pos;
  }

  /**
   * Pulls chunks until hasAhead(chars) holds. Unlike fill(), the unread text and the new chunk are
   * joined into one string (one copy of at most `chars` + a chunk), so spans stay within one string.
   */
  async ensureAhead(chars: number): Promise<void> {
    while (!this.ended && (this.carry !== '' || this.buf.length - this.pos < chars)) {
      const r = await this.it.next();
      const rest = this.pos < this.buf.length ? this.buf.slice(this.pos) : '';
      if (r.done) {
        this.ended = true;
        this.buf = flatJoin(this.carry, rest, '');
      } else {
        const chunk = typeof r.value === 'string' ? r.value : String(r.value);
        this.buf = flatJoin(this.carry, rest, chunk);
      }
      this.carry = '';
      this.pos = 0;
      this.checkTrailingLine();
    }
    if (this.carry !== '') {
      this.buf = flatJoin(this.carry, this.buf.slice(this.pos), '');
      this.carry = '';
      this.pos = 0;
    }
  }

  /** Throws when the unfinished last line of the buffer is longer than MAX_LINE_CHARS (it would be joined without end). */
  private checkTrailingLine(): void {
    const lastNl = this.buf.lastIndexOf('\n');
    if (this.buf.length - (lastNl + 1) <= MAX_LINE_CHARS) return;
    let n = this.lineNumber + 1;
    for (let i = this.buf.indexOf('\n', this.pos); i >= 0 && i <= lastNl; i = this.buf.indexOf('\n', i + 1)) n++;
    throw new InputError(this.file, n, lineTooLongReason(n));
  }

  /** Position after the line just taken, for rewind(); valid until the next fill/ensureAhead. */
  markPos(): number {
    return this.pos;
  }

  /**
   * Goes back to a position from markPos() (no fill/ensureAhead since), `lineNumber` being the
   * number of the line taken just before it. Lines split across chunks must not lie in between
   * (true after ensureAhead, which leaves no carried line).
   */
  rewind(pos: number, lineNumber: number): void {
    this.pos = pos;
    this.lineNumber = lineNumber;
    this.pending = false;
    this.pendingSrc = '';
  }

  /** Next line, awaiting more chunks as needed; null at the end. */
  async next(): Promise<string | null> {
    for (;;) {
      const l = this.take();
      if (l !== undefined) return l;
      await this.fill();
    }
  }

  /** Next span, awaiting more chunks as needed: SPAN_LINE or SPAN_END. */
  async nextSpan(): Promise<number> {
    for (;;) {
      const r = this.takeSpan();
      if (r !== SPAN_FILL) return r;
      await this.fill();
    }
  }

  /**
   * Drops the buffered text and the source once reading is over, so a cursor kept alive after use
   * (see obs-reader.ts, keepShapes) holds no text. The cursor then reads as ended.
   */
  release(): void {
    this.ended = true;
    this.buf = '';
    this.carry = '';
    this.pos = 0;
    this.src = '';
    this.lineStart = 0;
    this.lineEnd = 0;
    this.pending = false;
    this.pendingSrc = '';
    this.it = ENDED_SOURCE;
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

/**
 * a + b + c as one flat string. In V8, `+` makes a cons string: after its first search it is
 * flattened but stays an indirection that every charCodeAt follows (about 15 % slower parsing,
 * measured with bench/run.mjs Part 1); Array.prototype.join copies the parts into one sequential
 * string (common practice for V8). An empty part is skipped so a lone chunk is handed back as is.
 */
function flatJoin(a: string, b: string, c: string): string {
  if (a === '') {
    if (b === '') return c;
    if (c === '') return b;
    return [b, c].join('');
  }
  return b === '' && c === '' ? a : [a, b, c].join('');
}

/** A source that is over (what a released cursor points to). */
const ENDED_SOURCE: AsyncIterator<string> = { next: async () => ({ done: true, value: undefined }) };

/** takeSpan() results. */
export const SPAN_LINE = 1;
export const SPAN_FILL = 0;
export const SPAN_END = -1;

/** Async iterable over the lines of the text (convenience; the readers use LineCursor directly). */
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
