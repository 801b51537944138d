/**
 * The simulator's files go through the project's RINEX 3 writers and readers: SELF-CONSISTENCY tests
 * (writer, reader and simulator are all ours). Values must come back to the files' resolution: F14.3 for
 * observations (RINEX 3.04 table A3), D19.12 for navigation records (RINEX 3.04 table A6).
 */
import { describe, expect, it } from 'vitest';
import { ALL_ERRORS_ON, exampleScenarioSpec, simulateScenario } from '../packages/sim/src/index.js';
import { readObsStream, collectEpochs, writeObsRinex3 } from '../packages/core/src/rinex/index.js';
import type { ObsEpoch } from '../packages/core/src/gnss/index.js';
import { readNav } from '../packages/core/src/rinex/nav-reader.js';
import { writeNavRinex3 } from '../packages/core/src/rinex/nav-writer.js';
import type { KeplerEphemeris } from '../packages/core/src/gnss/nav-types.js';

async function* asAsync(chunks: Iterable<string>): AsyncIterable<string> {
  for (const c of chunks) yield c;
}

const sim = simulateScenario(exampleScenarioSpec(ALL_ERRORS_ON));

async function roundTrip(header: typeof sim.roverHeader, epochs: () => Iterable<ObsEpoch>, file: string) {
  const warnings: string[] = [];
  const text = [...writeObsRinex3(header, epochs(), { version: 3.04, program: 'refdelta sim', dateText: '20240302 120000 UTC' })];
  const stream = await readObsStream(file, asAsync(text), { onWarning: (w) => warnings.push(w.message) });
  return { stream, read: await collectEpochs(stream), warnings };
}

function compare(original: ObsEpoch[], read: ObsEpoch[]): number {
  expect(read.length).toBe(original.length);
  let values = 0;
  for (let i = 0; i < original.length; i++) {
    const a = original[i]!, b = read[i]!;
    expect(b.flag).toBe(a.flag);
    expect(Math.abs(b.tagGpsS - a.tagGpsS)).toBeLessThan(1e-6);
    if (a.flag !== 0) {
      expect(b.event?.kind).toBe(a.event?.kind);
      expect(b.event?.markerName).toBe(a.event?.markerName);
      if (a.event?.antennaOffset) expect(b.event?.antennaOffset?.heightM).toBeCloseTo(a.event.antennaOffset.heightM, 4);
      continue;
    }
    expect(b.sats.map((s) => s.sat)).toEqual(a.sats.map((s) => s.sat));
    for (let k = 0; k < a.sats.length; k++) {
      const sa = a.sats[k]!, sb = b.sats[k]!;
      expect(sb.codes).toEqual(sa.codes);
      for (let c = 0; c < sa.codes.length; c++) {
        expect(Math.abs(sb.values[c]! - sa.values[c]!)).toBeLessThanOrEqual(0.0005 + 1e-9); // F14.3
        expect(sb.lli[c]).toBe(sa.lli[c]);
        expect(sb.ssi[c]).toBe(sa.ssi[c]);
        values++;
      }
    }
  }
  return values;
}

describe('simulator files (self-consistency with the rinex writers and readers)', () => {
  it('rover observations (events, LLI, SSI, every value) round-trip through RINEX 3.04', async () => {
    const { stream, read, warnings } = await roundTrip(sim.roverHeader, sim.roverEpochs, 'rover.obs');
    expect(warnings).toEqual([]);
    const h = stream.header;
    expect(h.version).toBe(3.04);
    expect(h.markerName).toBe('A');
    expect(h.antennaOffset.heightM).toBeCloseTo(1.5, 4);
    expect(h.obsCodes.G).toEqual(['C1C', 'L1C', 'D1C', 'S1C']);
    expect(h.obsCodes.E).toEqual(['C1C', 'L1C', 'D1C', 'S1C']);
    expect(h.firstObsGpsS).toBe(sim.roverHeader.firstObsGpsS);
    expect(compare([...sim.roverEpochs()], read)).toBeGreaterThan(10_000);
  });

  it('reference observations (dual-frequency GPS) round-trip, with the header mark and antenna height', async () => {
    const { stream, read, warnings } = await roundTrip(sim.referenceHeader, sim.referenceEpochs, 'ref.obs');
    expect(warnings).toEqual([]);
    const p = stream.header.approxPosition!;
    const m = sim.truth.referenceMark;
    expect(Math.hypot(p.x - m.x, p.y - m.y, p.z - m.z)).toBeLessThan(1e-6); // mark rounded to 0.1 mm = F14.4
    expect(stream.header.obsCodes.G).toContain('C2W');
    compare([...sim.referenceEpochs()], read);
  });

  it('navigation data round-trips through the RINEX 3.04 nav writer and reader (13 significant digits)', async () => {
    const warnings: string[] = [];
    const nav = await readNav('sim.nav', asAsync(writeNavRinex3(sim.nav, { date: '20240302 120000 UTC' })), { onWarning: (w) => warnings.push(w.message) });
    expect(warnings).toEqual([]);
    expect(nav.ephemerides.length).toBe(sim.nav.ephemerides.length);
    expect(nav.ionosphere.gps?.alpha).toEqual(sim.nav.ionosphere.gps?.alpha);
    expect(nav.ionosphere.gps?.beta).toEqual(sim.nav.ionosphere.gps?.beta);
    expect(nav.leapSeconds).toBe(18);
    const fields: (keyof KeplerEphemeris)[] = ['tocGpsS', 'toeGpsS', 'toeSowS', 'af0', 'af1', 'iode', 'crs', 'deltaN', 'm0', 'cuc', 'e', 'cus', 'sqrtA', 'cic', 'omega0', 'cis', 'i0', 'crc', 'omega', 'omegaDot', 'idot', 'accuracyM', 'health', 'tgdS', 'transmitGpsS'];
    for (let i = 0; i < nav.ephemerides.length; i++) {
      const a = sim.nav.ephemerides[i] as KeplerEphemeris, b = nav.ephemerides[i] as KeplerEphemeris;
      expect(b.sat).toBe(a.sat);
      for (const f of fields) {
        const x = a[f] as number, y = b[f] as number;
        expect(Math.abs(y - x)).toBeLessThanOrEqual(Math.abs(x) * 1e-12 + 1e-300);
      }
      if (a.system === 'G') { expect(b.iodc).toBe(a.iodc); expect(b.fitIntervalH).toBe(4); }
      else { expect(b.tgd2S).toBeCloseTo(a.tgd2S, 20); expect(b.dataSource).toBe(517); }
    }
  });
});
