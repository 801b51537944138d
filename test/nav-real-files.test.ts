/**
 * Navigation readers on the real files in ../shared/data (never walking-run/). Each expected value was
 * read by eye from the file at the line named; record counts were counted with grep on the record
 * start lines (RINEX 3: lines starting with the system letter, less header lines such as GPSA/GAL;
 * RINEX 2: lines starting with the I2 PRN). GPS seconds: check-values.md "GPS epoch" (1980-01-06),
 * BDT = GPST - 14 s and BDT week = GPS week - 1356 ("BeiDou time"), GPS - UTC = 18 s since 2017 and 16 s
 * in 2013 ("GPS - UTC", IERS Bulletin C).
 */
import { gunzipSync } from 'node:zlib';
import { beforeAll, expect, it } from 'vitest';
import { dataPath, describeShared, fileBytes } from './support/shared.js';
import type { Warning } from '../packages/core/src/errors.js';
import { mergeNav, readNav } from '../packages/core/src/rinex/nav-reader.js';
import type { Ephemeris, GlonassEphemeris, KeplerEphemeris, NavData, SbasEphemeris } from '../packages/core/src/gnss/nav-types.js';

const WEEK = 604800;

async function* once(s: string): AsyncIterable<string> {
  yield s;
}

async function load(rel: string): Promise<{ nav: NavData; warnings: Warning[] }> {
  const bytes = fileBytes(dataPath(rel));
  const text = new TextDecoder('latin1').decode(rel.endsWith('.gz') ? gunzipSync(bytes) : bytes);
  const warnings: Warning[] = [];
  const nav = await readNav(rel, once(text), { onWarning: (w) => warnings.push(w) });
  return { nav, warnings };
}

function countBySystem(eph: readonly Ephemeris[]): Record<string, number> {
  const c: Record<string, number> = {};
  for (const e of eph) c[e.system] = (c[e.system] ?? 0) + 1;
  return c;
}

const at = <T extends Ephemeris>(nav: NavData, line: number) => nav.ephemerides.find((e) => e.line === line) as T;

describeShared('cors-and-rover-2018-277 reference RINEX 2.10 nav files', () => {
  const hours = ['m', 'n', 'o', 'p', 'q', 'r'];
  const gpsCounts = [61, 58, 60, 56, 58, 56];
  const gloCounts = [42, 43, 42, 43, 43, 45];

  it('every hourly .18n and .18g parses without warnings, with the counted records', async () => {
    const parts: NavData[] = [];
    for (const [k, h] of hours.entries()) {
      const n = await load(`cors-and-rover-2018-277/reference/glw1277${h}.18n`);
      const g = await load(`cors-and-rover-2018-277/reference/glw1277${h}.18g`);
      expect(n.warnings).toEqual([]);
      expect(g.warnings).toEqual([]);
      expect(countBySystem(n.nav.ephemerides)).toEqual({ G: gpsCounts[k] });
      expect(countBySystem(g.nav.ephemerides)).toEqual({ R: gloCounts[k] });
      parts.push(n.nav, g.nav);
    }
    const all = mergeNav(parts);
    expect(all.ephemerides).toHaveLength(349 + 258);
    expect(all.files).toHaveLength(12);
  });

  it('GPS values (glw1277m.18n)', async () => {
    const { nav } = await load('cors-and-rover-2018-277/reference/glw1277m.18n');
    // ION ALPHA / ION BETA: lines 3-4; LEAP SECONDS line 6
    expect(nav.ionosphere.gps?.alpha).toEqual([1.0245e-8, 7.4506e-9, -5.9605e-8, -5.9605e-8]);
    expect(nav.ionosphere.gps?.beta).toEqual([8.8064e4, 0, -1.9661e5, -6.5536e4]);
    expect(nav.leapSeconds).toBe(18);
    // PRN 5, lines 24-31: toc 2018-10-04 08:00 GPST = week 2021 + 374400 s
    const g05 = at<KeplerEphemeris>(nav, 24);
    expect(g05.sat).toBe('G05');
    expect(g05.tocGpsS).toBe(2021 * WEEK + 374400);
    expect(g05.af0).toBe(-1.304782927036e-6);
    expect(g05.sqrtA).toBe(5.153798015594e3);
    expect(g05.e).toBe(5.672852159478e-3);
    expect(g05.toeGpsS).toBe(2021 * WEEK + 3.744e5);
  });

  it('GLONASS values (glw1277m.18g, glw1277r.18g): channels and metres', async () => {
    const m = (await load('cors-and-rover-2018-277/reference/glw1277m.18g')).nav;
    const channels = new Map(m.ephemerides.map((e) => [e.sat, (e as GlonassEphemeris).channel]));
    // lines 7, 11, 15, 23: frequency numbers of slots 1, 17, 2, 9
    expect([channels.get('R01'), channels.get('R17'), channels.get('R02'), channels.get('R09')]).toEqual([1, 4, -4, -2]);
    const r = (await load('cors-and-rover-2018-277/reference/glw1277r.18g')).nav;
    // glw1277r.18g lines 5-8: slot 4, 2018-10-04 10:45:00 UTC, X -1.275872167969D+04 km, channel 6
    const r04 = at<GlonassEphemeris>(r, 5);
    expect(r04.sat).toBe('R04');
    expect(r04.tbGpsS).toBe(2021 * WEEK + 4 * 86400 + 10 * 3600 + 45 * 60 + 18);
    expect(r04.posM[0]).toBeCloseTo(-12758721.67969, 4);
    expect(r04.velMS[0]).toBeCloseTo(-2622.618675232, 6);
    expect(r04.posM[2]).toBeCloseTo(19352993.65234, 4);
    expect(r04.channel).toBe(6);
  });
});

describeShared('single-station RINEX 2 broadcast files (brdc0100.24n/g.gz)', () => {
  it('GPS: 402 records, header and first record', async () => {
    const { nav, warnings } = await load('single-station/brdc0100.24n.gz');
    expect(warnings).toEqual([]);
    expect(countBySystem(nav.ephemerides)).toEqual({ G: 402 });
    // lines 4-5 (ION ALPHA/BETA with '0.' mantissas), line 7 LEAP SECONDS
    expect(nav.ionosphere.gps).toEqual({ alpha: [0.2235e-7, 0, -0.596e-7, 0.1192e-6], beta: [0.1454e6, -0.1966e6, 0, 0.1966e6] });
    expect(nav.leapSeconds).toBe(18);
    // lines 9-16: PRN 1, 2024-01-10 00:00 GPST
    const g01 = at<KeplerEphemeris>(nav, 9);
    expect(g01.sat).toBe('G01');
    expect(g01.tocGpsS).toBe(2296 * WEEK + 259200);
    expect(g01.sqrtA).toBe(0.515402525139e4);
    expect(g01.accuracyM).toBe(0.282842707634e1);
  });

  it('GLONASS: 1198 records and CORR TO SYSTEM TIME', async () => {
    const { nav, warnings } = await load('single-station/brdc0100.24g.gz');
    expect(warnings).toEqual([]);
    expect(countBySystem(nav.ephemerides)).toEqual({ R: 1198 });
    // line 8: slot 1, 2024-01-10 00:15 UTC; line 9 X = 0.141816733398D+05 km
    const r01 = at<GlonassEphemeris>(nav, 8);
    expect(r01.tbGpsS).toBe(2296 * WEEK + 259200 + 900 + 18);
    expect(r01.posM[0]).toBeCloseTo(14181673.3398, 4);
    expect(r01.channel).toBe(1);
    expect(nav.systemTimeOffsets?.[0]).toMatchObject({ code: 'GLUT', a0S: 0 }); // line 5
  });
});

describeShared('BRDC00IGS_R_20240100000_01D_MN.rnx.gz (RINEX 3.04, 142119 lines)', () => {
  let nav: NavData;
  let warnings: Warning[];
  beforeAll(async () => {
    ({ nav, warnings } = await load('single-station/BRDC00IGS_R_20240100000_01D_MN.rnx.gz'));
  });

  it('parses without warnings, with the counted records per system', () => {
    expect(warnings).toEqual([]);
    expect(countBySystem(nav.ephemerides)).toEqual({ G: 435, R: 1219, E: 9784, C: 1082, J: 100, I: 143, S: 11199 });
    const msg = (sys: string, m: string) => nav.ephemerides.filter((e) => e.system === sys && e.message === m).length;
    expect(msg('E', 'INAV') + msg('E', 'FNAV')).toBe(9784);
    expect(msg('C', 'D2') + msg('C', 'D1')).toBe(1082);
  });

  it('header: ionosphere, leap seconds', () => {
    expect(nav.ionosphere.galileo).toEqual([146.5, -0.63672, 2.533e-3]); // line 82
    expect(nav.ionosphere.qzss?.beta).toEqual([1.024e5, 0, -8.5197e5, 8.3231e6]); // line 86
    expect(nav.ionosphere.beidou?.alpha).toEqual([3.8184e-8, -6.7055e-8, -2.9802e-7, 5.9605e-7]); // line 3
    expect(nav.leapSeconds).toBe(18); // line 94
  });

  it('a BeiDou record: toe in BDT week 940 -> GPS seconds', () => {
    // lines 94404-94411: C45, toc 2024-01-10 00:00:00 BDT, toe 259200, BDT week 940
    const c45 = at<KeplerEphemeris>(nav, 94404);
    expect(c45.sat).toBe('C45');
    expect(c45.message).toBe('D1');
    expect(c45.toeGpsS).toBe((940 + 1356) * WEEK + 259200 + 14);
    expect(c45.tocGpsS).toBe(c45.toeGpsS);
    expect(c45.sqrtA).toBe(5.28261163139e3);
    expect(c45.af0).toBe(-6.1810365878e-5);
    expect([c45.tgdS, c45.tgd2S, c45.iodc]).toEqual([1.87999997792e-8, 1.88e-8, 1]);
  });

  it('the last record of the file (SBAS S58, lines 142116-142119)', () => {
    const s58 = nav.ephemerides[nav.ephemerides.length - 1] as SbasEphemeris;
    expect(s58.line).toBe(142116);
    expect(s58.sat).toBe('S58');
    expect(s58.posM[0]).toBeCloseTo(24783458, 3);
    expect(s58.posM[1]).toBeCloseTo(-34111504, 3);
    expect(s58.iodn).toBe(132);
  });
});

describeShared('other RINEX 3 multi-GNSS nav files', () => {
  it('CEDA00USA_R_20182100000_01D_MN.rnx.gz: Galileo only', async () => {
    const { nav, warnings } = await load('single-station/CEDA00USA_R_20182100000_01D_MN.rnx.gz');
    expect(warnings).toEqual([]);
    expect(countBySystem(nav.ephemerides)).toEqual({ E: 35 });
    expect(nav.ionosphere.galileo).toEqual([49.25, 0.20703, 4.0283e-3]); // line 5
    // lines 11-18: E05, 2018-07-29 02:50:00 GST (a Sunday: GPS week 2012), data source 517 -> I/NAV
    const e05 = at<KeplerEphemeris>(nav, 11);
    expect(e05.sat).toBe('E05');
    expect(e05.message).toBe('INAV');
    expect(e05.sqrtA).toBe(5.440621961594e3);
    expect(e05.e).toBe(2.510042395443e-4);
    expect(e05.af0).toBe(2.207611105405e-4);
    expect(e05.toeGpsS).toBe(2012 * WEEK + 1.02e4);
    expect(e05.accuracyM).toBe(3.12);
  });

  it('BRDM00DLR_R_20130010000_01D_MN.rnx (RINEX 3.02, lower-case e exponents)', async () => {
    const { nav, warnings } = await load('single-station/BRDM00DLR_R_20130010000_01D_MN.rnx');
    expect(warnings).toEqual([]);
    expect(countBySystem(nav.ephemerides)).toEqual({ G: 4, R: 4, J: 2 });
    expect(nav.leapSeconds).toBe(16); // line 12
    expect(nav.systemTimeOffsets?.map((o) => o.code)).toEqual(['GAUT', 'GLGP', 'GLUT', 'GPGA', 'GPUT', 'QZUT']);
    // lines 14-21: G01 2013-01-01 02:00:00, toe 1.8e5 s of GPS week 1721
    const g01 = at<KeplerEphemeris>(nav, 14);
    expect(g01.toeGpsS).toBe(1721 * WEEK + 1.8e5);
    expect(g01.tocGpsS).toBe(g01.toeGpsS);
    expect(g01.sqrtA).toBe(5.153710906982e3);
    // lines 62-69: J01; health 1; no fit interval given -> NaN
    const j01 = at<KeplerEphemeris>(nav, 62);
    expect(j01.sqrtA).toBe(6.493217412949e3);
    expect(j01.health).toBe(1);
    expect(j01.fitIntervalH).toBeNaN();
    // lines 46-49: R01 2013-01-01 00:15:00 UTC (GPS - UTC = 16 s in 2013), X 8.450493652344e+03 km
    const r01 = at<GlonassEphemeris>(nav, 46);
    expect(r01.tbGpsS).toBe(1721 * WEEK + 2 * 86400 + 900 + 16);
    expect(r01.posM[0]).toBeCloseTo(8450493.652344, 4);
    expect(r01.channel).toBe(1);
  });

  it('VILL00ESP_R_20181700000_01D_MN.rnx.gz (RINEX 3.03)', async () => {
    const { nav, warnings } = await load('single-station/VILL00ESP_R_20181700000_01D_MN.rnx.gz');
    expect(warnings).toEqual([]);
    expect(countBySystem(nav.ephemerides)).toEqual({ G: 263, R: 476, E: 961, S: 1631, C: 160 });
    expect(nav.ionosphere.gps?.alpha).toEqual([5.5879e-9, 1.4901e-8, -5.9605e-8, -1.1921e-7]); // line 3
    // lines 11-18: G01 2018-06-18 20:00:00 (Monday, GPS week 2006)
    const g01 = at<KeplerEphemeris>(nav, 11);
    expect(g01.af0).toBe(-5.753943696618e-5);
    expect(g01.sqrtA).toBe(5.153670063019e3);
    expect(g01.toeGpsS).toBe(2006 * WEEK + 1.584e5);
  });
});

describeShared('files that are not navigation files', () => {
  it('an observation file given as nav: one FormatError sentence', async () => {
    // glw1277m.18o line 1: '     2.11           OBSERVATION DATA    M                   RINEX VERSION / TYPE'
    await expect(load('cors-and-rover-2018-277/reference/glw1277m.18o')).rejects.toThrow(
      'cors-and-rover-2018-277/reference/glw1277m.18o:1: this is a RINEX observation file, not a navigation file',
    );
    await expect(load('hatanaka-pairs/york0440.15d')).rejects.toThrow(/compact RINEX observation file, not a navigation file/);
  });
});
