import { describe, expect, it } from 'vitest';
import fc from 'fast-check';
import { LineCursor, decodeUtf8Chunks, textLines } from './text-lines.js';

async function* from<T>(xs: readonly T[]): AsyncIterable<T> { for (const x of xs) yield x; }
async function all(chunks: string[]): Promise<string[]> {
  const out: string[] = [];
  for await (const l of textLines(from(chunks))) out.push(l);
  return out;
}

describe('LineCursor', () => {
  it('splits LF and CRLF lines across arbitrary chunk boundaries, keeps a final line without newline', async () => {
    expect(await all(['ab', 'c\r', '\nde\n', '', 'f'])).toEqual(['abc', 'de', 'f']);
    expect(await all(['x\n\n'])).toEqual(['x', '']);
    expect(await all([])).toEqual([]);
  });

  it('counts 1-based line numbers and supports one-line unread', async () => {
    const c = new LineCursor(from(['a\nb\nc']));
    expect(await c.next()).toBe('a');
    expect(c.lineNumber).toBe(1);
    const b = await c.next();
    expect(c.lineNumber).toBe(2);
    c.unread(b!);
    expect(c.lineNumber).toBe(1);
    expect(await c.next()).toBe('b');
    expect(await c.next()).toBe('c');
    expect(c.lineNumber).toBe(3);
    expect(await c.next()).toBeNull();
  });

  it('hands out lines synchronously within a chunk (undefined only when the buffer is empty)', async () => {
    const c = new LineCursor(from(['a\nb\n']));
    expect(c.take()).toBeUndefined();
    await c.fill();
    expect(c.take()).toBe('a');
    expect(c.take()).toBe('b');
    expect(c.take()).toBeUndefined();
  });

  it('property: any chunking gives the same lines as String.split on /\\r?\\n/', async () => {
    await fc.assert(fc.asyncProperty(fc.string({ unit: fc.constantFrom('a', 'b', '\n', '\r\n', ' ') }), fc.array(fc.nat(20)), async (text, cuts) => {
      const chunks: string[] = [];
      let pos = 0;
      for (const c of cuts) { chunks.push(text.slice(pos, pos + c)); pos += c; }
      chunks.push(text.slice(pos));
      const expected = text.split(/\r?\n/);
      if (expected[expected.length - 1] === '') expected.pop(); // the split of a final newline (common practice: no empty last line)
      expect(await all(chunks)).toEqual(expected);
    }), { numRuns: 200 });
  });

  it('decodes UTF-8 split inside a multi-byte character', async () => {
    const bytes = new TextEncoder().encode('é\nü');
    const parts = [bytes.slice(0, 1), bytes.slice(1, 4), bytes.slice(4)];
    const out: string[] = [];
    for await (const s of decodeUtf8Chunks(from(parts))) out.push(s);
    expect(out.join('')).toBe('é\nü');
  });
});
