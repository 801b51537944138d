/**
 * Damaged and hostile headers and line ends: bounded memory, one sentence naming file and line.
 * Inputs are the hand-made fixtures (fixtures/rinex, fixtures/compress) with lines added or changed.
 */
import { describe, expect, it } from 'vitest';
import { readFileSync } from 'node:fs';
import { resolve, dirname } from 'node:path';
import { fileURLToPath } from 'node:url';
import { collectEpochs, readObsStream } from './obs-reader.js';
import { readNav } from './nav-reader.js';
import { openText } from '../compress/open-text.js';
import { InputError, type Warning } from '../errors.js';
import { MAX_HEADER_COMMENTS, MAX_NAV_HEADER_LINES } from './header-limits.js';
import { MAX_LINE_CHARS } from '../text-limits.js';

const FIX = resolve(dirname(fileURLToPath(import.meta.url)), '../../../../fixtures');
const fixture = (name: string) => readFileSync(resolve(FIX, name), 'latin1');
async function* chunks(text: string, n = 65536): AsyncIterable<string> { for (let i = 0; i < text.length; i += n) yield text.slice(i, i + n); }
async function* bytes(b: Uint8Array, n = 65536): AsyncIterable<Uint8Array> { for (let i = 0; i < b.length; i += n) yield b.subarray(i, i + n); }
const comment = (s: string) => s.padEnd(60) + 'COMMENT';
const withAfterLine = (text: string, after: number, lines: string[]) => {
  const all = text.split('\n');
  all.splice(after, 0, ...lines);
  return all.join('\n');
};

describe('header bounds (observation reader)', () => {
  it('keeps the first comments, counts the rest and says so', async () => {
    const many = Array.from({ length: MAX_HEADER_COMMENTS + 500 }, (_, i) => comment(`note ${i}`));
    const text = withAfterLine(fixture('rinex/r2-events.24o'), 3, many);
    const warnings: Warning[] = [];
    const s = await readObsStream('c.obs', chunks(text), { onWarning: (w) => warnings.push(w) });
    expect(s.header.comments.length).toBe(MAX_HEADER_COMMENTS);
    const w = warnings.find((x) => x.code === 'header-records-dropped');
    expect(w?.message).toMatch(/1,000 are kept, 501 more/);
    expect((await collectEpochs(s)).length).toBeGreaterThan(0);
  });

  it('keeps a bounded number of unrecognised records', async () => {
    const many = Array.from({ length: 3000 }, (_, i) => 'x'.padEnd(60) + `ODD LABEL ${i}`);
    const text = withAfterLine(fixture('rinex/r2-events.24o'), 3, many);
    const warnings: Warning[] = [];
    const s = await readObsStream('c.obs', chunks(text), { onWarning: (w) => warnings.push(w) });
    expect(s.header.otherRecords!.length).toBeLessThanOrEqual(1001);
    expect(warnings.some((x) => x.code === 'header-records-dropped')).toBe(true);
  });

  it('refuses an absurd count of RINEX 2 observation types with the line', async () => {
    const text = fixture('rinex/r2-events.24o').replace('    10    C1    L1', '999999    C1    L1');
    const e = await readObsStream('t.obs', chunks(text)).catch((x: unknown) => x);
    expect(e).toBeInstanceOf(InputError);
    expect((e as InputError).line).toBe(12);
    expect((e as InputError).message).toMatch(/999999 observation types/);
  });

  it('stops at a line longer than the limit with file and line', async () => {
    const text = withAfterLine(fixture('rinex/r2-events.24o'), 5, ['A'.repeat(MAX_LINE_CHARS + 10)]);
    const e = await readObsStream('long.obs', chunks(text)).catch((x: unknown) => x);
    expect(e).toBeInstanceOf(InputError);
    expect((e as InputError).message).toMatch(/^long\.obs:6: line 6 is longer than 1,048,576 characters/);
  });
});

describe('header bounds (navigation reader)', () => {
  it('drops header lines over the bound and keeps line numbers of the records', async () => {
    const text = fixture('rinex/nav/glw1277m-excerpt.18n');
    const extra = MAX_NAV_HEADER_LINES + 20;
    const many = Array.from({ length: extra }, (_, i) => comment(`c ${i}`));
    const hdrEnd = text.split('\n').findIndex((l) => l.includes('END OF HEADER'));
    const damaged = withAfterLine(text, hdrEnd, many).split('\n');
    // an orphan continuation line right after the header: its warning must carry its true line number
    damaged.splice(hdrEnd + extra + 1, 0, '    orphan');
    const warnings: Warning[] = [];
    const nav = await readNav('n.18n', chunks(damaged.join('\n')), { onWarning: (w) => warnings.push(w) });
    expect(nav.ephemerides.length).toBeGreaterThan(0);
    expect(warnings.some((w) => w.code === 'header-records-dropped')).toBe(true);
    const orphan = warnings.find((w) => w.code === 'orphan-line');
    expect(orphan?.line).toBe(hdrEnd + extra + 2);
  });

  it('stops at a line longer than the limit', async () => {
    const e = await readNav('n.18n', chunks('x'.repeat(MAX_LINE_CHARS + 5))).catch((x: unknown) => x);
    expect(e).toBeInstanceOf(InputError);
    expect((e as InputError).message).toMatch(/n\.18n:1: line 1 is longer/);
  });
});

describe('encodings of line ends and byte order marks', () => {
  it('reads an observation file with a UTF-8 byte order mark', async () => {
    const body = Buffer.from(fixture('rinex/r2-events.24o'), 'latin1');
    const withBom = new Uint8Array(Buffer.concat([Buffer.from([0xef, 0xbb, 0xbf]), body]));
    const t = await openText('bom.obs', bytes(withBom));
    const s = await readObsStream('bom.obs', t.text);
    expect(s.header.version).toBe(2.11);
  });

  it('reads an observation file with CR-only line ends like the LF one', async () => {
    const lf = fixture('rinex/r2-events.24o');
    const cr = lf.replace(/\n/g, '\r');
    const a = await collectEpochs(await readObsStream('lf.obs', (await openText('lf.obs', bytes(new Uint8Array(Buffer.from(lf, 'latin1'))))).text));
    const b = await collectEpochs(await readObsStream('cr.obs', (await openText('cr.obs', bytes(new Uint8Array(Buffer.from(cr, 'latin1')), 1000))).text));
    expect(b.length).toBe(a.length);
    expect(b.length).toBeGreaterThan(0);
  });
});
