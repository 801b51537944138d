/**
 * Observation values of a compact RINEX file handed to the observation reader as numbers.
 *
 * The decoder's differences are integers (thousandths of the F14.3 value, Hatanaka 2008 section 3):
 * writing them as text for the reader to parse back costs more than the decoding itself. When the
 * observation reader is given the very text stream openText made for a compact RINEX 3 file, it claims
 * these records before the first chunk is decoded; the decoder then writes each observation line of
 * the standard layout as a placeholder (RINEX 3: the satellite id, RINEX 2: nothing, blank to the length
 * of the text line) and keeps the fields of that line here under its plain line number. Everything else
 * (header, epoch and event lines, values whose text would not be the standard layout) is written as
 * text, and line numbers are those of the full plain text. Unclaimed (any other consumer of the text),
 * nothing changes.
 *
 * The values are exactly what parsing the text gives: thousandths / 1000 is the correctly rounded
 * double of the decimal text (ECMA-262 7.1.4.1.1, IEEE 754 division), as parseF14p3 computes it.
 */

import { PlainTextBuffer } from './plain-text-buffer.js';

/** Text streams from openText whose observation values can be claimed (compact RINEX). */
const claimable = new WeakMap<object, ObservationRecords>();

/** Registers the records of a compact RINEX text stream (openText). */
export function offerObservationRecords(text: AsyncIterable<string>, records: ObservationRecords): void {
  claimable.set(text, records);
}

/**
 * The observation records of `text` when it is openText's own stream of a compact RINEX file and
 * no chunk has been decoded yet: from then on the stream carries placeholder lines for them.
 * null otherwise (parse the text).
 */
export function claimObservationRecords(text: AsyncIterable<string>): ObservationRecords | null {
  const r = claimable.get(text);
  if (r === undefined || r.started) return null;
  claimable.delete(text);
  r.claimed = true;
  return r;
}

export class ObservationRecords {
  /** Set by the reader's claim, before decoding starts. */
  claimed = false;
  /** Set by the decoder when it starts: a claim after that is refused. */
  started = false;
  /** Plain line number of each record, ascending; values and flags of record i start at start[i]. */
  private lineNo = new Int32Array(1024);
  private start = new Int32Array(1025);
  /** Integer thousandths (NaN = blank). */
  private units = new Float64Array(16384);
  /** LLI then SSI character code per value (a digit or a blank). */
  private flags = new Uint8Array(32768);
  private first = 0;
  private count = 0;
  private committed = 0;
  private hint = 0;
  /** Formats a record back into its text line (lineText). */
  private textOut: PlainTextBuffer | null = null;

  /**
   * Adds the record of plain line `line`: the fields [from, to) of a satellite written on that line,
   * values in thousandths (NaN = blank) with their LLI/SSI character codes (two per value).
   */
  add(line: number, units: Float64Array, flagChars: Uint8Array, from: number, to: number): void {
    if (this.count + 1 >= this.lineNo.length) this.compactOrGrow();
    const at = this.start[this.count]!;
    const n = to - from;
    if (at + n > this.units.length) this.growValues(at + n);
    const u = this.units, f = this.flags;
    for (let j = 0; j < n; j++) u[at + j] = units[from + j]!;
    for (let j = 0; j < 2 * n; j++) f[2 * at + j] = flagChars[2 * from + j]!;
    this.lineNo[this.count] = line;
    this.count++;
    this.start[this.count] = at + n;
  }

  /** The records added since the last commit become part of the stream (the epoch is complete). */
  commit(): void {
    this.committed = this.count;
  }

  /** Drops the records added since the last commit (a damaged epoch). */
  rollback(): void {
    this.count = this.committed;
  }

  /** Index of the record of plain line `line`, or -1 (a line written as text). */
  find(line: number): number {
    let i = this.hint;
    if (i < this.first || i >= this.count || this.lineNo[i] !== line) {
      let lo = this.first, hi = this.count - 1;
      i = -1;
      while (lo <= hi) {
        const mid = (lo + hi) >> 1;
        const l = this.lineNo[mid]!;
        if (l === line) { i = mid; break; }
        if (l < line) lo = mid + 1;
        else hi = mid - 1;
      }
      if (i < 0) return -1;
    }
    this.hint = i + 1;
    return i;
  }

  /**
   * Reads record i into fields [from, to) of a satellite's arrays as the reader reads its text line:
   * fields in order until the line's fields end (those after stay as they are: NaN and 0); value =
   * thousandths / 1000 (-0 is written '0.000', read +0), divided by its scale factor when `div` is
   * given; LLI and SSI digits, 0 for blanks; a blank field is NaN with flags 0.
   */
  copyTo(i: number, values: Float64Array, lli: Uint8Array, ssi: Uint8Array, div: Float64Array | null, from: number, to: number): void {
    const at = this.start[i]!;
    const n = Math.min(this.start[i + 1]! - at, to - from);
    const units = this.units, f = this.flags;
    for (let j = 0; j < n; j++) {
      const k = from + j;
      const u = units[at + j]!;
      if (u !== u) {
        values[k] = NaN;
        lli[k] = 0;
        ssi[k] = 0;
        continue;
      }
      const v = (u + 0) / 1000;
      values[k] = div !== null ? v / div[k]! : v;
      lli[k] = digitOf(f[2 * (at + j)]!);
      ssi[k] = digitOf(f[2 * (at + j) + 1]!);
    }
  }

  /**
   * The text line record i stands for, as the decoder would have written it: `prefix` (RINEX 3: the
   * satellite id its placeholder starts with; RINEX 2: '') and the fields, trailing blanks left out.
   */
  lineText(i: number, prefix: string): string {
    const at = this.start[i]!, n = this.start[i + 1]! - at;
    const out = (this.textOut ??= new PlainTextBuffer((b) => new TextDecoder('latin1').decode(b)));
    out.text(prefix);
    out.observationFields(this.units.subarray(at, at + n), this.flags.subarray(2 * at, 2 * (at + n)), 0, n);
    out.trimTrailingBlanks(prefix.length);
    out.newline();
    out.commit();
    return out.takeText().slice(0, -1);
  }

  /** Lets go of the records of lines before `line` (the reader has passed them). */
  dropBefore(line: number): void {
    while (this.first < this.committed && this.lineNo[this.first]! < line) this.first++;
  }

  private compactOrGrow(): void {
    if (this.first > 0) {
      const base = this.start[this.first]!;
      const n = this.count - this.first;
      this.lineNo.copyWithin(0, this.first, this.count);
      for (let i = 0; i <= n; i++) this.start[i] = this.start[this.first + i]! - base;
      this.units.copyWithin(0, base, this.start[n]! + base);
      this.flags.copyWithin(0, 2 * base, 2 * (this.start[n]! + base));
      this.count = n;
      this.committed -= this.first;
      this.hint = Math.max(0, this.hint - this.first);
      this.first = 0;
    }
    if (this.count + 1 >= this.lineNo.length) {
      const size = 2 * this.lineNo.length;
      const lineNo = new Int32Array(size);
      lineNo.set(this.lineNo);
      this.lineNo = lineNo;
      const start = new Int32Array(size + 1);
      start.set(this.start);
      this.start = start;
    }
  }

  private growValues(need: number): void {
    const size = Math.max(need, 2 * this.units.length);
    const units = new Float64Array(size);
    units.set(this.units);
    this.units = units;
    const flags = new Uint8Array(2 * size);
    flags.set(this.flags);
    this.flags = flags;
  }
}

/** An LLI/SSI character as the reader reads it: a digit, 0 for a blank. */
function digitOf(c: number): number {
  return c === 32 ? 0 : c - 48;
}
