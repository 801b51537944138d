/**
 * The compact RINEX decoder's output: plain RINEX lines written as bytes into one growing buffer and
 * turned into a string once per chunk, instead of a string per value, per line and per join.
 *
 * The buffer holds two parts: committed lines (complete records, handed out by takeText) and, after
 * them, the lines of the epoch being decoded, which a damaged record drops (rollback). Observation
 * fields are written digit by digit from their integer thousandths. Text copied from the input
 * (header lines, epoch lines) is written as UTF-8, so a character above U+007F (a latin1 byte in a
 * comment) comes back as itself: the chunk is then decoded as UTF-8, otherwise by the single-byte
 * decoder given (ASCII reads the same in both).
 */
import { formatObs } from './fixed-point.js';

const SPACE = 32;
const NEWLINE = 10;
const MINUS = 45;
const POINT = 46;
const ZERO = 48;
/** Columns of an observation field: F14.3, LLI, SSI (RINEX 3.05 table A3, RINEX 2.11 table A2). */
const FIELD_COLUMNS = 16;
/**
 * Thousandths written by the digit loop: an integer part up to 2^31 - 1 (int32 arithmetic; observables
 * stay far below); larger magnitudes (damaged files) go through formatObs itself.
 */
const MAX_DIGIT_LOOP_UNITS = 2_147_483_647_999;
const POW10 = [1, 10, 100, 1000, 1e4, 1e5, 1e6, 1e7, 1e8, 1e9];

export class PlainTextBuffer {
  private bytes = new Uint8Array(1 << 17);
  private len = 0;
  private committed = 0;
  /** Lines written since the start (taken, committed and not), and those committed. */
  private lines = 0;
  private committedLines = 0;
  /** True when bytes above 0x7F (UTF-8 of non-ASCII text) were written since the last takeText. */
  private nonAscii = false;
  private readonly encoder = new TextEncoder();
  private utf8: TextDecoder | null = null;

  constructor(private readonly decodeSingleByte: (bytes: Uint8Array) => string) {}

  /** Bytes of complete records waiting in takeText (ASCII: one byte per character). */
  get committedLength(): number {
    return this.committed;
  }

  /** Position at the end of what is written (for trimTrailingBlanks). */
  get position(): number {
    return this.len;
  }

  /** Number of the last line written (1-based, over everything written since the start). */
  get lineNumber(): number {
    return this.lines;
  }

  /** The lines written since the last commit become complete records. */
  commit(): void {
    this.committed = this.len;
    this.committedLines = this.lines;
  }

  /** Drops the lines written since the last commit. */
  rollback(): void {
    this.len = this.committed;
    this.lines = this.committedLines;
  }

  /** Drops what was written after `at` (a position read before, not before the last commit). */
  truncate(at: number): void {
    this.len = at < this.committed ? this.committed : at;
  }

  /** The committed text (each line ending in '\n'), removed from the buffer; uncommitted lines stay. */
  takeText(): string {
    if (this.committed === 0) return '';
    const part = this.bytes.subarray(0, this.committed);
    const text = this.nonAscii ? (this.utf8 ??= new TextDecoder('utf-8')).decode(part) : this.decodeSingleByte(part);
    this.bytes.copyWithin(0, this.committed, this.len);
    this.len -= this.committed;
    this.committed = 0;
    this.nonAscii = false;
    return text;
  }

  /** Makes room for `n` more bytes. */
  private reserve(n: number): void {
    if (this.len + n <= this.bytes.length) return;
    const grown = new Uint8Array(Math.max(2 * this.bytes.length, this.len + n));
    grown.set(this.bytes.subarray(0, this.len));
    this.bytes = grown;
  }

  /** A whole line (without its line end) and '\n'. */
  line(text: string): void {
    this.text(text);
    this.newline();
  }

  /** Text without a line end (ASCII byte for byte; anything else as UTF-8). */
  text(s: string): void {
    const n = s.length;
    this.reserve(n);
    const b = this.bytes;
    let at = this.len;
    for (let i = 0; i < n; i++) {
      const c = s.charCodeAt(i);
      if (c > 0x7f) {
        this.reserve(3 * n);
        this.len += this.encoder.encodeInto(s, this.bytes.subarray(this.len)).written;
        this.nonAscii = true;
        return;
      }
      b[at++] = c;
    }
    this.len = at;
  }

  newline(): void {
    this.reserve(1);
    this.bytes[this.len++] = NEWLINE;
    this.lines++;
  }

  /** `n` blanks. */
  blanks(n: number): void {
    this.reserve(n);
    this.bytes.fill(SPACE, this.len, this.len + n);
    this.len += n;
  }

  /** Two characters given by their codes (an LLI and SSI pair: digits or blanks). */
  pair(c1: number, c2: number): void {
    this.reserve(2);
    this.bytes[this.len] = c1;
    this.bytes[this.len + 1] = c2;
    this.len += 2;
  }

  /** True when formatObs writes `thousandths` in 14 columns, the point in the 11th (the standard F14.3 layout). */
  static fitsObsField(thousandths: number): boolean {
    return thousandths >= 0 ? thousandths <= 9_999_999_999_999 : thousandths >= -999_999_999_999;
  }

  /**
   * The RINEX observation field F14.3 of an integer number of thousandths, exactly as formatObs
   * writes it (right-aligned, '0' before the point, wider when it does not fit).
   */
  obsField(thousandths: number): void {
    const neg = thousandths < 0;
    const a = neg ? -thousandths : thousandths;
    if (!(a <= MAX_DIGIT_LOOP_UNITS)) {
      this.text(formatObs(thousandths));
      return;
    }
    // the integer and fraction parts as formatFixed finds them
    let ip = Math.floor(a / 1000);
    let fp = a - ip * 1000;
    if (fp < 0) {
      ip -= 1;
      fp += 1000;
    } else if (fp >= 1000) {
      ip += 1;
      fp -= 1000;
    }
    let ip32 = ip | 0;
    const fp32 = fp | 0;
    let digits = 1;
    while (digits < 10 && ip32 >= POW10[digits]!) digits++;
    const width = (neg ? 1 : 0) + digits + 4;
    this.reserve(width < 14 ? 14 : width);
    const b = this.bytes;
    let at = this.len;
    for (let k = width; k < 14; k++) b[at++] = SPACE;
    if (neg) b[at++] = MINUS;
    for (let k = digits - 1; k >= 0; k--) {
      const q = (ip32 / 10) | 0;
      b[at + k] = ZERO + ip32 - 10 * q;
      ip32 = q;
    }
    at += digits;
    b[at] = POINT;
    b[at + 1] = ZERO + ((fp32 / 100) | 0);
    b[at + 2] = ZERO + (((fp32 / 10) | 0) % 10);
    b[at + 3] = ZERO + (fp32 % 10);
    this.len = at + 4;
  }

  /**
   * Observation fields [from, to) of a record: F14.3 of the thousandths, then the LLI and SSI
   * characters (codes, two per value); a blank value (NaN) is 16 blank columns, flags included.
   */
  observationFields(thousandths: Float64Array, flagChars: Uint8Array, from: number, to: number): void {
    for (let j = from; j < to; j++) {
      const u = thousandths[j]!;
      if (u === u) {
        this.obsField(u);
        this.pair(flagChars[2 * j]!, flagChars[2 * j + 1]!);
      } else this.blanks(FIELD_COLUMNS);
    }
  }

  /** Removes blanks at the end of what is written, back to `from` at most (a line's trimEnd over blanks). */
  trimTrailingBlanks(from: number): void {
    let at = this.len;
    while (at > from && this.bytes[at - 1] === SPACE) at--;
    this.len = at;
  }
}
