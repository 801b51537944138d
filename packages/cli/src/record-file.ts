/**
 * The carrier-phase engine's records in a temporary file (the core's RecordStore): a day at 1 Hz keeps
 * about 38 MB of records (epochs and their satellites) for its passes and 2 x 16 MB of pass results (the
 * forward pass's, then the combined ones), which then leave the process's memory (the system's file
 * cache holds them while they are read back).
 *
 * The file is removed as soon as it is opened: its open descriptor keeps the data until close, so
 * nothing is left behind even when the process is killed (POSIX; where an open file cannot be removed,
 * it is removed at close).
 */
import { closeSync, openSync, readSync, rmSync, unlinkSync, writeSync } from 'node:fs';
import { randomBytes } from 'node:crypto';
import { tmpdir } from 'node:os';
import { join } from 'node:path';
import type { RecordStore } from '@refdelta/core';

export class FileRecordStore implements RecordStore {
  private fd: number | null;
  private path: string | null;
  private readonly offsets: number[] = [];
  private readonly lengths: number[] = [];
  private end = 0;
  /** Every block is read into this buffer (RecordStore.get: valid until the next get). */
  private buffer = new Uint8Array(0);

  constructor(dir: string = tmpdir()) {
    const path = join(dir, `.refdelta-records-${process.pid}-${randomBytes(6).toString('hex')}`);
    this.fd = openSync(path, 'wx+');
    this.path = path;
    try {
      unlinkSync(path);
      this.path = null;
    } catch {
      // removed at close
    }
  }

  private descriptor(): number {
    if (this.fd === null) throw new Error('the temporary record file is closed');
    return this.fd;
  }

  put(bytes: Uint8Array): number {
    const fd = this.descriptor();
    for (let done = 0; done < bytes.length;) done += writeSync(fd, bytes, done, bytes.length - done, this.end + done);
    this.offsets.push(this.end);
    this.lengths.push(bytes.length);
    this.end += bytes.length;
    return this.offsets.length - 1;
  }

  get(block: number): Uint8Array {
    const fd = this.descriptor();
    const n = this.lengths[block];
    if (n === undefined) throw new RangeError(`record block ${block} was never stored`);
    if (this.buffer.length < n) this.buffer = new Uint8Array(n);
    const out = this.buffer.subarray(0, n);
    for (let got = 0; got < n;) {
      const r = readSync(fd, out, got, n - got, this.offsets[block] + got);
      if (r === 0) throw new Error(`the temporary record file ended early (block ${block})`);
      got += r;
    }
    return out;
  }

  close(): void {
    if (this.fd !== null) closeSync(this.fd);
    this.fd = null;
    this.buffer = new Uint8Array(0);
    if (this.path !== null) rmSync(this.path, { force: true });
    this.path = null;
  }
}
