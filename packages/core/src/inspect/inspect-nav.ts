/** What a navigation file (or a merged set) holds: records per system and satellite, time span, extras. */
import type { Warning } from '../errors.js';
import { GNSS_SYSTEMS, SYSTEM_NAMES, type GnssSystem } from '../gnss/index.js';
import type { Ephemeris, NavData } from '../gnss/index.js';
import { timeStamp, type TimeStamp } from './inspect-obs.js';

export interface NavInspection {
  readonly kind: 'navigation';
  readonly files: readonly string[];
  readonly format: { readonly name: string; readonly version: number; readonly encoding_layers: readonly string[] };
  readonly records: number;
  readonly time_span: { readonly first: TimeStamp; readonly last: TimeStamp } | null;
  readonly per_system: Readonly<Record<string, {
    readonly name: string; readonly records: number; readonly satellites: number; readonly unhealthy_records: number;
    readonly messages: Readonly<Record<string, number>>; readonly records_per_satellite: Readonly<Record<string, number>>;
  }>>;
  readonly ionosphere: readonly string[];
  readonly leap_seconds: number | null;
  readonly time_offsets: readonly string[];
  readonly problems: { readonly count: number; readonly list: readonly { readonly file: string | null; readonly line: number | null; readonly code: string; readonly message: string }[] };
}

/** Reference time of a record: toe (Kepler), t_b (GLONASS), t0 (SBAS). */
export function ephemerisTimeGpsS(e: Ephemeris): number {
  return e.kind === 'kepler' ? e.toeGpsS : e.kind === 'glonass' ? e.tbGpsS : e.t0GpsS;
}

export function inspectNav(nav: NavData, opts: { readonly layers?: readonly string[]; readonly warnings?: readonly Warning[] } = {}): NavInspection {
  let first = Infinity;
  let last = -Infinity;
  const per = new Map<GnssSystem, { records: number; unhealthy: number; messages: Map<string, number>; sats: Map<string, number> }>();
  for (const e of nav.ephemerides) {
    const t = ephemerisTimeGpsS(e);
    if (Number.isFinite(t)) { first = Math.min(first, t); last = Math.max(last, t); }
    let p = per.get(e.system);
    if (!p) per.set(e.system, (p = { records: 0, unhealthy: 0, messages: new Map(), sats: new Map() }));
    p.records++;
    if (e.health !== 0) p.unhealthy++;
    const m = e.message || 'unstated';
    p.messages.set(m, (p.messages.get(m) ?? 0) + 1);
    p.sats.set(e.sat, (p.sats.get(e.sat) ?? 0) + 1);
  }
  const perSystem: NavInspection['per_system'] = Object.fromEntries(
    GNSS_SYSTEMS.filter((s) => per.has(s)).map((s) => {
      const p = per.get(s)!;
      return [s, {
        name: SYSTEM_NAMES[s], records: p.records, satellites: p.sats.size, unhealthy_records: p.unhealthy,
        messages: Object.fromEntries(p.messages), records_per_satellite: Object.fromEntries([...p.sats.entries()].sort()),
      }];
    }),
  );
  const iono: string[] = [];
  if (nav.ionosphere.gps) iono.push('GPS Klobuchar');
  if (nav.ionosphere.qzss) iono.push('QZSS Klobuchar');
  if (nav.ionosphere.beidou) iono.push('BeiDou Klobuchar');
  if (nav.ionosphere.galileo) iono.push('Galileo NeQuick');
  const ws = opts.warnings ?? [];
  return {
    kind: 'navigation',
    files: [...nav.files],
    format: { name: nav.version >= 3 ? 'RINEX 3/4 navigation' : 'RINEX 2 navigation', version: nav.version, encoding_layers: [...(opts.layers ?? [])] },
    records: nav.ephemerides.length,
    time_span: Number.isFinite(first) ? { first: timeStamp(first), last: timeStamp(last) } : null,
    per_system: perSystem,
    ionosphere: iono,
    leap_seconds: nav.leapSeconds,
    time_offsets: [...new Set((nav.systemTimeOffsets ?? []).map((o) => o.code))],
    problems: {
      count: ws.length,
      list: ws.slice(0, 200).map((w) => ({ file: w.file ?? null, line: w.line ?? null, code: w.code, message: w.message })),
    },
  };
}
