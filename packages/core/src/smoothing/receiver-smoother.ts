/**
 * Carrier smoothing of one receiver's primary-band pseudoranges, one Hatch filter per code type (hatch.ts),
 * with the receiver's millisecond clock steps repaired inside the filter. Three modes:
 * - 'forward': the Hatch filter's own output (one pass);
 * - 'record': the forward filters run (their restarts define the arcs) and every arc's code minus carrier
 *   is summarised (two-sided-arcs.ts), output as in 'forward';
 * - 'combined': the same forward filters run again (same restarts, same arcs) and the output is the
 *   carrier plus the arc's two-sided code-minus-carrier average: forwards and backwards combined.
 * Each output carries the variance factor of the smoothed code relative to one raw code.
 */
import type { GnssSystem, ObsEpoch, SatId } from '../gnss/index.js';
import { carrierWavelengthM, companionCodes, satSystem } from '../gnss/index.js';
import { primaryCodeSlots, pseudorangeAt, type CodeSlot } from '../observables/index.js';
import { CarrierSmoother } from './hatch.js';
import { CODE_ERROR_CORRELATION_S, SmoothingArc } from './two-sided-arcs.js';

export type SmoothingMode = 'forward' | 'record' | 'combined';

/** The arcs of one receiver, recorded in a first pass and played back in the second. */
export class SmoothingArcs {
  readonly byStart = new Map<string, SmoothingArc>();
  constructor(readonly timeConstantS: number) {}
  finish(): void {
    for (const a of this.byStart.values()) a.finish();
  }
}

/**
 * One satellite's values of an epoch per code, read as a map (get, has, size). Emptied and refilled
 * every epoch without allocating: a Map's clear() gives it a new table, and a double set into a Map is
 * a new heap number, per satellite and epoch of every smoothed receiver. A handful of codes: linear search.
 */
export class CodeValues {
  private readonly codes: string[] = [];
  private values = new Float64Array(4);
  private count = 0;

  get size(): number {
    return this.count;
  }

  get(code: string): number | undefined {
    for (let i = 0; i < this.count; i++) if (this.codes[i] === code) return this.values[i];
    return undefined;
  }

  has(code: string): boolean {
    for (let i = 0; i < this.count; i++) if (this.codes[i] === code) return true;
    return false;
  }

  set(code: string, value: number): void {
    for (let i = 0; i < this.count; i++) if (this.codes[i] === code) { this.values[i] = value; return; }
    if (this.count === this.values.length) {
      const grown = new Float64Array(2 * this.count);
      grown.set(this.values);
      this.values = grown;
    }
    this.codes[this.count] = code;
    this.values[this.count++] = value;
  }

  clear(): void {
    this.count = 0;
  }
}

/**
 * A primary-band pseudorange of a code list with its carrier phase and Doppler (companionCodes), as
 * indices in the list.
 */
interface CodeWithCompanions {
  readonly slot: CodeSlot;
  readonly phase: string | null;
  readonly phaseIndex: number;
  readonly dopplerIndex: number;
  /** The phase's wavelength (m); NaN without a phase, or for GLONASS (per satellite: its frequency channel). */
  readonly wavelengthM: number;
}

/** Per code list (shared by a file's satellites of one system) and system: made once. */
const companionsByList = new WeakMap<readonly string[], Map<GnssSystem, readonly CodeWithCompanions[]>>();

function codesWithCompanions(system: GnssSystem, codes: readonly string[]): readonly CodeWithCompanions[] {
  let bySystem = companionsByList.get(codes);
  if (!bySystem) { bySystem = new Map(); companionsByList.set(codes, bySystem); }
  let list = bySystem.get(system);
  if (!list) {
    list = primaryCodeSlots(system, codes).map((slot) => {
      const comp = companionCodes(slot.code, codes);
      return {
        slot, phase: comp.phase,
        phaseIndex: comp.phase ? codes.indexOf(comp.phase) : -1,
        dopplerIndex: comp.doppler ? codes.indexOf(comp.doppler) : -1,
        wavelengthM: comp.phase && system !== 'R' ? carrierWavelengthM(system, comp.phase) : NaN,
      };
    });
    bySystem.set(system, list);
  }
  return list;
}

interface SmootherInputRow { sat: SatId; codeM: number; phaseCycles: number; wavelengthM: number; lli: number; dopplerHz: number }

/** One code's inputs of an epoch: rows reused from epoch to epoch (`list` holds this epoch's, in order). */
interface CodeInputs { readonly code: string; readonly list: SmootherInputRow[]; readonly pool: SmootherInputRow[] }

export class ReceiverSmoother {
  private readonly filters = new Map<string, CarrierSmoother>();
  /** Receiver clock jumps repaired so far per code filter (m): removed from code minus carrier in the arcs. */
  private readonly jumpsM = new Map<string, number>();
  /** The arc each satellite is in, per code (code -> sat -> arc). */
  private readonly current = new Map<string, Map<SatId, SmoothingArc | undefined>>();
  /**
   * Variance factor of the last update's outputs: sat -> code -> factor. A satellite's map is kept from
   * epoch to epoch and emptied (a satellite without values this epoch has an empty one).
   */
  readonly factors = new Map<SatId, CodeValues>();
  /** The last update's smoothed values, kept and emptied as `factors` (update() returns it). */
  private readonly smoothed = new Map<SatId, CodeValues>();
  restarts = 0;
  /** The inputs per code, in the order the codes first came in this epoch (inputsOf). */
  private readonly inputs: CodeInputs[] = [];
  private readonly inputsByCode = new Map<string, CodeInputs>();
  /** The last arcValue: smoothed value (m) and its variance factor. */
  private readonly value = { m: NaN, factor: 1 };
  /** The arc's two-sided value at the epoch (SmoothingArc.atInto). */
  private readonly arcPoint = { cmcM: NaN, varianceFactor: 1 };

  constructor(
    private readonly intervalS: number,
    private readonly timeConstantS: number,
    private readonly systems: readonly GnssSystem[],
    private readonly glonassChannels: ReadonlyMap<number, number>,
    private readonly maxGapS: number,
    private readonly mode: SmoothingMode = 'forward',
    private readonly arcs: SmoothingArcs | null = null,
  ) {
    if (mode !== 'forward' && !arcs) throw new RangeError(`ReceiverSmoother: mode '${mode}' needs the arcs`);
  }

  /** Fills `this.inputs` with the epoch's filter inputs per code (codes in order of first appearance). */
  private inputsOf(epoch: ObsEpoch): void {
    const inputs = this.inputs;
    for (const x of inputs) x.list.length = 0;
    inputs.length = 0;
    for (const s of epoch.sats) {
      const system = satSystem(s.sat);
      if (!this.systems.includes(system)) continue;
      const k = system === 'R' ? this.glonassChannels.get(Number(s.sat.slice(1))) : undefined;
      for (const comp of codesWithCompanions(system, s.codes)) {
        const codeM = pseudorangeAt(s, comp.slot);
        if (!Number.isFinite(codeM)) continue;
        const code = comp.slot.code;
        const pi = comp.phaseIndex;
        const phase = pi >= 0 ? s.values[pi] : NaN;
        const lli = pi >= 0 ? s.lli[pi] : 0;
        const wl = comp.phase && system === 'R' ? carrierWavelengthM(system, comp.phase, k) : comp.wavelengthM;
        const di = comp.dopplerIndex;
        let forCode = this.inputsByCode.get(code);
        if (!forCode) { forCode = { code, list: [], pool: [] }; this.inputsByCode.set(code, forCode); }
        if (forCode.list.length === 0) inputs.push(forCode);
        const n = forCode.list.length;
        let row = forCode.pool[n];
        if (!row) { row = { sat: s.sat, codeM: NaN, phaseCycles: NaN, wavelengthM: NaN, lli: 0, dopplerHz: NaN }; forCode.pool.push(row); }
        row.sat = s.sat; row.codeM = codeM; row.phaseCycles = Number.isFinite(wl) ? phase : NaN; row.wavelengthM = wl; row.lli = lli;
        row.dopplerHz = di >= 0 ? s.values[di] : NaN;
        forCode.list.push(row);
      }
    }
  }

  /**
   * Smoothed pseudoranges of the epoch: sat -> code -> m (only where the filter had a value), valid until
   * the next update. The maps are reused, not made per satellite and epoch.
   */
  update(epoch: ObsEpoch): ReadonlyMap<SatId, CodeValues> {
    const out = this.smoothed;
    for (const m of out.values()) m.clear();
    for (const m of this.factors.values()) m.clear();
    const t = epoch.tagGpsS;
    this.inputsOf(epoch);
    for (const { code, list } of this.inputs) {
      let f = this.filters.get(code);
      if (!f) { f = new CarrierSmoother({ intervalS: this.intervalS, timeConstantS: this.timeConstantS, gapThresholdS: Math.max(this.maxGapS, 2 * this.intervalS + 1e-3) }); this.filters.set(code, f); }
      const count = f.step(t, list);
      const { smoothedM, length, restarted } = f.outputs;
      const jump = f.clockJump;
      let jumpM = this.jumpsM.get(code) ?? 0;
      // A Map holds a double as a new heap number: set only when a jump changed it.
      if (jump !== null) { jumpM += jump.jumpM; this.jumpsM.set(code, jumpM); }
      for (let i = 0; i < count; i++) {
        const row = list[i];
        const isRestart = restarted[i] === 1;
        if (isRestart && length[i] <= 1) this.restarts++;
        const value = this.arcValue(code, t, row, isRestart, jumpM, smoothedM[i], length[i]);
        if (!Number.isFinite(value.m)) continue;
        let m = out.get(row.sat);
        if (!m) { m = new CodeValues(); out.set(row.sat, m); }
        m.set(code, value.m);
        let fm = this.factors.get(row.sat);
        if (!fm) { fm = new CodeValues(); this.factors.set(row.sat, fm); }
        fm.set(code, value.factor);
      }
    }
    return out;
  }

  /** The smoothed value of one satellite and code in the current mode, and its variance factor (in `this.value`, reused). */
  private arcValue(code: string, t: number, row: SmootherInputRow, restarted: boolean, jumpM: number, forwardM: number, n: number): { readonly m: number; readonly factor: number } {
    const value = this.value;
    const phaseM = row.phaseCycles * row.wavelengthM;
    if (this.mode !== 'forward') {
      let current = this.current.get(code);
      if (!current) { current = new Map(); this.current.set(code, current); }
      if (restarted) {
        const id = `${row.sat}|${code}|${t}`;
        let arc = this.arcs!.byStart.get(id);
        if (!arc && this.mode === 'record') { arc = new SmoothingArc(t, this.timeConstantS / 10, this.timeConstantS); this.arcs!.byStart.set(id, arc); }
        current.set(row.sat, arc);
      }
      const arc = current.get(row.sat);
      if (this.mode === 'record') arc?.add(t, row.codeM - phaseM - jumpM);
      else {
        const v = this.arcPoint;
        if (Number.isFinite(phaseM) && arc !== undefined && arc.atInto(t, v) && Number.isFinite(v.cmcM)) { value.m = phaseM + jumpM + v.cmcM; value.factor = v.varianceFactor; return value; }
        value.m = row.codeM; value.factor = 1;
        return value;
      }
    }
    // The forward filter: n is its effective length 1/w (hatch.ts).
    const windowS = n * this.intervalS;
    value.m = forwardM; value.factor = Math.min(1, Math.max(1 / Math.max(n, 1), CODE_ERROR_CORRELATION_S / windowS));
    return value;
  }

  reset(): void {
    for (const f of this.filters.values()) f.reset();
  }

  /** An epoch of flag 6 (RINEX 3.05 5.3.3: cycle-slip records): its satellites restart their filters. */
  slipsReported(epoch: ObsEpoch): void {
    for (const s of epoch.sats) for (const f of this.filters.values()) f.reset(s.sat);
  }
}
