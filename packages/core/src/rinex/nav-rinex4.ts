/**
 * RINEX 4.00 navigation records other than ephemerides: ION (ionosphere), STO (system time offset) and
 * EOP (Earth orientation). Layouts from RINEX 4.00 section 5.4 and tables A32-A36 (from memory of the
 * standard; all data fields are 4X,4D19.12 as in the EPH bodies):
 *   ION LNAV / D1D2 / CNVX (Klobuchar): epoch, alpha0-2 | alpha3, beta0-2 | beta3, region
 *   ION IFNV (NeQuick G):               epoch, ai0-2   | disturbance flags
 *   STO: epoch, time-difference code, SBAS id, UTC id (A19 each from column 24) | t_tm, A0, A1, A2
 *   EOP: epoch, xp, dxp/dt, dxp/dt2 | (blank), yp, dyp/dt, dyp/dt2 | t_tm, dUT1, dUT1/dt, dUT1/dt2
 * Record epochs are in the broadcasting system's time (BDT for BDS, UTC for GLONASS, GPS time otherwise).
 */
import { bdtToGpsS, secondsFromCalendar, utcToGpsS } from '../time/index.js';
import type { GnssSystem, SatId } from '../gnss/index.js';
import type { EarthOrientation, KlobucharCoefficients, SystemTimeOffset } from '../gnss/index.js';
import { epochRinex3, NavRecordProblem, realAt } from './nav-fields.js';
import { weekTimeNear, type RawNavRecord } from './nav-records.js';

function row(rec: RawNavRecord, k: number): [number, number, number, number] {
  const line = rec.lines[k];
  const n = rec.firstLine + k;
  if (line === undefined) throw new NavRecordProblem(rec.firstLine, 'truncated-record', `record skipped: expected at least ${k + 1} lines after the '>' line`);
  // The first line holds the epoch where the other lines hold their first field.
  const first = k === 0 ? NaN : realAt(line, 4, 19, n);
  return [first, realAt(line, 23, 19, n), realAt(line, 42, 19, n), realAt(line, 61, 19, n)];
}

function epochGpsS(rec: RawNavRecord, system: GnssSystem): number {
  const s = secondsFromCalendar(epochRinex3(rec.lines[0] ?? '', rec.firstLine));
  if (system === 'C') return bdtToGpsS(s);
  if (system === 'R') return utcToGpsS(s);
  return s;
}

function finite(values: readonly number[], what: string, lineNo: number): void {
  if (values.some((v) => !Number.isFinite(v))) throw new NavRecordProblem(lineNo, 'missing-field', `expected ${what}, a field is blank`);
}

export type IonRecord =
  | { readonly key: 'gps' | 'qzss' | 'beidou'; readonly klobuchar: KlobucharCoefficients }
  | { readonly key: 'galileo'; readonly nequick: readonly [number, number, number] };

/** ION record; null when the model is not one this reader keeps (e.g. BDGIM 'CNVX' from BDS). */
export function parseIonRecord(rec: RawNavRecord, system: GnssSystem, message: string): IonRecord | null {
  epochGpsS(rec, system);
  if (system === 'E' && message === 'IFNV') {
    const [, a0, a1, a2] = row(rec, 0);
    finite([a0, a1, a2], 'ai0, ai1, ai2', rec.firstLine);
    return { key: 'galileo', nequick: [a0, a1, a2] };
  }
  const klobuchar = (system === 'G' || system === 'J') && (message === 'LNAV' || message === 'CNVX') || (system === 'C' && message === 'D1D2');
  if (!klobuchar) return null;
  const [, al0, al1, al2] = row(rec, 0);
  const [al3, b0, b1, b2] = row(rec, 1);
  const [b3] = row(rec, 2);
  finite([al0, al1, al2, al3, b0, b1, b2, b3], 'alpha0-3 and beta0-3', rec.firstLine);
  return { key: system === 'G' ? 'gps' : system === 'J' ? 'qzss' : 'beidou', klobuchar: { alpha: [al0, al1, al2, al3], beta: [b0, b1, b2, b3] } };
}

export function parseStoRecord(rec: RawNavRecord, file: string, sat: SatId, system: GnssSystem, message: string): SystemTimeOffset {
  const refGpsS = epochGpsS(rec, system);
  const l0 = rec.lines[0] ?? '';
  const code = l0.substring(23, 42).trim();
  if (code === '') throw new NavRecordProblem(rec.firstLine, 'missing-field', 'expected a time-difference code (e.g. GPUT) from column 25');
  const [ttm, a0, a1, a2] = row(rec, 1);
  finite([a0, a1], 'A0 and A1', rec.firstLine + 1);
  return {
    code, a0S: a0, a1SS: a1, a2SS2: Number.isFinite(a2) ? a2 : 0, refGpsS,
    transmitGpsS: Number.isFinite(ttm) ? weekTimeNear(NaN, ttm, refGpsS) : NaN,
    sat, message, sbasId: l0.substring(42, 61).trim(), utcId: l0.substring(61, 80).trim(),
    file, line: rec.firstLine,
  };
}

export function parseEopRecord(rec: RawNavRecord, file: string, sat: SatId, system: GnssSystem, message: string): EarthOrientation {
  const refGpsS = epochGpsS(rec, system);
  const [, xp, xpr, xpa] = row(rec, 0);
  const [, yp, ypr, ypa] = row(rec, 1);
  const [ttm, dut1, dut1r, dut1a] = row(rec, 2);
  finite([xp, yp, dut1], 'xp, yp and dUT1', rec.firstLine);
  return {
    sat, message, refGpsS,
    transmitGpsS: Number.isFinite(ttm) ? weekTimeNear(NaN, ttm, refGpsS) : NaN,
    xpArcsec: xp, xpRateArcsecPerDay: xpr, xpAccelArcsecPerDay2: xpa,
    ypArcsec: yp, ypRateArcsecPerDay: ypr, ypAccelArcsecPerDay2: ypa,
    dut1S: dut1, dut1RateSPerDay: dut1r, dut1AccelSPerDay2: dut1a,
    file, line: rec.firstLine,
  };
}
