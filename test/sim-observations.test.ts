/**
 * Simulator observations: SELF-CONSISTENCY tests (they share the orbit model with the code under test).
 * Each error switch is turned on alone and the observations are compared with the all-off run.
 */
import { describe, expect, it } from 'vitest';
import { exampleScenarioSpec, simulateScenario, type ErrorSpec } from '../packages/sim/src/index.js';
import type { ObsEpoch, NavData } from '../packages/core/src/gnss/index.js';
import { EphemerisStore, satelliteAtTransmission } from '../packages/core/src/orbit/index.js';
import { ecefToGeodetic, azimuthElevation } from '../packages/core/src/geodesy/index.js';

const C = 299_792_458;
const LAMBDA1 = C / 1575.42e6;

type Run = { ref: ObsEpoch[]; rover: ObsEpoch[]; sim: ReturnType<typeof simulateScenario> };
function run(errors: ErrorSpec, tweak?: (s: ReturnType<typeof exampleScenarioSpec>) => ReturnType<typeof exampleScenarioSpec>): Run {
  const spec = tweak ? tweak(exampleScenarioSpec(errors)) : exampleScenarioSpec(errors);
  const sim = simulateScenario(spec);
  return { ref: [...sim.referenceEpochs()], rover: [...sim.roverEpochs()], sim };
}

/** value of code for sat at an epoch, NaN when absent. */
function val(e: ObsEpoch, sat: string, code: string): number {
  const so = e.sats.find((s) => s.sat === sat);
  if (!so) return NaN;
  const i = so.codes.indexOf(code);
  return i < 0 ? NaN : so.values[i]!;
}

/** Pairs (epoch, sat, a, b) of a code present in both runs at the same tag. */
function diffs(a: ObsEpoch[], b: ObsEpoch[], code: string): { tag: number; sat: string; d: number }[] {
  const byTag = new Map(b.filter((e) => e.flag === 0).map((e) => [e.tagGpsS, e]));
  const out: { tag: number; sat: string; d: number }[] = [];
  for (const e of a) {
    if (e.flag !== 0) continue;
    const f = byTag.get(e.tagGpsS);
    if (!f) continue;
    for (const so of e.sats) {
      const x = val(e, so.sat, code), y = val(f, so.sat, code);
      if (Number.isFinite(x) && Number.isFinite(y)) out.push({ tag: e.tagGpsS, sat: so.sat, d: x - y });
    }
  }
  return out;
}

function elevationRad(nav: NavData, sat: string, t: number, rx: { x: number; y: number; z: number }): number {
  const store = new EphemerisStore(nav);
  const sel = store.select(sat, t);
  const s = satelliteAtTransmission(sel.eph!, t, null, rx);
  const g = ecefToGeodetic(rx);
  return azimuthElevation(rx, s.posM, g.latRad, g.lonRad).elevationRad;
}

const off = run({});

describe('simulator (self-consistency): exact geometry with every error off', () => {
  it('pseudorange + c dt_sat equals the light-time range from the orbit module to < 1 mm', () => {
    const store = new EphemerisStore(off.sim.nav);
    const arp = off.sim.truth.referenceArp;
    let n = 0, worst = 0;
    for (const e of off.ref) {
      for (const so of e.sats) {
        const sel = store.select(so.sat, e.tagGpsS);
        expect(sel.eph).not.toBeNull();
        // Independent light-time iteration in orbit/transmit.ts (IS-GPS-200 20.3.3.4.3.3.2 Earth rotation).
        const s = satelliteAtTransmission(sel.eph!, e.tagGpsS, null, arp);
        const p = so.values[so.codes.indexOf('C1C')]!;
        worst = Math.max(worst, Math.abs(p + C * s.clock.offsetS - s.rangeM!));
        n++;
      }
    }
    expect(n).toBeGreaterThan(1000);
    expect(worst).toBeLessThan(0.001);
  });

  it('the rover truth gives the same agreement while walking; phase = (range)/lambda + integer; Doppler = -range rate/lambda', () => {
    const store = new EphemerisStore(off.sim.nav);
    let worstP = 0, worstFrac = 0, worstD = 0;
    for (const e of off.rover) {
      if (e.flag !== 0) continue;
      const rx = off.sim.truth.roverAt(e.tagGpsS);
      for (const so of e.sats) {
        const s = satelliteAtTransmission(store.select(so.sat, e.tagGpsS).eph!, e.tagGpsS, null, rx);
        const p = so.values[0]!, l = so.values[1]!;
        worstP = Math.max(worstP, Math.abs(p + C * s.clock.offsetS - s.rangeM!));
        const n = l - p / LAMBDA1; // all else off: L - P/lambda is the integer ambiguity
        worstFrac = Math.max(worstFrac, Math.abs(n - Math.round(n)));
        const r0 = off.sim.truth.roverAt(e.tagGpsS), rp = off.sim.truth.roverAt(e.tagGpsS + 0.5), rm = off.sim.truth.roverAt(e.tagGpsS - 0.5);
        // Skip the corners of the walk (speed changes there, a central difference does not see it).
        if (Math.abs(Math.hypot(rp.x - r0.x, rp.y - r0.y, rp.z - r0.z) - Math.hypot(r0.x - rm.x, r0.y - rm.y, r0.z - rm.z)) > 1e-6) continue;
        const s2 = satelliteAtTransmission(store.select(so.sat, e.tagGpsS + 0.5).eph!, e.tagGpsS + 0.5, null, off.sim.truth.roverAt(e.tagGpsS + 0.5));
        const s1 = satelliteAtTransmission(store.select(so.sat, e.tagGpsS - 0.5).eph!, e.tagGpsS - 0.5, null, off.sim.truth.roverAt(e.tagGpsS - 0.5));
        const rateMS = s2.rangeM! - s1.rangeM! + C * (s2.clock.offsetS - s1.clock.offsetS);
        worstD = Math.max(worstD, Math.abs(so.values[2]! + rateMS / LAMBDA1));
      }
    }
    expect(worstP).toBeLessThan(0.001);
    expect(worstFrac).toBeLessThan(1e-4);
    expect(worstD).toBeLessThan(0.05); // central difference vs analytic rate, and the walk's corners
  });

  it('marks start-moving (flag 2) and new-occupation (flag 3) events with marker and antenna height', () => {
    const ev = off.rover.filter((e) => e.flag !== 0);
    expect(ev.map((e) => e.flag)).toEqual([2, 3]);
    expect(ev[1]!.event?.markerName).toBe('B');
    expect(ev[1]!.event?.antennaOffset?.heightM).toBe(2);
    expect(off.sim.roverHeader.markerName).toBe('A');
    expect(off.sim.roverHeader.antennaOffset.heightM).toBe(1.5);
  });

  it('only satellites above 5 deg are recorded', () => {
    for (const e of off.ref.slice(0, 20)) for (const so of e.sats) {
      expect(elevationRad(off.sim.nav, so.sat, e.tagGpsS, off.sim.truth.referenceArp)).toBeGreaterThan((5 * Math.PI) / 180 - 1e-6);
    }
  });
});

describe('simulator (self-consistency): each error switch moves the observations as theory says', () => {
  it('ionosphere: code delayed, phase advanced by the same amount; L2 delay = (77/60)^2 x L1; larger at low elevation', () => {
    const on = run({ iono: true });
    const dp = diffs(on.ref, off.ref, 'C1C');
    const dl = diffs(on.ref, off.ref, 'L1C');
    const dp2 = new Map(diffs(on.ref, off.ref, 'C2W').map((x) => [`${x.tag}:${x.sat}`, x.d]));
    expect(dp.length).toBeGreaterThan(500);
    expect(dp2.size).toBeGreaterThan(300);
    for (let i = 0; i < dp.length; i++) {
      expect(dp[i]!.d).toBeGreaterThan(0);
      // First-order ionosphere: phase advance = group delay (code-carrier divergence; Hofmann-Wellenhof 2008 eq. 5.76).
      expect(dl[i]!.d * LAMBDA1 + dp[i]!.d).toBeCloseTo(0, 6);
      // IS-GPS-200 20.3.3.3.3.2: delay scales as (f1/f2)^2 = (77/60)^2 = 1.6469...
      const d2 = dp2.get(`${dp[i]!.tag}:${dp[i]!.sat}`);
      if (d2 !== undefined) expect(d2 / dp[i]!.d).toBeCloseTo((77 / 60) ** 2, 6);
    }
    const arp = on.sim.truth.referenceArp;
    const low: number[] = [], high: number[] = [];
    for (const x of dp) {
      const el = (elevationRad(on.sim.nav, x.sat, x.tag, arp) * 180) / Math.PI;
      if (el < 20) low.push(x.d); else if (el > 60) high.push(x.d);
    }
    const mean = (a: number[]) => a.reduce((s, v) => s + v, 0) / a.length;
    expect(low.length).toBeGreaterThan(10);
    expect(high.length).toBeGreaterThan(10);
    expect(mean(low)).toBeGreaterThan(1.5 * mean(high));
  });

  it('ionosphere: the reference-rover difference grows with their distance', () => {
    const near = run({ iono: true });
    const far = run({ iono: { gradientMPerKm: 0.002 } }, (s) => ({ ...s, points: { A: { e: 20000, n: 15000, u: 2 }, B: { e: 20060, n: 15080, u: 1 } } }));
    const nearOff = off;
    const farOff = run({}, (s) => ({ ...s, points: { A: { e: 20000, n: 15000, u: 2 }, B: { e: 20060, n: 15080, u: 1 } } }));
    const sdRms = (onR: Run, offR: Run) => {
      const ref = new Map(diffs(onR.ref, offR.ref, 'C1C').map((x) => [`${x.tag}:${x.sat}`, x.d]));
      let s = 0, n = 0;
      for (const x of diffs(onR.rover, offR.rover, 'C1C')) {
        const r = ref.get(`${x.tag}:${x.sat}`);
        if (r === undefined) continue;
        s += (x.d - r) ** 2; n++;
      }
      return Math.sqrt(s / n);
    };
    const dNear = sdRms(near, nearOff), dFar = sdRms(far, farOff);
    expect(dFar).toBeGreaterThan(5 * dNear); // 0.6 km vs 25 km
  });

  it('troposphere: positive, about 2.3 m / sin(el)-like, and bigger for a lower site', () => {
    const on = run({ tropo: { zenithWetSigmaM: 0 } });
    const high = run({ tropo: { zenithWetSigmaM: 0 } }, (s) => ({ ...s, reference: { ...s.reference, markGeodetic: { ...s.reference.markGeodetic, heightM: 1500 } } }));
    const highOff = run({}, (s) => ({ ...s, reference: { ...s.reference, markGeodetic: { ...s.reference.markGeodetic, heightM: 1500 } } }));
    const d = diffs(on.ref, off.ref, 'C1C');
    const dh = new Map(diffs(high.ref, highOff.ref, 'C1C').map((x) => [`${x.tag}:${x.sat}`, x.d]));
    let compared = 0;
    for (const x of d) {
      const el = elevationRad(on.sim.nav, x.sat, x.tag, on.sim.truth.referenceArp);
      // check-values.md #7: sea-level zenith hydrostatic delay ~2.3 m; standard atmosphere wet part ~0.1-0.2 m at 100 m.
      expect(x.d * Math.sin(el)).toBeGreaterThan(2.0);
      expect(x.d * Math.sin(el)).toBeLessThan(2.8);
      const h = dh.get(`${x.tag}:${x.sat}`);
      if (h !== undefined) { expect(h).toBeLessThan(x.d); compared++; }
    }
    expect(compared).toBeGreaterThan(100);
  });

  it('receiver clock: tags in receiver time, a millisecond jump moves pseudoranges by c x 1 ms = 299792.458 m, phase stays continuous', () => {
    const on = run({ rxClock: true }, (s) => ({ ...s, rover: { ...s.rover, profileOverrides: { clockOffsetS: 4.4e-4, clockDriftSS: 5e-7, clockWanderS: 0 } } }));
    const rover = on.rover.filter((e) => e.flag === 0);
    let jumps = 0;
    for (let i = 1; i < rover.length; i++) {
      const a = rover[i - 1]!, b = rover[i]!;
      const sat = a.sats[0]!.sat;
      const cmcA = val(a, sat, 'C1C') - val(a, sat, 'L1C') * LAMBDA1;
      const cmcB = val(b, sat, 'C1C') - val(b, sat, 'L1C') * LAMBDA1;
      if (!Number.isFinite(cmcA + cmcB)) continue;
      const step = cmcB - cmcA;
      if (Math.abs(step) > 1000) {
        jumps++;
        expect(Math.abs(step)).toBeCloseTo(299_792.458, 3); // c x 1 ms (SI c)
      } else expect(Math.abs(step)).toBeLessThan(1e-3);
    }
    expect(jumps).toBe(1);
    // Tags stay whole seconds (receiver time) while the true time differs by the clock offset.
    expect(rover.every((e) => Number.isInteger(e.tagGpsS))).toBe(true);
    const t = on.sim.truth.roverTrueTime(rover[0]!.tagGpsS);
    expect(Math.abs(rover[0]!.tagGpsS - t - (4.4e-4 + 60 * 5e-7))).toBeLessThan(1e-6);
  });

  it('orbit and satellite clock errors are common to both receivers (cancel between them)', () => {
    const on = run({ orbit: true, satClock: true });
    const ref = new Map(diffs(on.ref, off.ref, 'C1C').map((x) => [`${x.tag}:${x.sat}`, x.d]));
    let s = 0, sd = 0, n = 0;
    for (const x of diffs(on.rover, off.rover, 'C1C')) {
      const r = ref.get(`${x.tag}:${x.sat}`);
      if (r === undefined) continue;
      s += r * r; sd += (x.d - r) ** 2; n++;
    }
    expect(n).toBeGreaterThan(500);
    expect(Math.sqrt(s / n)).toBeGreaterThan(0.3); // ~1 m orbit + ~1 m clock
    expect(Math.sqrt(sd / n)).toBeLessThan(0.005); // 0.6 km baseline: orbit error x 0.6/20000 << 1 mm, plus epoch-time effects
  });

  it('code noise follows sigma = a + b / sin(el) (geodetic reference profile: a 0.02 m, b 0.03 m)', () => {
    const on = run({ codeNoise: true }, (s) => ({ ...s, durationS: 600 }));
    const d = diffs(on.ref, off.ref, 'C1C');
    let z = 0;
    for (const x of d) {
      const el = elevationRad(on.sim.nav, x.sat, x.tag, on.sim.truth.referenceArp);
      z += (x.d / (0.02 + 0.03 / Math.sin(el))) ** 2;
    }
    // Normalised residuals have unit variance: chi-square / n within 4 sqrt(2/n).
    expect(Math.abs(z / d.length - 1)).toBeLessThan(4 * Math.sqrt(2 / d.length));
  });

  it('multipath only on the rover, bounded by the amplitude, slowly varying', () => {
    const on = run({ multipath: true });
    expect(diffs(on.ref, off.ref, 'C1C').every((x) => x.d === 0)).toBe(true);
    const d = diffs(on.rover, off.rover, 'C1C');
    const maxAbs = Math.max(...d.map((x) => Math.abs(x.d)));
    expect(maxAbs).toBeGreaterThan(0.05);
    expect(maxAbs).toBeLessThan(2 * Math.sqrt(3) + 1e-9); // 3 sinusoids of amplitude A sqrt(2/3)/sqrt 2 each, A <= 2 m
  });

  it('cycle slips: the ambiguity changes by whole cycles only where LLI bit 0 is set', () => {
    const on = run({ slips: { roverPerSatHour: 30 } });
    const rover = on.rover.filter((e) => e.flag === 0);
    let slips = 0;
    for (let i = 1; i < rover.length; i++) {
      for (const so of rover[i]!.sats) {
        const prevP = val(rover[i - 1]!, so.sat, 'C1C'), prevL = val(rover[i - 1]!, so.sat, 'L1C');
        if (!Number.isFinite(prevP)) continue;
        const dn = (so.values[1]! - so.values[0]! / LAMBDA1) - (prevL - prevP / LAMBDA1);
        expect(Math.abs(dn - Math.round(dn))).toBeLessThan(1e-4);
        if (Math.round(dn) !== 0) { slips++; expect(so.lli[1]! & 1).toBe(1); }
      }
    }
    expect(slips).toBeGreaterThan(10);
  });

  it('gaps remove whole rover epochs and single satellites; faults put a 20-50 m step on one satellite', () => {
    const on = run({ gaps: { epochGapsPerHour: 120, dropoutsPerHour: 30 }, faults: { perHour: 20 } });
    expect(on.sim.rover.epochGaps.length).toBeGreaterThan(0);
    expect(on.rover.filter((e) => e.flag === 0).length).toBeLessThan(off.rover.filter((e) => e.flag === 0).length);
    const d = diffs(on.rover, off.rover, 'C1C').filter((x) => x.d !== 0);
    expect(d.length).toBeGreaterThan(0);
    for (const x of d) {
      expect(Math.abs(x.d)).toBeGreaterThanOrEqual(20);
      expect(Math.abs(x.d)).toBeLessThanOrEqual(50);
    }
    const faultySats = new Set(d.map((x) => `${x.sat}`));
    expect(faultySats.size).toBeLessThanOrEqual(on.sim.rover.faults.length);
  });
});
