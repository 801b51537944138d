/**
 * Each hatanaka pair (../shared/data/hatanaka-pairs: the same observations compact/compressed and plain,
 * published as test data with open-source format readers) read through the observation reader
 * (rinex/obs-reader.ts readObsStream): decoded and plain must give the same header and the same epochs,
 * every value, LLI and SSI.
 */
import { expect, it } from 'vitest';
import { openText } from '../packages/core/src/compress/index.js';
import { readObsStream } from '../packages/core/src/rinex/obs-reader.js';
import type { ObsEpoch } from '../packages/core/src/gnss/obs-types.js';
import type { Warning } from '../packages/core/src/errors.js';
import { dataPath, describeShared, fileChunks } from './support/shared.js';

async function* epochsOf(rel: string, warnings: Warning[]): AsyncIterable<ObsEpoch> {
  const sink = (w: Warning): void => void warnings.push(w);
  const t = await openText(rel, fileChunks(dataPath(rel)), { onWarning: sink });
  const s = await readObsStream(rel, t.text, { onWarning: sink });
  yield* s.epochs;
}

async function headerOf(rel: string): Promise<unknown> {
  const t = await openText(rel, fileChunks(dataPath(rel)));
  const h = (await readObsStream(rel, t.text)).header;
  // headerLines differs by design (the compact file has 2 more lines); everything else must match.
  return { ...h, headerLines: 0 };
}

describeShared('hatanaka-pairs through readObsStream', () => {
  const pairs = [
    ['hatanaka-pairs/york0440.15d', 'hatanaka-pairs/york0440.15o'],
    ['hatanaka-pairs/brst155h.20d', 'hatanaka-pairs/brst155h.20o'],
    ['hatanaka-pairs/ac660270.18o.Z', 'hatanaka-pairs/ac660270.18o'],
  ] as const;
  for (const [packed, plain] of pairs) {
    it(`${packed} and ${plain}: same header, epochs, values and flags`, async () => {
      expect(await headerOf(packed)).toEqual(await headerOf(plain));
      const wa: Warning[] = [];
      const wb: Warning[] = [];
      const ia = epochsOf(packed, wa)[Symbol.asyncIterator]();
      const ib = epochsOf(plain, wb)[Symbol.asyncIterator]();
      let n = 0;
      let values = 0;
      for (;;) {
        const [a, b] = await Promise.all([ia.next(), ib.next()]);
        expect(a.done).toBe(b.done);
        if (a.done || b.done) break;
        const ea = a.value;
        const eb = b.value;
        expect([ea.tagGpsS, ea.flag, ea.receiverClockOffsetS]).toEqual([eb.tagGpsS, eb.flag, eb.receiverClockOffsetS]);
        expect(ea.sats.map((s) => s.sat)).toEqual(eb.sats.map((s) => s.sat));
        for (let i = 0; i < ea.sats.length; i++) {
          const sa = ea.sats[i];
          const sb = eb.sats[i];
          expect(Array.from(sa.values)).toEqual(Array.from(sb.values));
          expect(Array.from(sa.lli)).toEqual(Array.from(sb.lli));
          expect(Array.from(sa.ssi)).toEqual(Array.from(sb.ssi));
          values += sa.values.length;
        }
        expect(ea.event?.comments ?? null).toEqual(eb.event?.comments ?? null);
        n++;
      }
      expect(n).toBeGreaterThan(20); // ac660270.18o, the smallest, has 23 epochs
      expect(values).toBeGreaterThan(500);
      expect(wa).toEqual([]);
      expect(wb).toEqual([]);
    });
  }
});
