/**
 * Broadcast ephemeris store and selection: which issue of the navigation message to use for a
 * satellite at an epoch.
 *
 * Validity windows (|t - toe| or |t - t_b|, before the margin):
 *  - GPS/QZSS: half the fit interval (IS-GPS-200 20.3.4.4: fit interval flag 0 = 4 hours; toe is near
 *    the middle of the fit interval), i.e. 2 h for the usual 4-hour fit.
 *  - Galileo: 4 h (common practice: the Galileo OS SDD states a nominal validity of up to 4 h for a
 *    navigation data set; from memory).
 *  - BeiDou: 1 h (ephemerides are refreshed every hour, toe on the hour: common practice).
 *  - NavIC: 2 h (from memory).
 *  - GLONASS: 15 min (GLONASS ICD 5.1 A.3.1.2: t_b every 30 min, valid +-15 min).
 *  - SBAS: 10 min (common practice).
 * A margin (default 300 s, common practice) is added to every window, so GLONASS allows 20 min.
 * Among the usable records, healthy ones only (health 0, every system), preferably transmitted
 * before t when the transmission time is known, the one whose reference time is nearest t is taken.
 */
import type { Ephemeris, KeplerEphemeris, NavData } from '../gnss/index.js';
import type { GnssSystem, SatId } from '../gnss/index.js';
import { isGalileoFnav } from './clock.js';

/** Reference time of an ephemeris (toe, t_b or t0), GPS s. */
export function referenceTimeGpsS(eph: Ephemeris): number {
  switch (eph.kind) {
    case 'kepler': return eph.toeGpsS;
    case 'glonass': return eph.tbGpsS;
    case 'sbas': return eph.t0GpsS;
  }
}

/**
 * Identity of a broadcast issue: satellite, reference time and issue of data (IODE/IODnav/AODE, IODN
 * for SBAS; GLONASS t_b identifies the issue). Galileo keeps I/NAV and F/NAV apart (their clocks refer
 * to different signal pairs). Reference and rover processing use the same key at an epoch.
 */
export function issueKey(eph: Ephemeris): string {
  switch (eph.kind) {
    case 'kepler':
      return `${eph.sat}:${eph.toeGpsS}:${eph.iode}${eph.system === 'E' ? (isGalileoFnav(eph) ? ':F' : ':I') : ''}`;
    case 'glonass': return `${eph.sat}:${eph.tbGpsS}`;
    case 'sbas': return `${eph.sat}:${eph.t0GpsS}:${eph.iodn}`;
  }
}

export type SelectionFailure = 'no-ephemeris' | 'unhealthy' | 'too-old';

export type Selection =
  | { readonly eph: Ephemeris; readonly reason?: undefined; /** t - reference time (s). */ readonly ageS: number }
  | { readonly eph: null; readonly reason: SelectionFailure; /** For 'too-old': smallest |t - reference time| (s). */ readonly ageS?: number };

export interface SelectOptions {
  /** Seconds added to every validity window (default 300). */
  readonly marginS?: number;
  /** Use unhealthy records too (default false). */
  readonly allowUnhealthy?: boolean;
  /** Galileo: which clock to prefer when both are present (default 'INAV'); the other is used when alone. */
  readonly galileoClock?: 'INAV' | 'FNAV';
}

const DEFAULT_MARGIN_S = 300;

/** Half-width of the validity window (s) before margin: see the module comment. */
export function validityS(eph: Ephemeris): number {
  switch (eph.system) {
    case 'G': case 'J': {
      const fitH = eph.kind === 'kepler' && eph.fitIntervalH >= 4 ? eph.fitIntervalH : 4;
      return (fitH / 2) * 3600;
    }
    case 'E': return 4 * 3600;
    case 'C': return 3600;
    case 'I': return 2 * 3600;
    case 'R': return 15 * 60;
    case 'S': return 600;
  }
}

function isHealthy(eph: Ephemeris): boolean {
  return eph.health === 0;
}

function transmitGpsS(eph: Ephemeris): number {
  return eph.kind === 'kepler' ? eph.transmitGpsS : NaN;
}

export class EphemerisStore {
  private readonly bySat = new Map<SatId, Ephemeris[]>();
  private readonly byKey = new Map<string, Ephemeris>();
  /** Number of duplicate records dropped (same issue key seen again). */
  readonly duplicatesRemoved: number;

  constructor(nav: NavData | readonly NavData[]) {
    const list = Array.isArray(nav) ? (nav as readonly NavData[]) : [nav as NavData];
    let dup = 0;
    for (const n of list) {
      for (const eph of n.ephemerides) {
        const key = issueKey(eph);
        if (this.byKey.has(key)) { dup++; continue; }
        this.byKey.set(key, eph);
        let arr = this.bySat.get(eph.sat);
        if (arr === undefined) { arr = []; this.bySat.set(eph.sat, arr); }
        arr.push(eph);
      }
    }
    for (const arr of this.bySat.values()) arr.sort((a, b) => referenceTimeGpsS(a) - referenceTimeGpsS(b));
    this.duplicatesRemoved = dup;
  }

  static fromEphemerides(ephemerides: readonly Ephemeris[]): EphemerisStore {
    return new EphemerisStore({ files: [], version: 0, ephemerides, ionosphere: {}, leapSeconds: null });
  }

  /** Satellites with at least one record, sorted. */
  satellites(): SatId[] {
    return [...this.bySat.keys()].sort();
  }

  systemsWithEphemeris(): Set<GnssSystem> {
    const s = new Set<GnssSystem>();
    for (const arr of this.bySat.values()) s.add(arr[0].system);
    return s;
  }

  /** The satellite's distinct records, sorted by reference time. */
  ephemerides(sat: SatId): readonly Ephemeris[] {
    return this.bySat.get(sat) ?? [];
  }

  /** The record with this issue key (see issueKey), if present. */
  byIssueKey(key: string): Ephemeris | undefined {
    return this.byKey.get(key);
  }

  /** GLONASS slot -> frequency channel k, from the latest record of each slot (RINEX 2 obs files lack it). */
  glonassChannels(): Map<number, number> {
    const m = new Map<number, number>();
    for (const [sat, arr] of this.bySat) {
      if (arr[0].kind !== 'glonass') continue;
      const last = arr[arr.length - 1];
      if (last.kind === 'glonass') m.set(Number(sat.slice(1)), last.channel);
    }
    return m;
  }

  /** The issue to use for sat at GPS time t, or the reason there is none. */
  select(sat: SatId, tGpsS: number, opts: SelectOptions = {}): Selection {
    const arr = this.bySat.get(sat);
    if (arr === undefined || arr.length === 0) return { eph: null, reason: 'no-ephemeris' };
    const marginS = opts.marginS ?? DEFAULT_MARGIN_S;
    const window = validityS(arr[0]) + marginS;
    // First record with reference time >= t - window (binary search on the sorted list).
    let lo = 0;
    let hi = arr.length;
    while (lo < hi) {
      const mid = (lo + hi) >> 1;
      if (referenceTimeGpsS(arr[mid]) < tGpsS - window) lo = mid + 1; else hi = mid;
    }
    const wantFnav = opts.galileoClock === 'FNAV';
    let best: Ephemeris | null = null;
    let bestScore = Infinity;
    let sawValid = false;
    for (let i = lo; i < arr.length; i++) {
      const eph = arr[i];
      const ref = referenceTimeGpsS(eph);
      if (ref > tGpsS + window) break;
      sawValid = true;
      if (!opts.allowUnhealthy && !isHealthy(eph)) continue;
      // Score: distance in time, then penalties so that preferred records win whatever their distance.
      let score = Math.abs(tGpsS - ref);
      const tx = transmitGpsS(eph);
      if (tx > tGpsS) score += 1e7; // not yet transmitted at t: only when nothing else
      if (eph.kind === 'kepler' && eph.system === 'E' && isGalileoFnav(eph as KeplerEphemeris) !== wantFnav) score += 1e8;
      // Ties (equal distance): the later issue (larger reference time, then later in the list) wins.
      if (score <= bestScore) { best = eph; bestScore = score; }
    }
    if (best !== null) return { eph: best, ageS: tGpsS - referenceTimeGpsS(best) };
    if (sawValid) return { eph: null, reason: 'unhealthy' };
    let ageS = Infinity;
    for (const eph of arr) ageS = Math.min(ageS, Math.abs(tGpsS - referenceTimeGpsS(eph)));
    return { eph: null, reason: 'too-old', ageS };
  }
}
