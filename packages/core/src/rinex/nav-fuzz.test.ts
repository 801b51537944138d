/**
 * Property tests: garbled, truncated and random text into readNav never crashes or hangs; the outcome is
 * NavData (with warnings that name file and line) or one of the project's error types.
 */
import { readFileSync } from 'node:fs';
import fc from 'fast-check';
import { describe, expect, it } from 'vitest';
import { fixturePath } from '../../../../test/support/shared.js';
import { InputError, type Warning } from '../errors.js';
import { readNav } from './nav-reader.js';

const FIXTURES = ['glw1277m-excerpt.18n', 'glw1277m-excerpt.18g', 'brdc-excerpt-3.04.rnx', 'mixed-rinex4.00.rnx'].map((n) =>
  readFileSync(fixturePath(`rinex/nav/${n}`), 'latin1'),
);

async function* chunks(text: string, size: number): AsyncIterable<string> {
  for (let i = 0; i < text.length; i += size) yield text.substring(i, i + size);
}

/** Reads and checks the outcome; returns nothing, fails the property on a raw error or a bad warning. */
async function check(text: string, chunk: number): Promise<void> {
  const warnings: Warning[] = [];
  try {
    const nav = await readNav('fuzz.rnx', chunks(text, chunk), { onWarning: (w) => warnings.push(w) });
    expect(Array.isArray(nav.ephemerides)).toBe(true);
  } catch (e) {
    expect(e).toBeInstanceOf(InputError); // FormatError extends InputError
    // the reader's last-resort wrapper names an internal failure: that must never be reached
    expect((e as Error).message).not.toContain('could not read the navigation file');
  }
  for (const w of warnings) {
    expect(w.file).toBe('fuzz.rnx');
    expect(typeof w.line).toBe('number');
    expect(w.message.length).toBeGreaterThan(0);
  }
}

const ALPHABET = ' 0123456789.-+EDed\nGRECJSI>xX#';

describe('readNav on damaged input (fast-check)', () => {
  it('random text', async () => {
    await fc.assert(fc.asyncProperty(fc.string({ maxLength: 400 }), fc.integer({ min: 1, max: 64 }), check), { numRuns: 300 });
  });

  it('random characters replaced in real files', async () => {
    const arb = fc.tuple(
      fc.constantFrom(...FIXTURES),
      fc.array(fc.tuple(fc.nat(), fc.constantFrom(...ALPHABET.split(''))), { minLength: 1, maxLength: 30 }),
      fc.integer({ min: 1, max: 500 }),
    );
    await fc.assert(
      fc.asyncProperty(arb, async ([text, edits, chunk]) => {
        const a = text.split('');
        for (const [pos, ch] of edits) a[pos % a.length] = ch;
        await check(a.join(''), chunk);
      }),
      { numRuns: 300 },
    );
  });

  it('files cut anywhere, lines dropped or repeated', async () => {
    const arb = fc.tuple(fc.constantFrom(...FIXTURES), fc.nat(), fc.array(fc.nat(), { maxLength: 8 }), fc.boolean());
    await fc.assert(
      fc.asyncProperty(arb, async ([text, cut, drops, repeat]) => {
        const lines = text.substring(0, cut % (text.length + 1)).split('\n');
        for (const d of drops) {
          const k = d % Math.max(1, lines.length);
          if (repeat) lines.splice(k, 0, lines[k] ?? '');
          else lines.splice(k, 1);
        }
        await check(lines.join('\n'), 4096);
      }),
      { numRuns: 300 },
    );
  });
});
