/**
 * Round trip: read -> writeObsRinex3 -> read gives the same values, flags, LLI, SSI, clock offsets and
 * events, on the hand-made fixtures and on real files in ../shared/data.
 */
import { describe, expect, it } from 'vitest';
import { readFileSync } from 'node:fs';
import { resolve, dirname } from 'node:path';
import { fileURLToPath } from 'node:url';
import { collectEpochs, readObsStream } from './obs-reader.js';
import { writeObsRinex3 } from './obs-writer.js';
import type { ObsEpoch, ObsHeader } from '../gnss/obs-types.js';
import type { Warning } from '../errors.js';
import { dataPath, describeShared } from '../../../../test/support/shared.js';

const FIX = resolve(dirname(fileURLToPath(import.meta.url)), '../../../../fixtures/rinex');
async function* chunks(text: string, n = 1 << 16): AsyncIterable<string> { for (let i = 0; i < text.length; i += n) yield text.slice(i, i + n); }
async function read(text: string) {
  const warnings: Warning[] = [];
  const stream = await readObsStream('f', chunks(text), { onWarning: (w) => warnings.push(w) });
  return { header: stream.header, epochs: await collectEpochs(stream), warnings };
}

function expectSameEpochs(a: readonly ObsEpoch[], b: readonly ObsEpoch[], tagTolS: number): void {
  expect(b.length).toBe(a.length);
  for (let i = 0; i < a.length; i++) {
    const x = a[i]!, y = b[i]!;
    expect(y.flag).toBe(x.flag);
    if (tagTolS === 0) expect(y.tagGpsS).toBe(x.tagGpsS); else expect(Math.abs(y.tagGpsS - x.tagGpsS)).toBeLessThanOrEqual(tagTolS);
    expect(y.tagWasBlank ?? false).toBe(x.tagWasBlank ?? false);
    expect(y.receiverClockOffsetS).toBe(x.receiverClockOffsetS);
    expect(y.event).toEqual(x.event);
    expect(y.sats.map((s) => s.sat)).toEqual(x.sats.map((s) => s.sat));
    for (let k = 0; k < x.sats.length; k++) {
      const p = x.sats[k]!, q = y.sats[k]!;
      expect([...q.codes]).toEqual([...p.codes]);
      expect(Array.from(q.values, String)).toEqual(Array.from(p.values, String)); // String(): NaN equals NaN
      expect(Array.from(q.lli)).toEqual(Array.from(p.lli));
      expect(Array.from(q.ssi)).toEqual(Array.from(p.ssi));
    }
  }
}

function expectSameHeader(a: ObsHeader, b: ObsHeader): void {
  for (const k of ['markerName', 'markerNumber', 'receiverType', 'receiverNumber', 'antennaType', 'antennaNumber', 'approxPosition',
    'antennaOffset', 'obsCodes', 'intervalS', 'firstObsGpsS', 'lastObsGpsS', 'timeSystem', 'glonassChannels', 'glonassCodePhaseBias',
    'phaseShifts', 'scaleFactors', 'clockOffsetApplied', 'leapSeconds', 'comments', 'receiverVersion'] as const) {
    expect(b[k], k).toEqual(a[k]);
  }
}

async function roundTrip(text: string, version?: 3.03 | 3.04 | 3.05, tagTolS = 0) {
  const first = await read(text);
  const written = [...writeObsRinex3(first.header, first.epochs, { version, dateText: '20240110 000000 UTC' })].join('');
  const second = await read(written);
  expect(second.warnings).toEqual([]);
  expect(second.header.version).toBe(version ?? 3.05);
  expectSameHeader(first.header, second.header);
  expectSameEpochs(first.epochs, second.epochs, tagTolS);
  return written;
}

describe('writeObsRinex3 round trip on fixtures', () => {
  for (const f of ['r2-events.24o', 'r3-scale-events.rnx', 'r4-obs.rnx', 'r301-beidou.rnx']) {
    it(f, async () => {
      const out = await roundTrip(readFileSync(resolve(FIX, f), 'utf8'), 3.04);
      for (const line of out.split('\n').filter((l) => l.length > 0)) expect(line.length).toBeLessThanOrEqual(80 + 16 * 14);
    });
  }

  it('header lines are 80 columns with the label in 61-80 (RINEX 3.05 5.1)', async () => {
    const r = await read(readFileSync(resolve(FIX, 'r3-scale-events.rnx'), 'utf8'));
    const text = [...writeObsRinex3(r.header, r.epochs)].join('');
    const head = text.slice(0, text.indexOf('END OF HEADER') + 13).split('\n');
    expect(head[0]!.trimEnd()).toBe('     3.05           OBSERVATION DATA    M                   RINEX VERSION / TYPE');
    for (const l of head) expect(l.length).toBeLessThanOrEqual(80);
    expect(head.find((l) => l.includes('SYS / SCALE FACTOR') && l.startsWith('G'))?.trimEnd()).toBe('G   10   2 L1C L2W                                          SYS / SCALE FACTOR');
  });
});

describeShared('writeObsRinex3 round trip on real files', () => {
  const files = [
    'cors-and-rover-2018-277/reference/glw1277m.18o', 'hatanaka-pairs/york0440.15o', 'cors-and-rover-2018-277/static-run/base.obs',
    'single-station/REYK00ISL_R_20192701000_01H_30S_MO.rnx', 'single-station/BRUX00BEL_R_20183101900_01H_30S_MO.rnx',
  ];
  for (const f of files) {
    it(f, async () => {
      // Tags are GPS seconds in one double (~2.4e-7 s resolution near 1.2e9 s): receiver-time tags with
      // 7 decimals may move by one last digit through text and back (common practice: 1 microsecond tolerance).
      await roundTrip(readFileSync(dataPath(f), 'utf8'), 3.05, 1e-6);
    });
  }
});
