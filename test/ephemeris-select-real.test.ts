/**
 * EphemerisStore.select (per-satellite index, nearest-first search, last choice kept) against the
 * selection rule of orbit/ephemeris-store.ts written out plainly as a scan of the whole validity window,
 * on the real navigation files of ../shared/data (never walking-run/): the same record (the same
 * object) or the same failure, at times every 197 s over each file's day and 6 h beyond, for the default
 * options and the other option values.
 */
import { gunzipSync } from 'node:zlib';
import { expect, it } from 'vitest';
import { dataPath, describeShared, fileBytes } from './support/shared.js';
import { readNav } from '../packages/core/src/rinex/nav-reader.js';
import type { Ephemeris, NavData } from '../packages/core/src/rinex/nav-types.js';
import { EphemerisStore, referenceTimeGpsS, validityS, type Selection, type SelectOptions } from '../packages/core/src/orbit/ephemeris-store.js';
import { isGalileoFnav } from '../packages/core/src/orbit/clock.js';

async function* once(s: string): AsyncIterable<string> {
  yield s;
}

async function load(rel: string): Promise<NavData> {
  const bytes = fileBytes(dataPath(rel));
  const text = new TextDecoder('latin1').decode(rel.endsWith('.gz') ? gunzipSync(bytes) : bytes);
  return readNav(rel, once(text), { onWarning: () => {} });
}

/** The rule of the module comment as a plain scan of every record within the window. */
function plainSelect(list: readonly Ephemeris[], t: number, opts: SelectOptions): Selection {
  if (list.length === 0) return { eph: null, reason: 'no-ephemeris', ageS: NaN };
  const window = validityS(list[0]) + (opts.marginS ?? 300);
  let best: Ephemeris | null = null;
  let bestScore = Infinity;
  let sawValid = false;
  for (const eph of list) {
    const ref = referenceTimeGpsS(eph);
    if (ref < t - window || ref > t + window) continue;
    sawValid = true;
    if (!opts.allowUnhealthy && eph.health !== 0) continue;
    let score = Math.abs(t - ref);
    if (eph.kind === 'kepler' && eph.transmitGpsS > t) score += 1e7;
    if (eph.kind === 'kepler' && eph.system === 'E' && isGalileoFnav(eph) !== (opts.galileoClock === 'FNAV')) score += 1e8;
    if (score <= bestScore) { best = eph; bestScore = score; }
  }
  if (best !== null) return { eph: best, reason: undefined, ageS: t - referenceTimeGpsS(best) };
  if (sawValid) return { eph: null, reason: 'unhealthy', ageS: NaN };
  let ageS = Infinity;
  for (const eph of list) ageS = Math.min(ageS, Math.abs(t - referenceTimeGpsS(eph)));
  return { eph: null, reason: 'too-old', ageS };
}

const FILES = [
  'single-station/BRDC00IGS_R_20240100000_01D_MN.rnx.gz',
  'single-station/brdc0100.24n.gz',
  'single-station/brdc0100.24g.gz',
  'single-station/VILL00ESP_R_20181700000_01D_MN.rnx.gz',
  'single-station/CEDA00USA_R_20182100000_01D_MN.rnx.gz',
  'single-station/BRDM00DLR_R_20130010000_01D_MN.rnx',
  'cors-and-rover-2018-277/reference/glw1277m.18n',
  'cors-and-rover-2018-277/reference/glw1277m.18g',
];

const OPTION_SETS: SelectOptions[] = [{}, { allowUnhealthy: true }, { galileoClock: 'FNAV' }, { marginS: 0 }, { marginS: 3600, galileoClock: 'INAV' }];

describeShared('EphemerisStore.select on real navigation files agrees with a whole-window scan', () => {
  for (const rel of FILES) {
    it(rel, async () => {
      const nav = await load(rel);
      const store = new EphemerisStore(nav);
      // The files' days (a stray record weeks away would stretch the span: 1st to 99th percentile).
      const refs = nav.ephemerides.map(referenceTimeGpsS).filter(Number.isFinite).sort((a, b) => a - b);
      const first = refs[Math.floor(0.01 * refs.length)]! - 6 * 3600, last = refs[Math.floor(0.99 * refs.length)]! + 6 * 3600;
      let compared = 0;
      for (const sat of [...store.satellites(), 'G99' as const]) {
        const list = store.ephemerides(sat);
        for (let t = first; t <= last; t += 197) {
          for (const opts of OPTION_SETS) {
            const got = store.select(sat, t, opts);
            const want = plainSelect(list, t, opts);
            if (got.eph !== want.eph || got.reason !== want.reason || !Object.is(got.ageS, want.ageS)) {
              expect({ sat, t, opts, got: got.eph?.line ?? got.reason, ageS: got.ageS }).toEqual({ sat, t, opts, got: want.eph?.line ?? want.reason, ageS: want.ageS });
            }
            compared++;
          }
          // Asked again at once: the kept answer.
          if (list.length > 0) expect(store.select(sat, t)).toBe(store.select(sat, t));
        }
      }
      expect(compared).toBeGreaterThan(1000);
    }, 120_000);
  }
});
