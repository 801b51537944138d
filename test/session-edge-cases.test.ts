/**
 * Edge cases of a differential session, on simulated data (SELF-CONSISTENCY: the simulator shares the
 * orbit model with the engine). Each case is a user situation that must be reported, not dropped.
 */
import { describe, expect, it } from 'vitest';
import { simulateScenario, exampleScenarioSpec, type SimulatedScenario } from '../packages/sim/src/index.js';
import { solveSession, withDefaults, type EpochSolution } from '../packages/core/src/session/index.js';
import type { ObsEpoch, ObsHeader, ObsStream } from '../packages/core/src/gnss/obs-types.js';
import { ProcessingError } from '../packages/core/src/errors.js';

function stream(file: string, header: ObsHeader, epochs: Iterable<ObsEpoch>): ObsStream {
  return { file, header, epochs: (async function* () { yield* epochs; })() };
}

async function run(sim: SimulatedScenario, rover: Iterable<ObsEpoch>, reference: Iterable<ObsEpoch>, refHeader = sim.referenceHeader): Promise<EpochSolution[]> {
  const r = await solveSession({ rover: stream('rover', sim.roverHeader, rover), references: [stream('ref', refHeader, reference)], nav: sim.nav },
    withDefaults({ reference: { position: { ecef: sim.truth.referenceMark, frame: sim.truth.frame } } }));
  const out: EpochSolution[] = [];
  for await (const s of r.epochs) out.push(s);
  return out;
}

describe('session edge cases (self-consistency, simulated)', () => {
  const sim = simulateScenario(exampleScenarioSpec({}, 9));
  const rover = [...sim.roverEpochs()];
  const reference = [...sim.referenceEpochs()];

  it('an epoch with no satellites is reported, not dropped', async () => {
    const i = rover.findIndex((e) => e.flag === 0 && e.sats.length > 0);
    const withEmpty = [...rover.slice(0, i + 1), { ...rover[i], tagGpsS: rover[i].tagGpsS + 0.5, sats: [] }, ...rover.slice(i + 1)];
    const sols = await run(sim, withEmpty, reference);
    const empty = sols.find((s) => s.tagGpsS === rover[i].tagGpsS + 0.5);
    expect(empty?.kind).toBe('none');
    expect(empty?.reason).toBe('no satellites in the epoch');
  });

  it('rover epochs before the reference starts say so; later ones are solved', async () => {
    const late = reference.filter((e) => e.tagGpsS > rover[0].tagGpsS + 200);
    const sols = await run(sim, rover, late);
    const early = sols.filter((s) => s.tagGpsS < rover[0].tagGpsS + 100);
    expect(early.length).toBeGreaterThan(50);
    for (const s of early) expect(s.reason).toMatch(/^no reference epoch within the correction age limit/);
    expect(sols.filter((s) => s.kind === 'differential').length).toBeGreaterThan(100);
  });

  it('files that do not overlap in time give one clear ProcessingError', async () => {
    // the reference moved 6 h earlier (the simulated reference starts only 60 s before the rover, so a
    // filter on time would leave it empty: that is reported as a reference without epochs)
    const before = reference.map((e) => ({ ...e, tagGpsS: e.tagGpsS - 6 * 3600 }));
    await expect(run(sim, rover, before)).rejects.toThrow(ProcessingError);
    await expect(run(sim, rover, before)).rejects.toThrow(/do not overlap in time/);
  });

  it('a reference without the rover code type is not called "no overlap"', async () => {
    const renamed = reference.map((e) => ({ ...e, sats: e.sats.map((s) => ({ ...s, codes: s.codes.map((c) => (c === 'C1C' ? 'C1X' : c)) })) }));
    const sols = await run(sim, rover, renamed);
    const s = sols.find((x) => x.kind === 'none')!;
    expect(s.satellites.some((x) => x.reason.startsWith('no common code type'))).toBe(true);
  });

  it('a reference that starts moving is refused with its file and line', async () => {
    const i = 10;
    const moving = [...reference.slice(0, i), { ...reference[i], flag: 2, sats: [], event: { kind: 'start-moving' as const, comments: [] } }, ...reference.slice(i)];
    await expect(run(sim, rover, moving)).rejects.toThrow(/ref:\d+: the reference receiver starts moving/);
  });
});
