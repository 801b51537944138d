/**
 * Property tests: random, garbled and truncated bytes into openText and into the compact RINEX
 * decoder end with text, warnings, or the project's typed errors (InputError / FormatError), never a
 * raw TypeError, a crash or a hang (inputs are small, work is linear in them).
 */
import { readFileSync } from 'node:fs';
import { gzipSync } from 'node:zlib';
import fc from 'fast-check';
import { describe, expect, it } from 'vitest';
import { openText } from '../packages/core/src/compress/index.js';
import { InputError } from '../packages/core/src/errors.js';
import type { Warning } from '../packages/core/src/errors.js';
import { fixturePath } from './support/shared.js';

async function* chunked(bytes: Uint8Array, size: number): AsyncIterable<Uint8Array> {
  for (let i = 0; i < bytes.length; i += size) yield bytes.subarray(i, i + size);
}

/** Runs openText to the end; returns 'ok' | 'typed-error'; anything else fails the property. */
async function run(name: string, bytes: Uint8Array, chunk: number, lenient: boolean): Promise<string> {
  const warnings: Warning[] = [];
  try {
    const o = await openText(name, chunked(bytes, chunk), lenient ? { onWarning: (w) => warnings.push(w) } : {});
    let n = 0;
    for await (const c of o.text) n += c.length;
    expect(n).toBeLessThan(bytes.length * 64 + 100000);
    for (const w of warnings) {
      expect(w.file).toBe(name);
      expect(typeof w.message).toBe('string');
    }
    return 'ok';
  } catch (e) {
    expect(e).toBeInstanceOf(InputError); // FormatError extends InputError
    expect((e as InputError).file).toBe(name);
    return 'typed-error';
  }
}

const crx1 = new Uint8Array(readFileSync(fixturePath('compress/hand0100.24d')));
const crx3 = new Uint8Array(readFileSync(fixturePath('compress/HAND00XXX_R_20240100000_01H_30S_MO.crx')));
const prefix = (p: number[], body: Uint8Array): Uint8Array => new Uint8Array([...p, ...body]);

describe('openText on hostile input', () => {
  it('random bytes, with and without gzip / compress / CRINEX starts', async () => {
    const starts = fc.constantFrom<number[]>([], [0x1f, 0x8b], [0x1f, 0x9d], [0x1f, 0x9d, 0x90], [...crx3.subarray(0, 81)], [...crx1.subarray(0, 162)]);
    await fc.assert(
      fc.asyncProperty(starts, fc.uint8Array({ maxLength: 2000 }), fc.integer({ min: 1, max: 300 }), fc.boolean(), async (p, body, chunk, lenient) => {
        await run('random.crx.gz', prefix(p, body), chunk, lenient);
      }),
      { numRuns: 300 },
    );
  });

  it('compact fixtures with characters replaced: warnings or typed errors only', async () => {
    await fc.assert(
      fc.asyncProperty(
        fc.constantFrom(crx1, crx3),
        fc.array(fc.tuple(fc.nat(), fc.constantFrom(32, 38, 10, 45, 48, 51, 57, 62, 120, 13, 0)), { minLength: 1, maxLength: 8 }),
        fc.boolean(),
        async (src, edits, lenient) => {
          const b = src.slice();
          for (const [pos, ch] of edits) b[pos % b.length] = ch;
          await run('garbled.crx', b, 64, lenient);
        },
      ),
      { numRuns: 300 },
    );
  });

  it('truncated at any byte, plain and gzipped: text kept, warnings or typed errors', async () => {
    const gz3 = new Uint8Array(gzipSync(crx3));
    await fc.assert(
      fc.asyncProperty(fc.constantFrom(crx1, crx3, gz3), fc.double({ min: 0, max: 1, noNaN: true }), fc.boolean(), async (src, frac, lenient) => {
        const cut = src.subarray(0, Math.floor(src.length * frac));
        await run('cut.crx', cut, 50, lenient);
      }),
      { numRuns: 200 },
    );
  });

  it('a truncated gzip stream: warning naming the file, the text before it delivered', async () => {
    const gz = new Uint8Array(gzipSync(crx3));
    const warnings: Warning[] = [];
    const o = await openText('t.crx.gz', chunked(gz.subarray(0, gz.length - 12), 100), { onWarning: (w) => warnings.push(w) });
    let text = '';
    for await (const c of o.text) text += c;
    expect(o.layers).toEqual(['gzip', 'compact-rinex-3']);
    expect(warnings.map((w) => w.code)).toContain('gzip-damaged');
    expect(warnings.every((w) => w.file === 't.crx.gz')).toBe(true);
    expect(text).toContain('END OF HEADER');
  });

  it('content wins over the name: a plain file named .gz is read as plain, with a warning', async () => {
    const warnings: Warning[] = [];
    const o = await openText('plain.rnx.gz', chunked(new TextEncoder().encode('abc\r\ndef\r\n'), 3), { onWarning: (w) => warnings.push(w) });
    let text = '';
    for await (const c of o.text) text += c;
    expect(o.layers).toEqual(['plain']);
    expect(text).toBe('abc\ndef\n');
    expect(warnings.map((w) => w.code)).toEqual(['encoding-name-mismatch']);
  });

  it('gzip in gzip, multi-member gzip (RFC 1952 section 2.2)', async () => {
    const both = new Uint8Array([...gzipSync(crx3.subarray(0, 500)), ...gzipSync(crx3.subarray(500))]);
    for (const [bytes, layers] of [
      [new Uint8Array(gzipSync(gzipSync(crx3))), ['gzip', 'gzip', 'compact-rinex-3']],
      [both, ['gzip', 'compact-rinex-3']],
    ] as const) {
      const o = await openText('x.crx.gz', chunked(bytes, 77));
      let text = '';
      for await (const c of o.text) text += c;
      expect(o.layers).toEqual(layers);
      expect(text).toBe(readFileSync(fixturePath('compress/HAND00XXX_R_20240100000_01H_30S_MO.rnx'), 'latin1'));
    }
  });
});
