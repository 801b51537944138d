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

  constructor(source: AsyncIterable<string>) {
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
