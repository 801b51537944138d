import { describe, expect, it } from 'vitest';
import { findTimeDifferencedSlips, SLIP_MIN_CYCLES_REFERENCE_SWITCH, SLIP_W_CRITICAL, type TimeDifferencedPhase } from './time-differenced-slips.js';

const L1 = 299_792_458 / 1_575_420_000;

/** Eight satellites (or twelve) in two clock groups; changes made from a position change, clock changes and optional jumps. */
function epoch(jumpsM: Record<number, number> = {}, noiseM: readonly number[] = [], twelve = false): TimeDifferencedPhase[] {
  const dirs = [[0, 0, 1], [0.7, 0, 0.7], [-0.7, 0, 0.7], [0, 0.7, 0.7], [0, -0.7, 0.7], [0.5, 0.5, 0.7], [-0.5, -0.5, 0.7], [0.9, -0.3, 0.3]];
  if (twelve) dirs.splice(5, 0, [-0.9, 0.2, 0.4], [0.3, 0.9, 0.3], [0.2, -0.9, 0.4], [-0.4, 0.6, 0.7]);
  const d = [0.8, -1.1, 0.4];
  return dirs.map((u, i) => {
    const n = Math.hypot(u[0], u[1], u[2]);
    const ux = u[0] / n, uy = u[1] / n, uz = u[2] / n;
    const group = i < dirs.length - 3 ? 'G' : 'E';
    const changeM = -(ux * d[0] + uy * d[1] + uz * d[2]) + (group === 'G' ? 12.3 : -4.5) + (jumpsM[i] ?? 0) + (noiseM[i] ?? 0);
    return { changeM, ux, uy, uz, group, varianceM2: 2 * 2 * (0.003 ** 2 + 0.003 ** 2), wavelengthM: L1 };
  });
}

describe('time-differenced slip test (self-consistency on constructed time differences)', () => {
  it('critical value: two-sided 1e-5 of the standard normal, 4.417 (normal tables, from memory)', () => {
    expect(SLIP_W_CRITICAL).toBeCloseTo(4.417, 2);
  });

  it('no jump: nothing found, whatever the position and clock changes', () => {
    expect(findTimeDifferencedSlips(epoch({}, [0.004, -0.003, 0.002, -0.005, 0.001, 0.003, -0.002, 0.004]))).toEqual([]);
  });

  it('one cycle on one satellite: found, and only it', () => {
    expect(findTimeDifferencedSlips(epoch({ 3: L1 }))).toEqual([3]);
    expect(findTimeDifferencedSlips(epoch({ 6: -L1 }))).toEqual([6]);
  });

  it('slips on two satellites at once, with twelve satellites: both found, and only those', () => {
    expect(findTimeDifferencedSlips(epoch({ 1: -L1, 10: 2 * L1 }, [], true)).sort()).toEqual([1, 10]);
  });

  it('a jump under a quarter of a cycle (nearer none than half a cycle) is not called a slip, even when significant', () => {
    expect(findTimeDifferencedSlips(epoch({ 2: 0.2 * L1 }))).toEqual([]);
  });

  it('half a cycle: found, with its estimated jump; across a switch of the reference epochs held, under half a cycle is not a slip', () => {
    const jumps: number[] = [];
    expect(findTimeDifferencedSlips(epoch({ 4: -0.5 * L1 }, [0.004, -0.003, 0.002, -0.005, 0.001, 0.003, -0.002, 0.004]), jumps)).toEqual([4]);
    expect(Math.round(2 * jumps[0] / L1)).toBe(-1);
    expect(findTimeDifferencedSlips(epoch({ 2: 0.4 * L1 }, [], true))).toEqual([2]);
    expect(findTimeDifferencedSlips(epoch({ 2: 0.4 * L1 }, [], true), [], SLIP_MIN_CYCLES_REFERENCE_SWITCH)).toEqual([]);
  });

  it('what the w-tests cannot point at fails the global test: jumps under the floor on three satellites; none: passes', () => {
    const verdict = { unexplained: false };
    expect(findTimeDifferencedSlips(epoch({ 1: 0.2 * L1, 4: -0.2 * L1, 9: 0.2 * L1 }, [], true), [], undefined, verdict)).toEqual([]);
    expect(verdict.unexplained).toBe(true);
    expect(findTimeDifferencedSlips(epoch({}, [0.004, -0.003, 0.002, -0.005, 0.001, 0.003, -0.002, 0.004]), [], undefined, verdict)).toEqual([]);
    expect(verdict.unexplained).toBe(false);
  });

  it('too few observations for two degrees of freedom: nothing tested', () => {
    expect(findTimeDifferencedSlips(epoch({ 0: L1 }).slice(0, 5))).toEqual([]);
  });
});
