/**
 * The observation reader on the real files in ../shared/data (walking-run excluded: reserved).
 * Expected values were read from the files' text with sed/grep ("value read from <file> line N").
 * Expected epoch tags are computed with Date.UTC (an independent calendar), GPS time = uniform scale.
 */
import { expect, it } from 'vitest';
import { readFileSync } from 'node:fs';
import { gunzipSync } from 'node:zlib';
import { dataPath, describeShared, sharedPath } from './support/shared.js';
import { collectEpochs, readObsStream } from '../packages/core/src/rinex/index.js';
import type { ObsEpoch, ObsStream } from '../packages/core/src/gnss/index.js';
import type { Warning } from '../packages/core/src/errors.js';

/** GPS seconds of a GPS-calendar date, from Date.UTC (independent of the project's time code). */
const gps = (y: number, mo: number, d: number, h = 0, mi = 0, s = 0) => (Date.UTC(y, mo - 1, d, h, mi, 0) - Date.UTC(1980, 0, 6)) / 1000 + s;

async function* textChunks(text: string, n = 40_000): AsyncIterable<string> {
  for (let i = 0; i < text.length; i += n) yield text.slice(i, i + n);
}

function fileText(rel: string): string {
  let b: Uint8Array = readFileSync(dataPath(rel));
  if (rel.endsWith('.gz')) b = gunzipSync(b);
  return new TextDecoder().decode(b);
}

interface Read { stream: ObsStream; epochs: ObsEpoch[]; warnings: Warning[] }
async function read(rel: string): Promise<Read> {
  const warnings: Warning[] = [];
  const stream = await readObsStream(rel, textChunks(fileText(rel)), { onWarning: (w) => warnings.push(w) });
  return { stream, epochs: await collectEpochs(stream), warnings };
}

const value = (e: ObsEpoch, sat: string, code: string) => {
  const s = e.sats.find((x) => x.sat === sat)!;
  return s.values[s.codes.indexOf(code)];
};

const ALL = [
  'hatanaka-pairs/york0440.15o', 'hatanaka-pairs/ac660270.18o', 'hatanaka-pairs/brst155h.20o',
  ...['m', 'n', 'o', 'p', 'q', 'r'].map((h) => `cors-and-rover-2018-277/reference/glw1277${h}.18o`),
  'cors-and-rover-2018-277/static-run/base.obs', 'cors-and-rover-2018-277/static-run/rover.obs',
  'single-station/BRUX00BEL_R_20183101900_01H_30S_MO.rnx', 'single-station/REYK00ISL_R_20192701000_01H_30S_MO.rnx',
  'single-station/REYK00ISL_S_20192701000_01H_30S_MO.rnx', 'single-station/dgar0100.24o.gz',
  'single-station/CEDA00USA_R_20182100000_23H_15S_MO.rnx.gz',
];

describeShared('obs reader on real files', () => {
  for (const rel of ALL) {
    it(`${rel}: parses without error or warning, epochs in time order`, async () => {
      const r = await read(rel);
      expect(r.warnings.map((w) => `${w.line}: ${w.message}`)).toEqual([]);
      expect(r.epochs.length).toBeGreaterThan(10);
      for (let i = 1; i < r.epochs.length; i++) expect(r.epochs[i]!.tagGpsS).toBeGreaterThanOrEqual(r.epochs[i - 1]!.tagGpsS);
    });
  }

  it('york0440.15o (RINEX 2.11, CRLF): header, first/last epoch, event, values', async () => {
    const { stream, epochs } = await read('hatanaka-pairs/york0440.15o');
    // value read from york0440.15o line 12
    expect(stream.header.approxPosition).toEqual({ x: 1122459.225, y: -4763243.007, z: 4076945.547 });
    // lines 15-16: 11 types with a continuation line
    expect(stream.header.fileObsCodes.G).toEqual(['L1', 'L2', 'L5', 'C1', 'P1', 'C2', 'P2', 'C5', 'S1', 'S2', 'S5']);
    const e0 = epochs[0]!;
    // line 29: ' 15  2 13  0  0  0.0000000  0 10G07...'
    expect(e0.tagGpsS).toBe(gps(2015, 2, 13));
    expect(e0.sats.length).toBe(10);
    // lines 30-31: G07 L1 -5936986.221 (LLI 4, SSI 7), C1 24482102.132; line 2: P2 24482104.087, S1 42.000
    expect(value(e0, 'G07', 'L1C')).toBe(-5936986.221);
    expect(e0.sats[0]!.lli[0]).toBe(4);
    expect(e0.sats[0]!.ssi[0]).toBe(7);
    expect(value(e0, 'G07', 'C1C')).toBe(24482102.132);
    expect(value(e0, 'G07', 'C2W')).toBe(24482104.087);
    expect(value(e0, 'G07', 'S1C')).toBe(42);
    expect(Number.isNaN(value(e0, 'G07', 'C2L')!)).toBe(true);
    expect(Number.isNaN(value(e0, 'G07', 'L5Q')!)).toBe(true);
    // line 84677: last epoch 23:59:30 with 10 satellites
    const last = epochs[epochs.length - 1]!;
    expect(last.tagGpsS).toBe(gps(2015, 2, 13, 23, 59, 30));
    expect(last.line).toBe(84677);
    expect(last.sats.map((s) => s.sat)).toEqual(['G19', 'G23', 'G27', 'G07', 'G03', 'G20', 'G09', 'G31', 'G10', 'G16']);
    // line 44733: flag 4 event with one COMMENT record
    const ev = epochs.find((e) => e.line === 44733)!;
    expect(ev.flag).toBe(4);
    expect(ev.event?.kind).toBe('header-info');
    expect(ev.event?.comments[0]).toMatch(/antenna height/);
    expect(epochs.filter((e) => e.flag === 0).length).toBe(2880); // 24 h at 30 s, counted with grep -c ' 0 [ 1][0-9]G'
  });

  it('glw1277m.18o (CORS, RINEX 2.11 GPS+GLONASS): satellite continuation lines and C1', async () => {
    const { stream, epochs } = await read('cors-and-rover-2018-277/reference/glw1277m.18o');
    // value read from glw1277m.18o line 8 (also data README)
    expect(stream.header.approxPosition).toEqual({ x: 3774050.9626, y: -601852.6734, z: 5089350.3688 });
    expect(stream.header.intervalS).toBe(5);
    expect(stream.header.leapSeconds).toBe(18);
    expect(epochs.length).toBe(720); // README: 12:00-12:59:55 at 5 s
    const e0 = epochs[0]!;
    expect(e0.tagGpsS).toBe(gps(2018, 10, 4, 12));
    // lines 51-52: 22 satellites, 12 + 10 on the continuation line
    expect(e0.sats.length).toBe(22);
    expect(e0.sats[21]!.sat).toBe('R23');
    // line 53: G01 C1 20239291.580, L1 106358207.711 LLI 0 SSI 9
    expect(value(e0, 'G01', 'C1C')).toBe(20239291.58);
    expect(value(e0, 'G01', 'L1C')).toBe(106358207.711);
    expect(e0.sats[0]!.ssi[1]).toBe(9);
    // line 17953: last epoch 12:59:55 with 24 satellites
    expect(epochs[719]!.tagGpsS).toBe(gps(2018, 10, 4, 12, 59, 55));
    expect(epochs[719]!.sats.length).toBe(24);
  });

  it('ac660270.18o: two-digit year, mixed systems, 16 satellites over two lines', async () => {
    const { epochs } = await read('hatanaka-pairs/ac660270.18o');
    // line 33: ' 18  1 27  0 18 15.0000000  0 16G30...' continuation line 34 'R08R07R06G20'
    expect(epochs[0]!.tagGpsS).toBe(gps(2018, 1, 27, 0, 18, 15));
    expect(epochs[0]!.sats.map((s) => s.sat).slice(-4)).toEqual(['R08', 'R07', 'R06', 'G20']);
    // line 35: G30 L1 108545202.739 (LLI 1, SSI 8), C1 20655465.500
    expect(value(epochs[0]!, 'G30', 'L1C')).toBe(108545202.739);
    expect(value(epochs[0]!, 'G30', 'C1C')).toBe(20655465.5);
    expect(epochs.length).toBe(23); // grep -c '^ 18  1 27'
    // line 907: last epoch 01:36:15, 20 satellites
    expect(epochs[22]!.tagGpsS).toBe(gps(2018, 1, 27, 1, 36, 15));
    expect(epochs[22]!.sats.length).toBe(20);
  });

  it('base.obs (RINEX 3.03 receiver time tags)', async () => {
    const { stream, epochs } = await read('cors-and-rover-2018-277/static-run/base.obs');
    // value read from base.obs line 8 (also data README)
    expect(stream.header.approxPosition).toEqual({ x: 3774089.212, y: -601661.6157, z: 5089321.2474 });
    expect([...stream.header.glonassChannels.entries()].slice(0, 2)).toEqual([[6, -4], [7, 5]]); // line 15
    const e0 = epochs[0]!;
    // line 19: '> 2018 10 04 12 37 16.9900000  0 21'; line 20: G01 C1C 17959700.335 SSI 8, S1C 49.000
    expect(e0.tagGpsS).toBeCloseTo(gps(2018, 10, 4, 12, 37, 16.99), 6);
    expect(e0.sats.length).toBe(21);
    expect(value(e0, 'G01', 'C1C')).toBe(17959700.335);
    expect(value(e0, 'G01', 'S1C')).toBe(49);
    expect(e0.sats[0]!.ssi[0]).toBe(8);
    // line 7030: last epoch 12:58:40.991, 22 satellites
    const last = epochs[epochs.length - 1]!;
    expect(last.line).toBe(7030);
    expect(last.tagGpsS).toBeCloseTo(gps(2018, 10, 4, 12, 58, 40.991), 6);
    expect(last.sats.length).toBe(22);
    expect(epochs.length).toBe(321); // grep -c '^>'
  });

  it('BRUX00BEL (RINEX 3.03): coordinate, epochs, BeiDou value', async () => {
    const { stream, epochs } = await read('single-station/BRUX00BEL_R_20183101900_01H_30S_MO.rnx');
    // value read from BRUX00BEL...rnx line 9
    expect(stream.header.approxPosition).toEqual({ x: 4027881.8478, y: 306998.261, z: 4919498.6554 });
    // line 41 '> 2018 11 06 19 00  0.0000000  0 31', line 42 'C05  40278058.411 5 209738433.88205'
    expect(epochs[0]!.tagGpsS).toBe(gps(2018, 11, 6, 19));
    expect(epochs[0]!.sats.length).toBe(31);
    expect(epochs[0]!.sats[0]!.sat).toBe('C05');
    expect(epochs[0]!.sats[0]!.values[0]).toBe(40278058.411);
    // line 4346: last epoch 19:59:30 with 38 satellites
    expect(epochs.length).toBe(120);
    expect(epochs[119]!.tagGpsS).toBe(gps(2018, 11, 6, 19, 59, 30));
    expect(epochs[119]!.sats.length).toBe(38);
  });

  it('REYK00ISL_R (RINEX 3.04): phase shifts, GLONASS slots and biases', async () => {
    const { stream } = await read('single-station/REYK00ISL_R_20192701000_01H_30S_MO.rnx');
    // values read from REYK00ISL_R...rnx lines 13, 18-24
    expect(stream.header.approxPosition).toEqual({ x: 2587384.4105, y: -1043033.8325, z: 5716563.924 });
    expect(stream.header.phaseShifts.G).toEqual({ L2S: -0.25 });
    expect(stream.header.glonassChannels.size).toBe(24);
    expect(stream.header.glonassChannels.get(10)).toBe(-7);
    expect(stream.header.glonassCodePhaseBias.C1C).toBe(-71.94);
    expect(stream.header.obsCodes.E!.length).toBe(16);
    expect(stream.header.obsCodes.I).toEqual(['C5A', 'D5A', 'L5A', 'S5A']);
  });

  it('dgar0100.24o.gz and CEDA (gzip): day files', async () => {
    const d = await read('single-station/dgar0100.24o.gz');
    expect(d.epochs[0]!.tagGpsS).toBe(gps(2024, 1, 10));
    expect(d.epochs.length).toBe(2880);
    const c = await read('single-station/CEDA00USA_R_20182100000_23H_15S_MO.rnx.gz');
    expect(Object.keys(c.stream.header.obsCodes).sort()).toEqual(['E', 'R']); // README: Galileo + GLONASS only
    expect(c.epochs.every((e) => e.sats.every((s) => s.sat[0] === 'E' || s.sat[0] === 'R'))).toBe(true);
  });

  it('bad-input compact file: one FormatError sentence (it is not plain RINEX)', async () => {
    const text = new TextDecoder().decode(readFileSync(sharedPath('bad-input/hubu00DEU_R_20230931500_01H_30S_MO.crx')));
    await expect(readObsStream('hubu.crx', textChunks(text))).rejects.toThrow(/compact RINEX/);
  });
});
