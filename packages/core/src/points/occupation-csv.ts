/**
 * User occupation windows, CSV (our format):
 *
 *   name,start,end,antenna_height_m,height_kind
 *   P1,2018-10-04T12:38:00Z,2018-10-04T12:45:00Z,1.500,vertical
 *   P2,2018-10-04 12:47:00 GPST,2018-10-04 12:55:00 GPST,1.62,slant
 *
 * - The header row is optional (recognised by its first field 'name'); the last two columns optional.
 * - Times: ISO 8601 'YYYY-MM-DDThh:mm:ss[.fff]' (a space may replace the T) in UTC, optionally with a
 *   'Z', 'UTC' or '+hh:mm'/'-hh:mm' offset; or GPS time with a 'GPST' suffix (no leap seconds
 *   applied). UTC is converted to GPS time with the leap-second table (time/gps-time.ts).
 * - Empty lines and lines starting with '#' are skipped. Errors name the file, line and column.
 * - Two windows that overlap (one starts before the other ends) are a warning naming both: the epochs
 *   between are counted in both points (window-names.ts), which a rover standing on one point cannot be.
 *   Windows that only touch (one ends when the next starts) are not.
 */
import { InputError, type WarningSink } from '../errors.js';
import { secondsFromCalendar, utcToGpsS } from '../time/index.js';
import type { HeightKind } from './antenna-height.js';
import { csvRecords } from '../csv/index.js';

export interface OccupationWindow {
  readonly name: string;
  readonly startGpsS: number;
  readonly endGpsS: number;
  readonly antennaHeightM?: number;
  readonly heightKind?: HeightKind;
}

const ISO = /^(\d{4})-(\d{2})-(\d{2})[T ](\d{2}):(\d{2}):(\d{2}(?:\.\d+)?)\s*(Z|UTC|GPST|[+-]\d{2}:?\d{2})?$/i;

/** GPS seconds of an ISO time as described above; undefined when it does not parse. */
export function parseIsoTimeGpsS(text: string): number | undefined {
  const m = ISO.exec(text.trim());
  if (!m) return undefined;
  const [, y, mo, d, h, mi, s, zone] = m;
  const month = Number(mo), day = Number(d), hour = Number(h), minute = Number(mi), second = Number(s);
  if (month < 1 || month > 12 || day < 1 || day > 31 || hour > 23 || minute > 59 || second >= 61) return undefined;
  const cal = secondsFromCalendar({ year: Number(y), month, day, hour, minute, second });
  const z = (zone ?? '').toUpperCase();
  if (z === 'GPST') return cal;
  let offsetS = 0;
  if (z.startsWith('+') || z.startsWith('-')) {
    const digits = z.slice(1).replace(':', '');
    offsetS = (z.startsWith('-') ? -1 : 1) * (Number(digits.slice(0, 2)) * 3600 + Number(digits.slice(2)) * 60);
  }
  return utcToGpsS(cal - offsetS);
}

/** A window as read, with its line and its times as written, for the overlap warning. */
interface ReadWindow {
  readonly window: OccupationWindow;
  readonly line: number;
  readonly startText: string;
  readonly endText: string;
}

/** One warning per pair of overlapping windows, at the later-starting one's line. */
function warnOverlaps(file: string, read: readonly ReadWindow[], onWarning: WarningSink): void {
  const sorted = [...read].sort((a, b) => a.window.startGpsS - b.window.startGpsS || a.line - b.line);
  sorted.forEach((a, i) => {
    for (const b of sorted.slice(i + 1)) {
      if (b.window.startGpsS >= a.window.endGpsS) break;
      const endsFirst = a.window.endGpsS <= b.window.endGpsS ? a : b;
      const seconds = endsFirst.window.endGpsS - b.window.startGpsS;
      const what = (r: ReadWindow) => `${r.window.name} (line ${r.line}, ${r.startText.trim()} to ${r.endText.trim()})`;
      onWarning({
        file, line: b.line, code: 'windows-overlap',
        message: `the windows ${what(a)} and ${what(b)} overlap from ${b.startText.trim()} to ${endsFirst.endText.trim()} (${seconds.toFixed(seconds % 1 ? 1 : 0)} s), ` +
          'so the epochs of that time are counted in both points: end the first window before the second starts',
      });
    }
  });
}

/** The windows of the file; `onWarning` is told of windows that overlap (see above). */
export function parseOccupationCsv(file: string, text: string, onWarning?: WarningSink): OccupationWindow[] {
  const out: OccupationWindow[] = [];
  const read: ReadWindow[] = [];
  let sawData = false;
  for (const { lineNo, fields: f } of csvRecords(text)) {
    if (!sawData && f[0]!.toLowerCase() === 'name') {
      sawData = true;
      continue;
    }
    sawData = true;
    if (f.length < 3 || f.length > 5) {
      throw new InputError(file, lineNo, `expected 3 to 5 columns (name,start,end[,antenna_height_m,height_kind]), found ${f.length}`);
    }
    const [name, startText, endText, hText, kindText] = f as [string, string, string, string?, string?];
    if (name === '') throw new InputError(file, lineNo, 'column name: expected a point name');
    const startGpsS = parseIsoTimeGpsS(startText);
    if (startGpsS === undefined) throw new InputError(file, lineNo, `column start: expected an ISO time like 2018-10-04T12:38:00Z or '2018-10-04 12:38:00 GPST', found '${startText}'`);
    const endGpsS = parseIsoTimeGpsS(endText);
    if (endGpsS === undefined) throw new InputError(file, lineNo, `column end: expected an ISO time like 2018-10-04T12:45:00Z or '2018-10-04 12:45:00 GPST', found '${endText}'`);
    if (!(endGpsS > startGpsS)) throw new InputError(file, lineNo, 'column end: expected a time after start');
    let antennaHeightM: number | undefined;
    if (hText !== undefined && hText !== '') {
      antennaHeightM = Number(hText);
      if (!Number.isFinite(antennaHeightM) || antennaHeightM < 0 || antennaHeightM > 100) {
        throw new InputError(file, lineNo, `column antenna_height_m: expected a height in metres (0-100), found '${hText}'`);
      }
    }
    let heightKind: HeightKind | undefined;
    if (kindText !== undefined && kindText !== '') {
      const k = kindText.toLowerCase();
      if (k !== 'vertical' && k !== 'slant') throw new InputError(file, lineNo, `column height_kind: expected 'vertical' or 'slant', found '${kindText}'`);
      heightKind = k;
    }
    const window: OccupationWindow = { name, startGpsS, endGpsS, ...(antennaHeightM !== undefined ? { antennaHeightM, heightKind: heightKind ?? 'vertical' } : {}) };
    out.push(window);
    read.push({ window, line: lineNo, startText, endText });
  }
  if (onWarning) warnOverlaps(file, read, onWarning);
  return out;
}
