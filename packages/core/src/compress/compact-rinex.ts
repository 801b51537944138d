/**
 * Compact RINEX ("Hatanaka") 1.0 and 3.0 decoder: compact text lines in, plain RINEX text lines out.
 *
 * Source: Y. Hatanaka, "A Compression Format and Tools for GNSS Observation Data", Bulletin of the
 * Geographical Survey Institute 55 (2008), and the "Compact RINEX format" descriptions, version 1.0
 * (for RINEX 2) and 3.0 (for RINEX 3/4). Layout of one epoch in the compact file:
 *   1. epoch line: the RINEX epoch line with the whole satellite list on one line (CRX 1.0: from
 *      column 33, RINEX 2 layout; CRX 3.0: from column 42, RINEX 3 layout) and without the clock offset.
 *      It starts with '&' (CRX 1.0) or '>' (CRX 3.0) when written in full (initialisation; every
 *      difference state is reset), otherwise it is a text difference against the previous epoch line
 *      (see text-diff.ts).
 *   2. receiver clock offset line: empty, or the offset as an integer (digits without the point),
 *      differenced like an observable.
 *   3. one line per satellite, in epoch-line order: for each observation type, a field followed by one
 *      space: empty (no observation; the arc ends), 'M&v' (arc initialisation, difference order M,
 *      value v), or 'v' (the order-min(k, M) difference at the k-th epoch of the arc); then the LLI/SSI
 *      flag text difference (two characters per type). Missing trailing fields are blank, a missing
 *      flag text means flags unchanged. A missing observation is written blank, flags included (its
 *      flag state is kept: later differences refer to it; checked on the hatanaka-pairs files).
 *   Event records (epoch flag 2-5) are written in full and followed by their header lines as they are.
 * A satellite not in the previous epoch starts with fresh state (blank flags, arcs to initialise).
 *
 * Output (plain RINEX): observations F14.3 + LLI + SSI; RINEX 2.11 (section 5.1, table A2): 5 per line,
 * epoch line with 12 satellites per line and continuation lines from column 33, clock F12.9 in columns
 * 69-80; RINEX 3.05 (table A3): one line per satellite, clock F15.12 in columns 42-56. Trailing blanks
 * are not written (common practice). The lines are written as bytes (plain-text-buffer.ts) and handed
 * out as text once per chunk.
 */
import { FormatError } from '../errors.js';
import { formatFixed, parseSignedInt, spaces } from './fixed-point.js';
import { PlainTextBuffer } from './plain-text-buffer.js';
import type { ObservationRecords } from './observation-records.js';
import { ALL_SYSTEMS_KEY, headerLabel, newObsTypeCounts, readHeaderLine } from './obs-type-counts.js';
import type { ObsTypeCounts } from './obs-type-counts.js';
import { applyFlagDiff, applyTextDiff } from './text-diff.js';

export type CompactRinexVersion = 1 | 3;

/** Called for a damaged or truncated record; may throw to stop decoding (strict mode). */
export type CrxProblemSink = (line: number, code: string, message: string) => void;

/** One observable's difference state (an "arc"): d[0] value, d[i] i-th difference at the last epoch. */
interface Arc {
  readonly order: number;
  count: number;
  readonly d: Float64Array;
}

interface SatState {
  readonly arcs: (Arc | null)[];
  readonly flags: Uint8Array;
}

type Phase = 'crx-header' | 'header' | 'epoch' | 'clock' | 'sats' | 'event' | 'resync';

/** Longest epoch line accepted (999 satellites of 3 characters after column 41). */
const MAX_EPOCH_LINE = 41 + 3 * 999;

/** A satellite id as the observation reader reads it (system letter, two digits or blank + digit): such a record may travel as numbers. */
const PLAIN_SAT_ID = /^[A-Z][ \d]\d$/;

// RINEX 2.11 table A2 epoch line (columns 2-32) / RINEX 3.05 table A3 epoch line (columns 1-35).
const DATA_EPOCH_CRX1 = /^[ &][ \d]\d( [ \d]\d){4}[ \d]{2}\d\.\d{7}  [016][ \d]{2}\d/;
const DATA_EPOCH_CRX3 = /^> \d{4}( [ \d]\d){4}[ \d]{2}\d\.\d{7}  [016][ \d]{2}\d/;
const EVENT_EPOCH_CRX1 = /^[ &].{27}[2-5][ \d]{2}\d/;
const EVENT_EPOCH_CRX3 = /^>.{30}[2-5][ \d]{2}\d/;

export class CompactRinexDecoder {
  private phase: Phase = 'crx-header';
  private lineNo = 0;
  private readonly types: ObsTypeCounts = newObsTypeCounts();
  /** Plain lines: header lines committed as they come, an epoch's lines once the epoch is complete. */
  private readonly plain: PlainTextBuffer;
  /** An observation line's values (integer thousandths; NaN = blank), reused from line to line. */
  private values = new Float64Array(64);
  private prevEpoch: string | null = null;
  private prevSats = new Map<string, SatState>();
  private curSats = new Map<string, SatState>();
  private clockArc: Arc | null = null;
  private epochSats: string[] = [];
  private epochText = '';
  private epochLineNo = 0;
  private satIndex = 0;
  private remaining = 0;
  private damagedAt = 0;
  private skipped = 0;
  private readonly initChar: string;
  private readonly satListColumn: number;

  constructor(
    readonly file: string,
    readonly version: CompactRinexVersion,
    private readonly problem: CrxProblemSink,
    /** Bytes to text for the ASCII output (any single-byte decoder; Node's Buffer latin1 is the fastest). */
    decodeSingleByte: (bytes: Uint8Array) => string = latin1Decoder(),
    /** Claimed by the observation reader (observation-records.ts): observation values go there as numbers. */
    private readonly records: ObservationRecords | null = null,
  ) {
    this.plain = new PlainTextBuffer(decodeSingleByte);
    this.initChar = version === 1 ? '&' : '>';
    this.satListColumn = version === 1 ? 32 : 41;
  }

  /** Lines of the compact text read so far (the 1-based number of the last one). */
  get lineNumber(): number {
    return this.lineNo;
  }

  /** Characters of plain text waiting in takeText() (about: non-ASCII characters count as their UTF-8 bytes). */
  get pendingChars(): number {
    return this.plain.committedLength;
  }

  /** The plain lines of the complete records decoded so far, each ending in '\n', emptied. */
  takeText(): string {
    return this.plain.takeText();
  }

  /** One line of the compact file, without its line end. */
  pushLine(raw: string): void {
    this.lineNo++;
    const line = raw.length > 0 && raw.charCodeAt(raw.length - 1) === 13 ? raw.slice(0, -1) : raw;
    switch (this.phase) {
      case 'crx-header':
        return this.crxHeaderLine(line);
      case 'header':
        return this.headerLine(line);
      case 'epoch':
        return this.epochLine(line);
      case 'clock':
        return this.clockLine(line);
      case 'sats':
        return this.satLine(line);
      case 'event':
        return this.eventLine(line);
      case 'resync':
        return this.resyncLine(line);
    }
  }

  /** End of the compact text: reports an incomplete header or epoch. */
  finish(): void {
    switch (this.phase) {
      case 'crx-header':
      case 'header':
        this.problem(this.lineNo, 'crx-truncated', 'file ends inside the header (END OF HEADER not found)');
        break;
      case 'clock':
      case 'sats':
        this.problem(
          this.epochLineNo,
          'crx-truncated',
          `file ends inside the epoch starting here (${this.epochSats.length - this.satIndex} satellite line(s) missing); that epoch is dropped`,
        );
        break;
      case 'event':
        this.flushEpoch();
        this.problem(this.epochLineNo, 'crx-truncated', `file ends inside the event record starting here (${this.remaining} header line(s) missing)`);
        break;
      case 'resync':
        this.problem(this.damagedAt, 'crx-unrecovered', `no initialisation epoch after the damage at this line: the last ${this.skipped} line(s) were not decoded`);
        break;
      default:
        break;
    }
  }

  private flushEpoch(): void {
    this.plain.commit();
    this.records?.commit();
  }

  private crxHeaderLine(line: string): void {
    const label = headerLabel(line);
    if (this.lineNo === 1) {
      if (!label.startsWith('CRINEX VERS') && !line.includes('COMPACT RINEX FORMAT')) {
        throw new FormatError(this.file, 1, "not a compact RINEX file: 'CRINEX VERS   / TYPE' expected in columns 61-80 of the first line");
      }
      return;
    }
    if (label.startsWith('CRINEX')) return;
    this.phase = 'header';
    this.headerLine(line);
  }

  private headerLine(line: string): void {
    const label = readHeaderLine(line, this.types);
    this.plain.line(line);
    this.plain.commit();
    if (this.lineNo === 3 || (this.lineNo <= 3 && label === 'RINEX VERSION / TYPE')) {
      // RINEX 2.11 / 3.05 section 5.1: 'RINEX VERSION / TYPE' is the first header record.
      if (label !== 'RINEX VERSION / TYPE') {
        throw new FormatError(this.file, this.lineNo, "not a compact RINEX observation file: 'RINEX VERSION / TYPE' expected after the CRINEX lines");
      }
      const v = this.types.version;
      const ok = this.version === 1 ? v >= 1 && v < 3 : v >= 3 && v < 5;
      if (!ok) {
        throw new FormatError(this.file, this.lineNo, `compact RINEX ${this.version}.0 cannot hold RINEX version ${line.slice(0, 9).trim()} (${this.version === 1 ? '2.x' : '3.x or 4.x'} expected)`);
      }
    }
    if (label === 'END OF HEADER') {
      if (this.types.counts.size === 0) {
        throw new FormatError(this.file, this.lineNo, `no observation types in the header (${this.version === 1 ? "'# / TYPES OF OBSERV'" : "'SYS / # / OBS TYPES'"} expected)`);
      }
      this.phase = 'epoch';
    }
  }

  private resetState(): void {
    this.prevEpoch = null;
    this.prevSats = new Map();
    this.clockArc = null;
  }

  /** A damaged record: report it, drop the epoch being decoded, skip to the next initialisation epoch. */
  private damage(line: number, reason: string): void {
    this.plain.rollback();
    this.records?.rollback();
    this.resetState();
    this.phase = 'resync';
    this.damagedAt = line;
    this.skipped = 0;
    this.problem(line, 'crx-damaged', `${reason}; this epoch is dropped and lines are skipped up to the next initialisation epoch ('${this.initChar}' in column 1)`);
  }

  private resyncLine(line: string): void {
    if (line.startsWith(this.initChar) && this.isEpochText(line)) {
      this.problem(this.lineNo, 'crx-resumed', `decoding resumed at this initialisation epoch after ${this.skipped} line(s) skipped from line ${this.damagedAt}`);
      this.phase = 'epoch';
      this.epochLine(line);
      return;
    }
    this.skipped++;
  }

  private isEpochText(line: string): boolean {
    return this.version === 1
      ? DATA_EPOCH_CRX1.test(line) || EVENT_EPOCH_CRX1.test(line)
      : DATA_EPOCH_CRX3.test(line) || EVENT_EPOCH_CRX3.test(line);
  }

  private epochLine(line: string): void {
    this.epochLineNo = this.lineNo;
    if (line.length > MAX_EPOCH_LINE) return this.damage(this.lineNo, `epoch line of ${line.length} characters (at most ${MAX_EPOCH_LINE} expected)`);
    let text: string;
    if (line.startsWith(this.initChar)) {
      this.resetState();
      text = line;
    } else {
      if (this.prevEpoch === null) return this.damage(this.lineNo, `epoch line difference without a preceding full epoch line ('${this.initChar}' in column 1 expected)`);
      text = applyTextDiff(this.prevEpoch, line);
    }
    const v1 = this.version === 1;
    const flagCol = v1 ? 28 : 31;
    const flag = text.charCodeAt(flagCol) - 48;
    const count = Number(text.slice(flagCol + 1, flagCol + 4));
    if (flag >= 2 && flag <= 5 && (v1 ? EVENT_EPOCH_CRX1 : EVENT_EPOCH_CRX3).test(text)) {
      // Event record: written in full, its header lines follow as they are; not a reference for differences.
      this.plain.line(v1 ? (' ' + text.slice(1)).trimEnd() : text.trimEnd());
      this.remaining = count;
      if (count === 0) this.flushEpoch();
      else this.phase = 'event';
      return;
    }
    if (!(v1 ? DATA_EPOCH_CRX1 : DATA_EPOCH_CRX3).test(text)) {
      return this.damage(this.lineNo, `epoch line expected (${v1 ? 'RINEX 2 layout " yy mm dd hh mm ss.sssssss  f nnn"' : 'RINEX 3 layout "> yyyy mm dd hh mm ss.sssssss  f nnn"'}), found "${text.slice(0, 40).trimEnd()}"`);
    }
    const col = this.satListColumn;
    if (text.length < col + 3 * count - 2 && count > 0) {
      return this.damage(this.lineNo, `epoch line lists fewer satellites than its count ${count}`);
    }
    const sats: string[] = new Array(count);
    for (let i = 0; i < count; i++) {
      const s = text.substr(col + 3 * i, 3);
      sats[i] = s.length === 3 ? s : (s + '   ').slice(0, 3);
    }
    this.prevEpoch = text.trimEnd();
    this.epochSats = sats;
    this.epochText = text;
    this.satIndex = 0;
    this.curSats = new Map();
    this.phase = 'clock';
  }

  private clockLine(line: string): void {
    let clock: number | null = null;
    if (line.length === 0) {
      this.clockArc = null;
    } else {
      const amp = line.indexOf('&');
      if (amp >= 0) {
        const order = parseSignedInt(line, 0, amp);
        const v = parseSignedInt(line, amp + 1, line.length);
        if (!(order >= 0 && order <= 9) || Number.isNaN(v)) return this.damage(this.lineNo, `receiver clock offset line "${line.slice(0, 30)}" is not 'M&value'`);
        this.clockArc = newArc(order, v);
        clock = v;
      } else {
        const u = parseSignedInt(line, 0, line.length);
        if (Number.isNaN(u)) return this.damage(this.lineNo, `receiver clock offset line "${line.slice(0, 30)}" is not an integer`);
        if (this.clockArc === null) return this.damage(this.lineNo, 'receiver clock offset difference without an initialisation (M&value)');
        clock = stepArc(this.clockArc, u);
      }
    }
    this.writeEpochLines(clock);
    if (this.epochSats.length === 0) this.endDataEpoch();
    else this.phase = 'sats';
  }

  private writeEpochLines(clock: number | null): void {
    const text = this.epochText;
    const sats = this.epochSats;
    if (this.version === 1) {
      let head = ' ' + text.slice(1, 32);
      if (head.length < 32) head += spaces(32 - head.length);
      let first = head + sats.slice(0, 12).join('');
      if (clock !== null) first = first + spaces(68 - first.length) + formatFixed(clock, 9, 12);
      this.plain.line(first.trimEnd());
      for (let k = 12; k < sats.length; k += 12) this.plain.line(spaces(32) + sats.slice(k, k + 12).join(''));
    } else {
      let head = text.slice(0, 41).trimEnd();
      if (clock !== null) head = head + spaces(41 - head.length) + formatFixed(clock, 12, 15);
      this.plain.line(head);
    }
  }

  private satLine(line: string): void {
    const sat = this.epochSats[this.satIndex];
    const nTypes = this.types.counts.get(this.version === 1 ? ALL_SYSTEMS_KEY : sat.charAt(0));
    if (nTypes === undefined) return this.damage(this.lineNo, `satellite ${sat}: no observation types for system '${sat.charAt(0)}' in the header`);
    let st = this.prevSats.get(sat);
    if (st === undefined || st.arcs.length !== nTypes) {
      st = { arcs: new Array<Arc | null>(nTypes).fill(null), flags: new Uint8Array(2 * nTypes).fill(32) };
    }
    const arcs = st.arcs;
    if (this.values.length < nTypes) this.values = new Float64Array(nTypes);
    const values = this.values;
    let pos = 0;
    const len = line.length;
    for (let j = 0; j < nTypes; j++) {
      if (pos >= len) {
        arcs[j] = null;
        values[j] = NaN;
        pos = len + 1;
        continue;
      }
      // Most fields are a difference, '-'? and digits up to the next blank: read in one pass (up to 15
      // digits, well inside parseSignedInt's range, so the value is the same); anything else below.
      let at = pos;
      let c = line.charCodeAt(at);
      const negative = c === 45;
      if (negative) c = line.charCodeAt(++at);
      const digitsFrom = at;
      let magnitude = 0;
      while (c >= 48 && c <= 57) {
        magnitude = magnitude * 10 + (c - 48);
        c = line.charCodeAt(++at);
      }
      if ((at === len || c === 32) && at > digitsFrom && at - digitsFrom <= 15) {
        const arc = arcs[j];
        if (arc === null) return this.damage(this.lineNo, `satellite ${sat}, observation ${j + 1}: difference without an initialisation (M&value expected)`);
        values[j] = stepArc(arc, negative ? -magnitude : magnitude);
        pos = at + 1;
        continue;
      }
      // the field runs to the next blank: a difference (an integer), or 'M&value' (an arc initialisation)
      let end = line.indexOf(' ', pos);
      if (end < 0) end = len;
      const u = end === pos ? NaN : parseSignedInt(line, pos, end);
      if (end === pos) {
        arcs[j] = null;
        values[j] = NaN;
      } else if (u === u) {
        const arc = arcs[j];
        if (arc === null) return this.damage(this.lineNo, `satellite ${sat}, observation ${j + 1}: difference without an initialisation (M&value expected)`);
        values[j] = stepArc(arc, u);
      } else {
        const amp = line.indexOf('&', pos);
        if (amp < 0 || amp >= end) return this.damage(this.lineNo, `satellite ${sat}, observation ${j + 1}: "${line.slice(pos, Math.min(end, pos + 24))}" is not an integer difference`);
        const order = parseSignedInt(line, pos, amp);
        const v = parseSignedInt(line, amp + 1, end);
        if (!(order >= 0 && order <= 9) || Number.isNaN(v)) {
          return this.damage(this.lineNo, `satellite ${sat}, observation ${j + 1}: "${line.slice(pos, Math.min(end, pos + 24))}" is not 'M&value'`);
        }
        arcs[j] = newArc(order, v);
        values[j] = v;
      }
      pos = end + 1;
    }
    if (pos < len && !applyFlagDiff(st.flags, line.slice(pos))) {
      return this.damage(this.lineNo, `satellite ${sat}: LLI/SSI flag text "${line.slice(pos, pos + 40)}" is not digits, blanks and '&' of at most ${2 * nTypes} characters`);
    }
    this.curSats.set(sat, st);
    if (this.records !== null && allFitObsField(values, nTypes) && (this.version === 1 || PLAIN_SAT_ID.test(sat))) {
      this.writeSatPlaceholders(this.records, sat, values, nTypes, st.flags);
    } else this.writeSatLines(sat, values, nTypes, st.flags);
    this.satIndex++;
    if (this.satIndex === this.epochSats.length) this.endDataEpoch();
  }

  /** The plain observation line(s) of a satellite, trailing blanks left out. */
  private writeSatLines(sat: string, values: Float64Array, n: number, flags: Uint8Array): void {
    const out = this.plain;
    if (this.version === 3) {
      const start = out.position;
      out.text(sat);
      const fieldsStart = out.position;
      out.observationFields(values, flags, 0, n);
      out.trimTrailingBlanks(fieldsStart);
      if (out.position === fieldsStart) {
        // nothing but blanks after the id: the line is the id with its own trailing white space trimmed
        out.truncate(start);
        out.text(sat.trimEnd());
      }
      out.newline();
      return;
    }
    // RINEX 2.11 table A2: 5 observations per 80-column line.
    for (let j0 = 0; j0 < n || j0 === 0; j0 += 5) {
      const start = out.position;
      out.observationFields(values, flags, j0, Math.min(n, j0 + 5));
      out.trimTrailingBlanks(start);
      out.newline();
      if (n === 0) break;
    }
  }

  /**
   * The satellite's lines as placeholders, their fields kept as numbers (observation-records.ts): each
   * line blank to the length writeSatLines would give it (RINEX 3: after the id), so the text keeps its
   * size (chunks, the reader's look-ahead and a strict decoder's error fall as with the full text).
   */
  private writeSatPlaceholders(records: ObservationRecords, sat: string, values: Float64Array, n: number, flags: Uint8Array): void {
    const out = this.plain;
    if (this.version === 3) {
      out.text(sat);
      out.blanks(fieldsTextLength(values, flags, 0, n));
      out.newline();
      records.add(out.lineNumber, values, flags, 0, n);
      return;
    }
    for (let j0 = 0; j0 < n || j0 === 0; j0 += 5) {
      const j1 = Math.min(n, j0 + 5);
      out.blanks(fieldsTextLength(values, flags, j0, j1));
      out.newline();
      records.add(out.lineNumber, values, flags, j0, j1);
      if (n === 0) break;
    }
  }

  private endDataEpoch(): void {
    this.flushEpoch();
    this.prevSats = this.curSats;
    this.curSats = new Map();
    this.phase = 'epoch';
  }

  private eventLine(line: string): void {
    readHeaderLine(line, this.types);
    this.plain.line(line);
    this.remaining--;
    if (this.remaining <= 0) {
      this.flushEpoch();
      this.phase = 'epoch';
    }
  }
}

/** True when every present value of values[0, n) has the standard F14.3 text (see PlainTextBuffer.fitsObsField). */
function allFitObsField(values: Float64Array, n: number): boolean {
  for (let j = 0; j < n; j++) {
    const u = values[j]!;
    if (u === u && !PlainTextBuffer.fitsObsField(u)) return false;
  }
  return true;
}

/**
 * Length of the text of fields [from, to) as writeSatLines writes them, trailing blanks left out: 16
 * columns per field up to the last value present and its last non-blank flag character; 0 when none is.
 */
function fieldsTextLength(values: Float64Array, flags: Uint8Array, from: number, to: number): number {
  for (let j = to - 1; j >= from; j--) {
    const u = values[j]!;
    if (u !== u) continue;
    const flagChars = flags[2 * j + 1] !== 32 ? 2 : flags[2 * j] !== 32 ? 1 : 0;
    return 16 * (j - from) + 14 + flagChars;
  }
  return 0;
}

/** TextDecoder('latin1') as a function (the default single-byte decoder; the output it decodes is ASCII). */
function latin1Decoder(): (bytes: Uint8Array) => string {
  const d = new TextDecoder('latin1');
  return (bytes) => d.decode(bytes);
}

function newArc(order: number, value: number): Arc {
  const d = new Float64Array(order + 1);
  d[0] = value;
  return { order, count: 0, d };
}

/**
 * Adds the next difference to an arc and returns the new value. At the k-th epoch after the
 * initialisation the field holds the difference of order min(k, M) (Hatanaka 2008, section 3.2):
 * d_k = u, then d_i += d_(i+1) for i = k-1 .. 0.
 */
function stepArc(arc: Arc, u: number): number {
  const k = arc.count < arc.order ? arc.count + 1 : arc.order;
  const d = arc.d;
  d[k] = u;
  for (let i = k - 1; i >= 0; i--) d[i] += d[i + 1];
  arc.count = k;
  return d[0];
}
