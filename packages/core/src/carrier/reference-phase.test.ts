/**
 * Carrying the reference to a rover epoch (hand-checkable numbers): interpolation between bracketing
 * epochs of one arc with one weight for all satellites, never across a gap in the logging or a slip.
 */
import { describe, expect, it } from 'vitest';
import { ReferencePhaseBuffer, type ReferencePhaseEpoch } from './reference-phase.js';
import type { Ephemeris } from '../gnss/index.js';

const eph = {} as Ephemeris;
const ep = (t: number, arcs: Record<string, number>): ReferencePhaseEpoch => ({
  timeGpsS: t,
  sats: new Map(Object.entries(arcs).map(([sat, arc]) => [sat, { phaseM: 10 * t, codeM: 100 + t, arc, halfCycle: false, elevationRad: 0.5, eph }])),
});

describe('reference phase carried to the rover time', () => {
  const buf = new ReferencePhaseBuffer(30, null);
  for (const t of [0, 1, 2]) buf.add(ep(t, { G01: 1, G02: 2 }));
  buf.add(ep(26, { G01: 1, G02: 5 }));

  it('between epochs 1 s apart: interpolated (phase 10 m/s: 15 m at 1.5 s), age 0.5 s', () => {
    const a = buf.align(1.5)!;
    expect(a.interpolated).toBe(true);
    expect(a.sats.get('G01')!.phaseM).toBeCloseTo(15, 12);
    expect(a.ageS).toBeCloseTo(0.5, 12);
  });

  it('inside a 24 s gap: the nearest epoch alone for every satellite, never interpolated across the gap', () => {
    const a = buf.align(10)!;
    expect(a.interpolated).toBe(false);
    expect(a.sats.get('G01')!.phaseM).toBe(20);
    expect(a.ageS).toBe(8);
    const b = buf.align(20)!;
    expect(b.sats.get('G02')!.phaseM).toBe(260);
    expect(b.sats.get('G02')!.arc).toBe(5);
  });

  it('beyond the age limit: nothing', () => {
    expect(buf.align(70)).toBeNull();
  });

  it('after the last epoch (the data ended) and before the first: within one logging interval only (1 s here), not across 30 s', () => {
    expect(buf.align(26.8)).not.toBeNull();
    expect(buf.align(28)).toBeNull();
    const late = new ReferencePhaseBuffer(30, 5);
    late.add(ep(100, { G01: 1 }));
    expect(late.align(96)).not.toBeNull();
    expect(late.align(90)).toBeNull();
  });

  it('before the first epoch with no logging interval known (no INTERVAL in the header, one epoch read): nothing carried to an earlier time', () => {
    const first = new ReferencePhaseBuffer(30, null);
    first.add(ep(100, { G01: 1 }));
    expect(first.align(80)).toBeNull();
    expect(first.align(100)).not.toBeNull();
  });

  it('a satellite whose arc changed between the bracketing epochs gets code but no phase', () => {
    const b2 = new ReferencePhaseBuffer(30, 1);
    b2.add(ep(0, { G01: 1 }));
    b2.add(ep(1, { G01: 7 }));
    const a = b2.align(0.5)!;
    expect(a.interpolated).toBe(true);
    expect(Number.isNaN(a.sats.get('G01')!.phaseM)).toBe(true);
    expect(a.sats.get('G01')!.codeM).toBeCloseTo(100.5, 12);
  });
});
