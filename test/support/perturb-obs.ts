/**
 * Controlled, seeded perturbations of a real RINEX 3 observation file, done on its text so that every
 * value not perturbed stays byte for byte what the receiver wrote: cycle slips on the phase (with or
 * without the loss-of-lock bits), satellites' records removed for a while, epochs removed, code outliers.
 * They imitate what a receiver carried on foot under trees and beside buildings records.
 *
 * Layout (RINEX 3.05 section 5.7 and table A13): an epoch line '>' with the number of satellites in
 * columns 33-35 (1-based), then one line per satellite: the satellite id (3 characters), then per
 * observation type a field of 16 characters: value F14.3, loss-of-lock indicator (LLI, 1 digit: bit 0 lost
 * lock, bit 1 half-cycle ambiguity) and signal strength (1 digit).
 */

export interface ObsEpochText {
  /** Seconds of the epoch's tag from the first epoch of the file. */
  readonly tS: number;
  line: string;
  /** Satellite lines, keyed by satellite id ('G01'). */
  readonly sats: Map<string, string>;
}

export interface ObsText {
  readonly header: readonly string[];
  /** Observation types per system letter, in their order on the lines. */
  readonly types: ReadonlyMap<string, readonly string[]>;
  epochs: ObsEpochText[];
}

const FIELD = 16;

function epochSeconds(line: string): number {
  const f = line.slice(1).trim().split(/\s+/).map(Number);
  return Date.UTC(f[0], f[1] - 1, f[2], f[3], f[4]) / 1000 + f[5];
}

/** The file's header, observation types and epochs (event records, flags > 1, are not expected here). */
export function parseObsText(text: string): ObsText {
  const lines = text.split(/\r?\n/);
  const end = lines.findIndex((l) => l.slice(60).startsWith('END OF HEADER'));
  const header = lines.slice(0, end + 1);
  const types = new Map<string, string[]>();
  let last = '';
  for (const h of header) {
    if (!h.slice(60).startsWith('SYS / # / OBS TYPES')) continue;
    const sys = h[0] === ' ' ? last : h[0];
    last = sys;
    const list = types.get(sys) ?? [];
    list.push(...h.slice(7, 58).trim().split(/\s+/).filter(Boolean));
    types.set(sys, list);
  }
  const epochs: ObsEpochText[] = [];
  let t0 = NaN;
  for (let i = end + 1; i < lines.length;) {
    const line = lines[i];
    if (!line.startsWith('>')) { i++; continue; }
    const n = Number(line.slice(32, 35));
    const t = epochSeconds(line);
    if (Number.isNaN(t0)) t0 = t;
    const sats = new Map<string, string>();
    for (let k = 1; k <= n; k++) sats.set(lines[i + k].slice(0, 3), lines[i + k]);
    epochs.push({ tS: t - t0, line, sats });
    i += n + 1;
  }
  return { header, types, epochs };
}

/** The text of a (perturbed) file: epochs without satellites are left out. */
export function formatObsText(o: ObsText): string {
  const out = [...o.header];
  for (const e of o.epochs) {
    if (e.sats.size === 0) continue;
    out.push(e.line.slice(0, 32) + String(e.sats.size).padStart(3) + e.line.slice(35));
    for (const l of e.sats.values()) out.push(l);
  }
  return out.join('\n') + '\n';
}

/** Column of the value of an observation type on a satellite's line (0-based), -1 when the system has none. */
function column(o: ObsText, sat: string, type: string): number {
  const i = (o.types.get(sat[0]) ?? []).indexOf(type);
  return i < 0 ? -1 : 3 + FIELD * i;
}

/** The line with `deltaValue` added to the field at `col` and the LLI bits `lliOr` set (a blank field stays blank). */
function editField(line: string, col: number, deltaValue: number, lliOr = 0): string {
  const padded = line.padEnd(col + FIELD);
  const text = padded.slice(col, col + 14);
  if (text.trim() === '') return line;
  const value = Number(text) + deltaValue;
  const lliText = padded[col + 14];
  const lli = (lliText === ' ' ? 0 : Number(lliText)) | lliOr;
  const lliOut = lli === 0 ? lliText : String(lli);
  return padded.slice(0, col) + value.toFixed(3).padStart(14) + lliOut + padded.slice(col + 15);
}

/** Index of the first epoch at or after tS holding `sat` (-1 when none). */
function firstWith(o: ObsText, sat: string, tS: number): number {
  return o.epochs.findIndex((e) => e.tS >= tS - 1e-6 && e.sats.has(sat));
}

export interface Slip {
  readonly sat: string;
  /** Time of the slip (s from the first epoch): it lands on the first epoch at or after it with the satellite. */
  readonly tS: number;
  readonly cycles: number;
  /** LLI bits set at the slip's epoch (1: loss of lock; 0: unflagged). */
  readonly lli: number;
}

/** A jump of the phase (`type`, e.g. 'L1C') by whole or half cycles from the slip's epoch on (it stays: a slip). */
export function applySlip(o: ObsText, s: Slip, type = 'L1C'): void {
  const col = column(o, s.sat, type);
  const k = firstWith(o, s.sat, s.tS);
  if (col < 0 || k < 0) return;
  for (let i = k; i < o.epochs.length; i++) {
    const line = o.epochs[i].sats.get(s.sat);
    if (line !== undefined) o.epochs[i].sats.set(s.sat, editField(line, col, s.cycles, i === k ? s.lli : 0));
  }
}

/**
 * A half cycle the receiver has not yet resolved: the phase off by half a cycle with the half-cycle bit
 * (LLI bit 1) set from `tS` for `durationS`, then resolved (the receiver corrects the phase and clears
 * the bit), as receivers that decode the navigation message's preamble do after reacquiring a signal.
 */
export function applyFlaggedHalfCycle(o: ObsText, sat: string, tS: number, durationS: number, type = 'L1C'): void {
  const col = column(o, sat, type);
  if (col < 0) return;
  for (const e of o.epochs) {
    if (e.tS < tS - 1e-6 || e.tS >= tS + durationS - 1e-6) continue;
    const line = e.sats.get(sat);
    if (line !== undefined) e.sats.set(sat, editField(line, col, 0.5, 2));
  }
}

/** The satellite's records removed from `tS` for `durationS` seconds. */
export function applyOutage(o: ObsText, sat: string, tS: number, durationS: number): void {
  for (const e of o.epochs) if (e.tS >= tS - 1e-6 && e.tS < tS + durationS - 1e-6) e.sats.delete(sat);
}

/** Every record removed from `tS` for `durationS` seconds (a bridge: the epochs are missing). */
export function applyTotalOutage(o: ObsText, tS: number, durationS: number): void {
  for (const e of o.epochs) if (e.tS >= tS - 1e-6 && e.tS < tS + durationS - 1e-6) e.sats.clear();
}

/** `errorM` added to the satellite's code (`type`, e.g. 'C1C') from `tS` for `durationS` seconds (multipath). */
export function applyCodeError(o: ObsText, sat: string, tS: number, durationS: number, errorM: (tS: number) => number, type = 'C1C'): void {
  const col = column(o, sat, type);
  if (col < 0) return;
  for (const e of o.epochs) {
    if (e.tS < tS - 1e-6 || e.tS >= tS + durationS - 1e-6) continue;
    const line = e.sats.get(sat);
    if (line !== undefined) e.sats.set(sat, editField(line, col, errorM(e.tS)));
  }
}

/** A random satellite among those of the epoch nearest after tS (seeded draws `r`). */
export function satelliteAt(o: ObsText, tS: number, r: () => number): string | null {
  const e = o.epochs.find((x) => x.tS >= tS - 1e-6 && x.sats.size > 0);
  if (!e) return null;
  const ids = [...e.sats.keys()];
  return ids[Math.floor(r() * ids.length)];
}

/** Length of the file in seconds (last epoch's time from the first). */
export function spanS(o: ObsText): number {
  return o.epochs.length ? o.epochs[o.epochs.length - 1].tS : 0;
}
