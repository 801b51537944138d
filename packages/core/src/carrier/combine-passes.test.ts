/**
 * The combination of the two passes at one epoch (combine-passes.ts), on hand-made solutions: the cases
 * where one pass's solution is wrong and the other cannot say which. Values chosen by hand (no outside
 * source): a wrong fix 3 m away, centimetre and half-metre sigmas.
 */
import { describe, expect, it } from 'vitest';
import { combineEpoch } from './combine-passes.js';
import { EpochResult } from './float-filter.js';
import type { PassResults } from './pass-results.js';

const AGREEMENT_M = 0.05;

/** The forward pass's columns for one epoch, as PassResults holds them (only what combineEpoch reads and writes). */
function forwardColumns(kind: number, position: number[], covariance: number[], floatPosition: number[], floatCovariance: number[], ratio: number): PassResults {
  const f64 = (v: number[]) => Float64Array.from(v);
  return {
    kind: Uint8Array.of(kind), position: f64(position), covariance: f64(covariance), floatPosition: f64(floatPosition), floatCovariance: f64(floatCovariance),
    ratio: f64([ratio]), satellitesUsed: Uint8Array.of(8), fixedAmbiguities: Uint8Array.of(kind === 2 ? 7 : 0), backwardKind: Uint8Array.of(0),
    backwardCause: Uint8Array.of(0), backwardCauseA: f64([NaN]), backwardCauseB: f64([NaN]),
    residualM: new Float32Array(4), chiSquare: f64([1]), dof: Uint8Array.of(3),
  } as unknown as PassResults;
}

function backward(kind: number, position: number[], covariance: number[], floatPosition: number[], floatCovariance: number[], ratio: number): EpochResult {
  const b = new EpochResult();
  b.start(4);
  b.kind = kind; b.ratio = ratio; b.fixedAmbiguities = kind === 2 ? 7 : 0; b.satellitesUsed = 8;
  b.position.set(position); b.covariance.set(covariance); b.floatPosition.set(floatPosition); b.floatCovariance.set(floatCovariance);
  return b;
}

const iso = (sigmaM: number) => [sigmaM ** 2, 0, 0, sigmaM ** 2, 0, sigmaM ** 2];
/** Squared Mahalanobis distance of x from the combined solution (diagonal covariances only, as here). */
const distance2 = (r: PassResults, x: number[]) => ((r.position[0] - x[0]) ** 2) / r.covariance[0] + ((r.position[1] - x[1]) ** 2) / r.covariance[3] + ((r.position[2] - x[2]) ** 2) / r.covariance[5];

describe('pass combination when one pass is wrong', () => {
  it('both fixed and agreeing: fixed, between the two', () => {
    const r = forwardColumns(2, [0.01, 0, 0], iso(0.005), [0.01, 0, 0], iso(0.005), Infinity);
    combineEpoch(r, 0, 0, 4, backward(2, [0, 0, 0], iso(0.005), [0, 0, 0], iso(0.005), 8), AGREEMENT_M);
    expect(r.kind[0]).toBe(2);
    expect(r.position[0]).toBeCloseTo(0.005, 6);
  });

  it('both fixed, 3 m apart: float, no ratio, and either fix within 2 sigma of the result', () => {
    const r = forwardColumns(2, [3, 0, 0], iso(0.005), [3, 0, 0], iso(0.005), Infinity);
    combineEpoch(r, 0, 0, 4, backward(2, [0, 0, 0], iso(0.005), [0, 0, 0], iso(0.01), 12), AGREEMENT_M);
    expect(r.kind[0]).toBe(1);
    expect(Number.isNaN(r.ratio[0])).toBe(true);
    expect(distance2(r, [3, 0, 0])).toBeLessThanOrEqual(4);
    expect(distance2(r, [0, 0, 0])).toBeLessThanOrEqual(4);
  });

  it('a fix held to millimetres, contradicted by the other pass\'s float 3 m away: float, the other float within 2 sigma of the result', () => {
    const r = forwardColumns(2, [3, 0, 0], iso(0.005), [3, 0, 0], iso(0.005), Infinity);
    combineEpoch(r, 0, 0, 4, backward(1, [0, 0, 0], iso(0.5), [0, 0, 0], iso(0.5), 1.5), AGREEMENT_M);
    expect(r.kind[0]).toBe(1);
    expect(Number.isNaN(r.ratio[0])).toBe(true);
    expect(distance2(r, [0, 0, 0])).toBeLessThanOrEqual(4);
  });

  it('two floats that agree keep their weighted mean and its covariance', () => {
    const r = forwardColumns(1, [0.1, 0, 0], iso(0.2), [0.1, 0, 0], iso(0.2), 1.2);
    combineEpoch(r, 0, 0, 4, backward(1, [0, 0, 0], iso(0.2), [0, 0, 0], iso(0.2), 1.1), AGREEMENT_M);
    expect(r.kind[0]).toBe(1);
    expect(r.position[0]).toBeCloseTo(0.05, 9);
    expect(r.covariance[0]).toBeCloseTo(0.02, 9);
  });

  it('a singular float covariance: a finite, non-zero covariance, the disagreement in it', () => {
    const r = forwardColumns(2, [3, 0, 0], iso(0.005), [3, 0, 0], [0, 0, 0, 0, 0, 0], Infinity);
    combineEpoch(r, 0, 0, 4, backward(2, [0, 0, 0], iso(0.005), [0, 0, 0], iso(0.01), 12), AGREEMENT_M);
    expect(r.kind[0]).toBe(1);
    expect([...r.covariance].every(Number.isFinite)).toBe(true);
    expect(r.covariance[0]).toBeGreaterThan(1);
  });
});
