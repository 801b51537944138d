/**
 * ByteLineCursor against LineCursor (the lines the readers took from text before) over arbitrary
 * chunkings, from text chunks and from byte chunks with the file's own line ends (CR LF, lone CR).
 */
import { describe, expect, it } from 'vitest';
import fc from 'fast-check';
import { ByteLineCursor, SPAN_END, SPAN_FILL } from './byte-lines.js';
import { LineCursor } from './text-lines.js';
import { InputError } from '../errors.js';
import { MAX_LINE_CHARS } from './header-limits.js';

async function* from<T>(xs: readonly T[]): AsyncIterable<T> { for (const x of xs) yield x; }

function chunked(text: string, cuts: readonly number[]): string[] {
  const chunks: string[] = [];
  let pos = 0;
  for (const c of cuts) { chunks.push(text.slice(pos, pos + c)); pos += c; }
  chunks.push(text.slice(pos));
  return chunks;
}

const latin1Bytes = (s: string): Uint8Array => Uint8Array.from(s, (ch) => ch.charCodeAt(0));

async function linesOf(c: { next(): Promise<string | null>; lineNumber: number }): Promise<string[]> {
  const out: string[] = [];
  for (let l = await c.next(); l !== null; l = await c.next()) {
    out.push(l);
    expect(c.lineNumber).toBe(out.length);
  }
  return out;
}

const textArb = fc.string({ unit: fc.constantFrom('a', 'b', ' ', '\n', '\r\n', '\r', '\u00e9') });

describe('ByteLineCursor', () => {
  it('property: from text chunks, the lines and numbers of LineCursor', async () => {
    await fc.assert(fc.asyncProperty(textArb, fc.array(fc.nat(20)), async (text, cuts) => {
      const want = await linesOf(new LineCursor(from(chunked(text, cuts))));
      expect(await linesOf(new ByteLineCursor(from(chunked(text, cuts))))).toEqual(want);
    }), { numRuns: 500 });
  });

  it("property: from byte chunks with crEndsLine, the lines LineCursor reads from openText's text (CR LF and lone CR made LF)", async () => {
    await fc.assert(fc.asyncProperty(textArb, fc.array(fc.nat(20)), async (text, cuts) => {
      const want = await linesOf(new LineCursor(from([text.replace(/\r\n?/g, '\n')])));
      const bytes = chunked(text, cuts).map(latin1Bytes);
      const decode = (b: Uint8Array) => String.fromCharCode(...b);
      expect(await linesOf(new ByteLineCursor(from(bytes), 'f', decode, true))).toEqual(want);
    }), { numRuns: 500 });
  });

  it('property: ensureAhead + rewind re-reads the same spans (what the observation reader does at chunk ends)', async () => {
    await fc.assert(fc.asyncProperty(fc.string({ unit: fc.constantFrom('a', 'b', '\n') }), fc.array(fc.nat(20)), fc.nat(30), async (text, cuts, ahead) => {
      const want = await linesOf(new LineCursor(from([text])));
      const c = new ByteLineCursor(from(chunked(text, cuts).map(latin1Bytes)), 'f', undefined, true);
      const got: string[] = [];
      for (;;) {
        if (!c.hasAhead(ahead)) await c.ensureAhead(ahead);
        const mark = c.markPos(), n = c.lineNumber;
        const r = c.takeSpan();
        if (r === SPAN_FILL) { await c.ensureAhead(2 * c.ahead() + 1); continue; }
        if (r === SPAN_END) break;
        const first = c.textOf(c.lineStart, c.lineEnd);
        c.rewind(mark, n);
        expect(c.takeSpan()).not.toBe(SPAN_FILL);
        expect(c.textOf(c.lineStart, c.lineEnd)).toBe(first);
        got.push(first);
      }
      expect(got).toEqual(want);
    }), { numRuns: 300 });
  });

  it('property: a group of lines read after a mark, rewound and read again after ensureAhead, reads like split (what the observation reader does at chunk ends)', async () => {
    const arb = fc.string({ unit: fc.constantFrom('a', 'b', '\n', '\r\n', ' ') });
    await fc.assert(fc.asyncProperty(arb, fc.array(fc.nat(20)), fc.integer({ min: 1, max: 8 }), async (text, cuts, ahead) => {
      const want = text.split(/\r?\n/);
      if (want[want.length - 1] === '') want.pop(); // no empty line after a final newline (common practice)
      const c = new ByteLineCursor(from(chunked(text, cuts)));
      const got: string[] = [];
      for (;;) {
        if (!c.hasAhead(ahead)) await c.ensureAhead(ahead);
        const first = await c.next();
        if (first === null) break;
        const lineNo = c.lineNumber;
        let mark = c.markPos();
        // read up to two more lines synchronously; when the buffer runs out, rewind, pull more, retry
        let group: string[];
        for (;;) {
          group = [first];
          let short = false;
          for (let k = 0; k < 2; k++) {
            const r = c.takeSpan();
            if (r === SPAN_FILL) { short = true; break; }
            if (r === SPAN_END) break;
            group.push(c.textOf(c.lineStart, c.lineEnd));
          }
          if (!short) break;
          c.rewind(mark, lineNo);
          await c.ensureAhead(2 * c.ahead() + ahead);
          mark = c.markPos();
        }
        got.push(...group);
        expect(c.lineNumber).toBe(got.length);
      }
      expect(got).toEqual(want);
    }), { numRuns: 300 });
  });

  it('a second rewind after ensureAhead uses the new mark (a case the property above found in the text cursor)', async () => {
    const c = new ByteLineCursor(from(['\r', '\n', 'a']));
    await c.ensureAhead(1);
    expect(await c.next()).toBe('');
    let mark = c.markPos();
    expect(c.takeSpan()).toBe(SPAN_FILL);
    c.rewind(mark, 1);
    await c.ensureAhead(1);
    mark = c.markPos();
    expect(c.takeSpan()).toBe(SPAN_FILL);
    c.rewind(mark, 1);
    await c.ensureAhead(2);
    expect(c.take()).toBe('a');
    expect(c.take()).toBeNull();
  });

  it('release() ends the cursor', async () => {
    const c = new ByteLineCursor(from(['ab\ncd\n']));
    expect(await c.next()).toBe('ab');
    c.release();
    expect(c.takeSpan()).toBe(SPAN_END);
    expect(await c.next()).toBeNull();
  });

  it('gives text lines back as given, characters above U+00FF included', async () => {
    const c = new ByteLineCursor(from(['caf\u00e9 \u2003x\n', 'second\r\n']));
    expect(await c.next()).toBe('caf\u00e9 \u2003x');
    expect(c.bytes[c.lineStart + 5]).toBe(0xff); // no byte is U+2003: one that no number or flag accepts
    expect(await c.next()).toBe('second');
    expect(await c.next()).toBeNull();
  });

  it('unread puts the line just taken back', async () => {
    const c = new ByteLineCursor(from([latin1Bytes('a\nb\n')]));
    expect(await c.next()).toBe('a');
    expect(await c.next()).toBe('b');
    c.unread();
    expect(c.lineNumber).toBe(1);
    expect(await c.next()).toBe('b');
    expect(c.lineNumber).toBe(2);
  });

  it('stops at a line longer than the limit with file and line, from bytes', async () => {
    const long = latin1Bytes(`h\n${'A'.repeat(MAX_LINE_CHARS + 10)}\nz\n`);
    const parts = Array.from({ length: Math.ceil(long.length / 65536) }, (_, i) => long.subarray(65536 * i, 65536 * (i + 1)));
    const c = new ByteLineCursor(from(parts), 'long.obs', undefined, true);
    const e = await linesOf(c).catch((x: unknown) => x);
    expect(e).toBeInstanceOf(InputError);
    expect((e as InputError).message).toMatch(/^long\.obs:2: line 2 is longer than 1,048,576 characters/);
  });
});
