/**
 * The navigation reader's character-code number parser (rinex/nav-fields.ts fortranRealIn, used by
 * realAt) against the regex + Number() parser it replaces (parseFortranReal, kept as its fallback), on
 * every field position of every line of every real navigation file in ../shared/data (never
 * walking-run/), and on random Fortran reals: the same double, sign of zero included, or the same
 * verdict (blank, garbage).
 */
import { readdirSync } from 'node:fs';
import { join } from 'node:path';
import { gunzipSync } from 'node:zlib';
import { describe, expect, it } from 'vitest';
import fc from 'fast-check';
import { dataPath, describeShared, fileBytes } from './support/shared.js';
import { fortranRealIn, parseFortranReal, realAt } from '../packages/core/src/rinex/nav-fields.js';

/** realAt as it was: substring, regex, Number(); 'bad' where it threw. */
function oldRealAt(text: string, start: number, width: number): number | 'bad' {
  if (start >= text.length) return NaN;
  const v = parseFortranReal(text.substring(start, start + width));
  return v === undefined ? 'bad' : v;
}

function newRealAt(text: string, start: number, width: number): number | 'bad' {
  try {
    return realAt(text, start, width, 1);
  } catch {
    return 'bad';
  }
}

const NAV_FILES = [
  ...readdirSync(dataPath('single-station')).filter((f) => /_MN\.rnx(\.gz)?$|\.\d\d[ng]\.gz$/.test(f)).map((f) => `single-station/${f}`),
  ...readdirSync(dataPath('cors-and-rover-2018-277/reference')).filter((f) => /\.\d\d[ng]$/.test(f)).map((f) => `cors-and-rover-2018-277/reference/${f}`),
];

/** Field starts of RINEX 2 (3X,4D19.12) and RINEX 3 (4X,4D19.12) records, and RINEX 2 epoch seconds (F5.1). */
const FIELDS: [number, number][] = [[3, 19], [22, 19], [41, 19], [60, 19], [4, 19], [23, 19], [42, 19], [61, 19], [17, 5]];

describeShared('navigation numbers by character codes equal the regex parser on the real files', () => {
  it('finds the navigation files', () => expect(NAV_FILES.length).toBeGreaterThanOrEqual(10));
  for (const rel of NAV_FILES) {
    it(rel, () => {
      const bytes = fileBytes(dataPath(rel));
      const lines = Buffer.from(rel.endsWith('.gz') ? gunzipSync(bytes) : bytes).toString('latin1').split('\n');
      // Where the fast parser gives no number, realAt falls back to the regex parser itself: only the
      // fields it reads need checking (every field position of every line, header and records).
      let numbers = 0;
      for (const [n, line] of lines.entries()) {
        for (const [start, width] of FIELDS) {
          if (start >= line.length) continue;
          const got = fortranRealIn(line, start, Math.min(line.length, start + width));
          if (got === null) continue;
          const want = oldRealAt(line, start, width);
          if (!Object.is(got, want)) expect({ rel, line: n + 1, start, got }).toEqual({ rel, line: n + 1, start, got: want });
          numbers++;
        }
      }
      expect(numbers).toBeGreaterThan(100);
    });
  }
});

describe('navigation numbers by character codes equal the regex parser on random Fortran reals (self-consistency)', () => {
  it('random mantissas, exponents (D, d, E, e), signs, blanks and garbage', () => {
    const digits = fc.string({ unit: fc.constantFrom('0', '1', '2', '5', '7', '9'), maxLength: 18 });
    const real = fc.tuple(
      fc.constantFrom('', ' ', '   '), fc.constantFrom('', '-', '+'), digits, fc.constantFrom('', '.'), digits,
      fc.constantFrom('', 'D', 'd', 'E', 'e', 'D+', 'D-', 'E-', 'x'), fc.string({ unit: fc.constantFrom('0', '1', '2', '3', '9'), maxLength: 3 }),
      fc.constantFrom('', ' ', '  ', '\t', '.'),
    ).map((p) => p.join(''));
    fc.assert(fc.property(real, (s) => {
      const field = s.slice(0, 19);
      const want = oldRealAt(field, 0, 19), got = newRealAt(field, 0, 19);
      expect(Object.is(got, want), `'${field}': ${String(got)} vs ${String(want)}`).toBe(true);
    }), { numRuns: 20_000 });
  });

  it('the exact range: 15-digit mantissas at exponents -22..22', () => {
    for (let e = -30; e <= 30; e++) {
      const t = `-0.123456789012345D${e < 0 ? '-' : '+'}${String(Math.abs(e)).padStart(2, '0')}`;
      expect(Object.is(fortranRealIn(t, 0, t.length) ?? Number(t.replace('D', 'E')), Number(t.replace('D', 'E'))), t).toBe(true);
    }
  });
});
