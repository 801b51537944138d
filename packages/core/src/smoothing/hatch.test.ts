/**
 * Hatch filter tests. All are self-consistency checks on synthetic data (labelled as such), with the
 * expected magnitudes from Navipedia "Carrier-smoothing of code pseudoranges" (check-values.md,
 * "Carrier smoothing") where one exists.
 */
import { describe, expect, it } from 'vitest';
import { CarrierSmoother } from './hatch.js';
import type { SmootherInput } from './hatch.js';
import { MILLISECOND_RANGE_M, detectMillisecondClockJump } from './clock-jump.js';
import { rng, gauss } from '../../../../test/support/random.js';

const LAMBDA_L1 = 299792458 / 1575.42e6;


/** One satellite whose range grows linearly; code noisy, carrier exact (integer ambiguity 1e6 cycles). */
function obs(sat: string, t: number, opts: { noise?: number; r?: () => number; codeOffset?: number; phaseOffsetM?: number; lli?: number; ionoM?: number } = {}): SmootherInput {
  const rangeM = 2.2e7 + 150 * t + 1000 * sat.charCodeAt(2);
  const iono = opts.ionoM ?? 0;
  const noise = opts.noise && opts.r ? opts.noise * gauss(opts.r) : 0;
  return {
    sat,
    codeM: rangeM + iono + noise + (opts.codeOffset ?? 0),
    phaseCycles: (rangeM - iono + (opts.phaseOffsetM ?? 0)) / LAMBDA_L1 + 1e6,
    wavelengthM: LAMBDA_L1,
    lli: opts.lli ?? 0,
  };
}
const trueRange = (sat: string, t: number) => 2.2e7 + 150 * t + 1000 * sat.charCodeAt(2);

describe('Hatch carrier smoother', () => {
  it('reduces white code noise roughly by sqrt(N) (self-consistency)', () => {
    // N = 100; a fixed-length Hatch filter is an exponential average: std ratio sqrt(1/(2N-1)) = 0.071
    const s = new CarrierSmoother({ intervalS: 1, timeConstantS: 100 });
    const r = rng(42);
    let sum2raw = 0, sum2sm = 0, count = 0;
    for (let t = 0; t < 6000; t++) {
      const o = obs('G05', t, { noise: 1, r });
      const [res] = s.update(t, [o]);
      if (t >= 300) {
        sum2raw += (o.codeM - trueRange('G05', t)) ** 2;
        sum2sm += (res.smoothedM - trueRange('G05', t)) ** 2;
        count++;
      }
      if (t === 250) expect(res.n).toBe(100);
    }
    const ratio = Math.sqrt(sum2sm / count) / Math.sqrt(sum2raw / count);
    expect(ratio).toBeGreaterThan(0.05);
    expect(ratio).toBeLessThan(0.1); // ~1/sqrt(N)
  });

  it('the time constant is in seconds whatever the nominal interval says (self-consistency)', () => {
    // Header claims 30 s, data come every second: the filter must still average over ~100 s.
    const s = new CarrierSmoother({ intervalS: 30, timeConstantS: 100, gapThresholdS: 60 });
    const r = rng(7);
    let sum2raw = 0, sum2sm = 0, count = 0;
    for (let t = 0; t < 6000; t++) {
      const o = obs('G07', t, { noise: 1, r });
      const [res] = s.update(t, [o]);
      if (t >= 300) {
        sum2raw += (o.codeM - trueRange('G07', t)) ** 2;
        sum2sm += (res.smoothedM - trueRange('G07', t)) ** 2;
        count++;
      }
    }
    const ratio = Math.sqrt(sum2sm / count) / Math.sqrt(sum2raw / count);
    expect(ratio).toBeLessThan(0.1);
  });

  it('restarts on loss of lock (LLI bit 0) and on a change of the half-cycle bit, not on a steady one', () => {
    const s = new CarrierSmoother({ intervalS: 1, timeConstantS: 100 });
    expect(s.update(0, [obs('G01', 0), obs('G02', 0), obs('G03', 0, { lli: 2 })]).map((x) => x.reason)).toEqual(['start', 'start', 'start']);
    for (let t = 1; t < 20; t++) s.update(t, [obs('G01', t), obs('G02', t), obs('G03', t, { lli: 2 })]);
    // RINEX 3.05 5.3 LLI: bit 0 lost lock, bit 1 half-cycle ambiguity possible
    const out = s.update(20, [obs('G01', 20, { lli: 1, phaseOffsetM: 3 * LAMBDA_L1 }), obs('G02', 20, { lli: 2 }), obs('G03', 20, { lli: 2 })]);
    expect(out[0]).toMatchObject({ restarted: true, n: 1 });
    expect(out[0].reason).toMatch(/loss of lock/);
    expect(out[1]).toMatchObject({ restarted: true, n: 1 });
    expect(out[1].reason).toMatch(/half-cycle/);
    expect(out[2]).toMatchObject({ restarted: false, n: 21 });
  });

  it('a slip of a few cycles that the code cannot see is found by the Doppler; a change common to all satellites is not a slip', () => {
    // Doppler of the modelled range rate (150 m/s), RINEX sign: a positive Doppler shortens the range.
    const withDoppler = (x: SmootherInput): SmootherInput => ({ ...x, dopplerHz: -150 / LAMBDA_L1 });
    const sats = ['G01', 'G02', 'G03', 'G04'];
    const s = new CarrierSmoother({ intervalS: 1, timeConstantS: 100 });
    for (let t = 0; t < 10; t++) s.update(t, sats.map((p) => withDoppler(obs(p, t))));
    const out = s.update(10, sats.map((p) => withDoppler(obs(p, 10, { phaseOffsetM: p === 'G02' ? 5 * LAMBDA_L1 : 0 }))));
    expect(out.map((x) => x.restarted)).toEqual([false, true, false, false]);
    expect(out[1].reason).toMatch(/Doppler/);
    // The same 5 more cycles on every satellite (G02 keeps its slip): a receiver clock term, common, not a slip.
    const common = s.update(11, sats.map((p) => withDoppler(obs(p, 11, { phaseOffsetM: (p === 'G02' ? 10 : 5) * LAMBDA_L1 }))));
    expect(common.map((x) => x.restarted)).toEqual([false, false, false, false]);
  });

  it('restarts after a gap and on a large code-minus-carrier jump', () => {
    const s = new CarrierSmoother({ intervalS: 1 });
    for (let t = 0; t < 10; t++) s.update(t, [obs('G03', t), obs('G04', t), obs('G06', t)]);
    // one missed epoch is tolerated
    expect(s.update(11, [obs('G03', 11), obs('G04', 11), obs('G06', 11)])[0].restarted).toBe(false);
    for (let t = 12; t < 15; t++) s.update(t, [obs('G04', t), obs('G06', t)]);
    // G03 silent for 4 s -> gap; G04 phase slips by 200 cycles (~38 m) unflagged -> code-minus-carrier jump
    const out = s.update(15, [obs('G03', 15), obs('G04', 15, { phaseOffsetM: 200 * LAMBDA_L1 })]);
    expect(out[0].reason).toMatch(/gap/);
    expect(out[1].reason).toMatch(/code-minus-carrier jump/);
  });

  it('repairs a 1 ms receiver clock jump on all satellites (code jumps, carrier does not)', () => {
    const s = new CarrierSmoother({ intervalS: 1, timeConstantS: 100 });
    const sats = ['G07', 'G08', 'G09', 'G10', 'G11'];
    for (let t = 0; t < 50; t++) s.update(t, sats.map((p) => obs(p, t)));
    for (let t = 50; t < 60; t++) {
      const out = s.update(t, sats.map((p) => obs(p, t, { codeOffset: MILLISECOND_RANGE_M })));
      for (const [i, o] of out.entries()) {
        expect(o.restarted).toBe(false);
        expect(o.n).toBe(t + 1);
        // the smoothed code follows the jumped code exactly (noise-free data)
        expect(o.smoothedM - trueRange(sats[i], t) - MILLISECOND_RANGE_M).toBeCloseTo(0, 6);
      }
      if (t === 50) expect(s.clockJump).toMatchObject({ milliseconds: 1, satellites: 5 });
      else expect(s.clockJump).toBeNull();
    }
  });

  it('repairs a clock jump seen in the carrier only, and a jump on both is not a jump at all', () => {
    const s = new CarrierSmoother({ intervalS: 1 });
    const sats = ['G12', 'G13', 'G14', 'G15'];
    for (let t = 0; t < 10; t++) s.update(t, sats.map((p) => obs(p, t)));
    const out = s.update(10, sats.map((p) => obs(p, 10, { phaseOffsetM: -MILLISECOND_RANGE_M })));
    expect(out.every((o) => !o.restarted)).toBe(true);
    expect(s.clockJump?.milliseconds).toBe(1);
    const out2 = s.update(11, sats.map((p) => obs(p, 11, { phaseOffsetM: -MILLISECOND_RANGE_M, codeOffset: MILLISECOND_RANGE_M })));
    expect(out2.every((o) => !o.restarted)).toBe(true);
  });

  it('code-carrier divergence: a growing ionosphere biases the smoothed code by about -2 tau dI/dt', () => {
    // Navipedia "Carrier-smoothing": code-minus-carrier drifts by twice the ionospheric change; the
    // steady-state lag of the recursion is -(N-1) 2 dI/dt dt ~ -2 tau dI/dt (derived here, sign: smoothed < code)
    const rate = 1e-3; // m/s, i.e. 3.6 m/h
    const s = new CarrierSmoother({ intervalS: 1, timeConstantS: 100 });
    let last = { smoothedM: 0, codeM: 0 };
    for (let t = 0; t < 2000; t++) {
      const o = obs('G20', t, { ionoM: 5 + rate * t });
      const [res] = s.update(t, [o]);
      last = { smoothedM: res.smoothedM, codeM: o.codeM };
    }
    const bias = last.smoothedM - last.codeM;
    expect(bias).toBeLessThan(0);
    expect(bias).toBeCloseTo(-2 * rate * 100, 2);
  });
});

describe('millisecond clock-jump detector', () => {
  it('finds a common whole-millisecond change and ignores satellite-specific ones', () => {
    // c * 1 ms = 299792.458 m (SI speed of light)
    expect(detectMillisecondClockJump([299792.9, 299791.8, 299792.2, NaN])).toMatchObject({ milliseconds: 1, satellites: 3 });
    expect(detectMillisecondClockJump([-599585.3, -599584.6])).toMatchObject({ milliseconds: -2 });
    expect(detectMillisecondClockJump([0.3, -0.2, 38.1])).toBeNull();
    // one satellite only slipped by a large amount: not a clock jump (majority rule)
    expect(detectMillisecondClockJump([299792.4, 0.1, -0.3, 0.2])).toBeNull();
    // a change far from a whole millisecond
    expect(detectMillisecondClockJump([150000, 150001, 149999])).toBeNull();
  });
});
