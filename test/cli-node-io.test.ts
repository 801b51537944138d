/** The Node adapter: atomic writes, hashes, overlap rule. */
import { existsSync, mkdirSync, mkdtempSync, readdirSync, readFileSync, readlinkSync, statSync, utimesSync, writeFileSync } from 'node:fs';
import { createHash } from 'node:crypto';
import { tmpdir } from 'node:os';
import { join } from 'node:path';
import { describe, expect, it } from 'vitest';
import { gzipSync } from 'node:zlib';
import { OutputSet, fileChunks, obsHeaderOf, openObs, sha256File, writeFileAtomic } from '../packages/cli/src/node-io.js';
import { requireOverlap } from '../packages/cli/src/input-checks.js';
import { secondsFromCalendar } from '../packages/core/src/time/index.js';

const dir = () => mkdtempSync(join(tmpdir(), 'rd-io-'));

describe('input digests taken while reading (sha256File after fileChunks)', () => {
  const read = async (p: string, chunkBytes?: number) => { for await (const c of fileChunks(p, chunkBytes)) void c; };
  // FIPS 180-2 appendix B.1: SHA-256("abc").
  const ABC = 'ba7816bf8f01cfea414140de5dae2223b00361a396177a9cb410ff61f20015ad';

  it('a complete reading in small chunks gives the digest of the whole file', async () => {
    const p = join(dir(), 'abc.obs');
    writeFileSync(p, 'abc');
    await read(p, 1);
    expect(await sha256File(p)).toBe(ABC);
  });

  it('a reading left unfinished (a header probe) does not keep another from recording the digest; a file changed since is hashed afresh', async () => {
    const p = join(dir(), 'x.obs');
    writeFileSync(p, 'abc');
    const probe = fileChunks(p, 1)[Symbol.asyncIterator]();
    await probe.next();
    await read(p);
    expect(await sha256File(p)).toBe(ABC);
    writeFileSync(p, 'abcd');
    utimesSync(p, new Date(2001, 0, 1), new Date(2001, 0, 1));
    expect(await sha256File(p)).toBe(createHash('sha256').update('abcd').digest('hex'));
  });

  it('two readings at once (the rover file as reference too), in chunks of different sizes, one left behind, give the digest of the file', async () => {
    const p = join(dir(), 'twice.obs');
    const text = 'the quick brown fox jumps over the lazy dog';
    writeFileSync(p, text);
    utimesSync(p, 1_000_000_000, 1_000_000_000);
    const a = fileChunks(p, 3)[Symbol.asyncIterator]();
    const b = fileChunks(p, 5)[Symbol.asyncIterator]();
    // a leads, b catches up and overtakes it, a is left unfinished.
    for (let i = 0; i < 4; i++) await a.next();
    for (;;) if ((await b.next()).done) break;
    await a.next();
    // The digest comes from the readings, not from hashing the file again: the same bytes count and times
    // with other content still give the digest of what was read.
    // (the file's times were set to a whole second before the readings, so they can be set back exactly)
    writeFileSync(p, text.toUpperCase());
    utimesSync(p, 1_000_000_000, 1_000_000_000);
    expect(statSync(p).mtimeMs).toBe(1e12);
    expect(await sha256File(p)).toBe(createHash('sha256').update(text).digest('hex'));
  });
});

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

const sha256 = (t: string) => createHash('sha256').update(t).digest('hex');

describe('OutputSet: the outputs of a run committed together', () => {
  it('renames every member into place, the last one (the index) last, with sizes and SHA-256 (FIPS 180-4 via node:crypto)', async () => {
    const d = dir();
    const set = new OutputSet();
    await set.add('epochs', join(d, 'epochs.csv'), ['a,b\n', '1,2\n']);
    await set.add('points', join(d, 'points.csv'), ['p\n']);
    // nothing is visible under the final names before commit
    expect(readdirSync(d).filter((n) => !n.startsWith('.'))).toEqual([]);
    const sealed = await set.seal();
    expect(sealed.map((s) => s.written.sha256)).toEqual([sha256('a,b\n1,2\n'), sha256('p\n')]);
    await set.add('summary', join(d, 'summary.json'), ['{}\n']);
    const done = await set.commit();
    expect(done.map((x) => x.kind)).toEqual(['epochs', 'points', 'summary']);
    expect(readdirSync(d).sort()).toEqual(['epochs.csv', 'points.csv', 'summary.json']);
    expect(done[2].written.bytes).toBe(3);
  });

  it('a rename that fails in the middle leaves no temporary file and removes the stale index (review finding 27)', async () => {
    const d = dir();
    writeFileSync(join(d, 'a.csv'), 'old a\n');
    mkdirSync(join(d, 'b.csv')); // renaming a file onto a folder fails (rename(2): EISDIR)
    writeFileSync(join(d, 'summary.json'), 'old summary listing old hashes\n');
    const set = new OutputSet();
    await set.add('a', join(d, 'a.csv'), ['new a\n']);
    await set.add('b', join(d, 'b.csv'), ['new b\n']);
    await set.add('c', join(d, 'c.csv'), ['new c\n']);
    await set.add('summary', join(d, 'summary.json'), ['new summary\n']);
    await expect(set.commit()).rejects.toThrow();
    const left = readdirSync(d).sort();
    expect(left.filter((n) => n.endsWith('.tmp'))).toEqual([]);
    // the index is gone rather than describing a set that is not there
    expect(left).toEqual(['a.csv', 'b.csv']);
  });

  it('abort() removes every temporary file and leaves the earlier outputs as they were (review finding 28)', async () => {
    const d = dir();
    writeFileSync(join(d, 'epochs.csv'), 'complete earlier output\n');
    const set = new OutputSet();
    await set.add('epochs', join(d, 'epochs.csv'), ['half of a new run']);
    await set.add('summary', join(d, 'summary.json'), ['{}']);
    await set.seal();
    await set.abort();
    expect(readdirSync(d)).toEqual(['epochs.csv']);
    expect(readFileSync(join(d, 'epochs.csv'), 'utf8')).toBe('complete earlier output\n');
    await expect(set.create('x', join(d, 'x'))).rejects.toThrow(/already committed or aborted/);
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

describe('observation files are closed when their reading is given up (Linux: open descriptors counted in /proc/self/fd)', () => {
  const fdDir = '/proc/self/fd';
  const canCount = existsSync(fdDir);
  const demo = (f: string) => join(__dirname, '..', 'fixtures', 'demo', f);
  /** Descriptors open on files under `dir` (other descriptors of the test process come and go). */
  const openIn = (dir: string) => readdirSync(fdDir).filter((fd) => { try { return readlinkSync(join(fdDir, fd)).startsWith(dir); } catch { return false; } }).length;
  /**
   * Descriptors on files under `dir` left after `times` calls of `use` (a stream left open keeps one
   * each). Closing is asynchronous: waits until they are gone, at most 2 s.
   */
  const leftOpen = async (dir: string, use: () => Promise<void>, times = 6) => {
    for (let i = 0; i < times; i++) await use();
    for (let waitedMs = 0; openIn(dir) > 0 && waitedMs < 2000; waitedMs += 20) await new Promise((r) => setTimeout(r, 20));
    return openIn(dir);
  };

  it.skipIf(!canCount)('a header read alone, a loop left by break, a gzip file, a file that fails in its header or is not text: none keeps its file open', async () => {
    const d = dir();
    const rover = join(d, 'rover.obs');
    writeFileSync(rover, readFileSync(demo('rover-1s.obs')));
    const gz = join(d, 'rover.obs.gz');
    writeFileSync(gz, gzipSync(readFileSync(demo('rover-1s.obs'))));
    const headerOnly = join(d, 'header-only.obs');
    writeFileSync(headerOnly, readFileSync(demo('rover-1s.obs'), 'latin1').split('\n').slice(0, 5).join('\n') + '\n');
    const binary = join(d, 'binary.obs');
    writeFileSync(binary, Buffer.from([0x89, 0x50, 0x4e, 0x47, 0, 0, 0, 1]));
    const firstEpochs = async (p: string) => {
      const s = await openObs(p, () => {});
      let n = 0;
      for await (const e of s.epochs) if (e && ++n >= 3) break;
    };
    const failing = (p: string) => async () => { await openObs(p, () => {}).then(async (s) => { for await (const e of s.epochs) void e; }, () => undefined); };
    expect(await leftOpen(d, async () => { await obsHeaderOf(rover); })).toBe(0);
    expect(await leftOpen(d, () => firstEpochs(rover))).toBe(0);
    expect(await leftOpen(d, async () => { await obsHeaderOf(gz); })).toBe(0);
    expect(await leftOpen(d, () => firstEpochs(gz))).toBe(0);
    expect(await leftOpen(d, failing(headerOnly))).toBe(0);
    expect(await leftOpen(d, failing(binary))).toBe(0);
    // the check itself: a stream opened and never read nor closed keeps its file open
    const kept: unknown[] = [];
    expect(await leftOpen(d, async () => { kept.push(await openObs(rover, () => {})); }, 3)).toBe(3);
    for (const s of kept as { close?: () => Promise<void> }[]) await s.close?.();
  });
});
