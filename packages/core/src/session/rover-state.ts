/**
 * What the session knows about the rover between epochs: the point it occupies (from event records), the
 * antenna height in force, the last position and receiver clock (start values for the next epoch).
 */
import type { AntennaOffset, EcefM, ObsEpoch } from '../gnss/index.js';

export type OccupationEvent = 'new-occupation' | 'start-moving';

export class RoverState {
  pointName: string;
  pendingEvent: OccupationEvent | null = null;
  antenna: AntennaOffset;
  lastPosition: EcefM | null = null;
  lastClockM = NaN;

  constructor(markerName: string, antenna: AntennaOffset, private readonly antennaFixed: boolean) {
    this.pointName = markerName.trim();
    this.antenna = antenna;
  }

  /** Applies an epoch's event record (new occupation, start moving, antenna change). */
  applyEvent(e: ObsEpoch): void {
    const ev = e.event;
    if (!ev) return;
    if (ev.kind === 'new-occupation') { this.pointName = (ev.markerName ?? '').trim() || this.pointName; this.pendingEvent = 'new-occupation'; }
    if (ev.kind === 'start-moving') { this.pointName = ''; this.pendingEvent = 'start-moving'; }
    if (ev.antennaOffset && !this.antennaFixed) this.antenna = ev.antennaOffset;
  }
}
