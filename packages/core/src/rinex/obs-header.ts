/**
 * RINEX observation header records (RINEX 2.11 table A1; RINEX 3.05 table A2; RINEX 4.00 table A2).
 * Labels are in columns 61-80; contents in columns 1-60 with the formats quoted beside each record.
 */
import type { EcefM, GnssSystem } from '../gnss/index.js';
import { isGnssSystem } from '../gnss/index.js';
import { FormatError, InputError } from '../errors.js';
import type { Warning } from '../errors.js';
import type { TimeSystem } from '../time/index.js';
import { secondsFromCalendar, toGpsS } from '../time/index.js';
import type { AntennaOffset, ObsHeader } from '../gnss/index.js';
import { fieldState, parseFixed, parseIntField, textField } from './obs-fields.js';
import { normaliseBeidouCode, rinex2CodeList } from '../gnss/index.js';

import {
  droppedRecordsMessage, MAX_HEADER_COMMENTS, MAX_OBS_TYPES_RINEX2, MAX_OBS_TYPES_RINEX3, MAX_OTHER_HEADER_RECORDS,
} from './header-limits.js';

/** Labels this reader acts on (always remembered as seen; other labels only up to a bound). */
const KNOWN_LABELS = new Set([
  'MARKER NAME', 'MARKER NUMBER', 'REC # / TYPE / VERS', 'ANT # / TYPE', 'APPROX POSITION XYZ', 'ANTENNA: DELTA H/E/N',
  '# / TYPES OF OBSERV', 'SYS / # / OBS TYPES', 'INTERVAL', 'TIME OF FIRST OBS', 'TIME OF LAST OBS', 'GLONASS SLOT / FRQ #',
  'GLONASS COD/PHS/BIS', 'SYS / PHASE SHIFT', 'SYS / SCALE FACTOR', 'RCV CLOCK OFFS APPL', 'LEAP SECONDS', 'END OF HEADER',
]);

const TIME_SYSTEMS: readonly TimeSystem[] = ['GPS', 'GLO', 'GAL', 'BDT', 'QZS', 'IRN', 'UTC', 'TAI', 'SBAS'];

/** Default epoch time system of a single-system file (RINEX 3.05 A2 TIME OF FIRST OBS note); mixed -> GPS. */
export function defaultTimeSystem(systemField: string): TimeSystem {
  switch (systemField) {
    case 'R': return 'GLO';
    case 'E': return 'GAL';
    case 'C': return 'BDT';
    case 'J': return 'QZS';
    case 'I': return 'IRN';
    default: return 'GPS';
  }
}

/** The label of a header line (columns 61-80, trimmed). */
export function headerLabel(line: string): string {
  return line.length > 60 ? line.slice(60, 80).trim() : '';
}

const OTHER_FILE_TYPES: Readonly<Record<string, string>> = {
  N: 'a navigation file', G: 'a GLONASS navigation file', H: 'a GEO/SBAS navigation file', L: 'a Galileo navigation file',
  M: 'a meteorological file', C: 'a clock file', B: 'a GEO/SBAS broadcast file',
};

/**
 * Checks the first line (RINEX VERSION / TYPE: F9.2, 11X, A1, 19X, A1) and returns version, file type
 * and system field; throws one FormatError sentence for anything that is not a RINEX observation file.
 */
export function parseVersionLine(file: string, line: string): { version: number; fileType: string; systemField: string } {
  if (line.startsWith('CRINEX') || headerLabel(line) === 'CRINEX VERS   / TYPE') {
    throw new FormatError(file, 1, `${file} is a compact RINEX file: decompress it to plain RINEX before reading observations`);
  }
  if (headerLabel(line) !== 'RINEX VERSION / TYPE') {
    throw new FormatError(file, 1, `${file} is not a RINEX file: its first line does not end with the label 'RINEX VERSION / TYPE' in columns 61-80`);
  }
  fieldState.bad = false;
  const version = parseFixed(line, 0, 9);
  if (fieldState.bad || !Number.isFinite(version) || version < 1 || version >= 5) {
    throw new FormatError(file, 1, `${file} is not a readable RINEX file: its version field (columns 1-9) reads '${line.slice(0, 9).trim()}', expected 2.xx, 3.xx or 4.xx`);
  }
  const fileType = line.charAt(20).toUpperCase();
  if (fileType !== 'O') {
    const what = OTHER_FILE_TYPES[fileType] ?? `a RINEX file of type '${fileType}'`;
    throw new FormatError(file, 1, `${file} is ${what}, not an observation file`);
  }
  const sys = line.charAt(40).toUpperCase();
  return { version, fileType, systemField: sys === ' ' || sys === '' ? 'G' : sys };
}

/** Systems whose observation codes a RINEX 2 file's '# / TYPES OF OBSERV' applies to (RINEX 2.11 5.1). */
function rinex2Systems(systemField: string): GnssSystem[] {
  if (systemField === 'M') return ['G', 'R', 'E', 'S', 'C', 'J'];
  if (isGnssSystem(systemField)) return [systemField];
  return ['G'];
}

interface Pending {
  kind: 'r3types' | 'r2types' | 'scale';
  sys: GnssSystem | null;
  remaining: number;
  factor: number;
}

/** Accumulates header lines and builds the ObsHeader. Also used for the header records of events. */
export class ObsHeaderBuilder {
  markerName = '';
  markerNumber = '';
  receiverNumber = '';
  receiverType = '';
  receiverVersion = '';
  antennaNumber = '';
  antennaType = '';
  approxPosition: EcefM | null = null;
  antennaOffset: AntennaOffset | null = null;
  fileObsCodes: Partial<Record<GnssSystem, string[]>> = {};
  r2Codes: string[] | null = null;
  intervalS: number | null = null;
  firstObs: { calendarS: number; ts: TimeSystem | null } | null = null;
  lastObs: { calendarS: number; ts: TimeSystem | null } | null = null;
  glonassChannels = new Map<number, number>();
  glonassCodePhaseBias: Record<string, number> = {};
  phaseShifts: Partial<Record<GnssSystem, Record<string, number>>> = {};
  scaleFactors: Partial<Record<GnssSystem, Record<string, number>>> = {};
  /** Scale factor records naming no codes: apply to every code of the system. */
  private scaleAll: Partial<Record<GnssSystem, number>> = {};
  clockOffsetApplied = false;
  leapSeconds: number | null = null;
  comments: string[] = [];
  otherRecords: string[] = [];
  /** COMMENT and unrecognised records read beyond the kept bounds (header-limits.ts). */
  droppedComments = 0;
  droppedOther = 0;
  seen = new Set<string>();
  private pending: Pending | null = null;

  constructor(
    readonly file: string,
    readonly version: number,
    readonly systemField: string,
    private readonly warn: (w: Warning) => void,
  ) {}

  private bad(lineNo: number, label: string, expected: string): void {
    this.warn({ file: this.file, line: lineNo, code: 'bad-header-record', message: `header record '${label}' could not be read: expected ${expected}; record ignored` });
  }

  /** Takes one header line (not the first, not END OF HEADER). */
  line(line: string, lineNo: number): void {
    const label = headerLabel(line);
    if (label !== 'COMMENT' && (this.seen.size < MAX_OTHER_HEADER_RECORDS || this.seen.has(label) || KNOWN_LABELS.has(label))) this.seen.add(label);
    if (label !== 'SYS / # / OBS TYPES' && label !== '# / TYPES OF OBSERV' && label !== 'SYS / SCALE FACTOR') this.pending = null;
    fieldState.bad = false;
    switch (label) {
      case 'COMMENT':
        if (this.comments.length < MAX_HEADER_COMMENTS) this.comments.push(line.slice(0, 60).trimEnd()); else this.droppedComments++;
        return;
      case 'MARKER NAME': this.markerName = textField(line, 0, 60); return;
      case 'MARKER NUMBER': this.markerNumber = textField(line, 0, 20); return;
      case 'REC # / TYPE / VERS': // 3A20
        this.receiverNumber = textField(line, 0, 20); this.receiverType = textField(line, 20, 40); this.receiverVersion = textField(line, 40, 60);
        return;
      case 'ANT # / TYPE': this.antennaNumber = textField(line, 0, 20); this.antennaType = textField(line, 20, 40); return;
      case 'APPROX POSITION XYZ': { // 3F14.4
        const x = parseFixed(line, 0, 14), y = parseFixed(line, 14, 28), z = parseFixed(line, 28, 42);
        if (fieldState.bad || !Number.isFinite(x + y + z)) return this.bad(lineNo, label, 'three F14.4 numbers in columns 1-42');
        this.approxPosition = x === 0 && y === 0 && z === 0 ? null : { x, y, z };
        return;
      }
      case 'ANTENNA: DELTA H/E/N': { // 3F14.4
        const h = parseFixed(line, 0, 14), e = parseFixed(line, 14, 28), n = parseFixed(line, 28, 42);
        if (fieldState.bad) return this.bad(lineNo, label, 'three F14.4 numbers in columns 1-42');
        this.antennaOffset = { heightM: h || 0, eastM: e || 0, northM: n || 0 };
        return;
      }
      case '# / TYPES OF OBSERV': return this.r2Types(line, lineNo);
      case 'SYS / # / OBS TYPES': return this.r3Types(line, lineNo);
      case 'INTERVAL': { // F10.3
        const v = parseFixed(line, 0, 10);
        if (fieldState.bad) return this.bad(lineNo, label, 'F10.3 seconds in columns 1-10');
        this.intervalS = Number.isFinite(v) && v > 0 ? v : null;
        return;
      }
      case 'TIME OF FIRST OBS': case 'TIME OF LAST OBS': { // 5I6, F13.7, 5X, A3
        const t = this.timeRecord(line);
        if (t === null) return this.bad(lineNo, label, 'year, month, day, hour, minute (5I6) and seconds (F13.7) in columns 1-43');
        if (label === 'TIME OF FIRST OBS') this.firstObs = t; else this.lastObs = t;
        return;
      }
      case 'GLONASS SLOT / FRQ #': { // I3, 1X, 8(A1, I2.2, 1X, I2, 1X)
        for (let k = 0; k < 8; k++) {
          const at = 4 + 7 * k;
          if (line.length < at + 6 || line.charAt(at) === ' ') continue;
          const slot = parseIntField(line, at + 1, at + 3), ch = parseIntField(line, at + 4, at + 6);
          if (fieldState.bad || !Number.isFinite(slot) || !Number.isFinite(ch)) return this.bad(lineNo, label, 'entries R<slot> <channel> (A1, I2, 1X, I2)');
          this.glonassChannels.set(slot, ch);
        }
        return;
      }
      case 'GLONASS COD/PHS/BIS': { // 4(1X, A3, 1X, F8.3)
        for (let k = 0; k < 4; k++) {
          const code = textField(line, 1 + 13 * k, 4 + 13 * k);
          if (code === '') continue;
          const v = parseFixed(line, 5 + 13 * k, 13 + 13 * k);
          if (fieldState.bad) return this.bad(lineNo, label, 'code and F8.3 bias pairs');
          this.glonassCodePhaseBias[code] = Number.isFinite(v) ? v : 0;
        }
        return;
      }
      case 'SYS / PHASE SHIFT': { // A1, 1X, A3, 1X, F8.5, 2X, I2.2, 10(1X, A3); satellite lists are not kept
        const s = line.charAt(0);
        if (!isGnssSystem(s)) return; // continuation line of a satellite list
        const code = textField(line, 2, 5);
        const v = parseFixed(line, 6, 14);
        if (fieldState.bad) return this.bad(lineNo, label, 'system, code and F8.5 cycles');
        if (code !== '') (this.phaseShifts[s] ??= {})[this.normaliseCode(s, code)] = Number.isFinite(v) ? v : 0;
        return;
      }
      case 'SYS / SCALE FACTOR': return this.scale(line, lineNo);
      case 'RCV CLOCK OFFS APPL': this.clockOffsetApplied = parseIntField(line, 0, 6) === 1; return;
      case 'LEAP SECONDS': {
        // RINEX 3.04+: a record marked BDS (columns 25-27) gives BDT - UTC, i.e. GPS - UTC less 14 s (BDT = GPST - 14 s).
        const v = parseIntField(line, 0, 6);
        if (Number.isFinite(v)) this.leapSeconds = line.substring(24, 27).trim() === 'BDS' ? v + 14 : v;
        return;
      }
      case 'WAVELENGTH FACT L1/2': return; // RINEX 2 only: accepted, not needed for code processing
      case '# OF SATELLITES': case 'PRN / # OF OBS': return; // describe the original data; not kept (the writer omits them)
      default:
        if (this.otherRecords.length < MAX_OTHER_HEADER_RECORDS) this.otherRecords.push(line.slice(0, 80)); else this.droppedOther++;
    }
  }

  private normaliseCode(sys: GnssSystem, code: string): string {
    return sys === 'C' ? normaliseBeidouCode(code, this.version) : code;
  }

  private timeRecord(line: string): { calendarS: number; ts: TimeSystem | null } | null {
    const y = parseIntField(line, 0, 6), mo = parseIntField(line, 6, 12), d = parseIntField(line, 12, 18);
    const h = parseIntField(line, 18, 24), mi = parseIntField(line, 24, 30), s = parseFixed(line, 30, 43);
    if (fieldState.bad || !Number.isFinite(y + mo + d + h + mi + s)) return null;
    const tsText = textField(line, 48, 51) as TimeSystem;
    const ts = TIME_SYSTEMS.includes(tsText) ? tsText : null;
    return { calendarS: secondsFromCalendar({ year: y, month: mo, day: d, hour: h, minute: mi, second: s }), ts };
  }

  /** RINEX 2.11 '# / TYPES OF OBSERV': I6, 9(4X, A2); continuation lines 6X, 9(4X, A2). */
  private r2Types(line: string, lineNo: number): void {
    const p = this.pending;
    if (p === null || p.kind !== 'r2types' || p.remaining <= 0) {
      const n = parseIntField(line, 0, 6);
      if (fieldState.bad || !Number.isFinite(n) || n < 0) return this.bad(lineNo, '# / TYPES OF OBSERV', 'the number of types (I6) in columns 1-6');
      if (n > MAX_OBS_TYPES_RINEX2) throw new InputError(this.file, lineNo, `'# / TYPES OF OBSERV' declares ${n} observation types; RINEX 2 defines fewer than ${MAX_OBS_TYPES_RINEX2 + 1}: the header is damaged`);
      this.r2Codes = [];
      this.pending = { kind: 'r2types', sys: null, remaining: n, factor: 1 };
    }
    const q = this.pending!;
    for (let k = 0; k < 9 && q.remaining > 0; k++) {
      const code = textField(line, 10 + 6 * k, 12 + 6 * k);
      if (code === '') break;
      this.r2Codes!.push(code);
      q.remaining--;
    }
    if (q.remaining <= 0) this.pending = null;
  }

  /** RINEX 3 'SYS / # / OBS TYPES': A1, 2X, I3, 13(1X, A3); continuation lines 6X, 13(1X, A3). */
  private r3Types(line: string, lineNo: number): void {
    const s = line.charAt(0);
    let p = this.pending;
    if (s !== ' ') {
      if (!isGnssSystem(s)) return this.bad(lineNo, 'SYS / # / OBS TYPES', 'a system letter G R E C J S I in column 1');
      const n = parseIntField(line, 3, 6);
      if (fieldState.bad || !Number.isFinite(n) || n < 0) return this.bad(lineNo, 'SYS / # / OBS TYPES', 'the number of types (I3) in columns 4-6');
      if (n > MAX_OBS_TYPES_RINEX3) throw new InputError(this.file, lineNo, `'SYS / # / OBS TYPES' declares ${n} observation types for system ${s}; the count is an I3 field (at most ${MAX_OBS_TYPES_RINEX3}): the header is damaged`);
      this.fileObsCodes[s] = [];
      p = this.pending = { kind: 'r3types', sys: s, remaining: n, factor: 1 };
    } else if (p === null || p.kind !== 'r3types') {
      return this.bad(lineNo, 'SYS / # / OBS TYPES', 'a system letter in column 1 (continuation line without a first line)');
    }
    const list = this.fileObsCodes[p.sys!]!;
    for (let k = 0; k < 13 && p.remaining > 0; k++) {
      const code = textField(line, 7 + 4 * k, 10 + 4 * k);
      if (code === '') break;
      list.push(code);
      p.remaining--;
    }
    if (p.remaining <= 0) this.pending = null;
  }

  /** 'SYS / SCALE FACTOR': A1, 1X, I4, 2X, I2, 12(1X, A3); continuation lines 10X, 12(1X, A3). */
  private scale(line: string, lineNo: number): void {
    const s = line.charAt(0);
    let p = this.pending;
    if (s !== ' ') {
      if (!isGnssSystem(s)) return this.bad(lineNo, 'SYS / SCALE FACTOR', 'a system letter in column 1');
      const f = parseIntField(line, 2, 6);
      const n = parseIntField(line, 8, 10);
      if (fieldState.bad || !(f > 0)) return this.bad(lineNo, 'SYS / SCALE FACTOR', 'a factor 1, 10, 100 or 1000 (I4) in columns 3-6');
      if (!(n > 0)) { this.scaleAll[s] = f; this.pending = null; return; }
      p = this.pending = { kind: 'scale', sys: s, remaining: n, factor: f };
    } else if (p === null || p.kind !== 'scale') {
      return this.bad(lineNo, 'SYS / SCALE FACTOR', 'a system letter in column 1');
    }
    const table = (this.scaleFactors[p.sys!] ??= {});
    // codes read as blank-separated words from column 11 (tolerates writers that shift the 1X, A3 grid)
    for (const code of line.slice(10, 60).trim().split(/\s+/)) {
      if (code === '' || p.remaining <= 0) break;
      table[this.normaliseCode(p.sys!, code)] = p.factor;
      p.remaining--;
    }
    if (p.remaining <= 0) this.pending = null;
  }

  /** RINEX 3 codes per system (RINEX 2 codes mapped; BeiDou 3.01 band 1 renamed). */
  obsCodes(): Partial<Record<GnssSystem, string[]>> {
    const out: Partial<Record<GnssSystem, string[]>> = {};
    if (this.version < 3) {
      if (this.r2Codes !== null) for (const s of rinex2Systems(this.systemField)) out[s] = rinex2CodeList(s, this.r2Codes);
    } else {
      for (const [s, list] of Object.entries(this.fileObsCodes) as [GnssSystem, string[]][]) {
        out[s] = list.map((c) => this.normaliseCode(s, c));
      }
    }
    return out;
  }

  fileCodes(): Partial<Record<GnssSystem, string[]>> {
    if (this.version < 3) {
      const out: Partial<Record<GnssSystem, string[]>> = {};
      if (this.r2Codes !== null) for (const s of rinex2Systems(this.systemField)) out[s] = this.r2Codes;
      return out;
    }
    return this.fileObsCodes;
  }

  build(headerLines: number): ObsHeader {
    const w = (name: string) => this.warn({ file: this.file, line: 0, code: 'missing-header-record', message: `mandatory header record '${name}' is missing` });
    const codesLabel = this.version < 3 ? '# / TYPES OF OBSERV' : 'SYS / # / OBS TYPES';
    if (!this.seen.has(codesLabel)) w(codesLabel);
    if (!this.seen.has('MARKER NAME')) w('MARKER NAME');
    if (!this.seen.has('TIME OF FIRST OBS')) w('TIME OF FIRST OBS');
    if (this.droppedComments > 0) this.warn({ file: this.file, line: 0, code: 'header-records-dropped', message: droppedRecordsMessage(this.droppedComments, 'COMMENT records', MAX_HEADER_COMMENTS) });
    if (this.droppedOther > 0) this.warn({ file: this.file, line: 0, code: 'header-records-dropped', message: droppedRecordsMessage(this.droppedOther, 'unrecognised records', MAX_OTHER_HEADER_RECORDS) });
    if (this.approxPosition === null) this.warn({ file: this.file, line: 0, code: 'missing-header-record', message: "header record 'APPROX POSITION XYZ' is missing or zero: no header coordinate" });
    const obsCodes = this.obsCodes();
    const scaleFactors: Partial<Record<GnssSystem, Record<string, number>>> = {};
    for (const [s, t] of Object.entries(this.scaleFactors) as [GnssSystem, Record<string, number>][]) scaleFactors[s] = { ...t };
    for (const [s, f] of Object.entries(this.scaleAll) as [GnssSystem, number][]) {
      const t = (scaleFactors[s] ??= {});
      for (const c of obsCodes[s] ?? []) if (t[c] === undefined) t[c] = f;
    }
    const ts: TimeSystem = this.firstObs?.ts ?? defaultTimeSystem(this.systemField);
    const conv = (t: { calendarS: number; ts: TimeSystem | null } | null) => (t === null ? null : toGpsS(t.calendarS, t.ts ?? ts));
    const firstGpsS = conv(this.firstObs);
    const pgm = this.otherRecords.find((l) => l.slice(60).trim() === 'PGM / RUN BY / DATE');
    const createdGpsS = pgm ? programDateSeconds(pgm.slice(40, 60)) : null;
    if (firstGpsS !== null && createdGpsS !== null) {
      // A receiver that lost track of the 10-bit GPS week (IS-GPS-200 20.3.3.3.1.1) dates its data
      // exactly 1024 weeks (19.6 years) early.
      const weeksEarly = (createdGpsS - firstGpsS) / 604800;
      if (weeksEarly > 1020 && weeksEarly < 1030) {
        this.warn({ file: this.file, line: 0, code: 'week-rollover', message: `the observations are dated ${Math.round(weeksEarly)} weeks before the file was made (${pgm!.slice(40, 60).trim()}): a receiver week-rollover fault? Times are used as written` });
      }
    }
    return {
      version: this.version,
      fileType: 'O',
      systemField: this.systemField,
      markerName: this.markerName,
      markerNumber: this.markerNumber,
      receiverType: this.receiverType,
      receiverNumber: this.receiverNumber,
      antennaType: this.antennaType,
      antennaNumber: this.antennaNumber,
      approxPosition: this.approxPosition,
      antennaOffset: this.antennaOffset ?? { heightM: 0, eastM: 0, northM: 0 },
      obsCodes,
      fileObsCodes: this.fileCodes(),
      intervalS: this.intervalS,
      firstObsGpsS: conv(this.firstObs),
      lastObsGpsS: conv(this.lastObs),
      timeSystem: ts,
      glonassChannels: this.glonassChannels,
      glonassCodePhaseBias: this.glonassCodePhaseBias,
      phaseShifts: this.phaseShifts,
      scaleFactors,
      clockOffsetApplied: this.clockOffsetApplied,
      leapSeconds: this.leapSeconds,
      comments: this.comments,
      headerLines,
      receiverVersion: this.receiverVersion,
      otherRecords: this.otherRecords,
    };
  }
}

const MONTHS = ['JAN', 'FEB', 'MAR', 'APR', 'MAY', 'JUN', 'JUL', 'AUG', 'SEP', 'OCT', 'NOV', 'DEC'];

/**
 * The file-creation date of a PGM / RUN BY / DATE record (columns 41-60): 'yyyymmdd hhmmss zone'
 * (RINEX 3) or 'dd-MMM-yy hh:mm' (RINEX 2), as seconds on the GPS-epoch calendar; null when unreadable.
 */
export function programDateSeconds(field: string): number | null {
  const f = field.trim().toUpperCase();
  let m = /^(\d{4})(\d{2})(\d{2})\s+(\d{2})(\d{2})(\d{2})/.exec(f);
  if (m) return secondsFromCalendar({ year: +m[1], month: +m[2], day: +m[3], hour: +m[4], minute: +m[5], second: +m[6] });
  m = /^(\d{1,2})-([A-Z]{3})-(\d{2,4})\s+(\d{1,2}):(\d{2})/.exec(f);
  if (m && MONTHS.includes(m[2])) {
    const y = +m[3] < 100 ? (+m[3] >= 80 ? 1900 + +m[3] : 2000 + +m[3]) : +m[3];
    return secondsFromCalendar({ year: y, month: MONTHS.indexOf(m[2]) + 1, day: +m[1], hour: +m[4], minute: +m[5], second: 0 });
  }
  return null;
}
