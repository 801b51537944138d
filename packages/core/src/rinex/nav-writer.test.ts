/**
 * RINEX 3.04 writer: read -> write -> read gives the same values (the fixtures are records copied from
 * public IGS / EUREF files, see nav-reader.test.ts), and random values survive to 12 significant digits
 * (D19.12 prints 13, RINEX 3.04 table A6).
 */
import { readFileSync } from 'node:fs';
import fc from 'fast-check';
import { describe, expect, it } from 'vitest';
import { fixturePath } from '../../../../test/support/shared.js';
import type { Warning } from '../errors.js';
import type { Ephemeris, KeplerEphemeris, NavData } from '../gnss/nav-types.js';
import { parseNavLines } from './nav-reader.js';
import { writeNavRinex3 } from './nav-writer.js';

function readFixture(name: string): NavData {
  return parseNavLines(name, readFileSync(fixturePath(`rinex/nav/${name}`), 'latin1').split('\n'));
}

function rewrite(nav: NavData): { nav: NavData; text: string; warnings: Warning[] } {
  const text = [...writeNavRinex3(nav, { date: '20240111 000000 UTC' })].join('');
  const warnings: Warning[] = [];
  return { nav: parseNavLines('written.rnx', text.split('\n'), { onWarning: (w) => warnings.push(w) }), text, warnings };
}

/** Record values without where they came from (and without the RINEX 4 message, which RINEX 3 does not carry for G/J/I/R/S). */
function values(e: Ephemeris, dropMessage = false): Record<string, unknown> {
  const { file: _f, line: _l, ...rest } = e;
  const out: Record<string, unknown> = rest;
  if (dropMessage && e.system !== 'E' && e.system !== 'C') delete out['message'];
  return out;
}

describe('writeNavRinex3 round trip', () => {
  for (const name of ['glw1277m-excerpt.18n', 'glw1277m-excerpt.18g', 'brdc-excerpt-3.04.rnx', 'mixed-rinex4.00.rnx']) {
    it(`${name}: same values after write and read`, () => {
      const a = readFixture(name);
      const { nav: b, warnings } = rewrite(a);
      expect(warnings).toEqual([]);
      expect(b.version).toBe(3.04);
      const rinex4 = a.version >= 4;
      expect(b.ephemerides.map((e) => values(e, rinex4))).toEqual(a.ephemerides.map((e) => values(e, rinex4)));
      expect(b.ionosphere).toEqual(a.ionosphere);
      expect(b.leapSeconds).toBe(a.leapSeconds);
      // TIME SYSTEM CORR prints A0 as D17.10 and A1 as D16.9 (RINEX 3.04 table A5): 11 and 10 digits
      const oa = a.systemTimeOffsets ?? [];
      const ob = b.systemTimeOffsets ?? [];
      expect(ob.map((o) => o.code)).toEqual(oa.map((o) => o.code));
      ob.forEach((o, k) => {
        expect(Math.abs(o.a0S - oa[k]!.a0S)).toBeLessThanOrEqual(Math.abs(oa[k]!.a0S) * 1e-10);
        expect(Math.abs(o.a1SS - oa[k]!.a1SS)).toBeLessThanOrEqual(Math.abs(oa[k]!.a1SS) * 1e-9);
        expect(o.refGpsS).toEqual(oa[k]!.refGpsS);
      });
    });
  }

  it('writes the layout of RINEX 3.04 (header labels at column 61, records as in IGS files)', () => {
    const { text } = rewrite(readFixture('brdc-excerpt-3.04.rnx'));
    const lines = text.split('\n');
    expect(lines[0]).toBe('     3.04           N: GNSS NAV DATA    M: MIXED            RINEX VERSION / TYPE');
    expect(lines.find((l) => l.startsWith('GPSA'))).toBe('GPSA   2.2352E-08  0.0000E+00 -5.9605E-08  1.1921E-07       IONOSPHERIC CORR');
    expect(lines.find((l) => l.includes('LEAP SECONDS'))!.substring(0, 6)).toBe('    18');
    // the G01 record as printed in BRDC00IGS_R_20240100000_01D_MN.rnx lines 96-99
    const g = lines.findIndex((l) => l.startsWith('G01'));
    expect(lines[g]).toBe('G01 2024 01 10 00 00 00 1.656920649111E-04 9.094947017729E-13 0.000000000000E+00');
    expect(lines[g + 3]).toBe('     2.592000000000E+05-7.823109626770E-08-1.736225857873E+00 8.940696716309E-08');
    // the C01 epoch is written back in BDT (BRDC line 86724)
    expect(lines.find((l) => l.startsWith('C01'))!.substring(0, 23)).toBe('C01 2024 01 10 00 00 00');
  });

  it('random Kepler values survive to 12 significant digits', () => {
    const base = readFixture('brdc-excerpt-3.04.rnx').ephemerides.filter((e): e is KeplerEphemeris => e.kind === 'kepler');
    const real = fc.double({ min: -1e6, max: 1e6, noNaN: true, noDefaultInfinity: true });
    fc.assert(
      fc.property(fc.constantFrom(...base), fc.array(real, { minLength: 8, maxLength: 8 }), (e, r) => {
        const mod: KeplerEphemeris = {
          ...e, af0: r[0]! * 1e-9, af1: r[1]! * 1e-15, crs: r[2]!, deltaN: r[3]! * 1e-14, m0: r[4]! / 1e6,
          cuc: r[5]! * 1e-12, omegaDot: r[6]! * 1e-15, idot: r[7]! * 1e-16,
        };
        const nav: NavData = { files: ['sim'], version: 3.04, ephemerides: [mod], ionosphere: {}, leapSeconds: 18 };
        const back = rewrite(nav).nav.ephemerides[0] as KeplerEphemeris;
        for (const k of ['af0', 'af1', 'crs', 'deltaN', 'm0', 'cuc', 'omegaDot', 'idot'] as const) {
          const want = mod[k];
          expect(Math.abs(back[k] - want)).toBeLessThanOrEqual(Math.abs(want) * 1e-12 + 1e-99);
        }
        expect(back.toeGpsS).toBe(e.toeGpsS);
        expect(back.tocGpsS).toBe(e.tocGpsS);
      }),
      { numRuns: 200 },
    );
  });
});
