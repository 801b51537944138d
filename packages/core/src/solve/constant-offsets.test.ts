/**
 * Session-constant offsets from correlated samples (self-consistency: series drawn here with a known
 * offset and AR(1) noise, whose variance of the mean is known in closed form: Box & Jenkins, AR(1)).
 */
import { describe, expect, it } from 'vitest';
import { ConstantOffsetSamples, estimateConstantOffset } from './constant-offsets.js';
import { rng, gauss } from '../../../../test/support/random.js';

function ar1(n: number, phi: number, sigma: number, seed: number): Float64Array {
  const r = rng(seed);
  const x = new Float64Array(n);
  let v = 0;
  const innovation = sigma * Math.sqrt(1 - phi * phi);
  for (let i = 0; i < n; i++) { v = phi * v + innovation * gauss(r); x[i] = v; }
  return x;
}

describe('constant offsets of a session (self-consistency)', () => {
  it('a 1.5 m offset in AR(1) noise (phi 0.9, 1 m): found within 3 sigma, significant, stable; sigma allows for the correlation', () => {
    const n = 2000, phi = 0.9;
    const x = ar1(n, phi, 1, 11).map((v) => v + 1.5);
    const e = estimateConstantOffset(x, 0.001)!;
    expect(Math.abs(e.offsetM - 1.5)).toBeLessThan(3 * e.sigmaM);
    expect(e.significant).toBe(true);
    expect(e.stable).toBe(true);
    // AR(1): var(mean) = sigma^2 / n (1 + phi) / (1 - phi); the iid value would be sqrt(19) times too small.
    const arSigma = Math.sqrt(((1 + phi) / (1 - phi)) / n);
    expect(e.sigmaM).toBeGreaterThan(0.7 * arSigma);
    expect(e.nEff).toBeLessThan(n / 5);
  });

  it('no offset: not significant at 0.1 % in 19 of 20 seeds or more', () => {
    let significant = 0;
    for (let seed = 1; seed <= 20; seed++) if (estimateConstantOffset(ar1(1000, 0.8, 1, seed), 0.001)!.significant) significant++;
    expect(significant).toBeLessThanOrEqual(1);
  });

  it('an offset that steps by 3 m half-way is no constant: the halves disagree', () => {
    const n = 1000;
    const x = ar1(n, 0.5, 0.3, 5).map((v, i) => v + (i >= n / 2 ? 3 : 0));
    expect(estimateConstantOffset(x, 0.001)!.stable).toBe(false);
  });

  it('robust: 10 % of samples 50 m off do not move the estimate by more than its sigma', () => {
    const x = ar1(1000, 0.5, 1, 3).map((v, i) => (i % 10 === 0 ? v + 50 : v - 0.8));
    const e = estimateConstantOffset(x, 0.001)!;
    expect(Math.abs(e.offsetM + 0.8)).toBeLessThan(e.sigmaM + 0.15);
  });

  it('too few samples: no estimate; samples kept per key as Float32', () => {
    expect(estimateConstantOffset([1, 2, 3], 0.001)).toBeNull();
    const s = new ConstantOffsetSamples();
    for (let i = 0; i < 100; i++) s.add('R channel +1', i);
    s.add('G01', NaN);
    expect(s.keys()).toEqual(['R channel +1']);
    expect(s.samples('R channel +1').length).toBe(100);
    expect(s.samples('R channel +1')[99]).toBe(99);
  });
});
