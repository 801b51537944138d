/**
 * Unix compress (.Z) decoder: round trips through a tiny LZW ENCODER written here from the compress
 * 4.0 format (Welch 1984 LZW; codes LSB first; width 9..maxBits; output padded to a whole group of
 * 8 codes whenever the width grows or after CLEAR), cross-checked with the system's `gzip -d`
 * (an independent .Z decoder) when it is installed; random and garbled input.
 */
import { execFileSync } from 'node:child_process';
import fc from 'fast-check';
import { describe, expect, it } from 'vitest';
import { UnixCompressDamage, UnixCompressDecoder } from './unix-compress.js';
// compress 4.0 style test encoder (shared with the fuzz run); checked below against the system gzip -d.
import { lzwEncode } from '../../../../fuzz/lzw.mjs';

function decodeAll(z: Uint8Array, chunk: number): Uint8Array {
  const d = new UnixCompressDecoder();
  const parts: Uint8Array[] = [];
  for (let i = 0; i < z.length; i += chunk) parts.push(...d.push(z.subarray(i, i + chunk)));
  parts.push(...d.finish());
  const n = parts.reduce((a, p) => a + p.length, 0);
  const out = new Uint8Array(n);
  let o = 0;
  for (const p of parts) {
    out.set(p, o);
    o += p.length;
  }
  return out;
}

function systemGunzip(z: Uint8Array): Uint8Array | null {
  try {
    return new Uint8Array(execFileSync('gzip', ['-dc'], { input: z, maxBuffer: 1 << 26 }));
  } catch (e) {
    if ((e as NodeJS.ErrnoException).code === 'ENOENT') return null;
    throw e;
  }
}

/** Text-like data with repetitions, so that the table fills and widths grow. */
const textish = fc
  .array(fc.constantFrom('G01', ' 12345.678', '  ', '\n', 'abc', 'L1C', '9', '-'), { maxLength: 6000 })
  .map((a) => new TextEncoder().encode(a.join('')));

describe('Unix compress LZW decoder', () => {
  const gz = systemGunzip(lzwEncode(new TextEncoder().encode('hello hello hello')));
  it.skipIf(gz === null)('the test encoder agrees with the system gzip -d (independent .Z decoder)', () => {
    fc.assert(
      fc.property(fc.oneof(textish, fc.uint8Array({ maxLength: 20000 })), fc.integer({ min: 9, max: 16 }), fc.boolean(), (data, maxBits, clear) => {
        const z = lzwEncode(data, maxBits, true, clear);
        expect(Buffer.from(systemGunzip(z) as Uint8Array).equals(Buffer.from(data))).toBe(true);
      }),
      { numRuns: 25 },
    );
  });

  it('round trip: random data, every width limit 9..16, block and non-block, CLEAR codes, any chunking', () => {
    fc.assert(
      fc.property(
        fc.oneof(textish, fc.uint8Array({ maxLength: 30000 })),
        fc.integer({ min: 9, max: 16 }),
        fc.boolean(),
        fc.boolean(),
        fc.integer({ min: 1, max: 5000 }),
        (data, maxBits, block, clear, chunk) => {
          const z = lzwEncode(data, maxBits, block, clear);
          expect(Buffer.from(decodeAll(z, chunk)).equals(Buffer.from(data))).toBe(true);
        },
      ),
      { numRuns: 150 },
    );
  });

  it('a long input crossing all widths up to 16 bits and a CLEAR decodes exactly', () => {
    const parts: string[] = [];
    let x = 12345;
    for (let i = 0; i < 60000; i++) {
      x = (x * 1103515245 + 12345) % 2147483648;
      parts.push(String(x % 9973));
    }
    const data = new TextEncoder().encode(parts.join(' '));
    for (const clear of [false, true]) {
      const z = lzwEncode(data, 16, true, clear);
      expect(Buffer.from(decodeAll(z, 65536)).equals(Buffer.from(data))).toBe(true);
    }
  });

  it('garbled or truncated input: output or UnixCompressDamage, nothing else, bounded output', () => {
    fc.assert(
      fc.property(fc.uint8Array({ maxLength: 3000 }), fc.integer({ min: 0, max: 255 }), (body, flags) => {
        const z = new Uint8Array([0x1f, 0x9d, flags, ...body]);
        try {
          const out = decodeAll(z, 97);
          expect(out.length).toBeLessThan(body.length * body.length + 1000);
        } catch (e) {
          expect(e).toBeInstanceOf(UnixCompressDamage);
        }
      }),
      { numRuns: 300 },
    );
  });

  it('rejects a header with a width limit outside 9..16 and a missing header', () => {
    expect(() => decodeAll(new Uint8Array([0x1f, 0x9d, 0x88, 1, 2]), 10)).toThrow(UnixCompressDamage);
    expect(() => decodeAll(new Uint8Array([0x1f, 0x9d]), 10)).toThrow(UnixCompressDamage);
  });
});
