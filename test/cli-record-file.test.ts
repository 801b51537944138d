/** The carrier records' temporary file: blocks read back bit for bit, nothing left in the folder (common practice for temporary files). */
import { mkdtempSync, readdirSync } from 'node:fs';
import { tmpdir } from 'node:os';
import { join } from 'node:path';
import { describe, expect, it } from 'vitest';
import { FileRecordStore } from '../packages/cli/src/record-file.js';

describe('FileRecordStore', () => {
  it('gives back every block as written and leaves no file behind', () => {
    const dir = mkdtempSync(join(tmpdir(), 'rd-records-'));
    const store = new FileRecordStore(dir);
    const blocks = [3, 100_000, 0, 17].map((n, b) => Uint8Array.from({ length: n }, (_, i) => (i * 31 + b) & 255));
    const ids = blocks.map((b) => store.put(b));
    expect(readdirSync(dir)).toEqual([]);
    for (const i of [3, 1, 0, 2, 1]) expect(Array.from(store.get(ids[i]))).toEqual(Array.from(blocks[i]));
    expect(store.get(ids[1]).byteOffset % 8).toBe(0);
    store.close();
    expect(() => store.get(ids[0])).toThrow(/closed/);
    expect(readdirSync(dir)).toEqual([]);
  });
});
