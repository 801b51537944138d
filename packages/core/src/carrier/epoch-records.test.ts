/**
 * Records kept in chunks and read back in any order, forwards and backwards as the passes do: every field
 * comes back bit for bit (a storage round trip, common practice; the values are arbitrary).
 */
import { describe, expect, it } from 'vitest';
import { CHUNK_SATELLITES, EpochRecords, type RecordStore } from './epoch-records.js';
import { SharedBufferStore } from './shared-buffer-store.test-support.js';


const satsAt = (k: number): number => 5 + (k % 9);
const value = (k: number, i: number): number => Math.fround(Math.sin(k * 7.1 + i * 0.37));

function record(store: RecordStore, epochs: number): EpochRecords {
  const rec = new EpochRecords(store);
  for (let k = 0; k < epochs; k++) {
    rec.beginEpoch(1e9 + k, 1e9 + k - 1e-7, { x: 4e6 + k, y: 6e5 - k, z: 4.6e6 + 0.5 * k }, k % 3 === 0, k % 31, k % 4);
    if (k % 5 === 0) rec.setVelocity(k, 0.1 * k, -0.2, 0.3, 0.05);
    rec.reason[rec.indexOf(k)] = k % 7;
    for (let i = 0; i < satsAt(k); i++) {
      rec.addSatellite(k, i, k * 10 + i, 2e4 + k + i / 3, -1e3 + k * 0.001 + i, value(k, i), value(k, i + 1), value(k, i + 2), value(k, i + 3), (k + i) % 2 === 0);
    }
    // While recording, the previous epoch's entries are still there (the reading compares the two).
    if (k > 0) {
      const p = k - 1, i0 = rec.satStart[rec.indexOf(p)];
      for (let i = 0; i < satsAt(p); i++) if (rec.arc[i0 + i] !== p * 10 + i || rec.phaseM[i0 + i] !== 2e4 + p + i / 3) throw new Error(`epoch ${p} lost while recording epoch ${k}`);
    }
  }
  return rec;
}

function expectEpoch(rec: EpochRecords, k: number): void {
  const e = rec.visit(k);
  expect([rec.timeGpsS[e], rec.tagGpsS[e], rec.isStatic[e], rec.referenceAgeS[e], rec.context[e]]).toEqual([1e9 + k, 1e9 + k - 1e-7, k % 3 === 0 || k < 50 ? 1 : 0, k % 31, k % 4]);
  expect(rec.x0[3 * e + 2]).toBe(4.6e6 + 0.5 * k);
  expect(rec.reason[e]).toBe(k % 7);
  expect(rec.velocity[4 * e]).toBe(k % 5 === 0 ? 0.1 * k : NaN);
  expect(rec.satCount[e]).toBe(satsAt(k));
  const j0 = rec.satStart[e];
  for (let i = 0; i < satsAt(k); i++) {
    const j = j0 + i;
    expect([rec.sat[j], rec.arc[j], rec.phaseM[j], rec.codeM[j], rec.los[3 * j + 2], rec.elevationRad[j], rec.fixable[j]])
      .toEqual([i, k * 10 + i, 2e4 + k + i / 3, -1e3 + k * 0.001 + i, value(k, i + 2), value(k, i + 3), (k + i) % 2 === 0 ? 1 : 0]);
  }
}

describe('carrier records in chunks (storage round trip)', () => {
  const epochs = Math.ceil((3.5 * CHUNK_SATELLITES) / 9);

  it('reads every epoch back forwards, backwards and at random, across chunk boundaries', () => {
    const store = new SharedBufferStore();
    const rec = record(store, epochs);
    // The epochs before the first start-moving event are static (marked when the reading ends).
    rec.staticBefore(50);
    expect(rec.count).toBe(epochs);
    expect(rec.firstIntervalsS.length).toBe(2000);
    for (let k = 0; k < epochs; k += 37) expectEpoch(rec, k);
    // Session-wide entry indices: epoch k's first entry is the sum of the satellites of the epochs before it.
    let before = 0;
    for (let k = 0; k < epochs; k++) {
      if (k % 97 === 0) { const e = rec.visit(k); expect(rec.satBase + rec.satStart[e]).toBe(before); }
      before += satsAt(k);
    }
    expect(rec.satTotal).toBe(before);
    for (let k = epochs - 1; k >= 0; k -= 41) expectEpoch(rec, k);
    expect(store.blocks).toBeGreaterThanOrEqual(4);
    // Another user of the store in between (the stored forward pass) does not disturb the current chunk.
    rec.visit(epochs - 1);
    store.get(0);
    expectEpoch(rec, epochs - 1);
  });

});
