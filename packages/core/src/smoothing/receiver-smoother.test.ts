/**
 * Carrier smoothing of a receiver forwards, and forwards + backwards from recorded arcs (self-consistency:
 * synthetic code = range + white noise, carrier = range / lambda + an integer).
 */
import { describe, expect, it } from 'vitest';
import type { ObsEpoch, SatId } from '../gnss/index.js';
import { ReceiverSmoother, SmoothingArcs } from './receiver-smoother.js';
import { rng, gauss } from '../../../../test/support/random.js';

const LAMBDA_L1 = 299_792_458 / 1575.42e6;
const CODES = ['C1C', 'L1C'];

function epochs(n: number, noiseM: number, slipAt: number): ObsEpoch[] {
  const r = rng(7);
  const out: ObsEpoch[] = [];
  for (let t = 0; t < n; t++) {
    const sats = (['G01', 'G02', 'G03'] as SatId[]).map((sat, i) => {
      const range = 2.2e7 + 120 * t + 1e5 * i;
      const slip = sat === 'G02' && t >= slipAt ? 40 : 0;
      const g = gauss(r);
      return { sat, codes: CODES, values: Float64Array.from([range + noiseM * g, range / LAMBDA_L1 + 1e6 + slip]), lli: new Uint8Array(2), ssi: new Uint8Array(2) };
    });
    out.push({ tagGpsS: 1e9 + t, flag: 0, receiverClockOffsetS: null, line: t + 1, sats, event: null });
  }
  return out;
}

const truth = (sat: SatId, t: number) => 2.2e7 + 120 * t + 1e5 * Number(sat.slice(1)) - 1e5;

describe('receiver carrier smoothing, forwards and combined (self-consistency)', () => {
  const data = epochs(600, 1.0, 1e9);
  const errorsOf = (s: ReceiverSmoother, first: number) => {
    const err: number[] = [];
    for (const e of data) {
      const m = s.update(e);
      const t = e.tagGpsS - 1e9;
      if (t < first) err.push(Math.abs(m.get('G01')!.get('C1C')! - truth('G01', t)));
    }
    return Math.max(...err);
  };

  it('forwards and backwards combined, an arc starts converged; forwards alone it starts with raw code', () => {
    const forward = errorsOf(new ReceiverSmoother(1, 100, ['G'], new Map(), 30), 10);
    const arcs = new SmoothingArcs(100);
    const rec = new ReceiverSmoother(1, 100, ['G'], new Map(), 30, 'record', arcs);
    for (const e of data) rec.update(e);
    arcs.finish();
    const combined = errorsOf(new ReceiverSmoother(1, 100, ['G'], new Map(), 30, 'combined', arcs), 10);
    // White noise of 1 m: the first 10 forward epochs average 1-10 samples; the two-sided window ~200.
    expect(forward).toBeGreaterThan(2 * combined);
    expect(combined).toBeLessThan(0.3);
  });

  it('the variance factor of a combined value is below one and at least 1/N_eff', () => {
    const arcs = new SmoothingArcs(100);
    const rec = new ReceiverSmoother(1, 100, ['G'], new Map(), 30, 'record', arcs);
    for (const e of data) rec.update(e);
    arcs.finish();
    const s = new ReceiverSmoother(1, 100, ['G'], new Map(), 30, 'combined', arcs);
    s.update(data[0]);
    const f = s.factors.get('G01')!.get('C1C')!;
    expect(f).toBeLessThan(1);
    expect(f).toBeGreaterThan(1 / 300);
  });

  it('a flag-6 epoch (cycle-slip records, RINEX 3.05 5.3.3) restarts its satellites', () => {
    const s = new ReceiverSmoother(1, 100, ['G'], new Map(), 30);
    const clean = epochs(30, 0, 20);
    for (let i = 0; i < 20; i++) s.update(clean[i]);
    // A 40-cycle slip on G02 at epoch 20 is below the 10 m code-minus-carrier test; the receiver reports it.
    s.slipsReported({ ...clean[20], flag: 6, sats: [clean[20].sats[1]] });
    const m = s.update(clean[20]);
    expect(Math.abs(m.get('G02')!.get('C1C')! - truth('G02', 20))).toBeLessThan(1e-6);
  });
});
