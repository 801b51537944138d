/**
 * What an observation file holds, in a layout of our own: format, encoding, station, time span,
 * interval and gaps, satellites per constellation, observation types, events and problems found.
 */
import type { Warning } from '../errors.js';
import { GNSS_SYSTEMS, SYSTEM_NAMES, satSystem, type GnssSystem } from '../gnss/index.js';
import { gpsToUtcS, isoFromSeconds, weekTowFromGpsS } from '../time/index.js';
import { ecefToGeodetic, radToDeg } from '../geodesy/index.js';
import type { ObsStream } from '../gnss/index.js';
import { jsonNumber } from '../report/index.js';

/** RINEX 2.11 section 5.1 / RINEX 3.05 table A3: epoch flag meanings. */
export const EPOCH_FLAG_WORDS: Readonly<Record<number, string>> = {
  0: 'ok',
  1: 'power failure between previous and current epoch',
  2: 'start moving antenna',
  3: 'new site occupation',
  4: 'header information follows',
  5: 'external event',
  6: 'cycle slip records follow',
};

export interface TimeStamp { readonly gps_s: number; readonly gps_week: number; readonly gps_tow_s: number; readonly gps: string; readonly utc: string }

export interface GapRecord { readonly start: TimeStamp; readonly end: TimeStamp; readonly length_s: number }

export interface EventRecord { readonly line: number; readonly flag: number; readonly meaning: string; readonly time: TimeStamp | null; readonly marker: string | null; readonly comments: readonly string[] }

export interface ObsInspection {
  readonly kind: 'observation';
  readonly file: string;
  readonly format: { readonly name: string; readonly version: number; readonly system_field: string; readonly encoding_layers: readonly string[] };
  readonly station: {
    readonly marker_name: string; readonly marker_number: string;
    readonly receiver_type: string; readonly receiver_number: string; readonly receiver_version: string | null;
    readonly antenna_type: string; readonly antenna_number: string;
    readonly antenna_delta_hen_m: readonly [number, number, number];
  };
  readonly approx_position: { readonly x_m: number; readonly y_m: number; readonly z_m: number; readonly latitude_deg: number; readonly longitude_deg: number; readonly height_m: number; readonly note: string } | null;
  readonly time_system: string;
  readonly time_span: { readonly first: TimeStamp; readonly last: TimeStamp; readonly duration_s: number } | null;
  readonly interval: { readonly nominal_s: number | null; readonly detected_s: number | null };
  readonly gaps: { readonly threshold_s: number | null; readonly count: number; readonly total_s: number; readonly list: readonly GapRecord[]; readonly list_truncated: boolean };
  readonly epochs: { readonly observation: number; readonly by_flag: Readonly<Record<string, number>> };
  readonly satellites: {
    readonly total: number;
    readonly per_system: Readonly<Record<string, { readonly name: string; readonly count: number; readonly epochs_per_satellite: Readonly<Record<string, number>> }>>;
  };
  readonly observation_types: Readonly<Record<string, { readonly rinex3: readonly string[]; readonly as_written: readonly string[] }>>;
  readonly events: { readonly count: number; readonly list: readonly EventRecord[]; readonly list_truncated: boolean };
  readonly problems: { readonly count: number; readonly list: readonly { readonly line: number | null; readonly code: string; readonly message: string }[]; readonly list_truncated: boolean };
}

export interface InspectOptions {
  /** Encoding layers the decompression stage found (outermost first). */
  readonly layers?: readonly string[];
  /**
   * Warnings raised while reading this stream. Pass the same array the reader's onWarning pushes into:
   * it is read after the epochs are consumed.
   */
  readonly warnings?: readonly Warning[];
  /** Longest lists kept (gaps, events, problems); default 200. */
  readonly maxListed?: number;
}

export function timeStamp(gpsS: number): TimeStamp {
  const wt = weekTowFromGpsS(gpsS);
  return {
    gps_s: jsonNumber(gpsS, 3)!, gps_week: wt.week, gps_tow_s: jsonNumber(wt.towS, 3)!,
    gps: isoFromSeconds(gpsS), utc: isoFromSeconds(gpsToUtcS(gpsS), 'Z'),
  };
}

/** The most frequent spacing between consecutive epochs, to the millisecond (receiver tags jitter by ms). */
export function modalIntervalS(spacingsMs: ReadonlyMap<number, number>): number | null {
  let best: number | null = null;
  let bestCount = 0;
  for (const [ms, n] of spacingsMs) if (n > bestCount || (n === bestCount && best !== null && ms < best)) { best = ms; bestCount = n; }
  return best === null ? null : best / 1000;
}

/** Reads the whole stream (epochs consumed once) and describes it. */
export async function inspectObs(stream: ObsStream, opts: InspectOptions = {}): Promise<ObsInspection> {
  const h = stream.header;
  const maxListed = opts.maxListed ?? 200;
  const byFlag: Record<string, number> = {};
  const perSat = new Map<string, number>();
  const spacingsMs = new Map<number, number>();
  const tags: number[] = [];
  const events: EventRecord[] = [];
  let eventCount = 0;
  let first = NaN;
  let last = NaN;
  let prev = NaN;
  let observationEpochs = 0;
  for await (const ep of stream.epochs) {
    byFlag[String(ep.flag)] = (byFlag[String(ep.flag)] ?? 0) + 1;
    const hasTime = Number.isFinite(ep.tagGpsS) && !ep.tagWasBlank;
    if (ep.flag >= 1 && ep.flag <= 6) {
      eventCount++;
      if (events.length < maxListed) {
        events.push({
          line: ep.line, flag: ep.flag, meaning: EPOCH_FLAG_WORDS[ep.flag] ?? 'unknown flag',
          time: hasTime ? timeStamp(ep.tagGpsS) : null,
          marker: ep.event?.markerName ?? null, comments: ep.event?.comments ?? [],
        });
      }
    }
    // Flags 2-6 carry events or cycle-slip records, not a new observation epoch.
    if (ep.flag > 1) continue;
    observationEpochs++;
    if (!hasTime) continue;
    if (!Number.isFinite(first)) first = ep.tagGpsS;
    last = ep.tagGpsS;
    if (Number.isFinite(prev)) {
      const ms = Math.round((ep.tagGpsS - prev) * 1000);
      spacingsMs.set(ms, (spacingsMs.get(ms) ?? 0) + 1);
    }
    prev = ep.tagGpsS;
    tags.push(ep.tagGpsS);
    for (const s of ep.sats) perSat.set(s.sat, (perSat.get(s.sat) ?? 0) + 1);
  }

  const detected = modalIntervalS(spacingsMs);
  const base = detected ?? h.intervalS;
  // Gap rule of this project: a spacing longer than 1.5 x the interval (common practice for "missing epoch").
  const threshold = base !== null && base > 0 ? 1.5 * base : null;
  const gaps: GapRecord[] = [];
  let gapCount = 0;
  let gapTotal = 0;
  if (threshold !== null) {
    for (let i = 1; i < tags.length; i++) {
      const d = tags[i] - tags[i - 1];
      if (d > threshold) {
        gapCount++;
        gapTotal += d;
        if (gaps.length < maxListed) gaps.push({ start: timeStamp(tags[i - 1]), end: timeStamp(tags[i]), length_s: jsonNumber(d, 3)! });
      }
    }
  }

  const perSystem: Record<string, { name: string; count: number; epochs_per_satellite: Record<string, number> }> = {};
  const order = (sat: string): number => GNSS_SYSTEMS.indexOf(satSystem(sat));
  for (const sat of [...perSat.keys()].sort((a, b) => order(a) - order(b) || (a < b ? -1 : a > b ? 1 : 0))) {
    const sys = satSystem(sat);
    const entry = (perSystem[sys] ??= { name: SYSTEM_NAMES[sys] ?? sys, count: 0, epochs_per_satellite: {} });
    entry.count++;
    entry.epochs_per_satellite[sat] = perSat.get(sat)!;
  }

  const obsTypes: Record<string, { rinex3: readonly string[]; as_written: readonly string[] }> = {};
  for (const sys of GNSS_SYSTEMS as readonly GnssSystem[]) {
    const c = h.obsCodes[sys];
    if (c && c.length) obsTypes[sys] = { rinex3: [...c], as_written: [...(h.fileObsCodes[sys] ?? c)] };
  }

  let approx: ObsInspection['approx_position'] = null;
  if (h.approxPosition) {
    const g = ecefToGeodetic(h.approxPosition);
    approx = {
      x_m: h.approxPosition.x, y_m: h.approxPosition.y, z_m: h.approxPosition.z,
      latitude_deg: jsonNumber(radToDeg(g.latRad), 9)!, longitude_deg: jsonNumber(radToDeg(g.lonRad), 9)!, height_m: jsonNumber(g.heightM, 4)!,
      note: 'header APPROX POSITION XYZ: frame not stated by the file; may be approximate (latitude/longitude/height on WGS-84)',
    };
  }

  const problems = (opts.warnings ?? []).filter((w) => !w.file || w.file === stream.file);
  return {
    kind: 'observation',
    file: stream.file,
    format: {
      name: h.version >= 3 ? 'RINEX 3/4 observation' : 'RINEX 2 observation',
      version: h.version, system_field: h.systemField, encoding_layers: [...(opts.layers ?? [])],
    },
    station: {
      marker_name: h.markerName, marker_number: h.markerNumber,
      receiver_type: h.receiverType, receiver_number: h.receiverNumber, receiver_version: h.receiverVersion ?? null,
      antenna_type: h.antennaType, antenna_number: h.antennaNumber,
      antenna_delta_hen_m: [h.antennaOffset.heightM, h.antennaOffset.eastM, h.antennaOffset.northM],
    },
    approx_position: approx,
    time_system: h.timeSystem,
    time_span: Number.isFinite(first)
      ? { first: timeStamp(first), last: timeStamp(last), duration_s: jsonNumber(last - first, 3)! }
      : null,
    interval: { nominal_s: h.intervalS, detected_s: detected },
    gaps: { threshold_s: threshold, count: gapCount, total_s: jsonNumber(gapTotal, 3)!, list: gaps, list_truncated: gapCount > gaps.length },
    epochs: { observation: observationEpochs, by_flag: byFlag },
    satellites: { total: perSat.size, per_system: perSystem },
    observation_types: obsTypes,
    events: { count: eventCount, list: events, list_truncated: eventCount > events.length },
    problems: {
      count: problems.length,
      list: problems.slice(0, maxListed).map((w) => ({ line: w.line ?? null, code: w.code, message: w.message })),
      list_truncated: problems.length > maxListed,
    },
  };
}
