/**
 * Time scales. Internally every instant is a number of seconds of GPS time since the GPS epoch
 * 1980-01-06 00:00:00 (a uniform scale, no leap seconds), named `...GpsS`.
 *
 * Sources: GPS epoch 1980-01-06 00:00 UTC, broadcast week numbers modulo 1024 (USNO GPS time notes;
 * IS-GPS-200 20.3.3.3.1.1); GST aligned with GPST, GST week 0 = GPS week 1024 (Galileo OS SIS ICD 5.1.2);
 * BDT = GPST - 14 s, BDT week 0 = GPS week 1356 (BeiDou ICD B1I 5.2.4.x); GLONASS time = UTC(SU) + 3 h
 * (GLONASS ICD 3.3.3); GPS-UTC per IERS Bulletin C.
 */

export const SECONDS_PER_WEEK = 604_800;
export const SECONDS_PER_DAY = 86_400;
/** Days from 1970-01-01 (Unix epoch) to 1980-01-06 (GPS epoch). */
const GPS_EPOCH_UNIX_DAYS = 3657;
/** BDT = GPST - 14 s (BeiDou ICD). */
export const BDT_MINUS_GPST_S = -14;
/** BDT week 0 starts at GPS week 1356 (2006-01-01 00:00:00 BDT). */
export const BDT_WEEK_OFFSET = 1356;
/** GST week 0 = GPS week 1024 (Galileo OS SIS ICD). */
export const GST_WEEK_OFFSET = 1024;

/** Days since 1970-01-01 of a proleptic Gregorian date (Howard Hinnant's days_from_civil algorithm). */
export function daysFromCivil(year: number, month: number, day: number): number {
  const y = month <= 2 ? year - 1 : year;
  const era = Math.floor(y / 400);
  const yoe = y - era * 400;
  const mp = (month + 9) % 12;
  const doy = Math.floor((153 * mp + 2) / 5) + day - 1;
  const doe = yoe * 365 + Math.floor(yoe / 4) - Math.floor(yoe / 100) + doy;
  return era * 146097 + doe - 719468;
}

/** Inverse of daysFromCivil. */
export function civilFromDays(z: number): { year: number; month: number; day: number } {
  z += 719468;
  const era = Math.floor(z / 146097);
  const doe = z - era * 146097;
  const yoe = Math.floor((doe - Math.floor(doe / 1460) + Math.floor(doe / 36524) - Math.floor(doe / 146096)) / 365);
  const y = yoe + era * 400;
  const doy = doe - (365 * yoe + Math.floor(yoe / 4) - Math.floor(yoe / 100));
  const mp = Math.floor((5 * doy + 2) / 153);
  const day = doy - Math.floor((153 * mp + 2) / 5) + 1;
  const month = mp < 10 ? mp + 3 : mp - 9;
  return { year: month <= 2 ? y + 1 : y, month, day };
}

export interface CalendarTime {
  readonly year: number;
  readonly month: number;
  readonly day: number;
  readonly hour: number;
  readonly minute: number;
  readonly second: number;
}

/**
 * Seconds since the GPS epoch of a calendar reading taken on a uniform scale (GPS time, or any scale
 * that differs from it by a constant that the caller removes).
 */
export function secondsFromCalendar(c: CalendarTime): number {
  const days = daysFromCivil(c.year, c.month, c.day) - GPS_EPOCH_UNIX_DAYS;
  return days * SECONDS_PER_DAY + c.hour * 3600 + c.minute * 60 + c.second;
}

/** Calendar reading of seconds since the GPS epoch on the same uniform scale. */
export function calendarFromSeconds(s: number): CalendarTime {
  const days = Math.floor(s / SECONDS_PER_DAY);
  let rem = s - days * SECONDS_PER_DAY;
  const { year, month, day } = civilFromDays(days + GPS_EPOCH_UNIX_DAYS);
  const hour = Math.floor(rem / 3600);
  rem -= hour * 3600;
  const minute = Math.floor(rem / 60);
  const second = rem - minute * 60;
  return { year, month, day, hour, minute, second };
}

export interface WeekTow {
  /** Continuous (not modulo 1024) week number. */
  readonly week: number;
  /** Seconds into the week. */
  readonly towS: number;
}

export function weekTowFromGpsS(gpsS: number): WeekTow {
  const week = Math.floor(gpsS / SECONDS_PER_WEEK);
  return { week, towS: gpsS - week * SECONDS_PER_WEEK };
}

export function gpsSFromWeekTow(week: number, towS: number): number {
  return week * SECONDS_PER_WEEK + towS;
}

/**
 * Resolves a broadcast week number given modulo `modulus` (1024 for GPS LNAV, 8192 for CNAV) to the
 * continuous week closest to a time known to within half a rollover period.
 */
export function resolveWeek(weekMod: number, nearGpsS: number, modulus = 1024): number {
  const nearWeek = Math.floor(nearGpsS / SECONDS_PER_WEEK);
  const k = Math.round((nearWeek - weekMod) / modulus);
  return weekMod + k * modulus;
}

/**
 * Time difference t - ref corrected for a week crossing: IS-GPS-200 20.3.3.4.3 (if tk > 302400 subtract
 * 604800, if tk < -302400 add 604800). Used with times of week.
 */
export function wrapWeekS(dtS: number): number {
  if (dtS > 302_400) return dtS - SECONDS_PER_WEEK;
  if (dtS < -302_400) return dtS + SECONDS_PER_WEEK;
  return dtS;
}

/**
 * GPS - UTC in seconds, from IERS Bulletin C. Each entry: UTC date (as GPS-epoch seconds of that UTC
 * midnight on the uniform scale) from which the offset applies.
 */
const LEAP_TABLE: ReadonlyArray<readonly [number, number, number, number]> = [
  [1981, 7, 1, 1], [1982, 7, 1, 2], [1983, 7, 1, 3], [1985, 7, 1, 4], [1988, 1, 1, 5],
  [1990, 1, 1, 6], [1991, 1, 1, 7], [1992, 7, 1, 8], [1993, 7, 1, 9], [1994, 7, 1, 10],
  [1996, 1, 1, 11], [1997, 7, 1, 12], [1999, 1, 1, 13], [2006, 1, 1, 14], [2009, 1, 1, 15],
  [2012, 7, 1, 16], [2015, 7, 1, 17], [2017, 1, 1, 18],
];
const LEAP_STARTS_UTC_S = LEAP_TABLE.map(([y, m, d, n]) => ({
  utcS: secondsFromCalendar({ year: y, month: m, day: d, hour: 0, minute: 0, second: 0 }),
  leapS: n,
}));

/** GPS - UTC (s) at a UTC instant expressed as seconds since 1980-01-06 on the UTC calendar. */
export function leapSecondsAtUtc(utcS: number): number {
  let n = 0;
  for (const e of LEAP_STARTS_UTC_S) if (utcS >= e.utcS) n = e.leapS;
  return n;
}

/** GPS - UTC (s) at a GPS instant. */
export function leapSecondsAtGps(gpsS: number): number {
  let n = 0;
  for (const e of LEAP_STARTS_UTC_S) if (gpsS - e.leapS >= e.utcS) n = e.leapS;
  return n;
}

export function utcToGpsS(utcS: number): number {
  return utcS + leapSecondsAtUtc(utcS);
}

export function gpsToUtcS(gpsS: number): number {
  return gpsS - leapSecondsAtGps(gpsS);
}

/** GLONASS time = UTC(SU) + 3 h (GLONASS ICD). */
export function glonassToGpsS(glonassS: number): number {
  return utcToGpsS(glonassS - 3 * 3600);
}

export function gpsToGlonassS(gpsS: number): number {
  return gpsToUtcS(gpsS) + 3 * 3600;
}

export function bdtToGpsS(bdtS: number): number {
  return bdtS - BDT_MINUS_GPST_S;
}

export function gpsToBdtS(gpsS: number): number {
  return gpsS + BDT_MINUS_GPST_S;
}

/** Time systems that RINEX names in TIME OF FIRST OBS and nav records. */
export type TimeSystem = 'GPS' | 'GLO' | 'GAL' | 'BDT' | 'QZS' | 'IRN' | 'UTC' | 'TAI' | 'SBAS';

/**
 * Converts a calendar reading in the given time system to GPS seconds. GST and QZSST are GPS time;
 * IRNSS time is aligned with GPS time (IRNSS ICD); SBAS network time is GPS time; TAI = GPST + 19 s.
 */
export function toGpsS(calendarS: number, system: TimeSystem): number {
  switch (system) {
    case 'GPS': case 'GAL': case 'QZS': case 'IRN': case 'SBAS': return calendarS;
    case 'BDT': return bdtToGpsS(calendarS);
    case 'GLO': return glonassToGpsS(calendarS);
    case 'UTC': return utcToGpsS(calendarS);
    case 'TAI': return calendarS - 19;
  }
}

/** Decimal year of a GPS instant (for frame epochs), on the UTC calendar. */
export function decimalYearFromGpsS(gpsS: number): number {
  const c = calendarFromSeconds(gpsToUtcS(gpsS));
  const start = secondsFromCalendar({ year: c.year, month: 1, day: 1, hour: 0, minute: 0, second: 0 });
  const end = secondsFromCalendar({ year: c.year + 1, month: 1, day: 1, hour: 0, minute: 0, second: 0 });
  return c.year + (gpsToUtcS(gpsS) - start) / (end - start);
}

/** ISO 8601 text of a GPS instant on the GPS calendar ('2018-10-04T12:37:00.000' + suffix). */
export function isoFromSeconds(s: number, suffix = ''): string {
  const ms = Math.round(s * 1000);
  const c = calendarFromSeconds(Math.floor(ms / 1000));
  const frac = ms - Math.floor(ms / 1000) * 1000;
  const p = (n: number, w = 2) => String(n).padStart(w, '0');
  return `${p(c.year, 4)}-${p(c.month)}-${p(c.day)}T${p(c.hour)}:${p(c.minute)}:${p(Math.round(c.second))}.${p(frac, 3)}${suffix}`;
}

/**
 * The receiver week-rollover fault: data dated exactly 1024 weeks early. Returns true when `gpsS` is
 * before the GPS epoch + 1024 weeks yet the file was made after 2000 (caller passes a plausibility hint),
 * or generally when the date precedes 1999-08-22 for RINEX 3 files (format released 2007).
 */
export function looksLikeWeekRollover(gpsS: number, notBeforeGpsS: number): boolean {
  return gpsS < notBeforeGpsS && gpsS + 1024 * SECONDS_PER_WEEK >= notBeforeGpsS;
}
