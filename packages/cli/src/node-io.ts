/**
 * The thin Node adapter: file bytes as chunks, opening observation and navigation files through the
 * core readers, SHA-256 of inputs, and atomic writes (temporary file in the same folder, fsync, rename).
 */
import { createReadStream } from 'node:fs';
import { createHash } from 'node:crypto';
import { open, rename, rm, stat, type FileHandle } from 'node:fs/promises';
import { dirname } from 'node:path';
import { readFile } from 'node:fs/promises';
import { makeFolder } from './output-folder.js';
import { commitWithJournal, registerTemporary, releaseTemporary, temporaryName } from './output-commit.js';
import {
  InputError, mergeNav, openText, readNav, readObsStream,
  type GnssSystem, type NavData, type ObsHeader, type ObsStream, type WarningSink,
} from '@refdelta/core';

/**
 * SHA-256 of files read from start to end by fileChunks in this process, so that the inputs' digests of
 * a run cost no second reading: path as given -> the digest with the file's size and modification time
 * when it was read (a file changed since is hashed afresh).
 */
const digestsRead = new Map<string, { readonly sizeBytes: number; readonly mtimeMs: number; readonly sha256: string }>();

async function fileVersion(path: string): Promise<{ sizeBytes: number; mtimeMs: number } | null> {
  try {
    const st = await stat(path);
    return { sizeBytes: st.size, mtimeMs: st.mtimeMs };
  } catch {
    return null;
  }
}

/**
 * A file's SHA-256 being computed by the readings of it in progress, each adding the bytes past those
 * already added (readings of one file hold the same bytes at the same offsets): a file read twice at once,
 * as when the rover's file is the reference's too, is hashed once; a reading left unfinished (a header
 * probe) leaves the rest to the others.
 */
class SharedDigest {
  private readonly hash = createHash('sha256');
  /** Bytes hashed: the file's first `bytes` bytes. */
  bytes = 0;
  private done = false;

  constructor(readonly version: { readonly sizeBytes: number; readonly mtimeMs: number }) {}

  /** Adds the part of a chunk read at `offset` that extends what is hashed (a reading's chunks start at or before `bytes`). */
  add(chunk: Uint8Array, offset: number): void {
    const end = offset + chunk.byteLength;
    if (this.done || end <= this.bytes || offset > this.bytes) return;
    this.hash.update(offset === this.bytes ? chunk : chunk.subarray(this.bytes - offset));
    this.bytes = end;
  }

  digest(): string {
    this.done = true;
    return this.hash.digest('hex');
  }
}

/** Per path, the digest the readings in progress are computing (until one reading completes it). */
const digestsInProgress = new Map<string, SharedDigest>();

/** The digest a new reading of `path` adds to: the one in progress for this version of the file, or a new one. */
function sharedDigestFor(path: string, version: { sizeBytes: number; mtimeMs: number }): SharedDigest {
  const now = digestsInProgress.get(path);
  if (now && now.version.sizeBytes === version.sizeBytes && now.version.mtimeMs === version.mtimeMs) return now;
  const fresh = new SharedDigest(version);
  digestsInProgress.set(path, fresh);
  return fresh;
}

/**
 * The file's bytes as chunks (what the core readers take); the first complete reading records the file's
 * SHA-256. Readings started before that add to one digest (SharedDigest): a reading may be left
 * unfinished, as by a header probe, and cannot be waited for.
 */
export async function* fileChunks(path: string, chunkBytes = 1 << 16): AsyncGenerator<Uint8Array> {
  const version = digestsRead.has(path) ? null : await fileVersion(path);
  const digest = version ? sharedDigestFor(path, version) : null;
  let offset = 0;
  for await (const c of createReadStream(path, { highWaterMark: chunkBytes })) {
    digest?.add(c as Uint8Array, offset);
    offset += (c as Uint8Array).byteLength;
    yield c as Uint8Array;
  }
  if (digest && !digestsRead.has(path) && digest.bytes === offset) {
    digestsRead.set(path, { ...digest.version, sha256: digest.digest() });
    if (digestsInProgress.get(path) === digest) digestsInProgress.delete(path);
  }
}

/** Throws one clear InputError when `path` is not a readable regular file. */
export async function requireFile(path: string): Promise<number> {
  let st;
  try {
    st = await stat(path);
  } catch {
    throw new InputError(path, 0, `file not found: ${path}`);
  }
  if (!st.isFile()) throw new InputError(path, 0, `not a regular file: ${path}`);
  return st.size;
}

function layerNames(layers: unknown): string[] {
  if (!Array.isArray(layers)) return [];
  return layers.map((l) => (typeof l === 'string' ? l : typeof l === 'object' && l && 'name' in l ? String((l as { name: unknown }).name) : String(l)));
}

export interface OpenedText {
  readonly layers: readonly string[];
  readonly text: AsyncIterable<string>;
}

/**
 * Bytes to characters one for one by Node's latin1 decoding (ISO-8859-1), 2-3x the speed of the core's
 * default TextDecoder('latin1') (windows-1252). RINEX is ASCII: the two differ only on bytes 0x80-0x9F,
 * which can stand in a comment, one character each, so no column moves.
 */
export function latin1Text(bytes: Uint8Array): string {
  return Buffer.from(bytes.buffer, bytes.byteOffset, bytes.byteLength).toString('latin1');
}

/** Opens a file through the decompression stage (gzip, Unix compress, compact RINEX detected by content). */
export async function openTextFile(path: string, onWarning: WarningSink): Promise<OpenedText> {
  await requireFile(path);
  const chunks = fileChunks(path);
  try {
    const opened = await openText(path, chunks, { onWarning, decodeLatin1: latin1Text });
    return { layers: layerNames(opened.layers), text: opened.text };
  } catch (err) {
    await chunks.return(undefined); // closes the file now, not at the process's exit
    throw err;
  }
}

export type OpenedObs = ObsStream & { readonly layers: readonly string[] };

/**
 * Opens an observation file (any encoding): header read, epochs streamed on iteration. Given `systems`,
 * only their satellites' values are read (the others come with blank fields: ReadObsOptions.systems).
 */
export async function openObs(path: string, onWarning: WarningSink, systems?: readonly GnssSystem[]): Promise<OpenedObs> {
  const t = await openTextFile(path, onWarning);
  const stream = await readObsStream(path, t.text, systems ? { onWarning, systems } : { onWarning });
  return { file: stream.file, header: stream.header, epochs: stream.epochs, layers: t.layers, ...(stream.close ? { close: stream.close } : {}) };
}

/** The header of an observation file, the file closed once it is read. */
export async function obsHeaderOf(path: string, onWarning: WarningSink = () => {}): Promise<ObsHeader> {
  const s = await openObs(path, onWarning);
  await s.close?.();
  return s.header;
}

export interface OpenedNav {
  readonly nav: NavData;
  readonly layers: ReadonlyMap<string, readonly string[]>;
}

/** Reads and merges navigation files. */
export async function openNav(paths: readonly string[], onWarning: WarningSink): Promise<OpenedNav> {
  const parts: NavData[] = [];
  const layers = new Map<string, readonly string[]>();
  for (const p of paths) {
    const t = await openTextFile(p, onWarning);
    parts.push(await readNav(p, t.text, { onWarning }));
    layers.set(p, t.layers);
  }
  return { nav: parts.length === 1 ? parts[0] : mergeNav(parts), layers };
}

/** Hex SHA-256 of a file's bytes as stored (FIPS 180-4); from the run's own complete reading when there was one. */
export async function sha256File(path: string): Promise<string> {
  const known = digestsRead.get(path);
  const now = known ? await fileVersion(path) : null;
  if (known && now && now.sizeBytes === known.sizeBytes && now.mtimeMs === known.mtimeMs) return known.sha256;
  const h = createHash('sha256');
  // One buffer read into again and again: a stream's fresh chunk per read would leave the whole file
  // (97 MB for a day at 1 Hz) as garbage for the collector, and in the process's peak memory.
  const buf = Buffer.allocUnsafe(1 << 20);
  const fh = await open(path, 'r');
  try {
    for (;;) {
      const { bytesRead } = await fh.read(buf, 0, buf.length, null);
      if (bytesRead === 0) break;
      h.update(buf.subarray(0, bytesRead));
    }
  } finally {
    await fh.close();
  }
  return h.digest('hex');
}

export interface WrittenFile {
  readonly path: string;
  readonly bytes: number;
  readonly sha256: string;
}

/** Removes a file, ignoring "not there". */
async function removeQuietly(path: string): Promise<void> {
  await rm(path, { force: true }).catch(() => {});
}

/**
 * A file written under a temporary name in its final folder and renamed into place on commit()
 * (rename(2) within one file system replaces the name atomically, POSIX.1-2017). Until commit() an
 * existing file of the final name is untouched; abort() removes the temporary file.
 */
export class AtomicFile {
  /** Bytes not yet written (the first `used` of one buffer, reused: no allocation per chunk written). */
  private buffer: Buffer | null = null;
  private used = 0;
  private bytes = 0;
  private readonly hash = createHash('sha256');
  private done = false;
  private sealed: WrittenFile | null = null;

  private constructor(readonly path: string, private readonly tmp: string, private readonly fh: FileHandle) {}

  static async create(path: string): Promise<AtomicFile> {
    const dir = dirname(path);
    await makeFolder(dir);
    const tmp = temporaryName(path);
    registerTemporary(tmp);
    let fh: FileHandle;
    try {
      fh = await open(tmp, 'wx');
    } catch (e) {
      releaseTemporary(tmp);
      throw withPath(e, path);
    }
    return new AtomicFile(path, tmp, fh);
  }

  /**
   * Buffers text or bytes; written to the temporary file 256 KiB at a time. A run writes a chunk per
   * epoch: copied into one buffer, they leave no garbage behind (a Buffer per chunk left tens of MB of
   * a day's outputs waiting for the collector).
   */
  async write(chunk: string | Uint8Array): Promise<void> {
    const n = typeof chunk === 'string' ? Buffer.byteLength(chunk, 'utf8') : chunk.byteLength;
    if (n === 0) return;
    this.buffer ??= Buffer.allocUnsafe(1 << 18);
    if (n > this.buffer.length - this.used) await this.flush();
    if (n > this.buffer.length) {
      await this.writeOut(typeof chunk === 'string' ? Buffer.from(chunk, 'utf8') : chunk);
      return;
    }
    if (typeof chunk === 'string') this.used += this.buffer.write(chunk, this.used, 'utf8');
    else { this.buffer.set(chunk, this.used); this.used += n; }
  }

  private async flush(): Promise<void> {
    if (this.used === 0 || !this.buffer) return;
    const n = this.used;
    this.used = 0;
    await this.writeOut(this.buffer.subarray(0, n));
  }

  /** Hashes and writes bytes to the temporary file. */
  private async writeOut(buf: Uint8Array): Promise<void> {
    this.hash.update(buf);
    let off = 0;
    try {
      while (off < buf.length) {
        const { bytesWritten } = await this.fh.write(buf, off, buf.length - off);
        off += bytesWritten;
      }
    } catch (e) {
      throw withPath(e, this.path);
    }
    this.bytes += buf.length;
  }

  /**
   * Phase 1 of a commit: flushes, fsyncs and closes the temporary file; the final name is not touched
   * yet. Returns what the file will hold (path under its final name, bytes, SHA-256). On failure the
   * temporary file is removed and the error rethrown.
   */
  async seal(): Promise<WrittenFile> {
    if (this.sealed) return this.sealed;
    if (this.done) throw new Error(`${this.path}: already committed or aborted`);
    try {
      await this.flush();
      this.buffer = null;
      await this.fh.sync();
      await this.fh.close();
    } catch (e) {
      await this.abort();
      throw withPath(e, this.path);
    }
    this.sealed = { path: this.path, bytes: this.bytes, sha256: this.hash.digest('hex') };
    return this.sealed;
  }

  /** Phase 2: renames the sealed temporary file into place (the folder is not fsynced here). */
  async publish(): Promise<WrittenFile> {
    const w = await this.seal();
    if (this.done) throw new Error(`${this.path}: already committed or aborted`);
    try {
      await rename(this.tmp, this.path);
    } catch (e) {
      await this.abort();
      throw withPath(e, this.path);
    }
    this.done = true;
    releaseTemporary(this.tmp);
    return w;
  }

  /** Seals and renames into place, then fsyncs the folder. On failure the temporary file is removed and the error rethrown. */
  async commit(): Promise<WrittenFile> {
    const w = await this.publish();
    await syncFolder(dirname(this.path));
    return w;
  }

  /** Drops the temporary file (open or sealed); the final name is left as it was. No-op once published. */
  async abort(): Promise<void> {
    if (this.done) return;
    this.done = true;
    if (!this.sealed) await this.fh.close().catch(() => {});
    await removeQuietly(this.tmp);
    releaseTemporary(this.tmp);
  }

  /** The rename that publishes this sealed file, handed to a journalled commit (the file counts as published). */
  takeRenameStep(): readonly [string, string] {
    if (!this.sealed || this.done) throw new Error(`${this.path}: not sealed, or already committed or aborted`);
    this.done = true;
    return [this.tmp, this.path];
  }

  /** The temporary file's path (tests). */
  get temporaryPath(): string {
    return this.tmp;
  }
}

/**
 * A set of output files committed together: every file is written under a temporary name; commit()
 * first seals them all (flush, fsync, close: phase 1, where nearly every failure happens: full disk,
 * I/O errors), then renames them all into place (phase 2), the `last` file (the set's index, e.g.
 * summary.json) after the others. Before the renames begin, the old version of the last file is
 * removed, so a set that could not be renamed completely is never described by a stale index.
 * On any failure every temporary file not yet renamed is closed and removed. abort() drops the
 * whole set and leaves earlier outputs as they were.
 */
export class OutputSet {
  private readonly files: { readonly kind: string; readonly file: AtomicFile }[] = [];
  private closed = false;

  /** Opens a member; `kind` is the name given in summaries and events ('epochs', 'points'...). */
  async create(kind: string, path: string): Promise<AtomicFile> {
    if (this.closed) throw new Error(`output set already committed or aborted (adding ${path})`);
    try {
      const f = await AtomicFile.create(path);
      this.files.push({ kind, file: f });
      return f;
    } catch (e) {
      await this.abort();
      throw e;
    }
  }

  /** A member written in one go. */
  async add(kind: string, path: string, chunks: Iterable<string | Uint8Array>): Promise<AtomicFile> {
    const f = await this.create(kind, path);
    try {
      for (const c of chunks) await f.write(c);
    } catch (e) {
      await this.abort();
      throw e;
    }
    return f;
  }

  /** The temporary file of a member (readable once sealed), undefined when the set has no such member. */
  temporaryPathOf(kind: string): string | undefined {
    return this.files.find((f) => f.kind === kind)?.file.temporaryPath;
  }

  get kinds(): readonly string[] {
    return this.files.map((f) => f.kind);
  }

  /** Phase 1 for every member so far: their final contents, sizes and hashes. Aborts the set on failure. */
  async seal(): Promise<{ readonly kind: string; readonly written: WrittenFile }[]> {
    const out: { kind: string; written: WrittenFile }[] = [];
    try {
      for (const { kind, file } of this.files) out.push({ kind, written: await file.seal() });
    } catch (e) {
      await this.abort();
      throw e;
    }
    return out;
  }

  /**
   * Seals every member, then renames them in the order they were created (so the member created last,
   * the index, is renamed last), then fsyncs the folders. Aborts what is left on failure.
   */
  async commit(): Promise<{ readonly kind: string; readonly written: WrittenFile }[]> {
    const sealed = await this.seal();
    this.closed = true;
    try {
      const last = this.files[this.files.length - 1];
      const removes: string[] = [];
      if (last && this.files.length > 1) {
        // The old index first, and the old members it lists that the new set does not have: the set on
        // disk is then never described by an index that does not match it.
        removes.push(...(await formerMembers(last.file.path, new Set(this.files.map((f) => f.file.path)))), last.file.path);
      }
      const steps = this.files.map(({ file }) => file.takeRenameStep());
      commitWithJournal(dirname(last!.file.path), steps, removes);
    } catch (e) {
      for (const { file } of this.files) await file.abort();
      throw withPath(e, this.files[this.files.length - 1]?.file.path ?? '');
    }
    for (const dir of new Set(this.files.map((f) => dirname(f.file.path)))) await syncFolder(dir);
    return sealed;
  }

  /** Closes and removes every temporary file not yet renamed. */
  async abort(): Promise<void> {
    this.closed = true;
    for (const { file } of this.files) await file.abort();
  }
}

/** Paths an existing index (summary JSON with an `outputs` list) names in its own folder, other than `keep`. */
async function formerMembers(indexPath: string, keep: ReadonlySet<string>): Promise<string[]> {
  try {
    const doc = JSON.parse(await readFile(indexPath, 'utf8')) as { outputs?: { path?: unknown }[] };
    const dir = dirname(indexPath);
    return (doc.outputs ?? [])
      .map((o) => (typeof o?.path === 'string' ? o.path : ''))
      .filter((p) => p !== '' && dirname(p) === dir && p !== indexPath && !keep.has(p));
  } catch {
    return [];
  }
}

/** A system error with the path of the output it concerns (fs write errors on a handle carry none). */
function withPath(e: unknown, path: string): unknown {
  const err = e as NodeJS.ErrnoException;
  if (err && typeof err === 'object' && typeof err.code === 'string' && typeof err.path !== 'string' && path) err.path = path;
  return e;
}

/** fsync of the folder so a rename survives a crash (common practice on POSIX file systems). */
async function syncFolder(dir: string): Promise<void> {
  try {
    const d = await open(dir, 'r');
    try { await d.sync(); } finally { await d.close(); }
  } catch {
    // Some platforms cannot open a folder for fsync; the data file itself is already synced.
  }
}

/** Writes `chunks` to `path` atomically (see AtomicFile). Nothing half-written is ever left under `path`. */
export async function writeFileAtomic(
  path: string,
  chunks: Iterable<string | Uint8Array> | AsyncIterable<string | Uint8Array>,
): Promise<WrittenFile> {
  const f = await AtomicFile.create(path);
  try {
    for await (const c of chunks as AsyncIterable<string | Uint8Array>) await f.write(c);
  } catch (e) {
    await f.abort();
    throw e;
  }
  return f.commit();
}
