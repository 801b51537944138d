/** The Node adapter: atomic writes, hashes, overlap rule. */
import { existsSync, mkdtempSync, readdirSync, readFileSync, writeFileSync } from 'node:fs';
import { tmpdir } from 'node:os';
import { join } from 'node:path';
import { describe, expect, it } from 'vitest';
import { sha256File, writeFileAtomic } from '../packages/cli/src/node-io.js';
import { requireOverlap } from '../packages/cli/src/input-checks.js';
import { secondsFromCalendar } from '../packages/core/src/time/index.js';

const dir = () => mkdtempSync(join(tmpdir(), 'rd-io-'));

describe('writeFileAtomic', () => {
  it('writes the bytes and returns their SHA-256', async () => {
    const d = dir();
    const w = await writeFileAtomic(join(d, 'a.txt'), ['a', 'b', new TextEncoder().encode('c')]);
    expect(readFileSync(join(d, 'a.txt'), 'utf8')).toBe('abc');
    // FIPS 180-2 appendix B.1: SHA-256("abc").
    expect(w.sha256).toBe('ba7816bf8f01cfea414140de5dae2223b00361a396177a9cb410ff61f20015ad');
    expect(await sha256File(join(d, 'a.txt'))).toBe(w.sha256);
    expect(readdirSync(d)).toEqual(['a.txt']);
  });

  it('a failure while writing leaves the existing file untouched and no temporary file', async () => {
    const d = dir();
    const p = join(d, 'out.csv');
    writeFileSync(p, 'complete earlier output\n');
    async function* failing(): AsyncIterable<string> {
      yield 'half of a new ';
      throw new Error('disk went away');
    }
    await expect(writeFileAtomic(p, failing())).rejects.toThrow('disk went away');
    expect(readFileSync(p, 'utf8')).toBe('complete earlier output\n');
    expect(readdirSync(d)).toEqual(['out.csv']);
  });

  it('creates the output folder', async () => {
    const d = dir();
    await writeFileAtomic(join(d, 'x', 'y', 'z.json'), ['{}']);
    expect(existsSync(join(d, 'x', 'y', 'z.json'))).toBe(true);
  });
});

describe('time overlap', () => {
  const t = (h: number, m: number, day = 4) => secondsFromCalendar({ year: 2018, month: 10, day, hour: h, minute: m, second: 0 });
  it('sessions across midnight overlap by time, not by date (common practice: GPS seconds are continuous)', () => {
    expect(() => requireOverlap({ path: 'rover', span: { firstGpsS: t(23, 50), lastGpsS: t(0, 10, 5) } },
      [{ path: 'ref', span: { firstGpsS: t(0, 0, 5), lastGpsS: t(0, 59, 5) } }])).not.toThrow();
  });
  it('disjoint spans are refused with one sentence naming both', () => {
    expect(() => requireOverlap({ path: 'rover', span: { firstGpsS: t(12, 37), lastGpsS: t(12, 58) } },
      [{ path: 'ref', span: { firstGpsS: t(14, 0), lastGpsS: t(14, 59) } }])).toThrow(/do not overlap in time: rover rover runs 2018-10-04 12:3.*ref/);
  });
});
