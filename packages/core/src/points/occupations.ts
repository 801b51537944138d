/**
 * Splits a per-epoch series into point occupations. Priority:
 * 1. user windows (occupation-csv.ts), when given: used as they are (windows with no epoch warn);
 * 2. RINEX event flags (RINEX 2.11 / 3.04 section on epoch flags: 2 = start moving antenna,
 *    3 = new site occupation, followed by a MARKER NAME record): a flag 3 starts a point named by its
 *    marker, a flag 2 or the next flag 3 ends it. Epochs before the first flag belong to the header's
 *    marker (initialMarkerName) unless the first flag is a flag 3;
 * 3. automatic static detection from Doppler-derived receiver speed (our choice of thresholds, common
 *    practice values for a hand-held or pole-mounted antenna, where walking is ~1-1.5 m/s and a
 *    standing antenna's Doppler speed noise is a few cm/s):
 *    - static begins when speed < 0.2 m/s and ends when speed > 0.3 m/s (hysteresis against noise);
 *    - a moving interruption shorter than 5 s between two static spans is merged into one span;
 *    - a data gap (no epochs) longer than 60 s ends a span (nothing is known about the antenna then);
 *    - a span must last at least 20 s to count as a point.
 *    Epochs without a speed neither start nor end a span.
 */
import type { WarningSink } from '../errors.js';
import type { HeightKind } from './antenna-height.js';
import type { OccupationWindow } from './occupation-csv.js';

export interface EpochMark {
  readonly tGpsS: number;
  readonly event?: { readonly kind: 'start-moving' | 'new-occupation'; readonly markerName?: string };
  readonly speedMS?: number;
}

export interface SplitInput {
  /** In time order. */
  readonly epochs: readonly EpochMark[];
  readonly windows?: readonly OccupationWindow[];
  /** MARKER NAME of the file header, names the occupation before the first event. */
  readonly initialMarkerName?: string;
  /**
   * Put before the names of static spans found from the Doppler speed (S1, S2...), so that spans of
   * different sessions do not share a name (e.g. 'ptA-' gives ptA-S1). Names from windows and events stay as given.
   */
  readonly detectedNamePrefix?: string;
}

export interface Occupation {
  readonly name: string;
  readonly startGpsS: number;
  readonly endGpsS: number;
  readonly source: 'windows' | 'events' | 'doppler';
  readonly antennaHeightM?: number;
  readonly heightKind?: HeightKind;
}

export interface StaticDetection {
  readonly enterBelowMS: number;
  readonly leaveAboveMS: number;
  readonly mergeGapS: number;
  readonly maxDataGapS: number;
  readonly minDurationS: number;
}

export const DEFAULT_STATIC_DETECTION: StaticDetection = {
  enterBelowMS: 0.2,
  leaveAboveMS: 0.3,
  mergeGapS: 5,
  maxDataGapS: 60,
  minDurationS: 20,
};

export function splitOccupations(input: SplitInput, opts: { detection?: Partial<StaticDetection>; onWarning?: WarningSink } = {}): Occupation[] {
  const epochs = input.epochs;
  if (input.windows && input.windows.length > 0) {
    const out: Occupation[] = [];
    for (const w of [...input.windows].sort((a, b) => a.startGpsS - b.startGpsS)) {
      if (!epochs.some((e) => e.tGpsS >= w.startGpsS && e.tGpsS <= w.endGpsS)) {
        opts.onWarning?.({ code: 'window-without-epochs', message: `occupation window ${w.name} holds no epoch of the data` });
      }
      out.push({ ...w, source: 'windows' });
    }
    return out;
  }
  if (epochs.some((e) => e.event)) return fromEvents(input);
  return fromDoppler(epochs, { ...DEFAULT_STATIC_DETECTION, ...opts.detection }, input.detectedNamePrefix ?? '');
}

function fromEvents(input: SplitInput): Occupation[] {
  // An event is attached to the first epoch it applies to: 'start-moving' on an epoch means that epoch
  // is already moving; 'new-occupation' means that epoch is the first of the new point.
  const out: Occupation[] = [];
  let current: { name: string; start: number; last: number; n: number } | undefined;
  let count = 0;
  const close = () => {
    if (current && current.n > 0) out.push({ name: current.name, startGpsS: current.start, endGpsS: current.last, source: 'events' });
    current = undefined;
  };
  const first = input.epochs.find((e) => e.event);
  if (first?.event?.kind !== 'new-occupation' && input.epochs.length > 0) {
    const t0 = input.epochs[0]!.tGpsS;
    current = { name: input.initialMarkerName?.trim() || `P${++count}`, start: t0, last: t0, n: 0 };
  }
  for (const e of input.epochs) {
    if (e.event?.kind === 'start-moving') close();
    else if (e.event?.kind === 'new-occupation') {
      close();
      current = { name: e.event.markerName?.trim() || `P${++count}`, start: e.tGpsS, last: e.tGpsS, n: 0 };
    }
    if (current) {
      current.last = e.tGpsS;
      current.n++;
    }
  }
  close();
  return out;
}

function fromDoppler(epochs: readonly EpochMark[], d: StaticDetection, namePrefix: string): Occupation[] {
  const spans: Array<{ start: number; end: number }> = [];
  let open: { start: number; end: number } | undefined;
  let prevT = -Infinity;
  for (const e of epochs) {
    if (open && e.tGpsS - prevT > d.maxDataGapS) {
      spans.push(open);
      open = undefined;
    }
    prevT = e.tGpsS;
    const v = e.speedMS;
    if (v === undefined || !Number.isFinite(v)) continue;
    if (!open && v < d.enterBelowMS) open = { start: e.tGpsS, end: e.tGpsS };
    else if (open && v > d.leaveAboveMS) {
      spans.push(open);
      open = undefined;
    } else if (open) open.end = e.tGpsS;
  }
  if (open) spans.push(open);
  const merged: Array<{ start: number; end: number }> = [];
  for (const s of spans) {
    const last = merged[merged.length - 1];
    if (last && s.start - last.end < d.mergeGapS) last.end = s.end;
    else merged.push({ ...s });
  }
  return merged
    .filter((s) => s.end - s.start >= d.minDurationS)
    .map((s, i) => ({ name: `${namePrefix}S${i + 1}`, startGpsS: s.start, endGpsS: s.end, source: 'doppler' as const }));
}
