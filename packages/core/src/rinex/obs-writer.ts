/**
 * RINEX 3 observation writer (RINEX 3.05, IGS/RTCM 2020: header table A2, epoch and observation records
 * table A3; 3.03 and 3.04 share the layout). Produces text chunks: the header, then one chunk per epoch.
 */
import type { GnssSystem } from '../gnss/index.js';
import { GNSS_SYSTEMS } from '../gnss/index.js';
import type { TimeSystem } from '../time/index.js';
import { calendarFromSeconds, gpsToBdtS, gpsToGlonassS, gpsToUtcS } from '../time/index.js';
import type { HeaderEvent, ObsEpoch, ObsHeader, SatObservations } from '../gnss/index.js';
import { headerLabel } from './obs-header.js';

export interface WriteObsOptions {
  readonly version?: 3.03 | 3.04 | 3.05;
  /** Program name for PGM / RUN BY / DATE (default 'refdelta'). */
  readonly program?: string;
  /** Creation date text for PGM / RUN BY / DATE ('yyyymmdd hhmmss UTC'); default: now. */
  readonly dateText?: string;
}

/** Header line: contents padded/cut to 60 columns + label (RINEX 3.05 section 5.1). */
function hline(contents: string, label: string): string {
  return contents.padEnd(60).slice(0, 60) + label.padEnd(20) + '\n';
}

/** Fortran Fw.d right-justified; blank when not finite or wider than w. */
function fixed(v: number, w: number, d: number): string {
  if (!Number.isFinite(v)) return ' '.repeat(w);
  const s = v.toFixed(d);
  return s.length > w ? ' '.repeat(w) : s.padStart(w);
}

function int(v: number, w: number): string {
  return String(Math.round(v)).padStart(w);
}

/** GPS seconds -> calendar seconds on the file's time system (inverse of time/gps-time.ts toGpsS). */
export function calendarSecondsFromGpsS(gpsS: number, ts: TimeSystem): number {
  switch (ts) {
    case 'GPS': case 'GAL': case 'QZS': case 'IRN': case 'SBAS': return gpsS;
    case 'BDT': return gpsToBdtS(gpsS);
    case 'GLO': return gpsToGlonassS(gpsS);
    case 'UTC': return gpsToUtcS(gpsS);
    case 'TAI': return gpsS + 19;
  }
}

/** Calendar fields of a time with 7-decimal seconds, carrying a rounded-up fraction into the minute. */
function calendarFields(gpsS: number, ts: TimeSystem): { y: number; mo: number; d: number; h: number; mi: number; secText: string } {
  const t = calendarSecondsFromGpsS(gpsS, ts);
  let whole = Math.floor(t);
  let fracText = (t - whole).toFixed(7);
  if (fracText.startsWith('1')) { whole += 1; fracText = '0.0000000'; }
  const c = calendarFromSeconds(whole);
  const secText = String(Math.round(c.second)).padStart(2, '0') + fracText.slice(1);
  return { y: c.year, mo: c.month, d: c.day, h: c.hour, mi: c.minute, secText };
}

const p2 = (n: number) => String(n).padStart(2, '0');

/** Writes a RINEX 3 observation file as text chunks. */
export function* writeObsRinex3(header: ObsHeader, epochs: Iterable<ObsEpoch>, opts?: WriteObsOptions): Iterable<string> {
  const version = opts?.version ?? 3.05;
  const it = epochs[Symbol.iterator]();
  let firstResult = it.next();
  const systems = GNSS_SYSTEMS.filter((s) => (header.obsCodes[s]?.length ?? 0) > 0);
  const ts = header.timeSystem;
  const out: string[] = [];
  const sysField = header.systemField.length === 1 ? header.systemField : 'M';
  out.push(hline(`${fixed(version, 9, 2)}           ${'OBSERVATION DATA'.padEnd(20)}${sysField}`, 'RINEX VERSION / TYPE'));
  const date = opts?.dateText ?? new Date().toISOString().replace(/[-:]/g, '').replace('T', ' ').slice(0, 15) + ' UTC';
  out.push(hline(`${(opts?.program ?? 'refdelta').padEnd(20).slice(0, 20)}${''.padEnd(20)}${date}`, 'PGM / RUN BY / DATE'));
  for (const c of header.comments) out.push(hline(c, 'COMMENT'));
  out.push(hline(header.markerName, 'MARKER NAME'));
  if (header.markerNumber !== '') out.push(hline(header.markerNumber, 'MARKER NUMBER'));
  const others = (header.otherRecords ?? []).filter((l) => {
    const lab = headerLabel(l);
    return lab !== 'PGM / RUN BY / DATE' && lab !== 'END OF HEADER' && lab !== 'RINEX VERSION / TYPE';
  });
  for (const l of others) out.push(l.padEnd(80).slice(0, 80).trimEnd() + '\n');
  if (!others.some((l) => headerLabel(l) === 'OBSERVER / AGENCY')) out.push(hline('', 'OBSERVER / AGENCY'));
  out.push(hline(`${header.receiverNumber.padEnd(20).slice(0, 20)}${header.receiverType.padEnd(20).slice(0, 20)}${(header.receiverVersion ?? '').padEnd(20).slice(0, 20)}`, 'REC # / TYPE / VERS'));
  out.push(hline(`${header.antennaNumber.padEnd(20).slice(0, 20)}${header.antennaType.padEnd(20).slice(0, 20)}`, 'ANT # / TYPE'));
  const pos = header.approxPosition;
  if (pos !== null) out.push(hline(fixed(pos.x, 14, 4) + fixed(pos.y, 14, 4) + fixed(pos.z, 14, 4), 'APPROX POSITION XYZ'));
  const a = header.antennaOffset;
  out.push(hline(fixed(a.heightM, 14, 4) + fixed(a.eastM, 14, 4) + fixed(a.northM, 14, 4), 'ANTENNA: DELTA H/E/N'));
  for (const s of systems) out.push(...obsTypesLines(s, header.obsCodes[s]!));
  if (header.intervalS !== null) out.push(hline(fixed(header.intervalS, 10, 3), 'INTERVAL'));
  const firstTag = header.firstObsGpsS ?? (firstResult.done ? null : firstResult.value.tagGpsS);
  if (firstTag !== null && Number.isFinite(firstTag)) out.push(timeLine(firstTag, ts, 'TIME OF FIRST OBS'));
  if (header.lastObsGpsS !== null) out.push(timeLine(header.lastObsGpsS, ts, 'TIME OF LAST OBS'));
  out.push(hline(int(header.clockOffsetApplied ? 1 : 0, 6), 'RCV CLOCK OFFS APPL'));
  for (const s of systems) {
    const shifts = header.phaseShifts[s];
    if (shifts) for (const [code, cyc] of Object.entries(shifts)) out.push(hline(`${s} ${code.padEnd(3)} ${fixed(cyc, 8, 5)}`, 'SYS / PHASE SHIFT'));
  }
  for (const s of systems) out.push(...scaleLines(s, header.scaleFactors[s]));
  if (header.glonassChannels.size > 0) out.push(...glonassSlotLines(header.glonassChannels));
  const bias = Object.entries(header.glonassCodePhaseBias);
  for (let i = 0; i < bias.length; i += 4) {
    out.push(hline(bias.slice(i, i + 4).map(([c, v]) => ` ${c.padEnd(3)} ${fixed(v, 8, 3)}`).join(''), 'GLONASS COD/PHS/BIS'));
  }
  if (header.leapSeconds !== null) out.push(hline(int(header.leapSeconds, 6), 'LEAP SECONDS'));
  out.push(hline('', 'END OF HEADER'));
  yield out.join('');

  const scale: Partial<Record<GnssSystem, Float64Array | null>> = {};
  for (const s of systems) {
    const t = header.scaleFactors[s];
    scale[s] = t ? Float64Array.from(header.obsCodes[s]!, (c) => t[c] ?? 1) : null;
  }
  let current: Partial<Record<GnssSystem, readonly string[]>> = { ...header.obsCodes };
  while (!firstResult.done) {
    const e = firstResult.value;
    const chunk: string[] = [];
    // Observation types changed by an event in the data: announce them in a flag-4 event (RINEX 3.05 5.3.3).
    const changed = changedCodes(e.sats, current);
    if (changed !== null) {
      const lines = Object.entries(changed).flatMap(([s, list]) => obsTypesLines(s as GnssSystem, list!));
      chunk.push(epochLine(e.tagGpsS, ts, 4, lines.length, null, e.tagWasBlank === true), ...lines);
      current = { ...current, ...changed };
      for (const s of Object.keys(changed) as GnssSystem[]) scale[s] = null;
    }
    if (e.flag >= 2 && e.flag <= 5) {
      const lines = eventLines(e.event);
      chunk.push(epochLine(e.tagGpsS, ts, e.flag, lines.length, e.receiverClockOffsetS, e.tagWasBlank === true), ...lines);
    } else {
      chunk.push(epochLine(e.tagGpsS, ts, e.flag, e.sats.length, e.receiverClockOffsetS, false));
      for (const so of e.sats) chunk.push(satLine(so, scale[so.sat.charAt(0) as GnssSystem] ?? null));
    }
    yield chunk.join('');
    firstResult = it.next();
  }
}

function changedCodes(sats: readonly SatObservations[], current: Partial<Record<GnssSystem, readonly string[]>>): Partial<Record<GnssSystem, readonly string[]>> | null {
  let out: Partial<Record<GnssSystem, readonly string[]>> | null = null;
  for (const so of sats) {
    const s = so.sat.charAt(0) as GnssSystem;
    const cur = current[s];
    if (cur === so.codes || (out !== null && out[s] === so.codes)) continue;
    if (cur !== undefined && cur.length === so.codes.length && cur.every((c, i) => c === so.codes[i])) continue;
    (out ??= {})[s] = so.codes;
  }
  return out;
}

/** SYS / # / OBS TYPES: A1, 2X, I3, 13(1X, A3); continuation lines 6X, 13(1X, A3). */
function obsTypesLines(s: GnssSystem, codes: readonly string[]): string[] {
  const lines: string[] = [];
  for (let i = 0; i < Math.max(1, codes.length); i += 13) {
    const head = i === 0 ? `${s}  ${int(codes.length, 3)}` : '      ';
    lines.push(hline(head + codes.slice(i, i + 13).map((c) => ' ' + c.padEnd(3)).join(''), 'SYS / # / OBS TYPES'));
  }
  return lines;
}

/** SYS / SCALE FACTOR: A1, 1X, I4, 2X, I2, 12(1X, A3), grouped by factor. */
function scaleLines(s: GnssSystem, table: Readonly<Record<string, number>> | undefined): string[] {
  if (!table) return [];
  const byFactor = new Map<number, string[]>();
  for (const [c, f] of Object.entries(table)) if (f !== 1) (byFactor.get(f) ?? byFactor.set(f, []).get(f)!).push(c);
  const lines: string[] = [];
  for (const [f, codes] of byFactor) {
    for (let i = 0; i < codes.length; i += 12) {
      const head = i === 0 ? `${s} ${int(f, 4)}  ${int(codes.length, 2)}` : '          ';
      lines.push(hline(head + codes.slice(i, i + 12).map((c) => ' ' + c.padEnd(3)).join(''), 'SYS / SCALE FACTOR'));
    }
  }
  return lines;
}

/** GLONASS SLOT / FRQ #: I3, 1X, 8(A1, I2.2, 1X, I2, 1X); continuation lines 4X. */
function glonassSlotLines(ch: ReadonlyMap<number, number>): string[] {
  const entries = [...ch.entries()].sort((x, y) => x[0] - y[0]);
  const lines: string[] = [];
  for (let i = 0; i < entries.length; i += 8) {
    const head = i === 0 ? `${int(entries.length, 3)} ` : '    ';
    lines.push(hline(head + entries.slice(i, i + 8).map(([slot, k]) => `R${p2(slot)} ${int(k, 2)} `).join(''), 'GLONASS SLOT / FRQ #'));
  }
  return lines;
}

/** TIME OF FIRST/LAST OBS: 5I6, F13.7, 5X, A3. */
function timeLine(gpsS: number, ts: TimeSystem, label: string): string {
  const c = calendarFields(gpsS, ts);
  return hline(`${int(c.y, 6)}${int(c.mo, 6)}${int(c.d, 6)}${int(c.h, 6)}${int(c.mi, 6)}${c.secText.padStart(13)}     ${ts}`, label);
}

/** Epoch record: '>', 1X, I4, 4(1X, I2.2), F11.7, 2X, I1, I3, 6X, F15.12. */
function epochLine(tagGpsS: number, ts: TimeSystem, flag: number, n: number, clockS: number | null, blankTag: boolean): string {
  let t: string;
  if (blankTag || !Number.isFinite(tagGpsS)) t = ' '.repeat(27);
  else {
    const c = calendarFields(tagGpsS, ts);
    t = `${String(c.y).padStart(4)} ${p2(c.mo)} ${p2(c.d)} ${p2(c.h)} ${p2(c.mi)}${c.secText.padStart(11)}`;
  }
  const clk = clockS !== null && Number.isFinite(clockS) ? '      ' + fixed(clockS, 15, 12) : '';
  return `> ${t}  ${flag}${int(n, 3)}${clk}\n`;
}

/** Observation record: A1, I2.2, m(F14.3, I1, I1); blanks for NaN and zero indicators. */
function satLine(so: SatObservations, factors: Float64Array | null): string {
  let s = so.sat;
  const n = so.codes.length;
  for (let k = 0; k < n; k++) {
    const v = so.values[k]!;
    const f = factors !== null ? factors[k]! : 1;
    const l = so.lli[k]!, q = so.ssi[k]!;
    s += fixed(f === 1 ? v : v * f, 14, 3) + (l > 0 ? String(l) : ' ') + (q > 0 ? String(q) : ' ');
  }
  return s.trimEnd() + '\n';
}

/** Header records carried by an event epoch (RINEX 3.05 5.3.3). */
function eventLines(ev: HeaderEvent | null): string[] {
  if (ev === null) return [];
  const lines: string[] = [];
  if (ev.markerName !== undefined) lines.push(hline(ev.markerName, 'MARKER NAME'));
  if (ev.markerNumber !== undefined) lines.push(hline(ev.markerNumber, 'MARKER NUMBER'));
  if (ev.antennaOffset) lines.push(hline(fixed(ev.antennaOffset.heightM, 14, 4) + fixed(ev.antennaOffset.eastM, 14, 4) + fixed(ev.antennaOffset.northM, 14, 4), 'ANTENNA: DELTA H/E/N'));
  if (ev.approxPosition) lines.push(hline(fixed(ev.approxPosition.x, 14, 4) + fixed(ev.approxPosition.y, 14, 4) + fixed(ev.approxPosition.z, 14, 4), 'APPROX POSITION XYZ'));
  for (const c of ev.comments) lines.push(hline(c, 'COMMENT'));
  return lines;
}
