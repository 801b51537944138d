/**
 * Simulated sessions solved with every fixed integer checked against the simulator's own (SELF-CONSISTENCY:
 * the simulator shares the orbit model with the engine). Shared by the carrier-phase simulator tests.
 */
import type { SimulatedScenario } from '../../packages/sim/src/index.js';
import { withDefaults } from '../../packages/core/src/session/index.js';
import { solveCarrierSession, withCarrierDefaults, type CarrierEpochSolution, type CarrierOptions, type CarrierSummary } from '../../packages/core/src/carrier/index.js';
import type { GnssSystem } from '../../packages/core/src/gnss/types.js';
import type { ObsEpoch, ObsHeader, ObsStream } from '../../packages/core/src/gnss/obs-types.js';

/** A short baseline's errors with frequent slips (flagged, as receivers do) and gaps, multipath off. */
export const SHORT_BASELINE_ERRORS = {
  orbit: true, satClock: true, rxClock: true, codeNoise: true, phaseNoise: true,
  iono: { klobucharScale: 1, gradientMPerKm: 0.001, waveLengthKm: 200, waveAzimuthDeg: 30, wavePeriodS: 1800 },
  // The standard atmosphere at both heights, no wet-delay error: over 600 m the differential wet delay is
  // millimetres (the simulator's field gives ~4 mm of zenith difference), which alone moves heights by about
  // a centimetre and is no part of the integer algebra checked.
  tropo: { zenithWetSigmaM: 0, minPeriodS: 1800, maxPeriodS: 3600 },
  slips: { roverPerSatHour: 20, referencePerSatHour: 2, maxCycles: 30 },
  gaps: true,
} as const;

/** Known integers: each receiver's ambiguity per satellite, band and epoch tag, as the simulator drew them. */
class TrueAmbiguities {
  private readonly bySat = new Map<string, { tags: number[]; n1: number[]; n2: number[] }>();
  record = (tagGpsS: number, sat: string, n1: number, n2: number): void => {
    let e = this.bySat.get(sat);
    if (!e) this.bySat.set(sat, (e = { tags: [], n1: [], n2: [] }));
    e.tags.push(tagGpsS); e.n1.push(n1); e.n2.push(n2);
  };
  /** The ambiguity of a band at the latest epoch at or before t (the engine never carries phase across a slip). */
  at(sat: string, band: 1 | 2, tGpsS: number): number {
    const e = this.bySat.get(sat);
    if (!e) return NaN;
    let lo = 0, hi = e.tags.length - 1, best = -1;
    while (lo <= hi) { const m = (lo + hi) >> 1; if (e.tags[m]! <= tGpsS + 1e-3) { best = m; lo = m + 1; } else hi = m - 1; }
    return best < 0 ? NaN : (band === 1 ? e.n1 : e.n2)[best]!;
  }
}

function stream(file: string, header: ObsHeader, epochs: () => Iterable<ObsEpoch>): ObsStream {
  return { file, header, epochs: (async function* () { yield* epochs(); })() };
}

export interface KnownIntegerRun {
  readonly sols: CarrierEpochSolution[];
  readonly summary: CarrierSummary;
  /** Fixed integers checked, by band, and those of GLONASS. */
  readonly fixes: { total: number; L1: number; L2: number; glonass: number };
  readonly wrongFixes: string[];
}

export interface KnownIntegerOptions {
  readonly carrier?: Partial<CarrierOptions>;
  readonly systems?: readonly GnssSystem[];
  /** Clear the rover's loss-of-lock bits: its slips left for the engine's own tests to find. */
  readonly unflagged?: boolean;
}

/**
 * Solves a simulated session; every double difference fixed by either pass is checked against the
 * simulator's integers: (rover - reference) of the satellite minus the same of the pivot, on the double
 * difference's band (a signal of band 2: the simulator's L2 integer; else L1/E1/G1), the rover's ambiguity
 * at the epoch's tag, the reference's at its latest epoch (within one reference arc, the engine's rule).
 */
export async function solveWithKnownIntegers(sim: SimulatedScenario, o: KnownIntegerOptions = {}): Promise<KnownIntegerRun> {
  const rover = new TrueAmbiguities(), reference = new TrueAmbiguities();
  const fixes = { total: 0, L1: 0, L2: 0, glonass: 0 };
  const wrongFixes: string[] = [];
  const roverEpochs = (): Iterable<ObsEpoch> => {
    const all = sim.rover.epochs(rover.record);
    return o.unflagged ? [...all].map((e) => ({ ...e, sats: e.sats.map((x) => ({ ...x, lli: new Uint8Array(x.lli.length) })) })) : all;
  };
  const run = await solveCarrierSession(async () => ({
    rover: stream('rover', sim.roverHeader, roverEpochs),
    references: [stream('reference', sim.referenceHeader, () => sim.reference.epochs(reference.record))],
    nav: sim.nav,
    onFixedAmbiguities: ({ pass, tagGpsS, ambiguities }) => {
      const t = sim.truth.roverTrueTime(tagGpsS);
      for (const a of ambiguities) {
        const band = a.signal[1] === '2' ? 2 : 1;
        fixes.total++;
        fixes[band === 2 ? 'L2' : 'L1']++;
        if (a.sat[0] === 'R') fixes.glonass++;
        const sd = (sat: string) => rover.at(sat, band, tagGpsS) - reference.at(sat, band, t);
        const truth = sd(a.sat) - sd(a.pivot);
        if (a.cycles !== truth) wrongFixes.push(`${pass} ${tagGpsS}: ${a.sat}-${a.pivot} ${a.signal} fixed ${a.cycles}, true ${truth}`);
      }
    },
  }), withDefaults({ ...(o.systems ? { systems: o.systems } : {}), reference: { position: { ecef: sim.truth.referenceMark, frame: sim.truth.frame } }, reduceToMark: false }), withCarrierDefaults(o.carrier ?? {}));
  const sols: CarrierEpochSolution[] = [];
  for await (const s of run.epochs) sols.push(s);
  return { sols, summary: run.summary(), fixes, wrongFixes };
}
