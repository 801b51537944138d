/**
 * Counts kept over a session for its summary: epochs by kind, rejected satellites and epochs by reason
 * (reasons counted without their numbers), constellations used.
 */
import type { GnssSystem } from '../gnss/index.js';
import { isRelativeKind, type EpochSolution, type RejectionCount, type SolutionKind } from './solution-types.js';

/** Reason text without its numbers, for counting ('below elevation mask (7.1 deg)' -> 'below elevation mask'). */
export function reasonKey(reason: string): string {
  return reason.replace(/\s*\(.*\)\s*$/, '').trim();
}

export class ReasonCounter {
  private readonly m = new Map<string, number>();
  private readonly keys = new Map<string, string>();
  add(reason: string): void {
    let k = this.keys.get(reason);
    if (k === undefined) {
      k = reasonKey(reason);
      if (this.keys.size < 10_000) this.keys.set(reason, k);
    }
    this.m.set(k, (this.m.get(k) ?? 0) + 1);
  }
  list(): RejectionCount[] {
    return [...this.m].map(([reason, count]) => ({ reason, count })).sort((a, b) => b.count - a.count);
  }
}

export class SessionTally {
  readonly satRejections = new ReasonCounter();
  readonly epochRejections = new ReasonCounter();
  readonly byKind: Record<SolutionKind, number> = { differential: 0, smoothed: 0, fixed: 0, float: 0, standalone: 0, none: 0 };
  readonly systemsUsed = new Set<GnssSystem>();
  roverEpochs = 0;
  withoutCorrections = 0;
  epochsInReach = 0;
  firstGpsS = NaN;
  lastGpsS = NaN;

  /** A rover epoch taken into the session (before it is solved). */
  epochSeen(tagGpsS: number): void {
    this.roverEpochs++;
    if (Number.isNaN(this.firstGpsS)) this.firstGpsS = tagGpsS;
    this.lastGpsS = tagGpsS;
  }

  /** A solved (or refused) epoch handed out. */
  epochOut(s: EpochSolution): void {
    this.byKind[s.kind]++;
    if (!isRelativeKind(s.kind)) this.epochRejections.add(s.reason || s.kind);
  }
}
