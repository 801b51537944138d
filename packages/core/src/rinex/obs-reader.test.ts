/**
 * Obs reader on hand-made fixtures (fixtures/rinex/*, written column by column from the RINEX 2.11 table
 * A2 and RINEX 3.05 table A3 layouts) and on damaged input. Expected tags use Date.UTC (independent).
 */
import { describe, expect, it } from 'vitest';
import fc from 'fast-check';
import { readFileSync } from 'node:fs';
import { resolve, dirname } from 'node:path';
import { fileURLToPath } from 'node:url';
import { collectEpochs, readObsStream } from './obs-reader.js';
import type { ObsEpoch } from '../gnss/obs-types.js';
import { FormatError, InputError } from '../errors.js';
import type { Warning } from '../errors.js';
import { openText } from '../compress/index.js';

const FIX = resolve(dirname(fileURLToPath(import.meta.url)), '../../../../fixtures/rinex');
const fixture = (name: string) => readFileSync(resolve(FIX, name), 'utf8');
const gps = (y: number, mo: number, d: number, h = 0, mi = 0, s = 0) => (Date.UTC(y, mo - 1, d, h, mi, 0) - Date.UTC(1980, 0, 6)) / 1000 + s;
async function* chunks(text: string, n = 97): AsyncIterable<string> { for (let i = 0; i < text.length; i += n) yield text.slice(i, i + n); }
async function read(text: string, n = 97) {
  const warnings: Warning[] = [];
  const stream = await readObsStream('f.obs', chunks(text, n), { onWarning: (w) => warnings.push(w) });
  return { stream, epochs: await collectEpochs(stream), warnings };
}
const val = (e: ObsEpoch, sat: string, code: string) => { const s = e.sats.find((x) => x.sat === sat)!; return s.values[s.codes.indexOf(code)]; };

describe('RINEX 2.11 fixture (r2-events.24o)', () => {
  it('header with type continuation line', async () => {
    const { stream, warnings } = await read(fixture('r2-events.24o'));
    expect(warnings).toEqual([]);
    const h = stream.header;
    expect(h.version).toBe(2.11);
    expect(h.markerName).toBe('FIX2');
    expect(h.receiverType).toBe('TESTRX');
    expect(h.antennaOffset).toEqual({ heightM: 1.234, eastM: 0.01, northM: -0.02 });
    expect(h.fileObsCodes.G).toEqual(['C1', 'L1', 'D1', 'S1', 'P1', 'P2', 'L2', 'C2', 'S2', 'C5']);
    expect(h.obsCodes.R).toEqual(['C1C', 'L1C', 'D1C', 'S1C', 'C1P', 'C2P', 'L2P', 'C2C', 'S2P', 'C5X']);
    expect(h.firstObsGpsS).toBe(gps(2024, 1, 10));
    expect(h.timeSystem).toBe('GPS');
  });

  it('epochs: 14 satellites over two lines, blank system = GPS, clock offset, LLI/SSI, flags 1-6', async () => {
    const { epochs } = await read(fixture('r2-events.24o'));
    expect(epochs.map((e) => e.flag)).toEqual([0, 6, 3, 4, 2, 5, 1, 0]);
    const e0 = epochs[0]!;
    expect(e0.sats.length).toBe(14);
    expect(e0.sats[13]!.sat).toBe('G14');
    expect(e0.receiverClockOffsetS).toBe(0.000123456);
    expect(val(e0, 'G01', 'C1C')).toBe(20000000);
    expect(val(e0, 'G02', 'L1C')).toBe(105525001.156);
    expect(e0.sats[1]!.lli[1]).toBe(1);
    expect(e0.sats[1]!.ssi[1]).toBe(7);
    expect(Number.isNaN(val(e0, 'G01', 'C1W')!)).toBe(true);
    expect(val(e0, 'G01', 'C5Q')).toBe(20000002);
    expect(Number.isNaN(val(e0, 'G02', 'C5Q')!)).toBe(true);
    const slip = epochs[1]!;
    expect(slip.sats[0]!.sat).toBe('G03');
    expect(slip.sats[0]!.lli[1]).toBe(1);
    const occ = epochs[2]!.event!;
    expect(occ.kind).toBe('new-occupation');
    expect(occ.markerName).toBe('FIX2B');
    expect(occ.markerNumber).toBe('FIX2B 00002');
    expect(occ.antennaOffset).toEqual({ heightM: 2, eastM: 0, northM: 0 });
    expect(occ.comments).toEqual(['new site occupied']);
    expect(epochs[3]!.tagWasBlank).toBe(true);
    expect(epochs[3]!.tagGpsS).toBe(gps(2024, 1, 10, 0, 0, 45)); // repeats the previous epoch's tag (the flag-3 event)
    expect(epochs[3]!.event!.kind).toBe('header-info');
    expect(epochs[4]!.event!.kind).toBe('start-moving');
    expect(epochs[5]!.event!.kind).toBe('external-event');
    expect(epochs[5]!.tagGpsS).toBe(gps(2024, 1, 10, 0, 1, 12.5));
    expect(epochs[6]!.event!.kind).toBe('power-failure');
    expect(epochs[6]!.sats.map((s) => s.sat)).toEqual(['G01', 'R01']);
    expect(epochs[7]!.receiverClockOffsetS).toBe(-0.000000001);
    expect(epochs[7]!.tagGpsS).toBe(gps(2024, 1, 10, 0, 2));
  });

  it('two-digit years 80-99 are 19xx (RINEX 2.11 6.5)', async () => {
    const t = fixture('r2-events.24o').replace(/ 24  1 10  0  2  0.0000000/, ' 99  1 10  0  2  0.0000000');
    const { epochs } = await read(t);
    expect(epochs[7]!.tagGpsS).toBe(gps(1999, 1, 10, 0, 2));
  });
});

describe('RINEX 3.04 fixture (CRLF, no final newline, scale factors, events)', () => {
  it('header records', async () => {
    const { stream, warnings } = await read(fixture('r3-scale-events.rnx'), 50);
    expect(warnings).toEqual([]);
    const h = stream.header;
    expect(h.obsCodes.G!.length).toBe(14);
    expect(h.obsCodes.G![13]).toBe('S2L');
    expect(h.scaleFactors.G).toEqual({ L1C: 10, L2W: 10 });
    expect(h.scaleFactors.R).toEqual({ C1C: 10, L1C: 10, C2P: 10, L2P: 10 });
    expect(h.phaseShifts.G).toEqual({ L2L: -0.25 });
    expect([...h.glonassChannels]).toEqual([[1, 1], [2, -4]]);
    expect(h.glonassCodePhaseBias).toEqual({ C1C: -71.94, C1P: 0, C2C: 1.25, C2P: 0 });
    expect(h.clockOffsetApplied).toBe(true);
    expect(h.leapSeconds).toBe(18);
    expect(h.intervalS).toBe(1);
    expect(h.lastObsGpsS).toBe(gps(2024, 1, 10, 12, 0, 3));
    expect(h.otherRecords!.some((l) => l.includes('SIGNAL STRENGTH UNIT'))).toBe(true);
  });

  it('values divided by the scale factor; events; short records', async () => {
    const { epochs } = await read(fixture('r3-scale-events.rnx'), 50);
    expect(epochs.map((e) => e.flag)).toEqual([0, 3, 5, 1, 0]);
    const e0 = epochs[0]!;
    expect(e0.receiverClockOffsetS).toBe(0.000000123456);
    expect(val(e0, 'G05', 'C1C')).toBe(21000000.125);
    expect(val(e0, 'G05', 'L1C')).toBeCloseTo(110355335.12, 6);
    expect(val(e0, 'G05', 'L2L')).toBe(85988753.375);
    expect(e0.sats[0]!.lli[7]).toBe(2);
    expect(val(e0, 'G05', 'S2L')).toBe(39.5);
    expect(val(e0, 'R01', 'C1C')).toBeCloseTo(19100000.05, 6);
    expect(val(e0, 'R01', 'L1C')).toBe(102196843);
    expect(Number.isNaN(val(e0, 'R01', 'L2P')!)).toBe(true);
    expect(val(e0, 'C11', 'L2I')).toBe(119775054.25);
    const occ = epochs[1]!.event!;
    expect(occ.markerName).toBe('FIX3B');
    expect(occ.approxPosition).toEqual({ x: 4000100, y: -500100, z: 4900100 });
    expect(occ.antennaOffset).toEqual({ heightM: 0.5, eastM: 0.1, northM: 0.2 });
    expect(epochs[2]!.tagGpsS).toBe(gps(2024, 1, 10, 12, 0, 1.5));
    expect(epochs[3]!.sats[0]!.lli[0]).toBe(1);
    expect(val(epochs[4]!, 'C11', 'C2I')).toBe(23000600.5);
  });
});

describe('RINEX 4.00 and 3.01 fixtures', () => {
  it('reads RINEX 4.00 observations', async () => {
    const { stream, epochs, warnings } = await read(fixture('r4-obs.rnx'));
    expect(warnings).toEqual([]);
    expect(stream.header.version).toBe(4);
    expect(epochs.length).toBe(2);
    expect(val(epochs[0]!, 'E07', 'C1C')).toBe(24000000.5);
    expect(epochs[0]!.sats[1]!.ssi[0]).toBe(9);
    expect(epochs[1]!.tagGpsS).toBe(gps(2024, 1, 10, 6, 30, 30));
  });

  it('RINEX 3.01 BeiDou C1I/L1I become C2I/L2I; BDT tags are GPS - 14 s... converted to GPS (BDT = GPST - 14 s)', async () => {
    const { stream, epochs } = await read(fixture('r301-beidou.rnx'));
    expect(stream.header.obsCodes.C).toEqual(['C2I', 'L2I', 'C7I']);
    expect(stream.header.fileObsCodes.C).toEqual(['C1I', 'L1I', 'C7I']);
    expect(stream.header.timeSystem).toBe('BDT');
    // check-values.md constants: BDT = GPST - 14 s, so 00:00:14 BDT = 00:00:28 GPST
    expect(epochs[0]!.tagGpsS).toBe(gps(2024, 1, 10, 0, 0, 28));
    expect(val(epochs[0]!, 'C06', 'C2I')).toBe(36000000.25);
  });
});

describe('wrong and damaged input', () => {
  it('not RINEX, a nav file, compact RINEX, empty: one FormatError sentence', async () => {
    await expect(read('hello world\n')).rejects.toThrow(FormatError);
    await expect(read('hello world\n')).rejects.toThrow(/not a RINEX file/);
    const nav = '     3.04           N: GNSS NAV DATA    M: MIXED            RINEX VERSION / TYPE\n';
    await expect(read(nav)).rejects.toThrow(/f\.obs is a navigation file, not an observation file/);
    const met = '     2.11           METEOROLOGICAL DATA                     RINEX VERSION / TYPE\n';
    await expect(read(met)).rejects.toThrow(/meteorological file/);
    await expect(read('')).rejects.toThrow(FormatError);
  });

  it('header without END OF HEADER: InputError naming the last line', async () => {
    const t = fixture('r4-obs.rnx').split('\n').slice(0, 9).join('\n');
    const err = await read(t).catch((e: unknown) => e);
    expect(err).toBeInstanceOf(InputError);
    expect((err as InputError).line).toBe(9);
  });

  it('missing mandatory records are warnings', async () => {
    const t = fixture('r4-obs.rnx').split('\n').filter((l) => !l.includes('MARKER NAME') && !l.includes('TIME OF FIRST OBS')).join('\n');
    const { warnings, epochs } = await read(t);
    expect(warnings.map((w) => w.code)).toEqual(['missing-header-record', 'missing-header-record']);
    expect(epochs.length).toBe(2);
  });

  it('a garbled epoch is skipped with a warning naming its line; the rest is read', async () => {
    const lines = fixture('r4-obs.rnx').split('\n');
    const i = lines.findIndex((l) => l.startsWith('G12'));
    lines[i] = lines[i]!.slice(0, 10) + 'x#' + lines[i]!.slice(12);
    const { epochs, warnings } = await read(lines.join('\n'));
    expect(epochs.length).toBe(1);
    expect(warnings.length).toBe(1);
    expect(warnings[0]!.line).toBe(i + 1);
    expect(warnings[0]!.file).toBe('f.obs');
  });

  it('fewer satellite records than announced: warned, epoch skipped, next epoch read', async () => {
    const t = fixture('r4-obs.rnx').replace('> 2024 01 10 06 30  0.0000000  0  2', '> 2024 01 10 06 30  0.0000000  0  3');
    const { epochs, warnings } = await read(t);
    expect(epochs.length).toBe(1);
    expect(warnings[0]!.code).toBe('bad-epoch-skipped');
    expect(warnings[0]!.line).toBe(14);
  });

  it('RINEX 2: truncated satellite block and garbled line', async () => {
    const lines = fixture('r2-events.24o').split('\n');
    const first = lines.findIndex((l) => l.startsWith(' 24  1 10  0  0  0.0000000'));
    const cut = [...lines.slice(0, first + 10), ...lines.slice(first + 30)].join('\n');
    const r = await read(cut);
    expect(r.warnings.length).toBe(1);
    expect(r.warnings[0]!.line).toBe(first + 1);
    expect(r.epochs.map((e) => e.flag)).toEqual([6, 3, 4, 2, 5, 1, 0]);
  });

  it('truncated file in the middle of an epoch: warning, earlier epochs kept', async () => {
    const t = fixture('r3-scale-events.rnx');
    const { epochs, warnings } = await read(t.slice(0, t.indexOf('C11')));
    expect(epochs.length).toBe(0);
    expect(warnings.length).toBe(1);
  });

  it('property: random damage never crashes or hangs; only InputError/FormatError or warnings', async () => {
    const texts = [fixture('r2-events.24o'), fixture('r3-scale-events.rnx'), fixture('r4-obs.rnx')];
    await fc.assert(fc.asyncProperty(
      fc.integer({ min: 0, max: 2 }),
      fc.array(fc.tuple(fc.nat(), fc.nat(40), fc.string({ maxLength: 30 })), { maxLength: 6 }),
      fc.integer({ min: 1, max: 300 }),
      async (which, edits, chunk) => {
        let t = texts[which]!;
        for (const [at, del, ins] of edits) { const p = at % (t.length + 1); t = t.slice(0, p) + ins + t.slice(p + del); }
        try {
          const r = await read(t, chunk);
          for (const w of r.warnings) expect(w.file).toBe('f.obs');
          for (const e of r.epochs) for (const s of e.sats) expect(s.values.length).toBe(s.codes.length);
        } catch (e) {
          expect(e).toBeInstanceOf(InputError); // FormatError extends InputError
        }
      },
    ), { numRuns: 300 });
  });

  it('property: CR LF line ends read as LF ones, damaged or not: the same epochs, values, warnings and line numbers', async () => {
    const texts = [fixture('r2-events.24o'), fixture('r3-scale-events.rnx'), fixture('r4-obs.rnx')].map((t) => t.replace(/\r\n/g, '\n'));
    /** Epochs and warnings as read from the file's bytes through openText (the reader then parses the bytes). */
    const readBytes = async (t: string, chunk: number) => {
      const bytes = new Uint8Array(Buffer.from(t, 'latin1'));
      const opened = await openText('f.obs', (async function* () { for (let i = 0; i < bytes.length; i += chunk) yield bytes.subarray(i, i + chunk); })());
      const warnings: Warning[] = [];
      try {
        const stream = await readObsStream('f.obs', opened.text, { onWarning: (w) => warnings.push(w) });
        const epochs = (await collectEpochs(stream)).map((e) => ({ ...e, sats: e.sats.map((x) => ({ ...x, values: [...x.values], lli: [...x.lli], ssi: [...x.ssi] })) }));
        return { epochs, warnings };
      } catch (e) {
        return { error: (e as Error).message, warnings };
      }
    };
    await fc.assert(fc.asyncProperty(
      fc.integer({ min: 0, max: 2 }),
      fc.array(fc.tuple(fc.nat(), fc.nat(20), fc.string({ maxLength: 20, unit: fc.constantFrom(' ', '1', '.', '-', 'x', '\n', 'G', '>') })), { maxLength: 4 }),
      fc.integer({ min: 1, max: 300 }),
      async (which, edits, chunk) => {
        let t = texts[which]!;
        for (const [at, del, ins] of edits) { const p = at % (t.length + 1); t = t.slice(0, p) + ins + t.slice(p + del); }
        expect(await readBytes(t.replace(/\n/g, '\r\n'), chunk)).toEqual(await readBytes(t, chunk));
      },
    ), { numRuns: 200 });
  });

  it('property: arbitrary text after a valid header is read without throwing', async () => {
    const head = fixture('r4-obs.rnx').split('END OF HEADER')[0] + 'END OF HEADER\n';
    await fc.assert(fc.asyncProperty(fc.string({ maxLength: 400, unit: fc.constantFrom('>', ' ', '1', '.', 'G', '0', '\n', '2', '-', 'x') }), async (junk) => {
      const r = await read(head + junk, 13);
      expect(Array.isArray(r.epochs)).toBe(true);
    }), { numRuns: 300 });
  });

  it('systems filter: wanted systems read as without it; the others listed with blank fields', async () => {
    for (const name of ['r2-events.24o', 'r3-scale-events.rnx', 'r4-obs.rnx']) {
      const all = await read(fixture(name));
      const stream = await readObsStream('f.obs', chunks(fixture(name)), { systems: ['G'] });
      const some = await collectEpochs(stream);
      expect(some.map((e) => e.sats.map((s) => s.sat))).toEqual(all.epochs.map((e) => e.sats.map((s) => s.sat)));
      let blanks = 0;
      some.forEach((e, i) => e.sats.forEach((s, j) => {
        const full = all.epochs[i]!.sats[j]!;
        expect(s.codes).toEqual(full.codes);
        if (s.sat[0] === 'G') {
          expect([...s.values]).toEqual([...full.values]);
          expect([...s.lli]).toEqual([...full.lli]);
          expect([...s.ssi]).toEqual([...full.ssi]);
        } else {
          blanks++;
          expect(s.values.every((v) => Number.isNaN(v))).toBe(true);
          expect(s.lli.every((v) => v === 0) && s.ssi.every((v) => v === 0)).toBe(true);
        }
      }));
      expect(blanks).toBeGreaterThan(0);
    }
  });

  it('systems filter: a garbled field of a system not wanted is not read, so not reported; an epoch record among its lines still is', async () => {
    const cases = [
      { name: 'r2-events.24o', from: '  21200001.500 7 111300008.37517', to: '  2120x001.500 7 111300008.37517', nth: 2 },
      { name: 'r3-scale-events.rnx', from: 'R01 191000000.500', to: 'R01 1910x0000.500', nth: 1 },
    ];
    for (const c of cases) {
      const parts = fixture(c.name).split(c.from);
      expect(parts.length).toBeGreaterThan(c.nth);
      const text = parts.slice(0, c.nth).join(c.from) + c.to + parts.slice(c.nth).join(c.from);
      const all = await read(text);
      expect(all.warnings.map((w) => w.code)).toContain('bad-epoch-skipped');
      const warnings: Warning[] = [];
      const some = await collectEpochs(await readObsStream('f.obs', chunks(text), { onWarning: (w) => warnings.push(w), systems: ['G'] }));
      expect(warnings).toEqual([]);
      expect(some.length).toBe(all.epochs.length + 1);
      // cut inside the records of a satellite not wanted: the epoch is reported as without the filter
      const cut = text.slice(0, text.indexOf(c.to) + 5);
      const cutAll = await read(cut);
      const cutWarnings: Warning[] = [];
      await collectEpochs(await readObsStream('f.obs', chunks(cut), { onWarning: (w) => cutWarnings.push(w), systems: ['G'] }));
      expect(cutWarnings.map((w) => w.message)).toEqual(cutAll.warnings.map((w) => w.message));
    }
  });
});
