/**
 * Compact RINEX decoder on the hand-made fixtures (fixtures/compress: encoded by an independent
 * script written from the Compact RINEX format description, Hatanaka 2008) and on format facts.
 */
import { readFileSync } from 'node:fs';
import { describe, expect, it } from 'vitest';
import { fixturePath } from '../../../../test/support/shared.js';
import { rng } from '../../../../test/support/random.js';
import { FormatError, InputError } from '../errors.js';
import type { Warning } from '../errors.js';
import { applyTextDiff, applyFlagDiff } from './text-diff.js';
import { formatFixed, formatObs, parseSignedInt } from './fixed-point.js';
import { PlainTextBuffer } from './plain-text-buffer.js';
import { encodingsFromName, openText } from './index.js';
import { readObsStream } from '../rinex/index.js';
import type { ObsStream } from '../gnss/index.js';

async function* chunked(bytes: Uint8Array, size: number): AsyncIterable<Uint8Array> {
  for (let i = 0; i < bytes.length; i += size) yield bytes.subarray(i, i + size);
}

async function decode(name: string, bytes: Uint8Array, chunk = 4096, warnings?: Warning[]): Promise<{ layers: string[]; text: string }> {
  const o = await openText(name, chunked(bytes, chunk), warnings ? { onWarning: (w) => warnings.push(w) } : {});
  let text = '';
  for await (const c of o.text) text += c;
  return { layers: o.layers, text };
}

const R2 = ['hand0100.24d', 'hand0100.24o'] as const;
const R3 = ['HAND00XXX_R_20240100000_01H_30S_MO.crx', 'HAND00XXX_R_20240100000_01H_30S_MO.rnx'] as const;

describe('compact RINEX fixtures (hand-made, fixtures/compress)', () => {
  for (const [crx, plain, layer] of [[...R2, 'compact-rinex-1'], [...R3, 'compact-rinex-3']] as const) {
    it(`${crx} decodes to ${plain} line for line, whatever the chunk size`, async () => {
      const bytes = new Uint8Array(readFileSync(fixturePath(`compress/${crx}`)));
      const expected = readFileSync(fixturePath(`compress/${plain}`), 'latin1');
      for (const size of [1, 7, 64, 100000]) {
        const warnings: Warning[] = [];
        const r = await decode(crx, bytes, size, warnings);
        expect(r.layers).toEqual([layer]);
        expect(warnings).toEqual([]);
        expect(r.text).toBe(expected);
      }
    });
  }

  it('RINEX 2 output: clock F12.9 in columns 69-80, 13 satellites on two lines', async () => {
    const r = await decode(R2[0], new Uint8Array(readFileSync(fixturePath(`compress/${R2[0]}`))));
    const lines = r.text.split('\n');
    const ep = lines.find((l) => l.startsWith(' 24  1 10  0  1 30.0000000  1  2G01G03')) ?? '';
    // RINEX 2.11 table A2: receiver clock offset F12.9 in columns 69-80; fixture value -500 ns.
    expect(ep.slice(68, 80)).toBe('-0.000000500');
    const i = lines.indexOf(' 24  1 10  0  2  0.0000000  0 13G01G02G03G04G05G06G07G08G09G10G11G12');
    expect(i).toBeGreaterThan(0);
    expect(lines[i + 1]).toBe(`${' '.repeat(32)}G13`); // RINEX 2.11 table A2: continuation from column 33
  });

  it('strict mode (no warning sink): a damaged record is an InputError naming the compact line, after the text before it', async () => {
    const src = readFileSync(fixturePath(`compress/${R3[0]}`), 'latin1').split('\n');
    const bad = src.indexOf('10000') + 1; // the E11 difference line of the second epoch (1-based)
    expect(bad).toBeGreaterThan(0);
    src[bad - 1] = '10x00';
    const bytes = new TextEncoder().encode(src.join('\n'));
    const o = await openText('bad.crx', chunked(bytes, 50));
    let text = '';
    let err: unknown = null;
    try {
      for await (const c of o.text) text += c;
    } catch (e) {
      err = e;
    }
    expect(err).toBeInstanceOf(InputError);
    expect((err as InputError).line).toBe(bad);
    expect(text).toContain('G05  20500000.250   107730000.125 7     -1234.567 7        45.000');
    expect(text).not.toContain('00 00 30.0000000');
  });

  it('lenient mode: damage is a warning, decoding resumes at the next initialisation epoch', async () => {
    const src = readFileSync(fixturePath(`compress/${R3[0]}`), 'latin1').split('\n');
    const bad = src.indexOf('10000') + 1;
    src[bad - 1] = '10x00';
    const warnings: Warning[] = [];
    const r = await decode('bad.crx', new TextEncoder().encode(src.join('\n')), 33, warnings);
    expect(warnings.map((w) => [w.code, w.line])).toEqual([
      ['crx-damaged', bad],
      ['crx-resumed', src.findIndex((l) => l.startsWith('> 2024 01 10 00 02  0.0000000  3')) + 1],
    ]);
    // kept: the first epoch; lost: epochs 2-4 (differences need the skipped ones); back: the event and after.
    expect(r.text).toContain('> 2024 01 10 00 00  0.0000000  0  2       0.123456789012');
    expect(r.text).not.toContain('> 2024 01 10 00 01');
    expect(r.text).toContain('G05  20499813.500   107729022.500 7     -1234.100 7        44.500');
  });

  it('a truncated compact file: warning naming the unfinished epoch, earlier epochs kept', async () => {
    const src = readFileSync(fixturePath(`compress/${R2[0]}`), 'latin1').split('\n');
    const cut = src.indexOf('100'); // clock line of epoch 2; keep its satellite line 1 only
    const warnings: Warning[] = [];
    const r = await decode('cut.24d', new TextEncoder().encode(src.slice(0, cut + 2).join('\n')), 10, warnings);
    expect(warnings).toHaveLength(1);
    expect(warnings[0]).toMatchObject({ code: 'crx-truncated', line: cut }); // epoch line is the line before (1-based = cut)
    expect(r.text).toContain(' 24  1 10  0  0  0.0000000  0  2G01G02');
    expect(r.text).not.toContain('30.0000000');
  });

  it('not compact RINEX 1.0/3.0: one FormatError sentence', async () => {
    const line = '2.0                 COMPACT RINEX FORMAT                    CRINEX VERS   / TYPE\n';
    await expect(decode('x.crx', new TextEncoder().encode(line))).rejects.toBeInstanceOf(FormatError);
    const r2in3 = readFileSync(fixturePath(`compress/${R2[0]}`), 'latin1').replace(/^1\.0 /, '3.0 ');
    const o = await openText('y.crx', chunked(new TextEncoder().encode(r2in3), 100));
    await expect((async () => { for await (const c of o.text) void c; })()).rejects.toBeInstanceOf(FormatError);
  });
});

describe('compact RINEX values handed to the observation reader as numbers (fixtures/compress)', () => {
  /** Every epoch field, values compared bit for bit (Object.is: NaN and the sign of zero included). */
  const epochsOf = async (stream: ObsStream) => {
    const out: unknown[] = [];
    for await (const e of stream.epochs) {
      out.push([e.tagGpsS, e.flag, e.receiverClockOffsetS, e.line, e.event, e.sats.map((s) => [s.sat, s.codes, [...s.values].map((v) => (Object.is(v, -0) ? '-0' : String(v))), [...s.lli], [...s.ssi]])]);
    }
    return out;
  };
  const fromCrx = async (name: string, crx: Uint8Array, warnings: Warning[]) => {
    const o = await openText(name, chunked(crx, 100), { onWarning: (w) => warnings.push(w) });
    return readObsStream(name, o.text, { onWarning: (w) => warnings.push(w) });
  };
  const fromText = async (name: string, text: string, warnings: Warning[]) =>
    readObsStream(name, (async function* () { yield text; })(), { onWarning: (w) => warnings.push(w) });

  for (const [crxName, plainName] of [R2, R3]) {
    it(`${crxName}: the epochs equal those read from ${plainName}`, async () => {
      const crx = new Uint8Array(readFileSync(fixturePath(`compress/${crxName}`)));
      const plain = readFileSync(fixturePath(`compress/${plainName}`), 'latin1');
      const w1: Warning[] = [], w2: Warning[] = [];
      const epochs = await epochsOf(await fromCrx(crxName, crx, w1));
      expect(epochs.length).toBeGreaterThan(0);
      expect(epochs).toEqual(await epochsOf(await fromText(crxName, plain, w2)));
      expect(w1).toEqual(w2);
    });
  }

  const headers = [
    // 'G    4' with three types listed: the decoder reads four fields, the reader's header has three codes
    [R3[0], 'G    4 C1C L1C D1C S1C', 'G    4 C1C L1C D1C    '],
    // six types counted, five listed: the reader's satellites take one line each, the decoder's two
    [R2[0], '     6    C1    L1    L2    P2    S1    S2', '     6    C1    L1    L2    P2    S1      '],
    // a count the decoder reads (Number) and the reader does not (I6): no types, lines skipped as text
    [R2[0], '     6    C1    L1    L2    P2    S1    S2', '   6.0    C1    L1    L2    P2    S1    S2'],
  ] as const;
  it.each(headers)('%s with a header the decoder and the reader read differently: the same epochs and warnings as from the text', async (name, from, to) => {
    const src = readFileSync(fixturePath(`compress/${name}`), 'latin1');
    expect(src).toContain(from);
    const crx = new TextEncoder().encode(src.replace(from, to));
    const w1: Warning[] = [], w2: Warning[] = [];
    const decoded = (await decode(name, crx, 100, w2)).text;
    const epochs = await epochsOf(await fromCrx(name, crx, w1));
    expect(epochs.length).toBeGreaterThan(0);
    expect(epochs).toEqual(await epochsOf(await fromText(name, decoded, w2)));
    expect(w1.map((w) => w.message).sort()).toEqual(w2.map((w) => w.message).sort());
  });
});

describe('compact RINEX building blocks', () => {
  it('text difference: blank = unchanged, & = becomes blank, longer/shorter lines (Hatanaka 2008 sec. 3)', () => {
    // Epoch lines of york0440.15d (lines 31 and 43 of the file): "...  0.0000000" -> "... 30.0000000".
    const e1 = '&15  2 13  0  0  0.0000000  0 10G07G27G19G03G23G20G09G31G10G16';
    expect(applyTextDiff(e1, '                3')).toBe('&15  2 13  0  0 30.0000000  0 10G07G27G19G03G23G20G09G31G10G16');
    expect(applyTextDiff('ab cd', '&  x   z')).toBe(' b xd  z');
  });

  it('flag difference: digits replace, & blanks, longer than 2 x types is damage', () => {
    const f = new Uint8Array(6).fill(32);
    expect(applyFlagDiff(f, '&&&6&&')).toBe(true);
    expect(String.fromCharCode(...f)).toBe('   6  ');
    expect(applyFlagDiff(f, ' 1 &')).toBe(true);
    expect(String.fromCharCode(...f)).toBe(' 1    ');
    expect(applyFlagDiff(f, '1234567')).toBe(false);
    expect(applyFlagDiff(f, 'x')).toBe(false);
  });

  it('F14.3 / F12.9 / F15.12 from integers, exact (RINEX 2.11 table A2, 3.05 table A3)', () => {
    expect(formatObs(-5936986221)).toBe('  -5936986.221'); // york0440.15o line 35: "-5936986.22147"
    expect(formatObs(205)).toBe('         0.205');
    expect(formatObs(-5)).toBe('        -0.005');
    expect(formatObs(9999999999999)).toBe('9999999999.999');
    expect(formatFixed(2000, 12, 15)).toBe(' 0.000000002000'); // BELE00BRA...crx.gz line 211 "3&2000"
    expect(formatFixed(-123456, 9, 12)).toBe('-0.000123456');
    expect(parseSignedInt('x-123y', 1, 5)).toBe(-123);
    expect(parseSignedInt('12a', 0, 3)).toBeNaN();
    expect(parseSignedInt('', 0, 0)).toBeNaN();
    expect(parseSignedInt('99999999999999999', 0, 17)).toBeNaN();
  });

  it('plain output buffer: F14.3 fields byte for byte as formatObs writes them, non-ASCII text kept', () => {
    const units = [0, -0, 5, -5, 205, 999, 1000, -1000, 123456789, -5936986221, 9999999999999, -9999999999999, 2147483647999, 2147483648000, -2147483648000, 1e15, 2 ** 53, -(2 ** 53)];
    const random = rng(20240110);
    for (let k = 0; k < 2000; k++) units.push(Math.round((random() - 0.5) * 10 ** (1 + random() * 14)));
    const out = new PlainTextBuffer((b) => new TextDecoder('latin1').decode(b));
    for (const u of units) {
      out.obsField(u);
      out.newline();
    }
    out.line('comment \u00e9\u20ac');
    out.commit();
    expect(out.takeText()).toBe(units.map((u) => formatObs(u) + '\n').join('') + 'comment \u00e9\u20ac\n');
  });

  it('file-name hints (RINEX 2.11 / 3.05 section 4 file names)', () => {
    expect(encodingsFromName('/a/BELE00BRA_R_20240100000_01D_30S_MO.crx.gz')).toEqual(['gzip', 'compact-rinex-3']);
    expect(encodingsFromName('york0440.15d.Z')).toEqual(['unix-compress', 'compact-rinex-1']);
    expect(encodingsFromName('ac660270.18o.Z')).toEqual(['unix-compress']);
    expect(encodingsFromName('x.rnx')).toEqual([]);
    expect(encodingsFromName('notes.txt')).toEqual([]);
  });
});
