/**
 * A carrier-phase session releases its records whether it ends or fails: its per-epoch objects outlive
 * it (carrier/kept-shapes.ts), so a failed session must not leave its records behind in them.
 * SELF-CONSISTENCY: simulated data (the simulator shares the orbit model with the engine).
 */
import { describe, expect, it } from 'vitest';
import { simulateScenario, exampleScenarioSpec } from '../packages/sim/src/index.js';
import { withDefaults } from '../packages/core/src/session/index.js';
import { MemoryRecordStore, solveCarrierSession, withCarrierDefaults } from '../packages/core/src/carrier/index.js';
import type { ObsEpoch, ObsHeader, ObsStream } from '../packages/core/src/gnss/obs-types.js';

function stream(file: string, header: ObsHeader, epochs: Iterable<ObsEpoch>): ObsStream {
  return { file, header, epochs: (async function* () { yield* epochs; })() };
}

/** A memory store that says whether it was closed. */
class WatchedStore extends MemoryRecordStore {
  closed = false;
  override close(): void {
    this.closed = true;
    super.close();
  }
}

describe('carrier session: records released when it ends or fails (self-consistency, simulated)', () => {
  const sim = simulateScenario(exampleScenarioSpec({}, 9));
  const rover = [...sim.roverEpochs()];
  const reference = [...sim.referenceEpochs()];
  const options = withDefaults({ reference: { position: { ecef: sim.truth.referenceMark, frame: sim.truth.frame } } });
  const solve = (store: WatchedStore, ref: Iterable<ObsEpoch>) => solveCarrierSession(async () => ({
    rover: stream('rover', sim.roverHeader, rover),
    references: [stream('reference', sim.referenceHeader, ref)],
    nav: sim.nav,
    recordStore: store,
  }), options, withCarrierDefaults({}));

  it('a session read through to its end closes its record store', async () => {
    const store = new WatchedStore();
    const run = await solve(store, reference);
    let n = 0;
    for await (const _ of run.epochs) n++;
    expect(n).toBeGreaterThan(0.9 * rover.length);
    expect(store.closed).toBe(true);
  });

  it('a session that fails after reading (files that do not overlap) closes its record store before the error goes on', async () => {
    const store = new WatchedStore();
    const sixHoursBefore = reference.map((e) => ({ ...e, tagGpsS: e.tagGpsS - 6 * 3600 }));
    await expect(solve(store, sixHoursBefore)).rejects.toThrow(/do not overlap in time/);
    expect(store.closed).toBe(true);
  });
});
