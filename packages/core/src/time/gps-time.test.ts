import { describe, expect, it } from 'vitest';
import {
  calendarFromSeconds, gpsSFromWeekTow, gpsToUtcS, leapSecondsAtGps, resolveWeek, secondsFromCalendar,
  toGpsS, weekTowFromGpsS, wrapWeekS, decimalYearFromGpsS,
} from './gps-time.js';

describe('GPS time', () => {
  it('2000-01-01 20:45:00 GPST is week 1042, TOW 593100 s', () => {
    // check-values.md #8 (derived from the GPS epoch 1980-01-06, USNO GPS time notes)
    const s = secondsFromCalendar({ year: 2000, month: 1, day: 1, hour: 20, minute: 45, second: 0 });
    expect(weekTowFromGpsS(s)).toEqual({ week: 1042, towS: 593100 });
    expect(gpsSFromWeekTow(1042, 593100)).toBe(s);
  });
  it('calendar round trip', () => {
    for (const s of [0, 1e9 + 0.25, 1_222_776_000.99, 2e9]) {
      expect(secondsFromCalendar(calendarFromSeconds(s))).toBeCloseTo(s, 6);
    }
  });
  it('GPS - UTC is 18 s after 2017-01-01 and 17 s in 2016', () => {
    // IERS Bulletin C (check-values.md: GPS - UTC)
    const s2018 = secondsFromCalendar({ year: 2018, month: 10, day: 4, hour: 12, minute: 0, second: 0 });
    expect(leapSecondsAtGps(s2018)).toBe(18);
    const s2016 = secondsFromCalendar({ year: 2016, month: 6, day: 1, hour: 0, minute: 0, second: 0 });
    expect(leapSecondsAtGps(s2016)).toBe(17);
    expect(gpsToUtcS(s2018)).toBe(s2018 - 18);
  });
  it('BDT = GPST - 14 s and GLONASS = UTC + 3 h', () => {
    // check-values.md: BeiDou ICD, GLONASS ICD
    const g = secondsFromCalendar({ year: 2024, month: 1, day: 10, hour: 0, minute: 0, second: 0 });
    expect(toGpsS(g - 14, 'BDT')).toBe(g);
    expect(toGpsS(g - 18 + 3 * 3600, 'GLO')).toBe(g);
    expect(toGpsS(g - 18, 'UTC')).toBe(g);
    expect(toGpsS(g, 'GAL')).toBe(g);
  });
  it('resolves a modulo-1024 week and wraps week crossings', () => {
    // IS-GPS-200 20.3.3.3.1.1 (10-bit week) and 20.3.3.4.3 (tk wrap)
    const near = gpsSFromWeekTow(2022, 0);
    expect(resolveWeek(2022 % 1024, near)).toBe(2022);
    expect(wrapWeekS(604000 - 100)).toBe(604000 - 100 - 604800);
    expect(wrapWeekS(-400000)).toBe(204800);
  });
  it('decimal year', () => {
    const s = secondsFromCalendar({ year: 2018, month: 10, day: 4, hour: 12, minute: 0, second: 18 });
    expect(decimalYearFromGpsS(s)).toBeCloseTo(2018 + (276 + 0.5) / 365, 6);
  });
});
