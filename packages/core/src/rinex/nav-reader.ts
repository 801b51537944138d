/**
 * RINEX navigation reader: RINEX 2.10/2.11 GPS (.n), GLONASS (.g) and GEO (.h) files, RINEX 3.0x mixed
 * and single-system files, RINEX 4.00 files with '> EPH / ION / STO / EOP' records.
 *
 * Garbled or truncated records become Warnings naming the file and line and are skipped; the rest of the
 * file is still read. Input that is not a RINEX navigation file raises one FormatError sentence.
 */
import { FormatError, InputError, RefdeltaError, type Warning, type WarningSink } from '../errors.js';
import type { GnssSystem } from '../gnss/index.js';
import { isGnssSystem, SYSTEM_NAMES } from '../gnss/index.js';
import type { EarthOrientation, Ephemeris, IonosphereCoefficients, NavData, SystemTimeOffset } from '../gnss/index.js';
import { NavRecordProblem } from './nav-fields.js';
import { parseNavHeader, type NavHeader } from './nav-header.js';
import { collectNavLines } from './nav-lines.js';
import { MAX_NAV_HEADER_LINES } from './header-limits.js';
import { parseNavRecord, RECORD_LINES, recordSat, type RawNavRecord, type RecordContext } from './nav-records.js';
import { parseEopRecord, parseIonRecord, parseStoRecord } from './nav-rinex4.js';

export interface ReadNavOptions {
  readonly onWarning?: WarningSink;
}

/** Joins text chunks (arbitrary boundaries) and splits them into lines (LF, CRLF or CR ends). */
export async function collectLines(file: string, text: AsyncIterable<string>): Promise<string[]> {
  return (await collectNavLines(file, text)).lines;
}

/** Reads a navigation file given as decompressed text chunks. */
export async function readNav(file: string, text: AsyncIterable<string>, opts?: ReadNavOptions): Promise<NavData> {
  const { lines, droppedHeaderLines } = await collectNavLines(file, text);
  if (droppedHeaderLines > 0) {
    opts?.onWarning?.({ file, line: MAX_NAV_HEADER_LINES, code: 'header-records-dropped', message: `the header runs on for ${droppedHeaderLines.toLocaleString('en-US')} lines after line ${MAX_NAV_HEADER_LINES.toLocaleString('en-US')}: they were read and dropped` });
  }
  return parseNavLines(file, lines, opts, droppedHeaderLines);
}

/** Same as readNav on text already split into lines (no line ends). */
export function parseNavLines(file: string, lines: readonly string[], opts?: ReadNavOptions, lineShift = 0): NavData {
  const warn: WarningSink = opts?.onWarning ?? (() => {});
  try {
    const header = parseNavHeader(file, lines, warn, lineShift);
    const body = header.version >= 4 ? readRinex4Body(file, lines, header, warn, lineShift) : readRinex23Body(file, lines, header, warn, lineShift);
    const ionosphere: IonosphereCoefficients = { ...header.ionosphere };
    for (const [k, v] of Object.entries(body.ionosphere) as [keyof IonosphereCoefficients, never][]) ionosphere[k] ??= v;
    return {
      files: [file],
      version: header.version,
      ephemerides: body.ephemerides,
      ionosphere,
      leapSeconds: header.leapSeconds,
      systemTimeOffsets: [...header.systemTimeOffsets, ...body.offsets],
      earthOrientation: body.eop,
    };
  } catch (e) {
    if (e instanceof RefdeltaError) throw e;
    // Only project error types leave the reader: anything unexpected is reported against the file.
    throw new InputError(file, 0, `could not read the navigation file: ${e instanceof Error ? e.message : String(e)}`);
  }
}

interface Body {
  ephemerides: Ephemeris[];
  ionosphere: IonosphereCoefficients;
  offsets: SystemTimeOffset[];
  eop: EarthOrientation[];
}

function problemWarning(file: string, p: NavRecordProblem): Warning {
  return { file, line: p.line, code: p.code, message: `record skipped: ${p.message}` };
}

/**
 * RINEX 2/3: a record starts on a line whose first 3 (RINEX 2: I2 PRN) or 4 (RINEX 3: A1,I2 satellite)
 * columns are not blank; its continuation lines start with 3 or 4 spaces (RINEX 2.11 table A4, 3.04 A6).
 */
function readRinex23Body(file: string, lines: readonly string[], header: NavHeader, warn: WarningSink, shift: number): Body {
  const layout: 2 | 3 = header.version >= 3 ? 3 : 2;
  const indent = layout === 3 ? 4 : 3;
  const defaultSystem: GnssSystem = header.system === 'M' ? 'G' : header.system;
  const ctx: RecordContext = { file, layout, defaultSystem, message: null };
  const out: Ephemeris[] = [];
  let current: string[] | null = null;
  let firstLine = 0;
  let orphanWarned = false;
  const flush = () => {
    if (current) parseOne({ lines: current, firstLine }, ctx, out, file, warn);
    current = null;
  };
  for (let i = header.dataStart; i < lines.length; i++) {
    const line = lines[i]!;
    if (line.trim() === '') continue;
    if (line.substring(0, indent).trim() !== '') {
      flush();
      current = [line];
      firstLine = i + 1 + shift;
    } else if (current) {
      current.push(line);
    } else if (!orphanWarned) {
      orphanWarned = true;
      warn({ file, line: i + 1 + shift, code: 'orphan-line', message: 'line skipped: expected a record to start with a satellite and epoch line' });
    }
  }
  flush();
  return { ephemerides: out, ionosphere: {}, offsets: [], eop: [] };
}

function parseOne(rec: RawNavRecord, ctx: RecordContext, out: Ephemeris[], file: string, warn: WarningSink): void {
  try {
    const eph = parseNavRecord(rec, ctx);
    const max = RECORD_LINES[eph.system].max;
    if (rec.lines.length > max) {
      warn({
        file, line: rec.firstLine + max, code: 'extra-lines',
        message: `${eph.sat} record: expected ${max} lines, found ${rec.lines.length}; the extra lines were ignored`,
      });
    }
    out.push(eph);
  } catch (e) {
    if (e instanceof NavRecordProblem) warn(problemWarning(file, e));
    else throw e;
  }
}

/** EPH message types whose bodies have the RINEX 3 layout and are read here (RINEX 4.00 table A5 list). */
const EPH_READ: Readonly<Record<string, readonly GnssSystem[]>> = {
  LNAV: ['G', 'J', 'I'], INAV: ['E'], FNAV: ['E'], D1: ['C'], D2: ['C'], FDMA: ['R'], SBAS: ['S'],
};

/** RINEX 4.00: every record begins with a '>' line naming the record type, satellite and message. */
function readRinex4Body(file: string, lines: readonly string[], header: NavHeader, warn: WarningSink, shift: number): Body {
  const body: Body = { ephemerides: [], ionosphere: {}, offsets: [], eop: [] };
  const iono = body.ionosphere as {
    gps?: IonosphereCoefficients['gps']; qzss?: IonosphereCoefficients['qzss'];
    beidou?: IonosphereCoefficients['beidou']; galileo?: IonosphereCoefficients['galileo'];
  };
  const skippedOnce = new Set<string>();
  const skipOnce = (key: string, lineNo: number, message: string) => {
    if (skippedOnce.has(key)) return;
    skippedOnce.add(key);
    warn({ file, line: lineNo, code: 'record-type-skipped', message: `${message} (further such records in this file are skipped without a warning)` });
  };
  let i = header.dataStart;
  while (i < lines.length) {
    const line = lines[i]!;
    if (!line.startsWith('>')) {
      if (line.trim() !== '') skipOnce('orphan', i + 1 + shift, "line skipped: expected a record line starting with '>'");
      i++;
      continue;
    }
    const headLine = i + 1 + shift;
    let j = i + 1;
    while (j < lines.length && !lines[j]!.startsWith('>')) j++;
    const rec: RawNavRecord = { lines: lines.slice(i + 1, j), firstLine: i + 2 + shift };
    i = j;
    const [type = '', sat = '', message = ''] = line.substring(1).trim().split(/\s+/);
    const system = sat.charAt(0);
    if (!['EPH', 'ION', 'STO', 'EOP'].includes(type)) {
      skipOnce(`type:${type}`, headLine, `record type '${type}' skipped: expected EPH, ION, STO or EOP`);
      continue;
    }
    if (!isGnssSystem(system) || !/^[A-Z]\d\d$/.test(sat)) {
      warn({ file, line: headLine, code: 'bad-record-line', message: `record skipped: expected '> ${type} <satellite, e.g. G01> <message>', found '${line.trim()}'` });
      continue;
    }
    try {
      if (type === 'EPH') {
        if (!(EPH_READ[message] ?? []).includes(system)) {
          skipOnce(`eph:${system}:${message}`, headLine, `EPH ${SYSTEM_NAMES[system]} ${message || '(no message type)'} records skipped: this reader reads LNAV, INAV, FNAV, D1, D2, FDMA and SBAS`);
          continue;
        }
        const ctx: RecordContext = { file, layout: 3, defaultSystem: system, message };
        const bodySat = recordSat(rec.lines[0] ?? '', ctx, rec.firstLine).sat;
        if (bodySat !== sat) {
          throw new NavRecordProblem(rec.firstLine, 'satellite-mismatch', `expected satellite ${sat} as on the '>' line, found ${bodySat}`);
        }
        parseOne(rec, ctx, body.ephemerides, file, warn);
      } else if (type === 'ION') {
        const ion = parseIonRecord(rec, system, message);
        if (!ion) {
          skipOnce(`ion:${system}:${message}`, headLine, `ION ${SYSTEM_NAMES[system]} ${message} records skipped: this reader keeps Klobuchar (LNAV, D1D2) and NeQuick G (IFNV) coefficients`);
        } else if (ion.key === 'galileo') iono.galileo ??= ion.nequick;
        else iono[ion.key] ??= ion.klobuchar;
      } else if (type === 'STO') {
        body.offsets.push(parseStoRecord(rec, file, sat, system, message));
      } else {
        body.eop.push(parseEopRecord(rec, file, sat, system, message));
      }
    } catch (e) {
      if (e instanceof NavRecordProblem) warn(problemWarning(file, e));
      else throw e;
    }
  }
  return body;
}

/**
 * Merges several navigation files: files and records concatenated in order; version of the first; the
 * ionosphere coefficients of the first file that has each model; the first leap-second count given.
 */
export function mergeNav(parts: readonly NavData[]): NavData {
  const ionosphere: IonosphereCoefficients = {};
  let leapSeconds: number | null = null;
  for (const p of parts) {
    for (const [k, v] of Object.entries(p.ionosphere) as [keyof IonosphereCoefficients, never][]) {
      if (v !== undefined) ionosphere[k] ??= v;
    }
    leapSeconds ??= p.leapSeconds;
  }
  return {
    files: parts.flatMap((p) => p.files),
    version: parts[0]?.version ?? NaN,
    ephemerides: parts.flatMap((p) => p.ephemerides),
    ionosphere,
    leapSeconds,
    systemTimeOffsets: parts.flatMap((p) => p.systemTimeOffsets ?? []),
    earthOrientation: parts.flatMap((p) => p.earthOrientation ?? []),
  };
}
