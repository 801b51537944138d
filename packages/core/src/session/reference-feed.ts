/**
 * The reference receiver's epochs fed into the reference corrections as the rover advances: files joined
 * in time order (join-references.ts), each file's antenna record and in-file antenna events applied from
 * their first epoch, a reference that moves refused, and the window of epochs kept bounded by the
 * correction age limit.
 */
import type { AntennaOffset, EcefM, ObsEpoch, ObsHeader, ObsStream, SatId, CodeValuesBySat } from '../gnss/index.js';
import { ProcessingError, type WarningSink } from '../errors.js';
import { isoFromSeconds } from '../time/index.js';
import type { ReferenceCorrections } from '../differencing/index.js';
import { joinReferenceStreams, type SourcedEpoch } from './join-references.js';
import { markToArp } from '../geodesy/index.js';

/** A per-receiver filter the reference epochs pass through (carrier smoothing), if any. */
export interface ReferenceFilter {
  update(epoch: SourcedEpoch['epoch']): CodeValuesBySat | undefined;
  /** Satellites of a flag-6 epoch (cycle-slip records) restart. */
  slipsReported?(epoch: SourcedEpoch['epoch']): void;
  /** Variance factors of the last update's values (sat -> code -> factor). */
  readonly factors?: CodeValuesBySat;
  reset(): void;
}

export class ReferenceFeed {
  private readonly iterator: AsyncIterator<SourcedEpoch>;
  private done = false;
  private header: ObsHeader;
  private readonly firstHeader: ObsHeader;
  private antenna: AntennaOffset;
  /** Reference antenna reference point in force. */
  arpM: EcefM;
  firstGpsS = NaN;
  lastGpsS = NaN;

  constructor(
    streams: readonly ObsStream[],
    private readonly corrections: ReferenceCorrections,
    private readonly refMark: EcefM,
    startAntenna: AntennaOffset,
    /** True when the user fixed the antenna offset: file records and events do not change it. */
    private readonly antennaFixed: boolean,
    private readonly filter: ReferenceFilter | null,
    private readonly maxAgeS: number,
    private readonly notes: string[],
    private readonly warn: WarningSink,
  ) {
    this.iterator = joinReferenceStreams(streams)[Symbol.asyncIterator]();
    this.header = streams[0].header;
    this.firstHeader = streams[0].header;
    this.antenna = startAntenna;
    this.arpM = markToArp(refMark, startAntenna);
  }

  /** How far ahead of a rover epoch reference epochs are read (s). */
  get lookaheadS(): number {
    return Math.min(this.maxAgeS, 35);
  }

  /** Reads reference epochs until one later than `untilGpsS` is held (or the files end). */
  async pullUntil(untilGpsS: number): Promise<void> {
    while (!this.done && this.corrections.latestTimeGpsS <= untilGpsS) {
      const e = await this.nextEpoch();
      if (e === null) break;
      const smoothed = this.filter?.update(e);
      this.corrections.addEpoch(e, this.arpM, smoothed, undefined, this.filter?.factors);
      // Bounded memory: nothing older than the age limit before the rover's time is kept.
      this.corrections.prune(untilGpsS - this.lookaheadS, this.maxAgeS + 2);
    }
  }

  /**
   * Passes the reference epochs through the filter as far as pullUntil(untilGpsS) would read them, but
   * computes corrections only for epochs tagged less than `exactWithinS` before untilGpsS: an earlier
   * epoch's time (its tag less the receiver clock) cannot pass untilGpsS while the clock is under
   * exactWithinS, so the reading stops at the same epoch. For a first pass that only records the filter.
   */
  async filterUntil(untilGpsS: number, exactWithinS = 1): Promise<void> {
    while (!this.done && this.corrections.latestTimeGpsS <= untilGpsS) {
      const e = await this.nextEpoch();
      if (e === null) break;
      const smoothed = this.filter?.update(e);
      if (e.tagGpsS >= untilGpsS - exactWithinS) this.corrections.addEpoch(e, this.arpM, smoothed, undefined, this.filter?.factors);
    }
  }

  /**
   * The next reference epoch to use (flag 0 or 1, with satellites), with the files' antenna records and
   * in-file events applied on the way; null when the files end.
   */
  private async nextEpoch(): Promise<ObsEpoch | null> {
    while (!this.done) {
      const r = await this.iterator.next();
      if (r.done) { this.done = true; break; }
      const e = r.value.epoch;
      if (r.value.header !== this.header) this.nextFile(r.value);
      if (e.event) {
        if (e.event.kind === 'new-occupation' || e.event.kind === 'start-moving') {
          throw new ProcessingError(`${r.value.file}:${e.line}: the reference receiver ${e.event.kind === 'start-moving' ? 'starts moving' : 'moves to a new site'} (epoch flag ${e.flag}); a reference must stay on its known point`);
        }
        if (e.event.antennaOffset && !this.antennaFixed) {
          this.setAntenna(e.event.antennaOffset);
          this.notes.push(`reference antenna height changed to ${this.antenna.heightM} m at ${isoFromSeconds(e.tagGpsS, ' GPST')} (${r.value.file}:${e.line})`);
        }
        if (e.flag === 1) this.filter?.reset();
        if (e.sats.length === 0) continue;
      }
      if (e.flag === 6) this.filter?.slipsReported?.(e);
      if (e.flag > 1) continue;
      if (Number.isNaN(this.firstGpsS)) this.firstGpsS = e.tagGpsS;
      this.lastGpsS = e.tagGpsS;
      return e;
    }
    return null;
  }

  /** The next reference file: its own antenna record applies from its first epoch. */
  private nextFile(x: SourcedEpoch): void {
    const h = x.header;
    const first = this.firstHeader;
    if (h.markerName.trim() && first.markerName.trim() && h.markerName.trim() !== first.markerName.trim()) {
      this.warn({ file: x.file, code: 'reference-station-changed', message: `reference file ${x.file} is of marker '${h.markerName.trim()}', the first of '${first.markerName.trim()}': all reference files must be of one station` });
    }
    const a = h.antennaOffset, b = this.antenna;
    if (!this.antennaFixed && (a.heightM !== b.heightM || a.eastM !== b.eastM || a.northM !== b.northM)) {
      this.setAntenna(a);
      this.notes.push(`reference antenna height ${this.antenna.heightM} m from ${x.file}`);
    }
    this.header = h;
  }

  private setAntenna(a: AntennaOffset): void {
    this.antenna = a;
    this.arpM = markToArp(this.refMark, a);
  }
}
