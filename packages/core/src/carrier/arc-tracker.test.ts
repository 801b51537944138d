/**
 * Arc bookkeeping on hand-made epochs (hand-checkable: a satellite approaching at 500 m/s, L1, 1 Hz):
 * each cause of a new arc on its own, and a receiver clock step common to all satellites that is no slip.
 */
import { describe, expect, it } from 'vitest';
import { ArcTracker, type ArcInput } from './arc-tracker.js';

const LAMBDA = 0.190293672798365; // GPS L1 wavelength c / 1575.42 MHz (IS-GPS-200 3.3.1.1)

/** Two satellites, ranges changing at -500 and +300 m/s, phase and Doppler consistent (RINEX sign: D = -range rate / lambda). */
function epoch(t: number, opts: { jump?: number; lli?: number; blank?: boolean; clockStepM?: number } = {}): ArcInput[] {
  const sats: [string, number][] = [['G01', -500], ['G02', 300], ['G03', 120]];
  return sats.map(([sat, rate], i) => {
    const range = 2.2e7 + rate * t + (opts.clockStepM ?? 0);
    const phase = range / LAMBDA + (i === 0 ? opts.jump ?? 0 : 0);
    return { sat, phaseCycles: i === 0 && opts.blank ? NaN : phase, codeM: range, dopplerHz: -rate / LAMBDA, lli: i === 0 ? opts.lli ?? 0 : 0, wavelengthM: LAMBDA };
  });
}

describe('phase arcs', () => {
  it('continuous phase keeps the arc; a 3-cycle jump against the Doppler starts a new one for that satellite only', () => {
    const a = new ArcTracker(30);
    const first = a.update(0, epoch(0));
    expect(a.update(1, epoch(1)).get('G01')).toBe(first.get('G01'));
    const third = a.update(2, epoch(2, { jump: 3 }));
    expect(third.get('G01')).not.toBe(first.get('G01'));
    expect(third.get('G02')).toBe(first.get('G02'));
    expect(a.causes.doppler).toBe(1);
  });

  it('a receiver clock step of 1 ms (300 km in phase and code of every satellite) is no slip', () => {
    const a = new ArcTracker(30);
    const first = a.update(0, epoch(0));
    const next = a.update(1, epoch(1, { clockStepM: 299792.458 }));
    for (const s of ['G01', 'G02', 'G03']) expect(next.get(s)).toBe(first.get(s));
  });

  it('GLONASS (one wavelength per channel): a clock step common in metres is no slip; a code-only millisecond step is summed as a code clock step', () => {
    // G1 = 1602 MHz + k 0.5625 MHz (GLONASS ICD 5.1 3.3.1.1): channels -7 and +6, the extremes.
    const lam = (k: number) => 299792458 / (1602e6 + k * 0.5625e6);
    const glo = (t: number, phaseStepM: number, codeStepM: number): ArcInput[] => [['R01', -500, -7], ['R02', 300, 6], ['R03', 120, 0]].map(([sat, rate, k]) => {
      const range = 2.2e7 + (rate as number) * t;
      const l = lam(k as number);
      return { sat: sat as string, phaseCycles: (range + phaseStepM) / l, codeM: range + codeStepM, dopplerHz: -(rate as number) / l, lli: 0, wavelengthM: l };
    });
    const a = new ArcTracker(30);
    const first = a.update(0, glo(0, 0, 0));
    // A 1 ms step in phase and code: 299,792 m, i.e. 1,573,000 cycles at -7 but 1,578,000 at +6.
    const second = a.update(1, glo(1, 299792.458, 299792.458));
    for (const s of ['R01', 'R02', 'R03']) expect(second.get(s)).toBe(first.get(s));
    expect(a.codeClockStepsM).toBe(0);
    // Then the code alone steps back by 1 ms (the phase runs on): no slip, and the step is summed.
    const third = a.update(2, glo(2, 299792.458, 0));
    for (const s of ['R01', 'R02', 'R03']) expect(third.get(s)).toBe(first.get(s));
    expect(a.codeClockStepsM).toBeCloseTo(-299792.458, 3);
    expect(a.causes.doppler + a.causes.codeMinusPhase).toBe(0);
  });

  it('loss of lock (LLI bit 0), a change of the half-cycle bit, blank phase and a long gap each start a new arc', () => {
    const a = new ArcTracker(30);
    let arc = a.update(0, epoch(0)).get('G01');
    const step = (t: number, o: Parameters<typeof epoch>[1]) => { const n = a.update(t, epoch(t, o)).get('G01'); const changed = n !== arc; arc = n; return changed; };
    expect(step(1, { lli: 1 })).toBe(true);
    expect(step(2, { lli: 2 })).toBe(true);
    expect(step(3, { lli: 2 })).toBe(false);
    expect(a.halfCycleUnresolved('G01')).toBe(true);
    expect(step(4, {})).toBe(true);
    expect(a.update(5, epoch(5, { blank: true })).get('G01')).toBe(0);
    arc = 0;
    expect(step(6, {})).toBe(true);
    expect(step(60, {})).toBe(true);
    // The 54 s gap is met by all three satellites.
    expect(a.causes).toMatchObject({ lli: 1, halfCycle: 2, blank: 1, gap: 3 });
  });

  it('a satellite absent from some of the receiver\'s epochs starts a new arc on its return; a gap of every satellite does not', () => {
    const a = new ArcTracker(30);
    const first = a.update(0, epoch(0));
    a.update(1, epoch(1).filter((s) => s.sat !== 'G02'));
    a.update(2, epoch(2).filter((s) => s.sat !== 'G02'));
    const back = a.update(3, epoch(3));
    expect(back.get('G02')).not.toBe(first.get('G02'));
    expect(back.get('G01')).toBe(first.get('G01'));
    // No epoch at 4 to 9 s at all (a logging gap, or a bridge): the arcs go on.
    expect(a.update(10, epoch(10)).get('G01')).toBe(first.get('G01'));
    expect(a.causes).toMatchObject({ absent: 1, gap: 0, doppler: 0 });
  });

  it('a satellite the file still lists but the solution left out for a while (blank code, no ephemeris) keeps its arc; one the file stopped listing does not', () => {
    const a = new ArcTracker(30);
    const all = epoch(0).map((s) => s.sat);
    const first = a.update(0, epoch(0), all);
    // G02 listed at 1 and 2 s (its code blank: not among the satellites solved), back at 3 s
    a.update(1, epoch(1).filter((s) => s.sat !== 'G02'), all);
    a.update(2, epoch(2).filter((s) => s.sat !== 'G02'), all);
    expect(a.update(3, epoch(3), all).get('G02')).toBe(first.get('G02'));
    // G02 not listed at 4 s: absent, a new arc at 5 s
    a.update(4, epoch(4).filter((s) => s.sat !== 'G02'), all.filter((s) => s !== 'G02'));
    expect(a.update(5, epoch(5), all).get('G02')).not.toBe(first.get('G02'));
    expect(a.causes).toMatchObject({ absent: 1, doppler: 0, codeMinusPhase: 0 });
  });
});
