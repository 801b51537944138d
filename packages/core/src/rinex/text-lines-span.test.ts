/**
 * LineCursor span API (takeSpan / ensureAhead / rewind) against String.prototype.split, the
 * platform's line splitting (ECMA-262 22.1.3.23), over arbitrary chunkings.
 */
import { describe, expect, it } from 'vitest';
import fc from 'fast-check';
import { LineCursor, SPAN_END, SPAN_FILL, SPAN_LINE } from './text-lines.js';

async function* from(xs: readonly string[]): AsyncIterable<string> { for (const x of xs) yield x; }

function chunked(text: string, cuts: readonly number[]): string[] {
  const chunks: string[] = [];
  let pos = 0;
  for (const c of cuts) { chunks.push(text.slice(pos, pos + c)); pos += c; }
  chunks.push(text.slice(pos));
  return chunks;
}

function expectedLines(text: string): string[] {
  const lines = text.split(/\r?\n/);
  if (lines[lines.length - 1] === '') lines.pop(); // no empty line after a final newline (common practice)
  return lines;
}

const textArb = fc.string({ unit: fc.constantFrom('a', 'b', '\n', '\r\n', ' ') });

describe('LineCursor spans', () => {
  it('property: takeSpan with fill gives the lines of String.split, with 1-based numbers', async () => {
    await fc.assert(fc.asyncProperty(textArb, fc.array(fc.nat(20)), async (text, cuts) => {
      const c = new LineCursor(from(chunked(text, cuts)));
      const got: string[] = [];
      for (;;) {
        const r = c.takeSpan();
        if (r === SPAN_FILL) { await c.fill(); continue; }
        if (r === SPAN_END) break;
        expect(r).toBe(SPAN_LINE);
        got.push(c.spanText());
        expect(c.lineNumber).toBe(got.length);
      }
      expect(got).toEqual(expectedLines(text));
    }), { numRuns: 300 });
  });

  it('property: ensureAhead + rewind re-reads the same lines (what the obs reader does at chunk ends)', async () => {
    await fc.assert(fc.asyncProperty(textArb, fc.array(fc.nat(20)), fc.integer({ min: 1, max: 8 }), async (text, cuts, ahead) => {
      const c = new LineCursor(from(chunked(text, cuts)));
      const got: string[] = [];
      for (;;) {
        if (!c.hasAhead(ahead)) await c.ensureAhead(ahead);
        let first = c.take();
        if (first === undefined) first = await c.next();
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
            group.push(c.spanText());
          }
          if (!short) break;
          c.rewind(mark, lineNo);
          await c.ensureAhead(2 * c.ahead() + ahead);
          mark = c.markPos();
        }
        got.push(...group);
        expect(c.lineNumber).toBe(got.length);
      }
      expect(got).toEqual(expectedLines(text));
    }), { numRuns: 300 });
  });

  it('regression 2024-01 (found by the property above): a second rewind after ensureAhead uses the new mark', async () => {
    const c = new LineCursor(from(['\r', '\n', 'a']));
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

  it('unreadSpan hands the same line back; release() ends the cursor', async () => {
    const c = new LineCursor(from(['ab\ncd\n']));
    await c.fill();
    expect(c.takeSpan()).toBe(SPAN_LINE);
    expect(c.spanText()).toBe('ab');
    c.unreadSpan();
    expect(c.lineNumber).toBe(0);
    expect(c.take()).toBe('ab');
    expect(c.take()).toBe('cd');
    c.release();
    expect(c.takeSpan()).toBe(SPAN_END);
    expect(await c.next()).toBeNull();
  });
});
