/**
 * A line cursor over bytes: the observation reader's view of its input, so that its hot loops read
 * observation fields straight from a Uint8Array and make no string per line or chunk.
 *
 * The source gives byte chunks (openText's own byte stream, see compress/byte-text.ts) or text chunks
 * (any other caller); a text chunk is copied into bytes, one byte per character, and kept beside them,
 * so that lines taken as text are exactly the characters given. Lines are those of LineCursor
 * (text-lines.ts): separated by '\n', a CR before it or at the end of the input left out, numbered from 1.
 * Bytes straight from a file keep its line ends: with `crEndsLine`, CR LF and a lone CR end a line as
 * '\n' does, the lines openText's text has (it makes them all '\n').
 *
 * The buffer always holds whole lines from the current position on, the last one possibly unfinished:
 * pulling a chunk moves the unread rest to the front of the buffer and copies the chunk after it (the
 * buffer is reused, grown when the two do not fit). A line is therefore
 * `bytes[lineStart, lineEnd)`, never split, and the cursor can go back to any position taken since the
 * last pull (unread, rewind). The buffer ends with PADDING_BYTES zero bytes after `end`, so a parser that
 * stops at the first unexpected byte may read a field's columns without checking the end first.
 *
 * Chunks are pulled asynchronously, lines already buffered are handed out synchronously: take() and
 * takeSpan() return SPAN_FILL (or undefined) when the buffer holds no complete line (call fill()).
 */
import { InputError } from '../errors.js';
import { lineTooLongReason, MAX_LINE_CHARS } from './header-limits.js';

/** takeSpan() results. */
export const SPAN_LINE = 1;
export const SPAN_FILL = 0;
export const SPAN_END = -1;

/** Zero bytes after the data in every buffer (see the file comment): a field's 16 columns. */
export const PADDING_BYTES = 16;
const LF = 10;
const CR = 13;
/** Lines up to this length are made into strings with String.fromCharCode (longer ones by the decoder). */
const SHORT_LINE_BYTES = 1024;

const EMPTY = new Uint8Array(PADDING_BYTES);
/** The smallest buffer made: a chunk of openText's 64 KiB and a few lines. */
const MIN_BUFFER_BYTES = 1 << 17;

const LF_WORD = 0x0a0a0a0a;
const CR_WORD = 0x0d0d0d0d;

/**
 * Whether one of the four bytes of `w` equals the byte repeated in `p` or in `q` (the zero-byte test on
 * w ^ p: (v - 0x01010101) & ~v & 0x80808080 is non-zero exactly when a byte of v is zero; common practice,
 * "bit twiddling hacks").
 */
function hasByte2(w: number, p: number, q: number): boolean {
  const a = w ^ p, d = w ^ q;
  return ((((a - 0x01010101) & ~a) | ((d - 0x01010101) & ~d)) & 0x80808080) !== 0;
}

/** Bytes to text one for one (ISO-8859-1 or windows-1252: a byte is one character). */
export type ByteDecoder = (bytes: Uint8Array) => string;

const defaultDecoder: ByteDecoder = (b) => new TextDecoder('latin1').decode(b);

export class ByteLineCursor {
  /** The buffered bytes: data in [0, end), then PADDING_BYTES zeros. */
  bytes: Uint8Array = EMPTY;
  /** `bytes` as 32-bit words (its buffer is ours, a whole number of words long). */
  private words: Uint32Array = new Uint32Array(EMPTY.buffer);
  /** `bytes` as a DataView, for parsers that read several columns at once (obs-fields.ts parseObsLineBytes). */
  view: DataView = new DataView(EMPTY.buffer);
  /** Length of the data in `bytes`. */
  end = 0;
  /** Position of the next line in `bytes`. */
  pos = 0;
  /** 1-based number of the line most recently taken (0 before the first). */
  lineNumber = 0;
  /** The line last taken by takeSpan(): bytes[lineStart, lineEnd). */
  lineStart = 0;
  lineEnd = 0;
  /** The buffered characters as given, when the source gave text (same offsets as `bytes`); else null. */
  private text: string | null = null;
  /** Where the newest chunk starts in `bytes`: a line across it was joined from two chunks. */
  private seam = 0;
  /** Position of the line last taken (for unread). */
  private lastPos = 0;
  private ended = false;
  private it: AsyncIterator<Uint8Array | string>;

  /**
   * `file` names the input in the error for a line over MAX_LINE_CHARS; `decode` turns bytes of a
   * byte source into text (default TextDecoder('latin1'), as openText's default); `crEndsLine`: a lone
   * CR ends a line too (see the file comment).
   */
  constructor(
    source: AsyncIterable<Uint8Array | string>,
    private readonly file = 'the input',
    private readonly decode: ByteDecoder = defaultDecoder,
    private readonly crEndsLine = false,
  ) {
    this.it = source[Symbol.asyncIterator]();
  }

  /**
   * Next line as a span of `bytes` (lineStart, lineEnd), without making a string.
   * Returns SPAN_LINE, SPAN_FILL (call fill()) or SPAN_END.
   */
  takeSpan(): number {
    const b = this.bytes, pos = this.pos, end = this.end;
    const nl = this.lineEndFrom(pos);
    if (nl >= end || (nl === end - 1 && b[nl] === CR && this.crEndsLine && !this.ended)) {
      // no line end buffered (a CR last may be the first half of CR LF)
      if (!this.ended) return SPAN_FILL;
      if (pos >= end) return SPAN_END;
      this.lineNumber++;
      if (end - pos > MAX_LINE_CHARS) throw new InputError(this.file, this.lineNumber, lineTooLongReason(this.lineNumber));
      this.lastPos = pos;
      this.pos = end;
      this.lineStart = pos;
      this.lineEnd = b[end - 1] === CR ? end - 1 : end;
      return SPAN_LINE;
    }
    this.lineNumber++;
    // a line joined from two chunks is held to the bound, as LineCursor holds it
    if (pos < this.seam && nl >= this.seam && nl - pos > MAX_LINE_CHARS) throw new InputError(this.file, this.lineNumber, lineTooLongReason(this.lineNumber));
    this.lastPos = pos;
    this.lineStart = pos;
    if (b[nl] === CR) {
      // crEndsLine: CR LF or a lone CR
      this.lineEnd = nl;
      this.pos = b[nl + 1] === LF && nl + 1 < end ? nl + 2 : nl + 1;
    } else {
      this.lineEnd = nl > pos && b[nl - 1] === CR ? nl - 1 : nl;
      this.pos = nl + 1;
    }
    return SPAN_LINE;
  }

  /** Position of the first line end at or after `from` ('\n', or a CR with crEndsLine); `end` when none is buffered. */
  private lineEndFrom(from: number): number {
    const b = this.bytes, end = this.end, crEnds = this.crEndsLine;
    let i = from;
    // to a word boundary byte by byte, then four bytes at a time (the word that holds a line end is read
    // again byte by byte below): over the 10.5 MB of dgar0100.24o about 1.9 ms, against 3.4 ms for
    // Uint8Array.prototype.indexOf and 6 ms for a byte loop (node 20, measured on this machine)
    for (; i < end && (i & 3) !== 0; i++) {
      const c = b[i]!;
      if (c === LF || (c === CR && crEnds)) return i;
    }
    if (i >= end) return end;
    const words = this.words, lastWord = end >> 2;
    let k = i >> 2;
    if (crEnds) while (k < lastWord && !hasByte2(words[k]!, LF_WORD, CR_WORD)) k++;
    else while (k < lastWord && !hasByte2(words[k]!, LF_WORD, LF_WORD)) k++;
    for (i = k << 2; i < end; i++) {
      const c = b[i]!;
      if (c === LF || (c === CR && crEnds)) return i;
    }
    return end;
  }

  /**
   * Marks the line bytes[pos, nl) as taken, as takeSpan() would have: `nl` is its end found by the
   * caller's own parse, a '\n' or the CR of CR LF (obs-fields.ts parseObsLineBytes), inside the buffer.
   */
  tookLine(nl: number): void {
    this.lineNumber++;
    this.lastPos = this.pos;
    this.lineStart = this.pos;
    this.lineEnd = nl;
    this.pos = this.bytes[nl] === CR ? nl + 2 : nl + 1;
  }

  /** Next line as text without its end-of-line; undefined = need fill(); null = end of the input. */
  take(): string | null | undefined {
    const r = this.takeSpan();
    if (r === SPAN_LINE) return this.textOf(this.lineStart, this.lineEnd);
    return r === SPAN_FILL ? undefined : null;
  }

  /** The characters at [from, to) of the buffer as text (as given, for a text source). */
  textOf(from: number, to: number): string {
    if (this.text !== null) return this.text.slice(from, to);
    const b = this.bytes;
    if (to - from > SHORT_LINE_BYTES) return this.decode(b.subarray(from, to));
    for (let i = from; i < to; i++) if (b[i]! > 0x7f) return this.decode(b.subarray(from, to));
    // ASCII: every single-byte decoding gives these characters
    return String.fromCharCode.apply(null, b.subarray(from, to) as unknown as number[]);
  }

  /** Puts the line just taken back, so that the next take() or takeSpan() returns it again (one line deep). */
  unread(): void {
    this.pos = this.lastPos;
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
    const chunk = r.value instanceof Uint8Array ? r.value : typeof r.value === 'string' ? r.value : String(r.value);
    const rest = this.end - this.pos;
    const restText = this.text === null ? null : this.text.slice(this.pos, this.end);
    const need = rest + chunk.length + PADDING_BYTES;
    let b = this.bytes;
    if (need > b.length || b === EMPTY) {
      // a whole number of 32-bit words, seen as words too (lineEndFrom)
      b = new Uint8Array((Math.max(need, 2 * b.length, MIN_BUFFER_BYTES) + 3) & ~3);
      this.words = new Uint32Array(b.buffer);
      this.view = new DataView(b.buffer);
      b.set(this.bytes.subarray(this.pos, this.end), 0);
    } else if (this.pos > 0) b.copyWithin(0, this.pos, this.end);
    if (typeof chunk === 'string') {
      copyText(chunk, b, rest);
      this.text = (restText ?? this.decode(b.subarray(0, rest))) + chunk;
    } else {
      b.set(chunk, rest);
      // after text, the rest keeps its characters (a source that mixes both: not made by openText)
      this.text = restText === null || restText === '' ? null : restText + this.decode(chunk);
    }
    this.end = rest + chunk.length;
    b.fill(0, this.end, this.end + PADDING_BYTES);
    this.bytes = b;
    this.seam = rest;
    this.pos = 0;
    this.lastPos = 0;
    this.checkTrailingLine();
    return true;
  }

  /** Throws when the unfinished last line of the buffer is longer than MAX_LINE_CHARS (it would be joined without end). */
  private checkTrailingLine(): void {
    const b = this.bytes;
    let last = this.end - 1;
    while (last >= this.pos && b[last] !== LF && !(this.crEndsLine && b[last] === CR)) last--;
    if (this.end - (last + 1) <= MAX_LINE_CHARS) return;
    let n = this.lineNumber + 1;
    for (let i = this.lineEndFrom(this.pos); i <= last; i = this.lineEndFrom(i + (b[i] === CR && b[i + 1] === LF ? 2 : 1))) n++;
    throw new InputError(this.file, n, lineTooLongReason(n));
  }

  /** True when at least `n` bytes are buffered after the current position (or the input is over). */
  hasAhead(n: number): boolean {
    return this.ended || this.end - this.pos >= n;
  }

  /** Bytes buffered after the current position. */
  ahead(): number {
    return this.end - this.pos;
  }

  /** Pulls chunks until hasAhead(n) holds. */
  async ensureAhead(n: number): Promise<void> {
    while (!this.ended && this.end - this.pos < n) await this.fill();
  }

  /** Position after the line just taken, for rewind(); valid until the next fill. */
  markPos(): number {
    return this.pos;
  }

  /**
   * Goes back to a position from markPos() (no fill since), `lineNumber` being the number of the
   * line taken just before it.
   */
  rewind(pos: number, lineNumber: number): void {
    this.pos = pos;
    this.lastPos = pos;
    this.lineNumber = lineNumber;
  }

  /** Next line as text, awaiting more chunks as needed; null at the end. */
  async next(): Promise<string | null> {
    for (;;) {
      const l = this.take();
      if (l !== undefined) return l;
      await this.fill();
    }
  }

  /** Next line as a span, awaiting more chunks as needed: SPAN_LINE or SPAN_END. */
  async nextSpan(): Promise<number> {
    for (;;) {
      const r = this.takeSpan();
      if (r !== SPAN_FILL) return r;
      await this.fill();
    }
  }

  /**
   * Drops the buffered input and the source once reading is over, so a cursor kept alive after use
   * (see obs-reader.ts, retire) holds no input. The cursor then reads as ended.
   */
  release(): void {
    this.ended = true;
    this.bytes = EMPTY;
    this.words = new Uint32Array(EMPTY.buffer);
    this.view = new DataView(EMPTY.buffer);
    this.text = null;
    this.end = 0;
    this.pos = 0;
    this.lastPos = 0;
    this.seam = 0;
    this.lineStart = 0;
    this.lineEnd = 0;
    // The source is stopped too, so that a file behind it is closed now rather than at the process's
    // exit (a reading given up early: a header probe, a loop left by break).
    const source = this.it;
    this.it = ENDED_SOURCE;
    source.return?.()?.catch(() => {});
  }
}

/**
 * Text into bytes one for one at `at`: a character above U+00FF (not a byte of any single-byte
 * decoding) becomes 0xFF, which no parse of a number, flag or line end accepts; the text itself is
 * kept beside the bytes for everything read as text.
 */
function copyText(s: string, into: Uint8Array, at: number): void {
  const n = s.length;
  const w = ENCODER.encodeInto(s, into.subarray(at, at + n));
  if (w.read === n && w.written === n) return; // ASCII: UTF-8 is the same bytes
  for (let i = 0; i < n; i++) {
    const c = s.charCodeAt(i);
    into[at + i] = c > 0xff ? 0xff : c;
  }
}

const ENCODER = new TextEncoder();

/** A source that is over (what a released cursor points to). */
const ENDED_SOURCE: AsyncIterator<Uint8Array | string> = { next: async () => ({ done: true, value: undefined }) };
