/**
 * The simulator's GLONASS: constellation, broadcast records, observation headers and inter-channel
 * biases. SELF-CONSISTENCY tests (the simulator's truth orbits follow the same published equations of
 * motion as the engine's propagator), with outside checks where there are some: the nominal constellation
 * and the FDMA frequency plan (GLONASS ICD), the channel assignment of the real 2018 navigation file.
 */
import { readFileSync } from 'node:fs';
import { describe, expect, it } from 'vitest';
import { simulateConstellation, glonassTruthOf, simulateScenario, exampleScenarioSpec, GLONASS_NOMINAL_CHANNELS } from '../packages/sim/src/index.js';
import { readNav, writeNavRinex3, readObsStream, writeObsRinex3 } from '../packages/core/src/rinex/index.js';
import { satelliteState } from '../packages/core/src/orbit/index.js';
import { glonassG1FrequencyHz } from '../packages/core/src/gnss/index.js';
import { secondsFromCalendar } from '../packages/core/src/time/index.js';
import type { GlonassEphemeris } from '../packages/core/src/gnss/index.js';
import { describeShared, dataPath } from './support/shared.js';

const START = secondsFromCalendar({ year: 2024, month: 1, day: 10, hour: 0, minute: 0, second: 0 });

async function* one(text: string): AsyncIterable<string> { yield text; }

describe('simulated GLONASS constellation (self-consistency with orbit/glonass.ts; nominal constellation)', () => {
  const nav = simulateConstellation({ seed: 5, startGpsS: START, endGpsS: START + 6 * 3600, systems: ['G', 'R'] });
  const glo = nav.ephemerides.filter((e): e is GlonassEphemeris => e.kind === 'glonass');
  const truth = glonassTruthOf(nav);

  it('24 slots in 3 planes 120 deg apart, 64.8 deg inclination, radius near 25,510 km (GLONASS ICD 5.1 nominal constellation; from memory)', () => {
    expect(truth.size).toBe(24);
    const we = 7.2921151467e-5; // PZ-90 rotation rate (check-values.md constants)
    const nodes: number[] = [];
    for (let slot = 1; slot <= 24; slot += 8) {
      const e = glo.find((x) => x.sat === `R${String(slot).padStart(2, '0')}`)!;
      const [x, y, z] = e.posM, [vx0, vy0, vz] = e.velMS;
      const r = Math.hypot(x, y, z);
      expect(Math.abs(r / 1000 - 25_510)).toBeLessThan(60); // near-circular, e < 0.002
      // Inertial velocity = ECEF velocity + omega x r; the angular momentum gives inclination and node.
      const vx = vx0 - we * y, vy = vy0 + we * x;
      const hx = y * vz - z * vy, hy = z * vx - x * vz, hz = x * vy - y * vx;
      const inc = Math.acos(hz / Math.hypot(hx, hy, hz)) * 180 / Math.PI;
      expect(Math.abs(inc - 64.8)).toBeLessThan(0.35);
      nodes.push(Math.atan2(hx, -hy) * 180 / Math.PI);
    }
    const gap = (a: number, b: number) => ((b - a) % 360 + 360) % 360;
    // Same epoch for the three records: planes 120 deg apart (seeded deviations of +-0.3 deg).
    expect(Math.abs(gap(nodes[0]!, nodes[1]!) - 120)).toBeLessThan(1);
    expect(Math.abs(gap(nodes[1]!, nodes[2]!) - 120)).toBeLessThan(1);
  });

  it('records every 30 min at 15 and 45 minutes past the UTC hour, channel numbers as broadcast, G1 = 1602 MHz + k 0.5625 MHz (GLONASS ICD 5.1 3.3.1.1)', () => {
    const r01 = glo.filter((e) => e.sat === 'R01').sort((a, b) => a.tbGpsS - b.tbGpsS);
    for (let i = 1; i < r01.length; i++) expect(r01[i]!.tbGpsS - r01[i - 1]!.tbGpsS).toBe(1800);
    expect(((r01[0]!.tbGpsS - 18) % 3600 + 3600) % 3600 % 1800).toBe(900); // GPS - UTC = 18 s (check-values.md)
    for (const e of glo) expect(e.channel).toBe(GLONASS_NOMINAL_CHANNELS[Number(e.sat.slice(1)) - 1]);
    expect(glonassG1FrequencyHz(-7)).toBe(1598.0625e6);
    expect(glonassG1FrequencyHz(6)).toBe(1605.375e6);
  });

  it("the engine's propagator (RK4 from t_b) reproduces the true orbit within 1 mm over +-15 min, after a RINEX round trip", async () => {
    const text = [...writeNavRinex3(nav)].join('');
    const back = (await readNav('sim.nav', one(text))).ephemerides.filter((e): e is GlonassEphemeris => e.kind === 'glonass');
    expect(back.length).toBe(glo.length);
    const tr = new Float64Array(6);
    let worstM = 0, worstClockS = 0;
    for (const e of back) {
      const t = truth.get(e.sat)!;
      for (let dt = -900; dt <= 900; dt += 150) {
        const s = satelliteState(e, e.tbGpsS + dt);
        t.stateInto(e.tbGpsS + dt, tr);
        worstM = Math.max(worstM, Math.hypot(s.posM.x - tr[0]!, s.posM.y - tr[1]!, s.posM.z - tr[2]!));
        worstClockS = Math.max(worstClockS, Math.abs(e.clockBiasS + e.gammaN * dt - t.clockOffsetS(e.tbGpsS + dt)));
      }
    }
    console.log(`GLONASS propagated records against the truth: worst ${(worstM * 1000).toFixed(2)} mm, clock ${worstClockS.toExponential(1)} s`);
    expect(worstM).toBeLessThan(0.001);
    expect(worstClockS).toBeLessThan(1e-12);
  });
});

describe('simulated GLONASS observations (self-consistency)', () => {
  it('RINEX 3 headers carry GLONASS SLOT / FRQ #; like receiver types get equal inter-channel biases, unlike ones different', async () => {
    const base = exampleScenarioSpec({ glonassInterChannel: true }, 4);
    const spec = { ...base, durationS: 120, rover: { ...base.rover, startOffsetS: 10, plan: [{ kind: 'static' as const, point: 'A', durationS: 60, antennaHeightM: 1.5 }] }, systems: ['G', 'R'] as const };
    const sim = simulateScenario({ ...spec, systems: [...spec.systems] });
    const text = [...writeObsRinex3(sim.roverHeader, sim.roverEpochs())].join('');
    expect(text).toContain('GLONASS SLOT / FRQ #');
    expect(text).toContain('GLONASS COD/PHS/BIS');
    const back = await readObsStream('rover.obs', one(text));
    expect(back.header.glonassChannels.get(10)).toBe(-7);
    expect(back.header.glonassChannels.size).toBe(24);
    let glonassSats = 0;
    for await (const e of back.epochs) for (const s of e.sats) if (s.sat[0] === 'R') glonassSats++;
    expect(glonassSats).toBeGreaterThan(0);
    // Inter-channel biases: the slopes are the receiver type's (errors.ts).
    const like = simulateScenario({ ...spec, systems: [...spec.systems], reference: { ...spec.reference, receiverType: 'SAME TYPE' }, rover: { ...spec.rover, receiverType: 'SAME TYPE' } });
    const slopes = (s: typeof sim) => [(s.reference as unknown as { setup: { glonassBiasMPerChannel: unknown } }).setup.glonassBiasMPerChannel, (s.rover as unknown as { setup: { glonassBiasMPerChannel: unknown } }).setup.glonassBiasMPerChannel];
    const [a, b] = slopes(like);
    expect(a).toEqual(b);
    const [c, d] = slopes(sim);
    expect(c).not.toEqual(d);
  });
});

describeShared('simulated GLONASS channel plan against a real navigation file', () => {
  it('every slot of glw1277m.18g (2018-10-04) broadcasts the channel of GLONASS_NOMINAL_CHANNELS', async () => {
    const path = dataPath('cors-and-rover-2018-277/reference/glw1277m.18g');
    const nav = await readNav('glw1277m.18g', one(readFileSync(path, 'latin1')));
    let n = 0;
    for (const e of nav.ephemerides) {
      if (e.kind !== 'glonass') continue;
      expect(e.channel).toBe(GLONASS_NOMINAL_CHANNELS[Number(e.sat.slice(1)) - 1]);
      n++;
    }
    expect(n).toBeGreaterThan(20);
  });
});
