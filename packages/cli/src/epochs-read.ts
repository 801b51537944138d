/**
 * What a run reads of an observation file, noted as the epochs pass: the first and last observation
 * epoch (flag 0 or 1) and whether the file was read to its end. The completeness of a run is judged
 * from the epochs read, not the header's TIME OF FIRST/LAST OBS, which a cut-off file keeps; noting
 * them as the run reads costs no second reading of the file.
 */
import type { ObsEpoch } from '@refdelta/core';
import type { OpenedObs } from './node-io.js';
import type { ReferenceRead } from './run-completeness.js';

/** The epochs read of one file, over every reading of it in a run (a session may read its inputs twice). */
export class EpochsRead implements ReferenceRead {
  firstGpsS = NaN;
  lastGpsS = NaN;
  toEnd = false;

  note(e: ObsEpoch): void {
    if (e.flag > 1 || !Number.isFinite(e.tagGpsS)) return;
    if (!(e.tagGpsS >= this.firstGpsS)) this.firstGpsS = e.tagGpsS;
    if (!(e.tagGpsS <= this.lastGpsS)) this.lastGpsS = e.tagGpsS;
  }
}

/**
 * An iterator handing out the file's epochs and noting each. A class, not a generator made per stream:
 * one call target for every session of a batch. return() and throw() go to the file's iterator, so a
 * reading left early still lets its file go.
 */
class NotingIterator implements AsyncIterator<ObsEpoch> {
  constructor(private readonly inner: AsyncIterator<ObsEpoch>, private readonly read: EpochsRead) {}

  async next(): Promise<IteratorResult<ObsEpoch>> {
    const r = await this.inner.next();
    if (r.done) this.read.toEnd = true;
    else this.read.note(r.value);
    return r;
  }

  async return(value?: unknown): Promise<IteratorResult<ObsEpoch>> {
    return this.inner.return ? this.inner.return(value) : { done: true, value: undefined };
  }

  async throw(e?: unknown): Promise<IteratorResult<ObsEpoch>> {
    if (this.inner.throw) return this.inner.throw(e);
    throw e;
  }
}

class NotedEpochs implements AsyncIterable<ObsEpoch> {
  constructor(private readonly inner: AsyncIterable<ObsEpoch>, private readonly read: EpochsRead) {}

  [Symbol.asyncIterator](): AsyncIterator<ObsEpoch> {
    return new NotingIterator(this.inner[Symbol.asyncIterator](), this.read);
  }
}

/** The stream with its epochs noted in `read` as they are read. */
export function notingEpochs(s: OpenedObs, read: EpochsRead): OpenedObs {
  return { file: s.file, header: s.header, epochs: new NotedEpochs(s.epochs, read), layers: s.layers, ...(s.close ? { close: s.close } : {}) };
}
