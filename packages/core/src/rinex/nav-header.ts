/**
 * Navigation file header: version and type line, ionosphere coefficients, time-system corrections and
 * leap seconds. RINEX 2.11 section 6.4 and table A3 (ION ALPHA, ION BETA, DELTA-UTC: A0,A1,T,W, LEAP
 * SECONDS), table A10 (GLONASS: CORR TO SYSTEM TIME); RINEX 3.04 table A5 (IONOSPHERIC CORR, TIME SYSTEM
 * CORR, LEAP SECONDS); RINEX 4.00 table A3 (header without ionosphere or time corrections: those are
 * ION / STO records).
 */
import { FormatError, InputError, type WarningSink } from '../errors.js';
import { bdtToGpsS, SECONDS_PER_WEEK, BDT_WEEK_OFFSET } from '../time/index.js';
import type { GnssSystem } from '../gnss/index.js';
import { isGnssSystem } from '../gnss/index.js';
import type { IonosphereCoefficients, KlobucharCoefficients, SystemTimeOffset } from '../gnss/index.js';
import { parseFortranReal } from './nav-fields.js';

export interface NavHeader {
  readonly version: number;
  /** System whose records the file holds, or 'M' for mixed. RINEX 2: 'G' (.n), 'R' (.g), 'S' (.h). */
  readonly system: GnssSystem | 'M';
  readonly ionosphere: IonosphereCoefficients;
  readonly leapSeconds: number | null;
  readonly systemTimeOffsets: SystemTimeOffset[];
  /** Index (0-based) of the first line after END OF HEADER. */
  readonly dataStart: number;
}

const LABEL_COLUMN = 60;

/** Reads `count` reals at `start`, `start + width`, ...; falls back to splitting on spaces when a column is not a number. */
function realsAt(text: string, start: number, width: number, count: number): number[] | undefined {
  const out: number[] = [];
  for (let k = 0; k < count; k++) {
    const v = parseFortranReal(text.substring(start + k * width, start + (k + 1) * width));
    if (v === undefined) {
      const tokens = text.substring(start, start + count * width).trim().split(/\s+/);
      const alt = tokens.map((t) => parseFortranReal(t));
      if (alt.length < count || alt.some((x) => x === undefined)) return undefined;
      return alt.slice(0, count) as number[];
    }
    out.push(v);
  }
  return out;
}

function quad(v: number[]): [number, number, number, number] {
  return [v[0] ?? NaN, v[1] ?? NaN, v[2] ?? NaN, v[3] ?? NaN];
}

/** Rejects input that is not a RINEX navigation file with one clear sentence. */
function checkFirstLine(file: string, first: string | undefined): { version: number; type: string; sysChar: string } {
  if (first === undefined || first.trim() === '') {
    throw new FormatError(file, 1, 'not a RINEX navigation file: the file is empty (expected a first line ending in "RINEX VERSION / TYPE")');
  }
  if (first.includes('CRINEX')) {
    throw new FormatError(file, 1, 'this is a compact RINEX observation file, not a navigation file');
  }
  if (!first.includes('RINEX VERSION / TYPE')) {
    throw new FormatError(file, 1, 'not a RINEX file: the first line does not end with "RINEX VERSION / TYPE"');
  }
  const version = Number(first.substring(0, 9).trim());
  const type = first.substring(20, 21);
  if (type === 'O') throw new FormatError(file, 1, 'this is a RINEX observation file, not a navigation file');
  if (type === 'M') throw new FormatError(file, 1, 'this is a RINEX meteorological file, not a navigation file');
  if (type === 'C') throw new FormatError(file, 1, 'this is a RINEX clock file, not a navigation file');
  if (!(type === 'N' || type === 'G' || type === 'H')) {
    throw new FormatError(file, 1, `not a RINEX navigation file: file type '${type}' in column 21 (expected N, G or H)`);
  }
  if (!Number.isFinite(version) || version < 2 || version >= 5) {
    throw new FormatError(file, 1, `unsupported RINEX version '${first.substring(0, 9).trim()}' (expected 2.xx, 3.xx or 4.xx)`);
  }
  return { version, type, sysChar: first.substring(40, 41) };
}

function systemOf(version: number, type: string, sysChar: string): GnssSystem | 'M' {
  if (type === 'G') return 'R';
  if (type === 'H') return 'S';
  if (version < 3) return 'G';
  if (sysChar === 'M' || sysChar === ' ' || sysChar === '') return 'M';
  return isGnssSystem(sysChar) ? sysChar : 'M';
}

/** Parses the header; `lines` are the file's lines without line ends. */
export function parseNavHeader(file: string, lines: readonly string[], onWarning: WarningSink, lineShift = 0): NavHeader {
  const { version, type, sysChar } = checkFirstLine(file, lines[0]);
  const system = systemOf(version, type, sysChar);
  const iono: {
    gps?: KlobucharCoefficients; qzss?: KlobucharCoefficients; beidou?: KlobucharCoefficients;
    galileo?: readonly [number, number, number];
  } = {};
  const alpha: Partial<Record<string, [number, number, number, number]>> = {};
  const beta: Partial<Record<string, [number, number, number, number]>> = {};
  let leapSeconds: number | null = null;
  const offsets: SystemTimeOffset[] = [];
  const bad = (i: number, what: string) =>
    onWarning({ file, line: i + 1, code: 'bad-header-record', message: `header record ignored: expected ${what}` });

  let i = 1;
  for (; i < lines.length; i++) {
    const line = lines[i]!;
    const label = line.length > LABEL_COLUMN ? line.substring(LABEL_COLUMN).trim() : '';
    if (label === 'END OF HEADER') break;
    if (label === 'ION ALPHA' || label === 'ION BETA') {
      // RINEX 2.11 table A3: 2X,4D12.4.
      const v = realsAt(line, 2, 12, 4);
      if (!v) { bad(i, 'four numbers (2X,4D12.4)'); continue; }
      (label === 'ION ALPHA' ? alpha : beta)['GPS'] ??= quad(v);
    } else if (label === 'IONOSPHERIC CORR') {
      // RINEX 3.04 table A5: A4,1X,4D12.4,1X,A1,1X,I2 (time mark and SV only for BDS per-satellite sets).
      const kind = line.substring(0, 4).trim();
      const v = realsAt(line, 5, 12, 4);
      if (!v) { bad(i, 'a correction type and four numbers (A4,1X,4D12.4)'); continue; }
      if (kind === 'GAL') iono.galileo ??= [v[0]!, v[1]!, v[2]!];
      else if (/^(GPS|QZS|BDS|IRN)[AB]$/.test(kind)) {
        const sys = kind.substring(0, 3);
        (kind.endsWith('A') ? alpha : beta)[sys] ??= quad(v);
      }
    } else if (label === 'DELTA-UTC: A0,A1,T,W') {
      // RINEX 2.11 table A3: 3X,2D19.12,2I9; W is the continuous GPS week.
      const a = realsAt(line, 3, 19, 2);
      const tw = line.substring(41, 59).trim().split(/\s+/).map(Number);
      if (!a || tw.length < 2 || tw.some((x) => !Number.isFinite(x))) { bad(i, 'A0, A1 (D19.12) and T, W (I9)'); continue; }
      offsets.push(offset(file, i + 1, 'GPUT', a[0]!, a[1]!, tw[1]! * SECONDS_PER_WEEK + tw[0]!, '', ''));
    } else if (label === 'CORR TO SYSTEM TIME') {
      // RINEX 2.11 table A10: 3I6,3X,D19.12: reference date and -TauC (GLONASS system time to UTC(SU)).
      const tau = realsAt(line, 21, 19, 1);
      if (!tau) { bad(i, 'year, month, day (3I6) and -TauC (D19.12)'); continue; }
      offsets.push(offset(file, i + 1, 'GLUT', tau[0]!, 0, NaN, '', ''));
    } else if (label === 'TIME SYSTEM CORR') {
      // RINEX 3.04 table A5: A4,1X,D17.10,D16.9,1X,I6,1X,I4,1X,A5,1X,I2.
      const code = line.substring(0, 4).trim();
      const a0 = parseFortranReal(line.substring(5, 22));
      const a1 = parseFortranReal(line.substring(22, 38));
      const t = Number(line.substring(38, 45).trim() || 'NaN');
      const w = Number(line.substring(45, 50).trim() || 'NaN');
      if (a0 === undefined || a1 === undefined || !/^[A-Z]{4}$/.test(code)) { bad(i, 'A4,1X,D17.10,D16.9,1X,I6,1X,I4'); continue; }
      // Reference week: GPS week (continuous) for every system except BDS, whose week is the BDT week
      // (RINEX 3.04 table A5 'TIME SYSTEM CORR' notes). Week 0 means "not given".
      let refGpsS = NaN;
      if (Number.isFinite(t) && Number.isFinite(w) && w > 0) {
        refGpsS = code.startsWith('BD') ? bdtToGpsS((w + BDT_WEEK_OFFSET) * SECONDS_PER_WEEK + t) : w * SECONDS_PER_WEEK + t;
      }
      offsets.push(offset(file, i + 1, code, a0, a1, refGpsS, line.substring(51, 56).trim(), line.substring(57, 59).trim()));
    } else if (label === 'LEAP SECONDS') {
      const n = Number(line.substring(0, 6).trim());
      if (line.substring(0, 6).trim() === '' || !Number.isInteger(n)) { bad(i, 'the number of leap seconds (I6)'); continue; }
      // RINEX 3.04+: marked BDS (columns 25-27) it is BDT - UTC = GPS - UTC - 14 s.
      leapSeconds ??= line.substring(24, 27).trim() === 'BDS' ? n + 14 : n;
    }
  }
  if (i >= lines.length) {
    throw new InputError(file, lines.length + lineShift, 'the header has no "END OF HEADER" line (expected it before the data records)');
  }
  for (const [sys, key] of [['GPS', 'gps'], ['QZS', 'qzss'], ['BDS', 'beidou']] as const) {
    const a = alpha[sys];
    const b = beta[sys];
    if (a && b) iono[key] = { alpha: a, beta: b };
  }
  return { version, system, ionosphere: iono, leapSeconds, systemTimeOffsets: offsets, dataStart: i + 1 };
}

function offset(file: string, line: number, code: string, a0S: number, a1SS: number, refGpsS: number, sbasId: string, utcId: string): SystemTimeOffset {
  return { code, a0S, a1SS, a2SS2: 0, refGpsS, transmitGpsS: NaN, sat: '', message: '', sbasId, utcId, file, line };
}
