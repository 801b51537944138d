/**
 * Several reference observation files (hourly CORS files, mixed intervals) joined into one stream in time
 * order. Epochs with the same tag (within 1 ms) in two files are taken once. Each epoch travels with the
 * header of the file it came from, so per-file antenna records still apply.
 */
import type { ObsEpoch, ObsHeader, ObsStream } from '../gnss/index.js';

export interface SourcedEpoch {
  readonly epoch: ObsEpoch;
  readonly header: ObsHeader;
  readonly file: string;
}

export async function* joinReferenceStreams(streams: readonly ObsStream[]): AsyncIterable<SourcedEpoch> {
  const its = streams.map((s) => ({ s, it: s.epochs[Symbol.asyncIterator]() }));
  const heads: Array<IteratorResult<ObsEpoch> | null> = await Promise.all(its.map((x) => x.it.next()));
  let lastTag = -Infinity;
  for (;;) {
    let best = -1;
    for (let i = 0; i < heads.length; i++) {
      const h = heads[i];
      if (!h || h.done) continue;
      if (best < 0 || h.value.tagGpsS < (heads[best] as IteratorYieldResult<ObsEpoch>).value.tagGpsS) best = i;
    }
    if (best < 0) return;
    const h = heads[best] as IteratorYieldResult<ObsEpoch>;
    const e = h.value;
    heads[best] = await its[best].it.next();
    // Flag-6 records (cycle slips) share the tag of their epoch: they are kept, not taken for a duplicate.
    const isObservation = e.flag <= 1;
    if (isObservation && Math.abs(e.tagGpsS - lastTag) < 1e-3) continue;
    if (isObservation) lastTag = e.tagGpsS;
    yield { epoch: e, header: its[best].s.header, file: its[best].s.file };
  }
}
