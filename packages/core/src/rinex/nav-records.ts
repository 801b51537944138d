/**
 * One broadcast-ephemeris record (the lines of one satellite's message) -> an Ephemeris.
 *
 * Layouts: RINEX 2.11 tables A4 (GPS), A11 (GLONASS), A16 (GEO/SBAS); RINEX 3.04 tables A6-A7 (GPS),
 * A8-A9 (Galileo), A10-A11 (GLONASS), A12-A13 (QZSS), A14-A15 (BDS), A16-A17 (SBAS), A18-A19 (IRNSS);
 * RINEX 3.05 adds a fifth GLONASS line (status flags, L1/L2 delay, URAI, health flags), which is read
 * past. RINEX 4.00 LNAV / INAV / FNAV / D1 / D2 / FDMA / SBAS bodies keep the RINEX 3 layout.
 *
 * Times: GPS, QZSS, Galileo (GST), NavIC and SBAS record epochs are on GPS time (GST and IRNWT are
 * steered to GPS time, offsets are broadcast separately); BDS epochs are BDT (BDT = GPST - 14 s, BeiDou
 * ICD B1I 5.1.5); GLONASS epochs are UTC (RINEX 3.04 section 8.3.4; RINEX 2.11 section 6.8).
 */
import { bdtToGpsS, gpsSFromWeekTow, secondsFromCalendar, SECONDS_PER_WEEK, BDT_WEEK_OFFSET, utcToGpsS } from '../time/index.js';
import type { CalendarTime } from '../time/index.js';
import type { GnssSystem, SatId } from '../gnss/index.js';
import { isGnssSystem } from '../gnss/index.js';
import type { Ephemeris, GlonassEphemeris, KeplerEphemeris, SbasEphemeris } from '../gnss/index.js';
import { epochRinex2, epochRinex3, intAt, NavRecordProblem, realAt } from './nav-fields.js';

/** The lines of one record and where it starts in the file. */
export interface RawNavRecord {
  readonly lines: readonly string[];
  /** 1-based line number of lines[0]. */
  readonly firstLine: number;
}

/** Record line counts per system (tables cited above). */
export const RECORD_LINES: Readonly<Record<GnssSystem, { min: number; max: number }>> = {
  G: { min: 8, max: 8 }, J: { min: 8, max: 8 }, E: { min: 8, max: 8 }, C: { min: 8, max: 8 }, I: { min: 8, max: 8 },
  R: { min: 4, max: 5 }, S: { min: 4, max: 4 },
};

/** Transmission time values of 0.9999E9 and above mean "not known" (RINEX 3.04 table A6 note). */
const TTM_UNKNOWN = 0.9999e9;

export interface RecordContext {
  readonly file: string;
  /** 2 for RINEX 2 (data from column 4), 3 for RINEX 3 and 4 bodies (data from column 5). */
  readonly layout: 2 | 3;
  /** System of a RINEX 2 file (or of a RINEX 3 record whose system letter is blank). */
  readonly defaultSystem: GnssSystem;
  /** RINEX 4 message type from the '> EPH' line, or null for RINEX 2/3 (then derived). */
  readonly message: string | null;
}

/** Satellite of a record's first line: RINEX 3 'G01' (A1,I2.2), RINEX 2 'nn' (I2). */
export function recordSat(line: string, ctx: RecordContext, lineNo: number): { sat: SatId; system: GnssSystem } {
  let sys: string = ctx.defaultSystem;
  let prn: number;
  if (ctx.layout === 3) {
    const c = line.charAt(0);
    if (c !== ' ') sys = c;
    prn = intAt(line, 1, 2, lineNo, 'satellite number');
  } else {
    prn = intAt(line, 0, 2, lineNo, 'satellite number');
  }
  if (!isGnssSystem(sys)) throw new NavRecordProblem(lineNo, 'unknown-system', `expected a satellite system letter G, R, E, C, J, S or I in column 1, found '${sys}'`);
  if (!Number.isInteger(prn) || prn < 1) throw new NavRecordProblem(lineNo, 'bad-satellite', 'expected a satellite number in columns 2-3');
  // RINEX 2 GEO records give the PRN minus 100 (RINEX 2.11 table A16); SBAS PRNs 120-158 are written S20-S58.
  return { sat: `${sys}${String(prn % 100).padStart(2, '0')}`, system: sys };
}

function clockRow(rec: RawNavRecord, ctx: RecordContext): { cal: CalendarTime; v: [number, number, number] } {
  const line = rec.lines[0]!;
  const n = rec.firstLine;
  const cal = ctx.layout === 3 ? epochRinex3(line, n) : epochRinex2(line, n);
  const c0 = ctx.layout === 3 ? 23 : 22;
  return { cal, v: [realAt(line, c0, 19, n), realAt(line, c0 + 19, 19, n), realAt(line, c0 + 38, 19, n)] };
}

/** BROADCAST ORBIT - k (k = 1..): four D19.12 fields from column 4 (RINEX 2) or 5 (RINEX 3). */
function orbitRow(rec: RawNavRecord, ctx: RecordContext, k: number): [number, number, number, number] {
  const line = rec.lines[k] ?? '';
  const n = rec.firstLine + k;
  const c0 = ctx.layout === 3 ? 4 : 3;
  return [realAt(line, c0, 19, n), realAt(line, c0 + 19, 19, n), realAt(line, c0 + 38, 19, n), realAt(line, c0 + 57, 19, n)];
}

function requireFinite(values: readonly number[], names: readonly string[], lineNo: number): void {
  values.forEach((v, k) => {
    if (!Number.isFinite(v)) throw new NavRecordProblem(lineNo, 'missing-field', `expected a value for ${names[k]}, the field is blank`);
  });
}

/**
 * Continuous reference time from a week number and seconds of week, moved by whole weeks so that it lies
 * within half a week of the clock reference time (the toe week may differ from the toc week across a
 * Saturday-midnight week change, and some writers give the week modulo 1024): common practice, following
 * the half-week rule of IS-GPS-200 20.3.3.4.3.
 */
export function weekTimeNear(week: number, sowS: number, nearS: number): number {
  const w = Number.isFinite(week) ? week : Math.floor(nearS / SECONDS_PER_WEEK);
  const t = gpsSFromWeekTow(w, sowS);
  return t + Math.round((nearS - t) / SECONDS_PER_WEEK) * SECONDS_PER_WEEK;
}

/** Galileo message from the data-source bits: bit 0 (I/NAV E1-B) or bit 2 (I/NAV E5b-I) -> INAV, bit 1 (F/NAV E5a-I) -> FNAV (RINEX 3.04 table A8). */
export function galileoMessage(dataSource: number): string {
  if (!Number.isFinite(dataSource)) return '';
  if (dataSource & 0b101) return 'INAV';
  if (dataSource & 0b010) return 'FNAV';
  return '';
}

/** BeiDou message: GEO satellites (C01-C05, C59-C63) broadcast D2, the others D1 (BeiDou ICD B1I 5.1). */
export function beidouMessage(sat: SatId): string {
  const prn = Number(sat.substring(1));
  return prn <= 5 || prn >= 59 ? 'D2' : 'D1';
}

/**
 * Fit interval (hours). GPS (RINEX 3.04 table A6): hours; 0 means "not known" -> NaN (4 h assumed);
 * a RINEX 2 writer that copies the flag writes 1 -> 6 h, the shortest longer interval of IS-GPS-200
 * 20.3.4.4 (from memory). QZSS (RINEX 3.04 table A12): flag 0 -> 2 h, 1 -> more than 2 h, taken as 4 h
 * (IS-QZSS-PNT 4.1.2.4, from memory).
 */
export function fitIntervalHours(system: GnssSystem, value: number): number {
  if (!Number.isFinite(value)) return NaN;
  if (system === 'J') return value === 0 ? 2 : value === 1 ? 4 : value;
  if (value === 0) return NaN;
  if (value === 1) return 6;
  return value;
}

function keplerRecord(rec: RawNavRecord, ctx: RecordContext, sat: SatId, system: KeplerEphemeris['system']): KeplerEphemeris {
  const { cal, v: clk } = clockRow(rec, ctx);
  const o = [1, 2, 3, 4, 5, 6, 7].map((k) => orbitRow(rec, ctx, k));
  const [r1, r2, r3, r4, r5, r6, r7] = o as [number, number, number, number][];
  const n = rec.firstLine;
  requireFinite(clk, ['af0', 'af1', 'af2'], n);
  requireFinite([r1![1]!, r1![2]!, r1![3]!], ['Crs', 'Delta n', 'M0'], n + 1);
  requireFinite(r2!, ['Cuc', 'e', 'Cus', 'sqrt(A)'], n + 2);
  requireFinite(r3!, ['Toe', 'Cic', 'OMEGA0', 'Cis'], n + 3);
  requireFinite(r4!, ['i0', 'Crc', 'omega', 'OMEGA DOT'], n + 4);
  requireFinite([r5![0]!], ['IDOT'], n + 5);
  const toeSowS = r3![0]!;
  const ownS = secondsFromCalendar(cal);
  // BDS: toc, toe and ttm are BDT; BDT week 0 = GPS week 1356 (BeiDou ICD B1I 5.1.5). Others: GPS week.
  const isBds = system === 'C';
  const weekInGpsCount = isBds ? r5![2]! + BDT_WEEK_OFFSET : r5![2]!;
  const toeOwnS = weekTimeNear(weekInGpsCount, toeSowS, ownS);
  const toGps = (s: number) => (isBds ? bdtToGpsS(s) : s);
  const ttm = r7![0]!;
  const transmitGpsS = Number.isFinite(ttm) && Math.abs(ttm) < TTM_UNKNOWN ? toGps(toeOwnS - toeSowS + ttm) : NaN;
  let message = ctx.message ?? '';
  if (ctx.message === null) {
    if (system === 'E') message = galileoMessage(r5![1]!);
    else if (system === 'C') message = beidouMessage(sat);
  }
  const gpsLike = system === 'G' || system === 'J';
  return {
    kind: 'kepler', sat, system, message,
    tocGpsS: toGps(ownS), toeGpsS: toGps(toeOwnS), toeSowS,
    af0: clk[0], af1: clk[1], af2: clk[2],
    iode: r1![0]!, iodc: gpsLike ? r6![3]! : isBds ? r7![1]! : NaN,
    crs: r1![1]!, deltaN: r1![2]!, m0: r1![3]!,
    cuc: r2![0]!, e: r2![1]!, cus: r2![2]!, sqrtA: r2![3]!,
    cic: r3![1]!, omega0: r3![2]!, cis: r3![3]!,
    i0: r4![0]!, crc: r4![1]!, omega: r4![2]!, omegaDot: r4![3]!,
    idot: r5![0]!,
    accuracyM: r6![0]!, health: r6![1]!, tgdS: r6![2]!,
    tgd2S: system === 'E' || isBds ? r6![3]! : NaN,
    dataSource: system === 'E' && Number.isFinite(r5![1]!) ? r5![1]! : 0,
    transmitGpsS,
    fitIntervalH: gpsLike ? fitIntervalHours(system, r7![1]!) : NaN,
    file: ctx.file, line: n,
  };
}

function glonassRecord(rec: RawNavRecord, ctx: RecordContext, sat: SatId): GlonassEphemeris {
  const { cal, v: clk } = clockRow(rec, ctx);
  const [x, y, z] = [1, 2, 3].map((k) => orbitRow(rec, ctx, k)) as [number, number, number, number][];
  const n = rec.firstLine;
  requireFinite([clk[0], clk[1]], ['-TauN', '+GammaN'], n);
  requireFinite(x!.slice(0, 3), ['X', 'Xdot', 'Xacc'], n + 1);
  requireFinite(y!.slice(0, 3), ['Y', 'Ydot', 'Yacc'], n + 2);
  requireFinite(z!.slice(0, 3), ['Z', 'Zdot', 'Zacc'], n + 3);
  const KM = 1000; // RINEX gives km, km/s, km/s^2 (RINEX 3.04 table A10)
  return {
    kind: 'glonass', sat, system: 'R', message: ctx.message ?? '',
    tbGpsS: utcToGpsS(secondsFromCalendar(cal)),
    clockBiasS: clk[0], gammaN: clk[1], frameTimeS: clk[2],
    posM: [x![0]! * KM, y![0]! * KM, z![0]! * KM],
    velMS: [x![1]! * KM, y![1]! * KM, z![1]! * KM],
    accMS2: [x![2]! * KM, y![2]! * KM, z![2]! * KM],
    health: x![3]!, channel: y![3]!, ageDays: z![3]!,
    file: ctx.file, line: n,
  };
}

function sbasRecord(rec: RawNavRecord, ctx: RecordContext, sat: SatId): SbasEphemeris {
  const { cal, v: clk } = clockRow(rec, ctx);
  const [x, y, z] = [1, 2, 3].map((k) => orbitRow(rec, ctx, k)) as [number, number, number, number][];
  const n = rec.firstLine;
  requireFinite([clk[0], clk[1]], ['aGf0', 'aGf1'], n);
  requireFinite(x!.slice(0, 3), ['X', 'Xdot', 'Xacc'], n + 1);
  requireFinite(y!.slice(0, 3), ['Y', 'Ydot', 'Yacc'], n + 2);
  requireFinite(z!.slice(0, 3), ['Z', 'Zdot', 'Zacc'], n + 3);
  const t0GpsS = secondsFromCalendar(cal);
  const KM = 1000; // km, km/s, km/s^2 (RINEX 3.04 table A16)
  const ttm = clk[2];
  return {
    kind: 'sbas', sat, system: 'S', message: ctx.message ?? '',
    t0GpsS, clockBiasS: clk[0], clockRateSS: clk[1],
    posM: [x![0]! * KM, y![0]! * KM, z![0]! * KM],
    velMS: [x![1]! * KM, y![1]! * KM, z![1]! * KM],
    accMS2: [x![2]! * KM, y![2]! * KM, z![2]! * KM],
    health: x![3]!, accuracyM: y![3]!, iodn: z![3]!,
    // Transmission time: seconds of the GPS week (RINEX 3.05 table A10), placed in the week nearest t0.
    transmitGpsS: Number.isFinite(ttm) && Math.abs(ttm) < TTM_UNKNOWN ? weekTimeNear(NaN, ttm, t0GpsS) : NaN,
    file: ctx.file, line: n,
  };
}

/** Parses one record; throws NavRecordProblem (turned into a warning by the reader) when it is garbled or short. */
export function parseNavRecord(rec: RawNavRecord, ctx: RecordContext): Ephemeris {
  const first = rec.lines[0] ?? '';
  const { sat, system } = recordSat(first, ctx, rec.firstLine);
  const need = RECORD_LINES[system];
  if (rec.lines.length < need.min) {
    throw new NavRecordProblem(
      rec.firstLine, 'truncated-record',
      `${sat} record skipped: expected ${need.min} lines, found ${rec.lines.length}`,
    );
  }
  if (system === 'R') return glonassRecord(rec, ctx, sat);
  if (system === 'S') return sbasRecord(rec, ctx, sat);
  return keplerRecord(rec, ctx, sat, system);
}
