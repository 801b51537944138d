/**
 * Nav reader on the small fixtures in fixtures/rinex/nav (records copied by hand from the public files
 * named in each comment; line numbers are those of the fixture unless said otherwise).
 * GPS-second values: GPS epoch 1980-01-06 (check-values.md "GPS epoch"); 2024-01-10 00:00 GPST is
 * week 2296 + 259200 s, 2018-10-04 06:00 GPST is week 2021 + 367200 s (derived from the GPS epoch, as
 * check-values.md #8).
 */
import { readFileSync } from 'node:fs';
import { describe, expect, it } from 'vitest';
import { fixturePath } from '../../../../test/support/shared.js';
import { FormatError, InputError, type Warning } from '../errors.js';
import type { GlonassEphemeris, KeplerEphemeris, NavData, SbasEphemeris } from '../gnss/nav-types.js';
import { mergeNav, parseNavLines, readNav } from './nav-reader.js';

const WEEK = 604800;

function fixtureText(name: string): string {
  return readFileSync(fixturePath(`rinex/nav/${name}`), 'latin1');
}

/** Yields the text in pieces of `size` characters, so chunk boundaries fall inside lines and numbers. */
async function* pieces(text: string, size: number): AsyncIterable<string> {
  for (let i = 0; i < text.length; i += size) yield text.substring(i, i + size);
}

async function read(name: string, text = fixtureText(name)): Promise<{ nav: NavData; warnings: Warning[] }> {
  const warnings: Warning[] = [];
  const nav = await readNav(name, pieces(text, 37), { onWarning: (w) => warnings.push(w) });
  return { nav, warnings };
}

const kepler = (nav: NavData, sat: string, k = 0) => nav.ephemerides.filter((e) => e.sat === sat)[k] as KeplerEphemeris;

describe('RINEX 2.10 GPS (.n)', () => {
  it('reads header and records (glw1277m.18n excerpt)', async () => {
    const { nav, warnings } = await read('glw1277m-excerpt.18n');
    expect(warnings).toEqual([]);
    expect(nav.version).toBe(2.1);
    expect(nav.ephemerides.map((e) => e.sat)).toEqual(['G25', 'G02', 'G05']);
    // ION ALPHA / ION BETA: values read from glw1277m.18n lines 3-4
    expect(nav.ionosphere.gps).toEqual({ alpha: [1.0245e-8, 7.4506e-9, -5.9605e-8, -5.9605e-8], beta: [8.8064e4, 0, -1.9661e5, -6.5536e4] });
    expect(nav.leapSeconds).toBe(18); // glw1277m.18n line 6
    // DELTA-UTC: A0,A1,T,W: glw1277m.18n line 5
    expect(nav.systemTimeOffsets?.[0]).toMatchObject({ code: 'GPUT', a0S: -4.656612873077e-9, a1SS: -1.33226762955e-14, refGpsS: 2021 * WEEK + 589824 });
    const g25 = kepler(nav, 'G25');
    // values read from glw1277m.18n lines 8-15
    expect(g25.tocGpsS).toBe(2021 * WEEK + 367200); // 2018-10-04 06:00:00 GPST
    expect(g25.af0).toBe(-6.56564719975e-4);
    expect(g25.iode).toBe(41);
    expect(g25.sqrtA).toBe(5.153591575623e3);
    expect(g25.e).toBe(7.479274529032e-3);
    expect(g25.toeSowS).toBe(367200);
    expect(g25.toeGpsS).toBe(2021 * WEEK + 367200);
    expect(g25.iodc).toBe(41);
    expect(g25.tgdS).toBe(5.587935447693e-9);
    expect(g25.transmitGpsS).toBe(2021 * WEEK + 359940);
    expect(g25.fitIntervalH).toBeNaN(); // 0 = not known (RINEX 2.11 table A4)
    expect(g25.message).toBe('');
    expect(g25.line).toBe(8);
  });
});

describe('RINEX 2.10 GLONASS (.g)', () => {
  it('reads state vectors in metres and channel numbers (glw1277m.18g excerpt)', async () => {
    const { nav, warnings } = await read('glw1277m-excerpt.18g');
    expect(warnings).toEqual([]);
    const [r1, r17, r2] = nav.ephemerides as GlonassEphemeris[];
    expect([r1!.sat, r17!.sat, r2!.sat]).toEqual(['R01', 'R17', 'R02']);
    // glw1277m.18g line 5: epoch 2018-10-04 06:15:00 UTC; GPS = UTC + 18 s (check-values.md "GPS - UTC")
    expect(r1!.tbGpsS).toBe(2021 * WEEK + 368100 + 18);
    expect(r1!.clockBiasS).toBe(3.29315662384e-5);
    expect(r1!.frameTimeS).toBe(21600);
    // glw1277m.18g lines 6-8, km -> m
    expect(r1!.posM[0]).toBeCloseTo(-14770020.50781, 4);
    expect(r1!.velMS[1]).toBeCloseTo(-2303.025245667, 6);
    expect(r1!.accMS2[1]).toBeCloseTo(-9.313225746155e-7, 15);
    expect(r1!.posM[2]).toBeCloseTo(19591456.05469, 4);
    expect([r1!.channel, r17!.channel, r2!.channel]).toEqual([1, 4, -4]); // lines 7, 11, 15 column 4
    expect(r1!.health).toBe(0);
  });
});

describe('RINEX 3.04 mixed (BRDC00IGS_R_20240100000_01D_MN.rnx excerpt)', () => {
  it('reads the header', async () => {
    const { nav, warnings } = await read('brdc-excerpt-3.04.rnx');
    expect(warnings).toEqual([]);
    expect(nav.version).toBe(3.04);
    // IONOSPHERIC CORR: fixture lines 5-9 (BRDC lines 82-86), first BDSA/BDSB pair lines 3-4
    expect(nav.ionosphere.gps).toEqual({ alpha: [2.2352e-8, 0, -5.9605e-8, 1.1921e-7], beta: [1.4541e5, -1.9661e5, 0, 1.9661e5] });
    expect(nav.ionosphere.galileo).toEqual([146.5, -0.63672, 2.533e-3]);
    expect(nav.ionosphere.qzss?.alpha[3]).toBe(1.1921e-6);
    expect(nav.ionosphere.beidou).toEqual({ alpha: [3.8184e-8, -6.7055e-8, -2.9802e-7, 5.9605e-7], beta: [1.1059e5, 2.2938e5, -1.9005e6, 1.9005e6] });
    expect(nav.leapSeconds).toBe(18);
    const corr = Object.fromEntries((nav.systemTimeOffsets ?? []).map((o) => [o.code, o]));
    expect(corr['GPUT']).toMatchObject({ a0S: -2.7939677238e-9, a1SS: -3.552713679e-15, refGpsS: 2296 * WEEK + 503808 });
    // BDUT reference week is a BDT week: BDT week 940 = GPS week 2296, BDT = GPST - 14 s (check-values.md "BeiDou time")
    expect(corr['BDUT']!.refGpsS).toBe(2296 * WEEK + 259145 + 14);
    expect(corr['GLUT']!.refGpsS).toBeNaN();
  });

  it('reads every system with its time scale and message', async () => {
    const { nav } = await read('brdc-excerpt-3.04.rnx');
    expect(nav.ephemerides.map((e) => `${e.sat}:${e.message}`)).toEqual(
      ['G01:', 'R01:', 'E02:FNAV', 'E02:INAV', 'C01:D2', 'C19:D1', 'J02:', 'I02:', 'S21:'],
    );
    const g01 = kepler(nav, 'G01');
    // BRDC lines 96-103
    expect(g01.sqrtA).toBe(5.154025251389e3);
    expect(g01.toeGpsS).toBe(2296 * WEEK + 259200);
    expect(g01.af0).toBe(1.656920649111e-4);
    expect(g01.accuracyM).toBe(2.8);
    expect(g01.health).toBe(63);
    expect(g01.fitIntervalH).toBe(4);
    expect(g01.transmitGpsS).toBe(2296 * WEEK + 252018);
    // Galileo data sources: 258 = bits 1, 8 -> F/NAV; 513 = bits 0, 9 -> I/NAV (RINEX 3.04 table A8); BRDC lines 8457, 8465
    const [eF, eI] = nav.ephemerides.filter((e) => e.sat === 'E02') as KeplerEphemeris[];
    expect([eF!.dataSource, eI!.dataSource]).toEqual([258, 513]);
    expect(eI!.tgd2S).toBe(-2.09547579288e-9);
    expect(eI!.iodc).toBeNaN();
    expect(eI!.toeGpsS).toBe(2296 * WEEK + 257400);
    // BeiDou: toc and toe are BDT; BDT week 940 + 1356 = GPS week 2296; BDT = GPST - 14 s (check-values.md "BeiDou time")
    const c01 = kepler(nav, 'C01');
    expect(c01.tocGpsS).toBe(2296 * WEEK + 259200 + 14);
    expect(c01.toeSowS).toBe(259200);
    expect(c01.toeGpsS).toBe(2296 * WEEK + 259200 + 14);
    expect(c01.tgdS).toBe(-5.40000000271e-9); // BRDC line 86730
    expect(c01.tgd2S).toBe(-9.8e-9);
    expect(c01.iodc).toBe(0); // AODC, BRDC line 86731
    // QZSS fit interval flag 0 -> 2 h (RINEX 3.04 table A12; IS-QZSS-PNT, from memory)
    const j02 = kepler(nav, 'J02');
    expect(j02.fitIntervalH).toBe(2);
    expect(j02.iodc).toBe(829);
    const i02 = kepler(nav, 'I02');
    expect(i02.tocGpsS).toBe(2296 * WEEK + 259200 - 9 * 60 - 36); // 2024-01-09 23:50:24, BRDC line 96180
    expect(i02.sqrtA).toBe(6.49329931259e3);
    // GLONASS epoch is UTC (RINEX 3.04 section 8.3.4): 2024-01-09 23:45:00 UTC + 18 s
    const r01 = nav.ephemerides.find((e) => e.sat === 'R01') as GlonassEphemeris;
    expect(r01.tbGpsS).toBe(2296 * WEEK + 258300 + 18);
    expect(r01.posM[0]).toBeCloseTo(9412895.996094, 4);
    expect(r01.channel).toBe(1);
    // SBAS (RINEX 3.04 table A16): BRDC lines 97324-97327
    const s21 = nav.ephemerides.find((e) => e.sat === 'S21') as SbasEphemeris;
    expect(s21.t0GpsS).toBe(2296 * WEEK + 2 * 86400 + 86352);
    expect(s21.transmitGpsS).toBe(2296 * WEEK + 259243);
    expect(s21.posM[0]).toBeCloseTo(42004684, 3);
    expect([s21.health, s21.accuracyM, s21.iodn]).toEqual([63, 32767, 189]);
  });
});

describe('RINEX 4.00 (hand-made fixture mixed-rinex4.00.rnx)', () => {
  it('reads EPH, ION, STO and EOP records and warns once about skipped types', async () => {
    const { nav, warnings } = await read('mixed-rinex4.00.rnx');
    expect(nav.version).toBe(4);
    expect(nav.ephemerides.map((e) => `${e.sat}:${e.message}`)).toEqual(['G01:LNAV', 'E02:INAV', 'C06:D1', 'R01:FDMA']);
    // the EPH bodies are the BRDC records: G01 sqrtA from BRDC line 98
    expect(kepler(nav, 'G01').sqrtA).toBe(5.154025251389e3);
    // C06: BDT week 940 toe 259200 -> GPS week 2296 + 14 s
    expect(kepler(nav, 'C06').toeGpsS).toBe(2296 * WEEK + 259200 + 14);
    const r01 = nav.ephemerides[3] as GlonassEphemeris;
    expect(r01.posM[1]).toBeCloseTo(-10708557.61719, 4);
    expect(nav.leapSeconds).toBe(18);
    expect(nav.ionosphere.gps).toEqual({ alpha: [2.2352e-8, 0, -5.9605e-8, 1.1921e-7], beta: [1.4541e5, -1.9661e5, 0, 1.9661e5] });
    expect(nav.ionosphere.galileo).toEqual([146.5, -0.63672, 2.533e-3]);
    expect(nav.ionosphere.beidou?.beta[3]).toBe(1.9005e6);
    const sto = nav.systemTimeOffsets?.[0];
    expect(sto).toMatchObject({ code: 'GPUT', a0S: -2.7939677238e-9, a1SS: -3.552713679e-15, sat: 'G01', message: 'LNAV', utcId: 'UTC(USNO)' });
    // STO epoch 2024-01-12 19:56:48 (Friday) = week 2296 + 503808 s; t_tm 503790
    expect(sto!.refGpsS).toBe(2296 * WEEK + 503808);
    expect(sto!.transmitGpsS).toBe(2296 * WEEK + 503790);
    const eop = nav.earthOrientation?.[0];
    expect(eop).toMatchObject({ xpArcsec: 0.0123, xpRateArcsecPerDay: 4.5e-4, ypArcsec: 0.3456, dut1S: -0.0123456, dut1RateSPerDay: 2e-4 });
    expect(eop!.transmitGpsS).toBe(2296 * WEEK + 259182);
    // CNAV: two records, one warning naming the first '>' line; the unknown 'XYZ' type: one warning
    const cnav = warnings.filter((w) => w.message.includes('CNAV'));
    expect(cnav).toHaveLength(1);
    const text = fixtureText('mixed-rinex4.00.rnx').split('\n');
    expect(text[cnav[0]!.line! - 1]).toBe('> EPH G02 CNAV');
    const xyz = warnings.filter((w) => w.message.includes("'XYZ'"));
    expect(xyz).toHaveLength(1);
    expect(text[xyz[0]!.line! - 1]).toBe('> XYZ G01 LNAV');
    expect(warnings).toHaveLength(2);
  });
});

describe('damaged input', () => {
  const base = fixtureText('brdc-excerpt-3.04.rnx').split('\n');

  it('skips a garbled record with a warning naming file and line, and keeps the others', async () => {
    const lines = [...base];
    const g01Orbit2 = lines.findIndex((l) => l.startsWith('G01')) + 2;
    lines[g01Orbit2] = lines[g01Orbit2]!.substring(0, 30) + 'xx' + lines[g01Orbit2]!.substring(32);
    const { nav, warnings } = await read('bad.rnx', lines.join('\n'));
    expect(nav.ephemerides).toHaveLength(8);
    expect(nav.ephemerides.some((e) => e.sat === 'G01')).toBe(false);
    expect(warnings).toHaveLength(1);
    expect(warnings[0]).toMatchObject({ file: 'bad.rnx', line: g01Orbit2 + 1, code: 'bad-number' });
  });

  it('skips a truncated record and an unknown system letter', async () => {
    const lines = [...base];
    const r01 = lines.findIndex((l) => l.startsWith('R01'));
    lines.splice(r01 + 2, 2); // GLONASS record cut to 2 lines
    const c19 = lines.findIndex((l) => l.startsWith('C19'));
    lines[c19] = 'X' + lines[c19]!.substring(1);
    const { nav, warnings } = await read('cut.rnx', lines.join('\n'));
    expect(nav.ephemerides.map((e) => e.sat)).toEqual(['G01', 'E02', 'E02', 'C01', 'J02', 'I02', 'S21']);
    expect(warnings.map((w) => [w.code, w.line])).toEqual([['truncated-record', r01 + 1], ['unknown-system', c19 + 1]]);
  });

  it('reads a file cut in the middle of the last record up to that record', async () => {
    const text = fixtureText('glw1277m-excerpt.18n');
    const { nav, warnings } = await read('cut.18n', text.substring(0, text.length - 200));
    expect(nav.ephemerides.map((e) => e.sat)).toEqual(['G25', 'G02']);
    expect(warnings[0]?.code).toBe('truncated-record');
  });

  it('short last lines and blank trailing fields give NaN, not a failure', async () => {
    const lines = [...base];
    const g01 = lines.findIndex((l) => l.startsWith('G01'));
    lines[g01 + 7] = lines[g01 + 7]!.substring(0, 23); // drop the fit interval
    lines[g01 + 6] = lines[g01 + 6]!.substring(0, 42); // drop TGD and IODC
    const { nav, warnings } = await read('short.rnx', lines.join('\n'));
    expect(warnings).toEqual([]);
    const e = kepler(nav, 'G01');
    expect(e.fitIntervalH).toBeNaN();
    expect(e.iodc).toBeNaN();
    expect(e.health).toBe(63);
  });

  it('places toe in the week of toc across a Saturday-midnight week change', async () => {
    // Hand-made: G01 of BRDC with toc moved to Sunday 2024-01-14 00:00:00 (week 2297, tow 0) while toe
    // stays at 604784 s with week 2297 (a writer that used the toc week). IS-GPS-200 20.3.3.4.3 half-week rule.
    const lines = [...base];
    const g01 = lines.findIndex((l) => l.startsWith('G01'));
    lines[g01] = 'G01 2024 01 14 00 00 00' + lines[g01]!.substring(23);
    lines[g01 + 3] = '     6.047840000000E+05' + lines[g01 + 3]!.substring(23);
    lines[g01 + 5] = lines[g01 + 5]!.substring(0, 42) + ' 2.297000000000E+03' + lines[g01 + 5]!.substring(61);
    const { nav } = await read('week.rnx', lines.join('\n'));
    const e = kepler(nav, 'G01');
    expect(e.tocGpsS).toBe(2297 * WEEK);
    expect(e.toeGpsS).toBe(2296 * WEEK + 604784);
  });

  it('rejects non-RINEX and observation files with one FormatError sentence', async () => {
    await expect(read('x.txt', 'hello world\nsecond line\n')).rejects.toThrow(FormatError);
    await expect(read('x.txt', '')).rejects.toThrow(/empty/);
    const obs = '     3.03           OBSERVATION DATA    M                   RINEX VERSION / TYPE\n';
    await expect(read('base.obs', obs)).rejects.toThrow(/observation file, not a navigation file/);
    const crx = '3.0                 COMPACT RINEX FORMAT                    CRINEX VERS   / TYPE\n';
    await expect(read('a.crx', crx)).rejects.toThrow(FormatError);
    const noEnd = base.slice(0, 5).join('\n');
    await expect(read('h.rnx', noEnd)).rejects.toThrow(InputError);
  });
});

describe('mergeNav', () => {
  it('concatenates records and keeps the first ionosphere and leap seconds', async () => {
    const a = (await read('glw1277m-excerpt.18g')).nav; // no ionosphere
    const b = (await read('glw1277m-excerpt.18n')).nav;
    const c = (await read('brdc-excerpt-3.04.rnx')).nav;
    const m = mergeNav([a, b, c]);
    expect(m.files).toEqual(['glw1277m-excerpt.18g', 'glw1277m-excerpt.18n', 'brdc-excerpt-3.04.rnx']);
    expect(m.ephemerides).toHaveLength(3 + 3 + 9);
    expect(m.ionosphere.gps).toEqual(b.ionosphere.gps);
    expect(m.ionosphere.galileo).toEqual(c.ionosphere.galileo);
    expect(m.leapSeconds).toBe(18);
    expect(m.systemTimeOffsets).toHaveLength((b.systemTimeOffsets?.length ?? 0) + (c.systemTimeOffsets?.length ?? 0));
  });

  it('parseNavLines gives the same as readNav', async () => {
    const text = fixtureText('glw1277m-excerpt.18n');
    const sync = parseNavLines('glw1277m-excerpt.18n', text.split('\n').slice(0, -1));
    expect(sync).toEqual((await read('glw1277m-excerpt.18n')).nav);
  });
});
