/**
 * RINEX observation reader: versions 2.10/2.11 (RINEX 2.11, IGS/RTCM 2012, section 5 and table A2),
 * 3.02-3.05 (RINEX 3.05, IGS/RTCM 2020, section 5.3 and table A3) and 4.00 (RINEX 4.00, IGS/RTCM 2021,
 * table A3: the observation record layout is that of 3.05).
 *
 * Reads the header fully, then hands out epochs one at a time (memory bounded by one chunk + one epoch).
 * Garbled or truncated epochs are reported as warnings naming the file and line and skipped; reading
 * resumes at the next recognisable epoch record.
 *
 * Lines are read from bytes (byte-lines.ts): given openText's own text of a plain file, the reader
 * takes its bytes instead (compress/byte-text.ts); any other text is copied into bytes chunk by chunk.
 * Epoch records and observation fields are parsed from the bytes (an observation line of the usual
 * layout in one pass, obs-fields.ts parseObsLineBytes); header lines, the header records of events and
 * lines skipped to resynchronise are read as text.
 *
 * Given openText's own text of a compact RINEX file, the reader claims its observation records
 * (compress/observation-records.ts): the values then come as numbers beside placeholder lines, the
 * same values the text would give, and every other line is read as text.
 */
import type { GnssSystem, SatId } from '../gnss/index.js';
import { isGnssSystem } from '../gnss/index.js';
import { FormatError, InputError, RefdeltaError } from '../errors.js';
import type { Warning, WarningSink } from '../errors.js';
import { daysFromCivil, toGpsS } from '../time/index.js';
import type { TimeSystem } from '../time/index.js';
import type { AntennaOffset, HeaderEvent, ObsEpoch, ObsHeader, ObsStream, SatObservations } from '../gnss/index.js';
import { ByteLineCursor, SPAN_END, SPAN_FILL } from './byte-lines.js';
import {
  digitInBytes, fieldState, NOT_USUAL_LAYOUT, parseF14p3Bytes, parseFixedBytes, parseFixedIn, parseIntBytes, parseObsLineBytes,
} from './obs-fields.js';
import { ObsHeaderBuilder, headerLabel, parseVersionLine } from './obs-header.js';
import { claimObservationRecords, claimTextBytes } from '../compress/index.js';
import type { ObservationRecords } from '../compress/index.js';

export interface ReadObsOptions {
  readonly onWarning?: WarningSink;
  /**
   * Systems whose observation values the caller will read (default: all). Satellites of other systems
   * are still handed out, with their codes, but their fields are neither parsed nor checked: values
   * NaN, LLI and SSI 0, as blank fields read (arrays shared by the satellites of a system, not to be
   * written). Parsing the fields is most of the reading: a session on one constellation of a
   * multi-constellation file skips the others' (a session gives them only a reason, see
   * session/setup.ts systemLeftOutReason).
   */
  readonly systems?: readonly GnssSystem[];
}

/** Days from 1970-01-01 to the GPS epoch 1980-01-06. */
const GPS_EPOCH_UNIX_DAYS = 3657;
const EVENT_KINDS: Readonly<Record<number, HeaderEvent['kind']>> = {
  1: 'power-failure', 2: 'start-moving', 3: 'new-occupation', 4: 'header-info', 5: 'external-event',
};

/** Reads the header of a RINEX observation text and returns it with a lazy epoch iterable. */
export async function readObsStream(file: string, text: AsyncIterable<string>, opts?: ReadObsOptions): Promise<ObsStream> {
  const warn: WarningSink = opts?.onWarning ?? (() => {});
  const records = claimObservationRecords(text);
  const bytes = records === null ? claimTextBytes(text) : null;
  const cur = bytes !== null ? new ByteLineCursor(bytes.chunks, file, bytes.decode, true) : new ByteLineCursor(text, file);
  let header: ObsHeader;
  try {
    header = await readHeader(file, cur, warn);
  } catch (err) {
    cur.release(); // the input is let go: nothing more will be read from it
    throw err;
  }
  const parser = new EpochParser(file, header, cur, warn, records, opts?.systems ?? null);
  const epochs = parser.epochs();
  const close = async (): Promise<void> => {
    // Ends the epoch loop where it stands (its finally lets the input go); one never started ends at
    // once without running, so the input is let go here too.
    await epochs.return(undefined);
    cur.release();
  };
  return { file, header, epochs, close };
}

/** The header records up to END OF HEADER (or to the first epoch record of a header without it). */
async function readHeader(file: string, cur: ByteLineCursor, warn: WarningSink): Promise<ObsHeader> {
  let first = await cur.next();
  if (first === null) throw new FormatError(file, 0, `${file} is empty, not a RINEX observation file`);
  if (first.charCodeAt(0) === 0xfeff) first = first.slice(1);
  const v = parseVersionLine(file, first);
  const hb = new ObsHeaderBuilder(file, v.version, v.systemField, warn);
  for (;;) {
    let line = cur.take();
    if (line === undefined) line = await cur.next();
    if (line === null) throw new InputError(file, cur.lineNumber, "the file ends inside the header: expected the record 'END OF HEADER'");
    const label = headerLabel(line);
    if (label === 'END OF HEADER') break;
    if (label === '' && (v.version >= 3 ? line.charCodeAt(0) === 62 : looksLikeR2Epoch(line))) {
      warn({ file, line: cur.lineNumber, code: 'missing-header-record', message: "the header has no 'END OF HEADER' record: data assumed to start here" });
      cur.unread();
      break;
    }
    hb.line(line, cur.lineNumber);
  }
  return hb.build(cur.lineNumber);
}

/** All epochs of a stream in an array (tests and small files; large files should iterate). */
export async function collectEpochs(stream: ObsStream): Promise<ObsEpoch[]> {
  const out: ObsEpoch[] = [];
  for await (const e of stream.epochs) out.push(e);
  return out;
}

/**
 * A RINEX 2 epoch line: seconds F11.7 with the point in column 19, flag digit in column 29, blank
 * columns 27-28 (RINEX 2.11 table A2); or, for event flags 2-5, blank epoch fields. Observation lines
 * (F14.3 fields of 16 columns) have no point in column 19.
 */
export function looksLikeR2Epoch(line: string): boolean {
  if (line.length < 29) return false;
  const f = line.charCodeAt(28);
  if (f < 48 || f > 54 || line.charCodeAt(26) !== 32 || line.charCodeAt(27) !== 32) return false;
  if (line.charCodeAt(18) === 46) return line.charCodeAt(0) === 32;
  return f >= 50 && f <= 53 && isBlank(line, 0, 26);
}

/** looksLikeR2Epoch on the line bytes[a, e) of the cursor (see ByteLineCursor.takeSpan). */
function looksLikeR2EpochBytes(cur: ByteLineCursor, a: number, e: number): boolean {
  if (e - a < 29) return false;
  const b = cur.bytes;
  const f = b[a + 28]!;
  if (f < 48 || f > 54 || b[a + 26] !== 32 || b[a + 27] !== 32) return false;
  if (b[a + 18] === 46) return b[a] === 32;
  return f >= 50 && f <= 53 && isBlankBytes(cur, a, a + 26);
}

/** isBlank on bytes[from, to) of the cursor: any byte other than a blank or an ASCII letter, digit or sign is judged on the text. */
function isBlankBytes(cur: ByteLineCursor, from: number, to: number): boolean {
  const b = cur.bytes;
  for (let i = from; i < to; i++) {
    const c = b[i]!;
    if (c === 32) continue;
    if ((c > 13 && c < 0x7f) || c < 9) return false;
    return isBlank(cur.textOf(from, to), 0, to - from);
  }
  return true;
}

/** s.slice(from, to).trim() === '' without making the slice (ECMA-262 WhiteSpace + LineTerminator). */
function isBlank(s: string, from: number, to: number): boolean {
  for (let i = from; i < to; i++) {
    const c = s.charCodeAt(i);
    if (c === 32) continue;
    // only these code points below U+1680 are white space or line terminators for String.prototype.trim
    if ((c > 13 && c !== 160 && c < 0x1680) || c < 9) return false;
    return s.slice(from, to).trim() === '';
  }
  return true;
}

/** Results of the synchronous epoch parsing steps (an epoch itself is returned as an object). */
const OK = 0;
const SKIPPED = 1;
const RESYNC = 2;
const NEED_MORE = 4;
/** Bytes kept buffered ahead of an epoch record so that most epochs parse without waiting (common practice: a few epochs). */
const LOOKAHEAD_CHARS = 1 << 14;

const ignoreWarning: WarningSink = () => {};
/** The last parser that finished reading (see EpochParser.retire). */
let lastRetired: EpochParser | null = null;

class EpochParser {
  private readonly r3: boolean;
  private readonly codes: Partial<Record<GnssSystem, readonly string[]>>;
  /** codes and divisors indexed by the char code of the system letter (the hot loops avoid keyed lookups). */
  private readonly codesBy: (readonly string[] | undefined)[] = new Array<readonly string[] | undefined>(128).fill(undefined);
  private readonly divBy: (Float64Array | null)[] = new Array<Float64Array | null>(128).fill(null);
  /** Whether the values of a system are wanted (ReadObsOptions.systems), by the char code of its letter. */
  private readonly wantedBy: boolean[] = new Array<boolean>(128).fill(true);
  /** Blank value/LLI/SSI arrays of a system whose values are not wanted, shared by its satellites (made on first use). */
  private readonly blankBy: (BlankFields | null)[] = new Array<BlankFields | null>(128).fill(null);
  private readonly ts: TimeSystem;
  private prevTagGpsS = NaN;
  private dayKey = -1;
  private dayBaseS = 0;
  private readonly warnedSystems = new Set<string>();
  private readonly slab = new ObsSlab();
  /** Fields of the epoch record last parsed by head2/head3. */
  private headFlag = 0;
  private headCount = 0;
  private headTagGpsS = NaN;
  private headTagWasBlank = false;
  private headClockS: number | null = null;
  private headSats: SatId[] | null = null;
  /** The text of the RINEX 2 continuation line being read when it is a record's placeholder (see satList2), else null. */
  private continuationText: string | null = null;
  /** Where and why the epoch loop resynchronises after a RESYNC result. */
  private resyncFrom = 0;
  private resyncReason = '';

  constructor(
    private readonly file: string,
    private readonly header: ObsHeader,
    private readonly cur: ByteLineCursor,
    private warnSink: WarningSink,
    /** Observation values that come as numbers (compact RINEX 3 through openText), or null. */
    private records: ObservationRecords | null,
    wantedSystems: readonly GnssSystem[] | null,
  ) {
    this.r3 = header.version >= 3;
    if (wantedSystems !== null) {
      this.wantedBy.fill(false);
      for (const s of wantedSystems) this.wantedBy[s.charCodeAt(0)] = true;
    }
    this.codes = { ...header.obsCodes };
    this.ts = header.timeSystem;
    for (const [s, list] of Object.entries(this.codes) as [GnssSystem, readonly string[]][]) this.setCodes(s, list);
  }

  private setCodes(s: GnssSystem, list: readonly string[]): void {
    this.codes[s] = list;
    const at = s.charCodeAt(0);
    this.codesBy[at] = list;
    this.blankBy[at] = null;
    const t = this.header.scaleFactors[s];
    if (t === undefined) { this.divBy[at] = null; return; }
    const d = new Float64Array(list.length).fill(1);
    let any = false;
    list.forEach((c, i) => { const f = t[c]; if (f !== undefined && f !== 1) { d[i] = f; any = true; } });
    this.divBy[at] = any ? d : null;
  }

  private warn(line: number, code: string, message: string): void {
    const w: Warning = { file: this.file, line, code, message };
    this.warnSink(w);
  }

  /** Next line, awaiting only at chunk boundaries. */
  private async line(): Promise<string | null> {
    const l = this.cur.take();
    return this.textOf(l !== undefined ? l : await this.cur.next());
  }

  /**
   * The line just taken as its full text: a placeholder of a record that came as numbers (see
   * observation-records.ts) is replaced by the text it stands for, so that every path reading lines
   * as text (epoch records, resynchronisation, event header records) sees the file as written.
   */
  private textOf<T extends string | null | undefined>(l: T): T | string {
    if (this.records === null || typeof l !== 'string') return l;
    const rec = this.records.find(this.cur.lineNumber);
    return rec < 0 ? l : this.records.lineText(rec, this.r3 ? l.slice(0, 3) : '');
  }

  /**
   * The text of the line just taken as a span when it is the placeholder of a record that came as
   * numbers (see textOf); null for any other line (read its bytes).
   */
  private recordLineText(): string | null {
    if (this.records === null) return null;
    const rec = this.records.find(this.cur.lineNumber);
    if (rec < 0) return null;
    const cur = this.cur;
    return this.records.lineText(rec, this.r3 ? cur.textOf(cur.lineStart, Math.min(cur.lineStart + 3, cur.lineEnd)) : '');
  }

  /**
   * The epoch loop. Each epoch record is parsed from its line's bytes (head2/head3), then the rest of
   * the epoch synchronously from the buffered bytes (epochBody); the loop awaits only to pull more
   * input: before an epoch when less than LOOKAHEAD_CHARS are buffered, and when an epoch turns out
   * longer than what is buffered (NEED_MORE: the cursor is put back to the epoch's second line and the
   * rest parsed again with more input). Resynchronisation and the header records of event epochs, both
   * rare, read line by line asynchronously.
   */
  async *epochs(): AsyncGenerator<ObsEpoch> {
    const cur = this.cur;
    try {
      for (;;) {
        if (!cur.hasAhead(LOOKAHEAD_CHARS)) await cur.ensureAhead(LOOKAHEAD_CHARS);
        let span = cur.takeSpan();
        if (span === SPAN_FILL) span = await cur.nextSpan();
        if (span === SPAN_END) return;
        const lineNo = cur.lineNumber;
        this.records?.dropBefore(lineNo);
        const a = cur.lineStart, e = cur.lineEnd;
        // an observation record that came as numbers is no epoch record (its text is the usual layout)
        const recordText = this.recordLineText();
        const isEpoch = recordText === null && (this.r3 ? e > a && cur.bytes[a] === 62 : looksLikeR2EpochBytes(cur, a, e));
        if (!isEpoch) {
          if (recordText === null ? isBlankBytes(cur, a, e) : recordText.trim() === '') continue; // blank lines between epochs: tolerated
          await this.resync(lineNo, `expected an epoch record${this.r3 ? " starting with '>'" : ' (RINEX 2 epoch line)'}`);
          continue;
        }
        const h = this.r3 ? this.head3(a, e, lineNo) : this.head2(a, e, lineNo);
        if (h === RESYNC) {
          await this.resync(this.resyncFrom, this.resyncReason);
          continue;
        }
        if (this.headFlag >= 2 && this.headFlag <= 5) {
          const ev = await this.eventEpoch(lineNo);
          if (ev !== null) yield ev;
          continue;
        }
        let markPos = cur.markPos();
        let r = this.epochBody(lineNo);
        while (r === NEED_MORE) {
          cur.rewind(markPos, lineNo);
          await cur.ensureAhead(2 * cur.ahead() + LOOKAHEAD_CHARS);
          markPos = cur.markPos(); // ensureAhead moved the bytes: the epoch's second line now starts here
          r = this.epochBody(lineNo);
        }
        if (r === RESYNC) await this.resync(this.resyncFrom, this.resyncReason);
        else if (r !== SKIPPED) yield r as ObsEpoch;
      }
    } catch (err) {
      if (err instanceof RefdeltaError) throw err;
      throw new InputError(this.file, cur.lineNumber, `could not read the observation data (${err instanceof Error ? err.message : String(err)})`);
    } finally {
      this.retire();
    }
  }

  /**
   * Reading is over (end, error or the consumer stopped): drops the text, the source and the warning
   * sink, and keeps this parser as the module's `lastRetired`. V8 holds the hidden classes (maps) of
   * objects whose fields were added after construction only weakly: once every reader of a run is
   * garbage, a full GC frees those maps and throws away the optimised code of the whole read loop,
   * and the next file is read by the interpreter until it is optimised again (measured with
   * bench/run.mjs, which collects garbage between runs: about half the throughput). One retired
   * parser, holding no text, keeps the maps alive.
   */
  private retire(): void {
    this.cur.release();
    this.slab.release();
    this.records = null;
    this.warnSink = ignoreWarning;
    lastRetired = this;
  }

  /** Skips lines up to the next recognisable epoch record, with one warning for the block skipped. */
  private async resync(fromLine: number, reason: string): Promise<void> {
    let last = fromLine;
    for (;;) {
      const l = await this.line();
      if (l === null) break;
      this.records?.dropBefore(this.cur.lineNumber); // a long stretch skipped holds no records
      if (this.r3 ? l.charCodeAt(0) === 62 : looksLikeR2Epoch(l)) { this.cur.unread(); break; }
      last = this.cur.lineNumber;
    }
    const span = last > fromLine ? `lines ${fromLine}-${last}` : `line ${fromLine}`;
    this.warn(fromLine, 'bad-epoch-skipped', `${reason}; ${span} skipped up to the next epoch record`);
  }

  private tag(y: number, mo: number, d: number, h: number, mi: number, s: number): number {
    const key = (y * 16 + mo) * 32 + d;
    if (key !== this.dayKey) {
      this.dayKey = key;
      this.dayBaseS = (daysFromCivil(y, mo, d) - GPS_EPOCH_UNIX_DAYS) * 86_400;
    }
    return toGpsS(this.dayBaseS + h * 3600 + mi * 60 + s, this.ts);
  }

  private validDate(y: number, mo: number, d: number, h: number, mi: number, s: number): boolean {
    return !fieldState.bad && mo >= 1 && mo <= 12 && d >= 1 && d <= 31 && h >= 0 && h <= 24 && mi >= 0 && mi <= 60 && s >= 0 && s < 61 && y > 1900;
  }

  /** Asks the epoch loop to resynchronise (see resync) and returns RESYNC. */
  private requestResync(fromLine: number, reason: string): number {
    this.resyncFrom = fromLine;
    this.resyncReason = reason;
    return RESYNC;
  }

  /**
   * The lines of an epoch after its record line (parsed by head2/head3 into this.head*), synchronously:
   * the epoch, or SKIPPED (warned), RESYNC (see requestResync) or NEED_MORE (the buffered bytes end inside
   * the epoch; nothing was reported).
   */
  private epochBody(lineNo: number): ObsEpoch | number {
    const flag = this.headFlag;
    if (!this.r3) {
      const r = this.satList2(lineNo);
      if (r !== OK) return r;
    }
    const sats: SatObservations[] = [];
    const ok = this.r3 ? this.sats3(lineNo, this.headCount, sats) : this.sats2(lineNo, this.headSats!, sats);
    if (ok !== OK) return ok;
    const tagGpsS = this.headTagGpsS;
    this.prevTagGpsS = tagGpsS;
    const event: HeaderEvent | null = flag === 1 ? { kind: 'power-failure', comments: [] } : null;
    return { tagGpsS, flag, receiverClockOffsetS: this.headClockS, line: lineNo, sats, event };
  }

  /** RINEX 3/4 epoch record: '>', 1X, I4, 4(1X, I2.2), F11.7, 2X, I1, I3, 6X, F15.12 (RINEX 3.05 table A3). */
  private head3(a: number, e: number, lineNo: number): number {
    fieldState.bad = false;
    const flag = digitInBytes(this.cur.bytes, a + 31, e);
    const n = this.intAt(a, e, 32, 35);
    if (flag < 0 || flag > 6 || fieldState.bad || !(n >= 0)) {
      return this.requestResync(lineNo, `garbled epoch record: expected flag 0-6 in column 32 and a satellite count (I3) in columns 33-35`);
    }
    const blank = isBlankBytes(this.cur, Math.min(a + 1, e), Math.min(a + 29, e));
    let tagGpsS = this.prevTagGpsS;
    if (!blank || flag < 2 || flag > 5) {
      const y = this.intAt(a, e, 2, 6), mo = this.intAt(a, e, 7, 9), d = this.intAt(a, e, 10, 12);
      const h = this.intAt(a, e, 13, 15), mi = this.intAt(a, e, 16, 18), s = this.fixedAt(a, e, 18, 29);
      if (!this.validDate(y, mo, d, h, mi, s)) {
        return this.requestResync(lineNo, 'garbled epoch record: expected year, month, day, hour, minute (I4, 4 I2) and seconds (F11.7) in columns 3-29');
      }
      tagGpsS = this.tag(y, mo, d, h, mi, s);
    }
    const clk = this.fixedAt(a, e, 35, 80);
    if (fieldState.bad) {
      return this.requestResync(lineNo, 'garbled epoch record: expected the receiver clock offset (F15.12) in columns 42-56');
    }
    this.setHead(flag, n, tagGpsS, blank && flag >= 2 && flag <= 5, Number.isFinite(clk) ? clk : null, null);
    return OK;
  }

  /** RINEX 2 epoch line: 1X, I2.2, 4(1X, I2), F11.7, 2X, I1, I3, 12(A1, I2), F12.9 (RINEX 2.11 table A2). */
  private head2(a: number, e: number, lineNo: number): number {
    fieldState.bad = false;
    const flag = digitInBytes(this.cur.bytes, a + 28, e);
    const n = this.intAt(a, e, 29, 32);
    if (flag < 0 || flag > 6 || fieldState.bad || !(n >= 0)) {
      return this.requestResync(lineNo, 'garbled epoch line: expected flag 0-6 in column 29 and a satellite count (I3) in columns 30-32');
    }
    const blank = isBlankBytes(this.cur, a, Math.min(a + 26, e));
    let tagGpsS = this.prevTagGpsS;
    if (!blank || flag < 2 || flag > 5) {
      const yy = this.intAt(a, e, 1, 3), mo = this.intAt(a, e, 4, 6), d = this.intAt(a, e, 7, 9);
      const h = this.intAt(a, e, 10, 12), mi = this.intAt(a, e, 13, 15), s = this.fixedAt(a, e, 15, 26);
      // RINEX 2.11 section 6.5: two-digit years 80-99 are 1980-1999, 00-79 are 2000-2079
      const y = yy >= 80 ? 1900 + yy : 2000 + yy;
      if (!(yy >= 0 && yy <= 99) || !this.validDate(y, mo, d, h, mi, s)) {
        return this.requestResync(lineNo, 'garbled epoch line: expected year, month, day, hour, minute (5 I3) and seconds (F11.7) in columns 2-26');
      }
      tagGpsS = this.tag(y, mo, d, h, mi, s);
    }
    const clk = this.fixedAt(a, e, 68, 80);
    if (fieldState.bad) {
      return this.requestResync(lineNo, 'garbled epoch line: expected the receiver clock offset (F12.9) in columns 69-80');
    }
    let sats: SatId[] | null = null;
    if (flag < 2 || flag > 5) {
      // the satellites of the epoch line itself; those of its continuation lines are read by satList2
      sats = [];
      for (let i = 0; i < n && i < 12; i++) {
        const sat = satIdInBytes(this.cur.bytes, a + 32 + 3 * i, e, true);
        if (sat === null) return this.requestResync(lineNo, this.garbledSatList(n));
        sats.push(sat);
      }
    }
    this.setHead(flag, n, tagGpsS, blank && flag >= 2 && flag <= 5, Number.isFinite(clk) ? clk : null, sats);
    return OK;
  }

  private garbledSatList(n: number): string {
    return `garbled satellite list: expected ${n} satellites (A1, I2 each) from column 33`;
  }

  /**
   * The continuation lines of a RINEX 2 epoch line announcing more than 12 satellites: 32X, 12(A1, I2)
   * (RINEX 2.11 table A2), their satellites appended to this.headSats after the epoch line's 12.
   * OK, SKIPPED (warned), RESYNC or NEED_MORE.
   */
  private satList2(lineNo: number): number {
    const n = this.headCount, sats = this.headSats!, cur = this.cur;
    sats.length = n < 12 ? n : 12;
    for (let i = 12; i < n; i++) {
      const k = i % 12;
      if (k === 0) {
        const r = cur.takeSpan();
        if (r === SPAN_FILL) return NEED_MORE;
        const text = r === SPAN_END ? null : this.recordLineText();
        const notContinuation =
          r === SPAN_END ||
          (text !== null
            ? looksLikeR2Epoch(text) || text.slice(0, 32).trim() !== ''
            : looksLikeR2EpochBytes(cur, cur.lineStart, cur.lineEnd) || !isBlankBytes(cur, cur.lineStart, Math.min(cur.lineStart + 32, cur.lineEnd)));
        if (notContinuation) {
          if (r !== SPAN_END) cur.unread();
          this.warn(lineNo, 'bad-epoch-skipped', `epoch announces ${n} satellites but its satellite list continuation line is missing; epoch skipped`);
          return SKIPPED;
        }
        this.continuationText = text;
      }
      const t = this.continuationText;
      const sat = t !== null ? satIdIn(t, 32 + 3 * k, t.length, true) : satIdInBytes(cur.bytes, cur.lineStart + 32 + 3 * k, cur.lineEnd, true);
      if (sat === null) return this.requestResync(lineNo, this.garbledSatList(n));
      sats.push(sat);
    }
    return OK;
  }

  /** Integer field at columns [from, to) of the line bytes[a, e) (see parseIntField). */
  private intAt(a: number, e: number, from: number, to: number): number {
    return parseIntBytes(this.cur.bytes, a + from, e < a + to ? e : a + to);
  }

  /** Number at columns [from, to) of the line bytes[a, e) (see parseFixed); an exponent is read from its text. */
  private fixedAt(a: number, e: number, from: number, to: number): number {
    const start = a + from, end = e < a + to ? e : a + to;
    const v = parseFixedBytes(this.cur.bytes, start, end);
    return v === NOT_USUAL_LAYOUT ? parseFixedIn(this.cur.textOf(start, end), 0, end - start) : v;
  }

  private setHead(flag: number, n: number, tagGpsS: number, tagWasBlank: boolean, clockS: number | null, sats: SatId[] | null): void {
    this.headFlag = flag;
    this.headCount = n;
    this.headTagGpsS = tagGpsS;
    this.headTagWasBlank = tagWasBlank;
    this.headClockS = clockS;
    this.headSats = sats;
  }

  /** An event epoch (flags 2-5) whose record was parsed by head2/head3: its header records follow. */
  private async eventEpoch(lineNo: number): Promise<ObsEpoch | null> {
    const flag = this.headFlag, tagGpsS = this.headTagGpsS, tagWasBlank = this.headTagWasBlank, clockS = this.headClockS;
    const event = await this.eventRecords(lineNo, flag, this.headCount);
    if (event === null) return null;
    if (!tagWasBlank) this.prevTagGpsS = tagGpsS;
    const e: ObsEpoch = { tagGpsS, flag, receiverClockOffsetS: clockS, line: lineNo, sats: [], event };
    return tagWasBlank ? { ...e, tagWasBlank: true } : e;
  }

  /**
   * The n RINEX 3 observation records of an epoch: A1, I2.2, m(F14.3, I1, I1) (RINEX 3.05 table A3).
   * OK, SKIPPED (warned), RESYNC or NEED_MORE.
   */
  private sats3(epochLine: number, n: number, sats: SatObservations[]): number {
    const cur = this.cur;
    for (let i = 0; i < n; i++) {
      // the usual layout, read in one pass (parseObsLineBytes); anything else as a span below, into the same arrays
      let into: SatObservations | null = null;
      if (this.records === null) {
        const b = cur.bytes, a = cur.pos, sc = b[a]!;
        const codes = sc < 128 ? this.codesBy[sc] : undefined;
        const sat = codes !== undefined && this.wantedBy[sc] ? satIdInBytes(b, a, cur.end, false) : null;
        if (sat !== null) {
          into = this.slab.sat(sat, codes!);
          const nl = parseObsLineBytes(b, cur.view, a + 3, 0, codes!.length, into.values, into.lli, into.ssi, this.divBy[sc]!);
          if (nl >= 0) {
            cur.tookLine(nl);
            sats.push(into);
            continue;
          }
        }
      }
      const r = cur.takeSpan();
      if (r === SPAN_FILL) return NEED_MORE;
      const src = cur.bytes, a = cur.lineStart, e = cur.lineEnd;
      if (r === SPAN_END || (e > a && src[a] === 62)) {
        if (r !== SPAN_END) cur.unread();
        this.warn(epochLine, 'bad-epoch-skipped', `epoch announces ${n} satellites but ${i} observation records follow${r === SPAN_END ? ' (file ends)' : ''}; epoch skipped`);
        return SKIPPED;
      }
      const sat = satIdInBytes(src, a, e, false);
      if (sat === null) return this.requestResync(cur.lineNumber, 'garbled observation record: expected a satellite id (A1, I2) in columns 1-3');
      const sc = src[a]!;
      const codes = this.codesBy[sc];
      if (codes === undefined) {
        this.noTypes(sat.charAt(0), sat);
        continue;
      }
      if (!this.wantedBy[sc]) {
        sats.push(this.blankSat(sat, sc, codes));
        continue;
      }
      const rec = this.records === null ? -1 : this.records.find(cur.lineNumber);
      const div = this.divBy[sc]!;
      const out = rec < 0 ? this.values(a + 3, e, codes, div, sat, 0, codes.length, into) : this.recordValues(rec, codes, div, sat, 0, codes.length, null);
      if (out === null) return this.requestResync(cur.lineNumber, `garbled observation record of ${sat}: expected F14.3 values with LLI and SSI digits`);
      sats.push(out);
    }
    return OK;
  }

  /** A satellite of a system whose values are not wanted: its fields read as blank, arrays shared. */
  private blankSat(sat: SatId, sc: number, codes: readonly string[]): SatObservations {
    let b = this.blankBy[sc];
    if (b === null) {
      const n = codes.length;
      b = { values: new Float64Array(n).fill(NaN), lli: new Uint8Array(n), ssi: new Uint8Array(n) };
      this.blankBy[sc] = b;
    }
    return { sat, codes, values: b.values, lli: b.lli, ssi: b.ssi };
  }

  private noTypes(s: string, sat: SatId): void {
    if (this.warnedSystems.has(s)) return;
    this.warnedSystems.add(s);
    this.warn(this.cur.lineNumber, 'no-obs-types', `satellite ${sat}: the header gives no observation types for system ${s}; its records are skipped`);
  }

  /**
   * RINEX 2 observations of each listed satellite: 5 (F14.3, I1, I1) per line (RINEX 2.11 table A2).
   * OK, SKIPPED (warned), RESYNC or NEED_MORE.
   */
  private sats2(epochLine: number, list: readonly SatId[], sats: SatObservations[]): number {
    const cur = this.cur;
    for (let si = 0; si < list.length; si++) {
      const sat = list[si]!;
      const sc = sat.charCodeAt(0);
      const codes = this.codesBy[sc];
      const div = this.divBy[sc]!;
      const nCodes = codes === undefined ? 0 : codes.length;
      const nLines = nCodes === 0 ? 1 : Math.ceil(nCodes / 5);
      const wanted = this.wantedBy[sc]!;
      let out: SatObservations | null = null;
      for (let j = 0; j < nLines; j++) {
        const from = j * 5, to = from + 5 < nCodes ? from + 5 : nCodes;
        if (wanted && this.records === null && nCodes > 0) {
          // the usual layout, read in one pass (parseObsLineBytes); anything else as a span below
          out ??= this.slab.sat(sat, codes!);
          const nl = parseObsLineBytes(cur.bytes, cur.view, cur.pos, from, to, out.values, out.lli, out.ssi, div);
          if (nl >= 0) {
            cur.tookLine(nl);
            continue;
          }
        }
        const r = cur.takeSpan();
        if (r === SPAN_FILL) return NEED_MORE;
        const a = cur.lineStart, e = cur.lineEnd;
        if (r === SPAN_END || looksLikeR2EpochBytes(cur, a, e)) {
          if (r !== SPAN_END) cur.unread();
          this.warn(epochLine, 'bad-epoch-skipped', `epoch's observation records end early at ${sat}${r === SPAN_END ? ' (file ends)' : ''}; epoch skipped`);
          return SKIPPED;
        }
        if (codes === undefined) { this.noTypes(sat.charAt(0), sat); break; }
        if (!wanted) {
          out ??= this.blankSat(sat, sc, codes);
          continue; // its lines are taken (and told from an epoch line) but not parsed
        }
        const rec = this.records === null ? -1 : this.records.find(cur.lineNumber);
        out = rec < 0 ? this.values(a, e, codes, div, sat, from, to, out) : this.recordValues(rec, codes, div, sat, from, to, out);
        if (out === null) return this.requestResync(cur.lineNumber, `garbled observation line of ${sat}: expected 5 fields of F14.3 + LLI + SSI`);
      }
      if (out !== null) sats.push(out);
    }
    return OK;
  }

  /**
   * Parses fields [from, to) of a satellite's list from the line bytes[c0, end) of the cursor,
   * 16 columns each: F14.3, LLI I1, SSI I1. null = garbled. A field not in the usual layout is parsed
   * from its text (parseFixedIn).
   */
  private values(
    c0: number, end: number, codes: readonly string[], div: Float64Array | null, sat: SatId, from: number, to: number,
    into: SatObservations | null,
  ): SatObservations | null {
    const r = into ?? this.slab.sat(sat, codes);
    const values = r.values, lli = r.lli, ssi = r.ssi;
    const cur = this.cur, src = cur.bytes;
    fieldState.bad = false;
    // a non-digit LLI/SSI is -1: OR-ed into `digits`, checked once for the line with fieldState.bad
    let digits = 0;
    for (let k = from, c = c0; k < to && c < end; k++, c += 16) {
      let v = parseF14p3Bytes(src, c, end);
      if (v === NOT_USUAL_LAYOUT) {
        const fe = end < c + 14 ? end : c + 14;
        v = parseFixedIn(cur.textOf(c, fe), 0, fe - c);
      }
      const a = digitInBytes(src, c + 14, end), b = digitInBytes(src, c + 15, end);
      digits |= a | b;
      values[k] = div !== null ? v / div[k]! : v;
      lli[k] = a;
      ssi[k] = b;
    }
    return fieldState.bad || digits < 0 ? null : r;
  }

  /**
   * Fields [from, to) of a satellite from the record of its line (values that came as numbers, see
   * observation-records.ts), as values() reads them from the line's text.
   */
  private recordValues(
    rec: number, codes: readonly string[], div: Float64Array | null, sat: SatId, from: number, to: number, into: SatObservations | null,
  ): SatObservations {
    const r = into ?? this.slab.sat(sat, codes);
    this.records!.copyTo(rec, r.values, r.lli, r.ssi, div, from, to);
    return r;
  }

  /** The N header records that follow an event epoch (flags 2-5; RINEX 3.05 5.3.3 / RINEX 2.11 5.3). */
  private async eventRecords(lineNo: number, flag: number, n: number): Promise<HeaderEvent | null> {
    const hb = new ObsHeaderBuilder(this.file, this.header.version, this.header.systemField, this.warnSink);
    for (let i = 0; i < n; i++) {
      const l = await this.line();
      if (l === null || (this.r3 && l.charCodeAt(0) === 62) || (!this.r3 && looksLikeR2Epoch(l) && headerLabel(l) === '')) {
        if (l !== null) this.cur.unread();
        this.warn(lineNo, 'bad-epoch-skipped', `event (flag ${flag}) announces ${n} header records but only ${i} follow; event skipped`);
        return null;
      }
      hb.line(l, this.cur.lineNumber);
    }
    // A header-info event may redefine the observation types (RINEX 3.05 5.3.3): applied from here on.
    if (hb.seen.has('SYS / # / OBS TYPES') || hb.seen.has('# / TYPES OF OBSERV')) {
      for (const [s, list] of Object.entries(hb.obsCodes()) as [GnssSystem, string[]][]) this.setCodes(s, list);
    }
    const antennaOffset: AntennaOffset | null = hb.antennaOffset;
    return {
      kind: EVENT_KINDS[flag]!,
      ...(hb.seen.has('MARKER NAME') ? { markerName: hb.markerName } : {}),
      ...(hb.seen.has('MARKER NUMBER') ? { markerNumber: hb.markerNumber } : {}),
      ...(antennaOffset !== null ? { antennaOffset } : {}),
      ...(hb.approxPosition !== null ? { approxPosition: hb.approxPosition } : {}),
      comments: hb.comments,
    };
  }
}

/** Value, LLI and SSI arrays of blank fields (see EpochParser.blankSat). */
interface BlankFields {
  readonly values: Float64Array;
  readonly lli: Uint8Array;
  readonly ssi: Uint8Array;
}

/** Float64 values per slab; lli/ssi bytes take twice as many entries. */
const SLAB_VALUES = 8192;

/**
 * Hands out each satellite's value/LLI/SSI arrays as views on shared slabs. In V8 a typed array over
 * 64 bytes gets its own off-heap store, about ten times as slow to make as a view (common practice;
 * measured with bench/run.mjs: 14 Float64 values ~300 ns new vs ~35 ns as a view). A slab stays alive
 * while any epoch cut from it is held, so memory is bounded by the epochs a consumer keeps plus one slab.
 */
class ObsSlab {
  private f64 = new Float64Array(0);
  private u8 = new Uint8Array(0);
  private f64Buffer: ArrayBufferLike = this.f64.buffer;
  private u8Buffer: ArrayBufferLike = this.u8.buffer;
  private next = 0;

  /** Lets go of the current slab (the views handed out keep their own). */
  release(): void {
    this.f64 = new Float64Array(0);
    this.u8 = new Uint8Array(0);
    this.f64Buffer = this.f64.buffer;
    this.u8Buffer = this.u8.buffer;
    this.next = 0;
  }

  sat(sat: SatId, codes: readonly string[]): SatObservations {
    const n = codes.length;
    if (this.next + n > this.f64.length) {
      const size = n > SLAB_VALUES ? n : SLAB_VALUES;
      this.f64 = new Float64Array(size).fill(NaN);
      this.u8 = new Uint8Array(2 * size);
      this.f64Buffer = this.f64.buffer;
      this.u8Buffer = this.u8.buffer;
      this.next = 0;
    }
    const at = this.next;
    this.next = at + n;
    const u8 = this.u8Buffer;
    return {
      sat,
      codes,
      values: new Float64Array(this.f64Buffer, 8 * at, n),
      lli: new Uint8Array(u8, 2 * at, n),
      ssi: new Uint8Array(u8, 2 * at + n, n),
    };
  }
}

/**
 * Satellite ids by system letter char code (below 128), then number 0-99; null = not a system letter.
 * Made whole at load (a few arrays of 100 strings), so the lookup meets one kind of element.
 */
const SAT_IDS: (SatId[] | null)[] = Array.from({ length: 128 }, (_, c0) => {
  const sys = String.fromCharCode(c0);
  return isGnssSystem(sys) ? Array.from({ length: 100 }, (_, k) => `${sys}${String(k).padStart(2, '0')}`) : null;
});

/** satIdIn on bytes. */
function satIdInBytes(b: Uint8Array, i: number, end: number, blankIsGps: boolean): SatId | null {
  if (i + 3 > end) return null;
  let c0 = b[i]!;
  if (c0 === 32 && blankIsGps) c0 = 71;
  const t1 = b[i + 1]!;
  const d1 = t1 === 32 ? 0 : t1 - 48, d2 = b[i + 2]! - 48;
  if (d1 < 0 || d1 > 9 || d2 < 0 || d2 > 9 || c0 > 127) return null;
  return satIdOf(c0, 10 * d1 + d2);
}

/**
 * Satellite id at s[i, i+3) of a line ending at `end` (A1, I2; RINEX 3.05 table A3 / 2.11 table A2):
 * a blank tens digit reads as 0; a blank system letter is GPS in RINEX 2 (RINEX 2.11 5.1), an error in 3.
 * null when not a system letter + two digits.
 */
function satIdIn(s: string, i: number, end: number, blankIsGps: boolean): SatId | null {
  if (i + 3 > end) return null;
  let c0 = s.charCodeAt(i);
  if (c0 === 32 && blankIsGps) c0 = 71;
  const t1 = s.charCodeAt(i + 1);
  const d1 = t1 === 32 ? 0 : t1 - 48, d2 = s.charCodeAt(i + 2) - 48;
  if (d1 < 0 || d1 > 9 || d2 < 0 || d2 > 9 || c0 > 127) return null;
  return satIdOf(c0, 10 * d1 + d2);
}

/** The satellite id of system letter code `c0` (below 128) and number 0-99; null when not a system letter. */
function satIdOf(c0: number, prn: number): SatId | null {
  const ids = SAT_IDS[c0]!;
  return ids === null ? null : ids[prn]!;
}
