/** Test support (not built): a record store for the carrier record tests. */
import { MemoryRecordStore, type RecordStore } from './epoch-records.js';

/** A store that counts its blocks and hands out one shared buffer (valid until its next get), as the command line's file store does. */
export class SharedBufferStore implements RecordStore {
  private readonly inner = new MemoryRecordStore();
  private buffer = new Uint8Array(0);
  blocks = 0;
  put(bytes: Uint8Array): number { this.blocks++; return this.inner.put(bytes); }
  get(block: number): Uint8Array {
    const b = this.inner.get(block);
    if (this.buffer.length < b.length) this.buffer = new Uint8Array(b.length);
    this.buffer.set(b);
    return this.buffer.subarray(0, b.length);
  }
  close(): void { this.inner.close(); }
}
