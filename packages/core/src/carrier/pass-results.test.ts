/**
 * The passes' results kept chunk by chunk in the records' store: written forwards, combined backwards in
 * place, read forwards; every value comes back bit for bit (a storage round trip, common practice; the
 * values are arbitrary, and the combinations used are the one-pass ones, whose result is that pass's).
 */
import { describe, expect, it } from 'vitest';
import { CHUNK_SATELLITES, EpochRecords, type RecordStore } from './epoch-records.js';
import { EpochResult } from './float-filter.js';
import { combineEpoch } from './combine-passes.js';
import { PassResults } from './pass-results.js';
import { SharedBufferStore } from './shared-buffer-store.test-support.js';


const satsAt = (k: number): number => 5 + (k % 9);

function record(store: RecordStore, epochs: number): EpochRecords {
  const rec = new EpochRecords(store);
  for (let k = 0; k < epochs; k++) {
    rec.beginEpoch(1e9 + k, 1e9 + k, { x: 4e6, y: 6e5, z: 4.6e6 }, false, 1, 0);
    for (let i = 0; i < satsAt(k); i++) rec.addSatellite(k, i, 1, 0, 0, 0, 0, 1, 0.5, true);
  }
  return rec;
}

/** A pass's result at epoch k: kind from `kind`, values from `pass` (1 forward, 2 backward). */
function resultAt(r: EpochResult, k: number, kind: number, pass: number): EpochResult {
  r.start(satsAt(k));
  r.kind = kind;
  r.satellitesUsed = satsAt(k) - pass;
  r.ratio = kind === 2 ? 3 + k / 7 : NaN;
  r.fixedAmbiguities = kind === 2 ? 4 : 0;
  if (kind > 0) {
    for (let a = 0; a < 3; a++) { r.position[a] = 4e6 + k + a / 3 + pass; r.floatPosition[a] = r.position[a] + 0.01; }
    for (let a = 0; a < 6; a++) { r.covariance[a] = 1e-4 * (a + 1) * pass; r.floatCovariance[a] = 2 * r.covariance[a]; }
    for (let i = 0; i < satsAt(k); i++) r.residualM[i] = Math.fround(0.001 * i - 0.0001 * k * pass);
  }
  return r;
}

describe('pass results in chunks (storage round trip)', () => {
  it('writes forwards, combines backwards in place and reads forwards across chunk boundaries', () => {
    const epochs = Math.ceil((3.5 * CHUNK_SATELLITES) / 9);
    // One store for the records and the results, as in a session.
    const store = new SharedBufferStore();
    const rec = record(store, epochs);
    const results = new PassResults(rec, store);
    // Forward: epochs k % 3 = 0 unsolved, 1 float, 2 fixed. Backward: solved (float) only where forward is not.
    const forwardKind = (k: number): number => k % 3;
    const backwardKind = (k: number): number => (k % 3 === 0 ? 1 : 0);
    const r = new EpochResult();
    for (let k = 0; k < epochs; k++) { rec.visit(k); results.putForward(k, resultAt(r, k, forwardKind(k), 1)); }
    for (let k = epochs - 1; k >= 0; k--) {
      const e = rec.visit(k);
      const i = results.at(k, 'combine');
      combineEpoch(results, i, rec.satStart[e], rec.satCount[e], resultAt(r, k, backwardKind(k), 2), 0.05);
    }
    results.finish();
    const expected = new EpochResult();
    for (let k = 0; k < epochs; k++) {
      const ep = rec.visit(k);
      const i = results.at(k, 'read');
      const pass = forwardKind(k) > 0 ? 1 : 2;
      const e = resultAt(expected, k, Math.max(forwardKind(k), backwardKind(k)), pass);
      expect([results.kind[i], results.forwardKind[i], results.backwardKind[i]]).toEqual([e.kind, forwardKind(k), backwardKind(k)]);
      expect([...results.position.subarray(3 * i, 3 * i + 3)]).toEqual([...e.position]);
      expect([...results.covariance.subarray(6 * i, 6 * i + 6)]).toEqual([...e.covariance]);
      expect(results.fixedAmbiguities[i]).toBe(e.fixedAmbiguities);
      // Combined: the larger ratio (none: 0) and the larger number of satellites used.
      expect(results.ratio[i]).toBe(Math.fround(e.kind === 2 ? e.ratio : 0));
      expect(results.satellitesUsed[i]).toBe(satsAt(k) - 1);
      expect([...results.residualM.subarray(rec.satStart[ep], rec.satStart[ep] + satsAt(k))]).toEqual([...e.residualM.subarray(0, satsAt(k))]);
    }
    results.release();
  });
});
