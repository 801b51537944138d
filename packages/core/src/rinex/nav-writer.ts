/**
 * RINEX 3.04 mixed navigation writer (RINEX 3.04 section 5 and tables A5-A19): header with
 * IONOSPHERIC CORR, TIME SYSTEM CORR and LEAP SECONDS, then GPS, Galileo, BeiDou, QZSS, NavIC, GLONASS
 * and SBAS records in the order given. Values print as D19.12 (13 significant digits), so a file read
 * back gives the same values to that precision. Record epochs are whole seconds (RINEX 3 writes I2
 * seconds): a clock reference time off the second is rounded.
 */
import { calendarFromSeconds, gpsToBdtS, gpsToUtcS, SECONDS_PER_WEEK, BDT_WEEK_OFFSET } from '../time/index.js';
import type { Ephemeris, GlonassEphemeris, KeplerEphemeris, KlobucharCoefficients, NavData, SbasEphemeris, SystemTimeOffset } from '../gnss/index.js';
import { d19, formatFortranReal, fortranInt, headerLine } from './nav-format.js';

export interface WriteNavOptions {
  /** PGM / RUN BY / DATE fields (A20 each). Date defaults to the current UTC time as 'YYYYMMDD HHMMSS UTC'. */
  readonly program?: string;
  readonly runBy?: string;
  readonly date?: string;
  /** COMMENT lines (each cut to 60 characters). */
  readonly comments?: readonly string[];
}

/** 'not known' transmission time (RINEX 3.04 table A6 note: 0.9999E9). */
const TTM_NOT_KNOWN = 0.9999e9;

function nowUtcText(): string {
  const d = new Date();
  const p = (n: number) => String(n).padStart(2, '0');
  return `${d.getUTCFullYear()}${p(d.getUTCMonth() + 1)}${p(d.getUTCDate())} ${p(d.getUTCHours())}${p(d.getUTCMinutes())}${p(d.getUTCSeconds())} UTC`;
}

/** 'YYYY MM DD HH MM SS' of seconds since 1980-01-06 on the record's own time scale (RINEX 3.04 table A6). */
function epochText(ownS: number): string {
  const c = calendarFromSeconds(Math.round(ownS));
  const p = (n: number) => String(n).padStart(2, '0');
  return `${c.year} ${p(c.month)} ${p(c.day)} ${p(c.hour)} ${p(c.minute)} ${p(Math.round(c.second))}`;
}

function dataLine(values: readonly number[]): string {
  return ('    ' + values.map(d19).join('')).trimEnd();
}

function firstLine(sat: string, ownS: number, values: readonly [number, number, number]): string {
  return `${sat} ${epochText(ownS)}${values.map(d19).join('')}`.trimEnd();
}

function ionoLines(kind: string, k: KlobucharCoefficients): string[] {
  const d12 = (v: number) => formatFortranReal(v, 12, 4);
  // RINEX 3.04 table A5: A4,1X,4D12.4.
  return [
    headerLine(`${kind}A ${k.alpha.map(d12).join('')}`, 'IONOSPHERIC CORR'),
    headerLine(`${kind}B ${k.beta.map(d12).join('')}`, 'IONOSPHERIC CORR'),
  ];
}

function timeCorrLine(o: SystemTimeOffset): string | null {
  if (!/^[A-Z]{4}$/.test(o.code)) return null;
  let t = 0;
  let w = 0;
  if (Number.isFinite(o.refGpsS)) {
    // Reference week: GPS week, BDT week for BDS codes (RINEX 3.04 table A5 'TIME SYSTEM CORR').
    const own = o.code.startsWith('BD') ? gpsToBdtS(o.refGpsS) - BDT_WEEK_OFFSET * SECONDS_PER_WEEK : o.refGpsS;
    w = Math.floor(own / SECONDS_PER_WEEK);
    t = own - w * SECONDS_PER_WEEK;
  }
  // A4,1X,D17.10,D16.9,1X,I6,1X,I4,1X,A5,1X,I2
  const content = `${o.code} ${formatFortranReal(o.a0S, 17, 10)}${formatFortranReal(o.a1SS, 16, 9)} ${fortranInt(t, 6)} ${fortranInt(w, 4)} ${o.sbasId.padEnd(5).substring(0, 5)} ${o.utcId.padStart(2).substring(0, 2)}`;
  return headerLine(content, 'TIME SYSTEM CORR');
}

function keplerLines(e: KeplerEphemeris): string[] {
  const isBds = e.system === 'C';
  const own = (gpsS: number) => (isBds ? gpsToBdtS(gpsS) : gpsS);
  const weekStartOwnS = own(e.toeGpsS) - e.toeSowS;
  const weekCount = Math.round(weekStartOwnS / SECONDS_PER_WEEK);
  const week = isBds ? weekCount - BDT_WEEK_OFFSET : weekCount;
  const ttm = Number.isFinite(e.transmitGpsS) ? own(e.transmitGpsS) - weekCount * SECONDS_PER_WEEK : TTM_NOT_KNOWN;
  const rows: number[][] = [
    [e.iode, e.crs, e.deltaN, e.m0],
    [e.cuc, e.e, e.cus, e.sqrtA],
    [e.toeSowS, e.cic, e.omega0, e.cis],
    [e.i0, e.crc, e.omega, e.omegaDot],
  ];
  switch (e.system) {
    case 'G':
    case 'J': {
      // Fit interval: GPS hours (0 = not known); QZSS flag 0 = 2 h, 1 = longer (see nav-records.ts).
      const fit = e.system === 'J'
        ? (Number.isFinite(e.fitIntervalH) && e.fitIntervalH > 2 ? 1 : 0)
        : (Number.isFinite(e.fitIntervalH) ? e.fitIntervalH : 0);
      rows.push([e.idot, 0, week, 0], [e.accuracyM, e.health, e.tgdS, e.iodc], [ttm, fit]);
      break;
    }
    case 'E':
      rows.push([e.idot, e.dataSource, week, NaN], [e.accuracyM, e.health, e.tgdS, e.tgd2S], [ttm]);
      break;
    case 'C':
      rows.push([e.idot, NaN, week, NaN], [e.accuracyM, e.health, e.tgdS, e.tgd2S], [ttm, e.iodc]);
      break;
    case 'I':
      rows.push([e.idot, NaN, week, NaN], [e.accuracyM, e.health, e.tgdS, NaN], [ttm]);
      break;
  }
  return [firstLine(e.sat, own(e.tocGpsS), [e.af0, e.af1, e.af2]), ...rows.map(dataLine)];
}

function glonassLines(e: GlonassEphemeris): string[] {
  const km = (v: number) => v / 1000; // RINEX 3.04 table A10: km, km/s, km/s^2
  return [
    firstLine(e.sat, gpsToUtcS(e.tbGpsS), [e.clockBiasS, e.gammaN, e.frameTimeS]),
    dataLine([km(e.posM[0]), km(e.velMS[0]), km(e.accMS2[0]), e.health]),
    dataLine([km(e.posM[1]), km(e.velMS[1]), km(e.accMS2[1]), e.channel]),
    dataLine([km(e.posM[2]), km(e.velMS[2]), km(e.accMS2[2]), e.ageDays]),
  ];
}

function sbasLines(e: SbasEphemeris): string[] {
  const km = (v: number) => v / 1000; // RINEX 3.04 table A16: km, km/s, km/s^2
  const tx = e.transmitGpsS ?? NaN;
  const ttm = Number.isFinite(tx) ? tx - Math.floor(tx / SECONDS_PER_WEEK) * SECONDS_PER_WEEK : TTM_NOT_KNOWN;
  return [
    firstLine(e.sat, e.t0GpsS, [e.clockBiasS, e.clockRateSS, ttm]),
    dataLine([km(e.posM[0]), km(e.velMS[0]), km(e.accMS2[0]), e.health]),
    dataLine([km(e.posM[1]), km(e.velMS[1]), km(e.accMS2[1]), e.accuracyM]),
    dataLine([km(e.posM[2]), km(e.velMS[2]), km(e.accMS2[2]), e.iodn]),
  ];
}

function recordLines(e: Ephemeris): string[] {
  if (e.kind === 'kepler') return keplerLines(e);
  if (e.kind === 'glonass') return glonassLines(e);
  return sbasLines(e);
}

/** RINEX 3.04 mixed navigation text, one line (with its '\n') per item. */
export function* writeNavRinex3(nav: NavData, opts: WriteNavOptions = {}): Iterable<string> {
  const header: string[] = [
    headerLine('     3.04           N: GNSS NAV DATA    M: MIXED', 'RINEX VERSION / TYPE'),
    headerLine(
      (opts.program ?? 'refdelta').padEnd(20).substring(0, 20) + (opts.runBy ?? '').padEnd(20).substring(0, 20) + (opts.date ?? nowUtcText()).padEnd(20).substring(0, 20),
      'PGM / RUN BY / DATE',
    ),
  ];
  for (const c of opts.comments ?? []) header.push(headerLine(c.substring(0, 60), 'COMMENT'));
  const ion = nav.ionosphere;
  if (ion.galileo) {
    const d12 = (v: number) => formatFortranReal(v, 12, 4);
    header.push(headerLine(`GAL  ${[...ion.galileo, 0].map(d12).join('')}`, 'IONOSPHERIC CORR'));
  }
  if (ion.gps) header.push(...ionoLines('GPS', ion.gps));
  if (ion.qzss) header.push(...ionoLines('QZS', ion.qzss));
  if (ion.beidou) header.push(...ionoLines('BDS', ion.beidou));
  for (const o of nav.systemTimeOffsets ?? []) {
    const l = timeCorrLine(o);
    if (l) header.push(l);
  }
  if (nav.leapSeconds !== null && Number.isFinite(nav.leapSeconds)) header.push(headerLine(fortranInt(nav.leapSeconds, 6), 'LEAP SECONDS'));
  header.push(headerLine('', 'END OF HEADER'));
  for (const l of header) yield l + '\n';
  for (const e of nav.ephemerides) {
    for (const l of recordLines(e)) yield l + '\n';
  }
}
