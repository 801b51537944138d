/**
 * The prepared between-receiver single differences of a whole session, kept compactly in typed arrays so
 * that the filter can run over them forwards and then backwards without reading the files again.
 *
 * Per satellite: single difference (rover minus reference) of phase and of code, each reduced by the
 * modelled range from the rover's linearisation point x0 (range, broadcast satellite clock, troposphere),
 * so that sd = -u . (x - x0) + c (dt_rover - dt_reference) [+ lambda N for phase] + noise, with u the unit
 * vector from x0 to the satellite.
 *
 * Memory: per satellite and epoch 2 + 4 + 8 + 8 + 3 * 4 + 4 + 1 = 39 bytes, per epoch 8 * 9 + 4 * 3 + 2 + 2
 * = 88 bytes (times, linearisation point, velocity, indices), kept in chunks of about CHUNK_SATELLITES
 * entries (1.3 MB with their epochs) handed to a RecordStore as they fill: the session holds one chunk in
 * memory whatever its length. A day at 1 Hz with 9 satellites is 86,400 * (9 * 39 + 88) = 38 MB in the
 * store: in memory with the default store (MemoryRecordStore, exact size), in a temporary file with the
 * command line's.
 *
 * Epoch k's values are at index e = indexOf(k) of the per-epoch arrays (timeGpsS[e], x0[3 e]...): while
 * recording, of the chunk being recorded; afterwards, `visit(k)` makes the chunk of epoch k current and
 * returns e. Epoch k's satellites are then the entries satStart[e] to satStart[e] + satCount[e] - 1 of the
 * per-satellite arrays (sat, arc, phaseM...). The first visit ends the recording.
 */
import { keepShape } from './kept-shapes.js';

/** Where the chunks of per-satellite records wait for the passes: blocks of bytes written once, read back any number of times. */
export interface RecordStore {
  /** Keeps a copy of the bytes (the caller reuses its buffer); returns the block's number. */
  put(bytes: Uint8Array): number;
  /**
   * The bytes of a block, at a multiple of 8 bytes into their buffer (so 8-byte typed arrays can view
   * them); valid until the next call of get (a store may read every block into one buffer).
   */
  get(block: number): Uint8Array;
  /** Releases what is kept. */
  close(): void;
}

/** The blocks kept in memory (browsers, tests; no copy on reading back). */
export class MemoryRecordStore implements RecordStore {
  private blocks: Uint8Array[] = [];
  constructor() {
    keepShape(this);
  }
  put(bytes: Uint8Array): number {
    this.blocks.push(bytes.slice());
    return this.blocks.length - 1;
  }
  get(block: number): Uint8Array {
    const b = this.blocks[block];
    if (!b) throw new RangeError(`record block ${block} was never stored`);
    return b;
  }
  close(): void {
    this.blocks = [];
  }
}

/** Entries per chunk of per-satellite records (a chunk ends at the first epoch boundary past it). */
export const CHUNK_SATELLITES = 32_768;
/** Bytes per satellite entry: phaseM, codeM (f64), los (3 x f32), elevationRad (f32), arc (i32), sat (u16), fixable (u8). */
const ENTRY_BYTES = 8 + 8 + 12 + 4 + 4 + 2 + 1;
/** Bytes per epoch: timeGpsS, tagGpsS, x0 (3), velocity (4) (f64), referenceAgeS (f32), satStart, context (i32), satCount (u16), isStatic, reason (u8). */
const EPOCH_BYTES = 8 * 9 + 4 * 3 + 2 + 2;

/**
 * The arrays of one chunk of n entries and m epochs, as views on one buffer of n * ENTRY_BYTES +
 * m * EPOCH_BYTES bytes (widest first, so each is aligned).
 */
function chunkViews(bytes: Uint8Array, n: number, m: number) {
  const b = bytes.buffer;
  let at = bytes.byteOffset;
  const take = <T>(make: (offset: number) => T, size: number): T => { const v = make(at); at += size; return v; };
  return {
    phaseM: take((o) => new Float64Array(b, o, n), 8 * n),
    codeM: take((o) => new Float64Array(b, o, n), 8 * n),
    timeGpsS: take((o) => new Float64Array(b, o, m), 8 * m),
    tagGpsS: take((o) => new Float64Array(b, o, m), 8 * m),
    x0: take((o) => new Float64Array(b, o, 3 * m), 24 * m),
    velocity: take((o) => new Float64Array(b, o, 4 * m), 32 * m),
    los: take((o) => new Float32Array(b, o, 3 * n), 12 * n),
    elevationRad: take((o) => new Float32Array(b, o, n), 4 * n),
    referenceAgeS: take((o) => new Float32Array(b, o, m), 4 * m),
    arc: take((o) => new Int32Array(b, o, n), 4 * n),
    satStart: take((o) => new Int32Array(b, o, m), 4 * m),
    context: take((o) => new Int32Array(b, o, m), 4 * m),
    sat: take((o) => new Uint16Array(b, o, n), 2 * n),
    satCount: take((o) => new Uint16Array(b, o, m), 2 * m),
    fixable: take((o) => new Uint8Array(b, o, n), n),
    isStatic: take((o) => new Uint8Array(b, o, m), m),
    reason: take((o) => new Uint8Array(b, o, m), m),
  };
}

type Growable = Float64Array | Int32Array | Uint16Array | Uint8Array | Float32Array;

/** A copy of `a` with room for `n` entries of `k` values each. */
function grown<T extends Growable>(a: T, n: number, k = 1): T {
  const b = new (a.constructor as new (n: number) => T)(n * k);
  b.set(a.subarray(0, Math.min(a.length, n * k)));
  return b;
}

export class EpochRecords {
  count = 0;
  satTotal = 0;
  // Per epoch, of the current chunk (being recorded, or made current by visit()): index indexOf(k).
  timeGpsS: Float64Array = new Float64Array(1024);
  tagGpsS: Float64Array = new Float64Array(1024);
  x0: Float64Array = new Float64Array(3 * 1024);
  velocity: Float64Array = new Float64Array(4 * 1024); // vx, vy, vz, sigma (m/s); NaN when none
  /** First satellite entry of the epoch, counted from the start of its chunk. */
  satStart: Int32Array = new Int32Array(1024);
  satCount: Uint16Array = new Uint16Array(1024);
  /** 1: static epoch (the position of the previous epoch carries over exactly). */
  isStatic: Uint8Array = new Uint8Array(1024);
  referenceAgeS: Float32Array = new Float32Array(1024);
  /** Index of the epoch's context (point name, event, antenna height) in `contexts`. */
  context: Int32Array = new Int32Array(1024);
  /** Why the epoch cannot be solved, as an index into the session's table of reasons (0: no reason given). */
  reason: Uint8Array = new Uint8Array(1024);
  // Per satellite, of the current chunk.
  sat: Uint16Array = new Uint16Array(CHUNK_SATELLITES);
  arc: Int32Array = new Int32Array(CHUNK_SATELLITES);
  phaseM: Float64Array = new Float64Array(CHUNK_SATELLITES);
  codeM: Float64Array = new Float64Array(CHUNK_SATELLITES);
  los: Float32Array = new Float32Array(3 * CHUNK_SATELLITES);
  elevationRad: Float32Array = new Float32Array(CHUNK_SATELLITES);
  /** 1 when the ambiguity may be fixed (constellation fixable, half cycle resolved at both receivers). */
  fixable: Uint8Array = new Uint8Array(CHUNK_SATELLITES);
  /** The first (up to 2000) positive intervals between consecutive epochs (s), in order. */
  readonly firstIntervalsS: number[] = [];

  /** Per chunk: its first epoch, its entries and its block in the store. */
  private readonly chunkFirstEpoch: number[] = [];
  private readonly chunkEntries: number[] = [];
  private readonly chunkBlock: number[] = [];
  /** Per chunk: the session-wide index of its first entry. */
  private readonly chunkBase: number[] = [];
  /** The chunk being sealed, packed as the store takes it (one buffer, reused). */
  private packed = new Uint8Array(0);
  /** The current chunk's bytes (one buffer, reused). */
  private loaded = new Uint8Array(0);
  /** Entries of the chunk being recorded; -1 once recording has ended. */
  private recorded = 0;
  /** The chunk whose entries and epochs are in the arrays (after recording). */
  private current = -1;
  /** First epoch of the arrays' chunk (being recorded, or current). */
  private firstEpoch = 0;
  /** Epochs before this one are static (staticBefore). */
  private staticUntil = 0;

  constructor(private readonly store: RecordStore = new MemoryRecordStore()) {
    keepShape(this);
  }

  /** Room for `need` epochs in the chunk being recorded. */
  private growEpochs(need: number): void {
    let n = this.timeGpsS.length;
    while (n < need) n *= 2;
    this.timeGpsS = grown(this.timeGpsS, n); this.tagGpsS = grown(this.tagGpsS, n); this.x0 = grown(this.x0, n, 3); this.velocity = grown(this.velocity, n, 4);
    this.satStart = grown(this.satStart, n); this.satCount = grown(this.satCount, n); this.isStatic = grown(this.isStatic, n);
    this.referenceAgeS = grown(this.referenceAgeS, n); this.context = grown(this.context, n); this.reason = grown(this.reason, n);
  }

  /** Room for `need` entries in the chunk being recorded (an epoch with more satellites than a chunk holds). */
  private growSats(need: number): void {
    let n = this.sat.length;
    while (n < need) n *= 2;
    this.sat = grown(this.sat, n); this.arc = grown(this.arc, n); this.phaseM = grown(this.phaseM, n); this.codeM = grown(this.codeM, n);
    this.los = grown(this.los, n, 3); this.elevationRad = grown(this.elevationRad, n); this.fixable = grown(this.fixable, n);
  }

  /**
   * Hands the chunk being recorded to the store, up to (not including) epoch `until`: the epochs from
   * `until` on, with their entries, stay as the start of the next chunk.
   */
  private sealChunk(until: number): void {
    const m = until - this.firstEpoch, kept = this.count - until;
    const n = kept > 0 ? this.satStart[m] : this.recorded;
    const size = n * ENTRY_BYTES + m * EPOCH_BYTES;
    if (this.packed.length < size) this.packed = new Uint8Array(size);
    const bytes = this.packed.subarray(0, size);
    const v = chunkViews(bytes, n, m);
    v.phaseM.set(this.phaseM.subarray(0, n)); v.codeM.set(this.codeM.subarray(0, n)); v.los.set(this.los.subarray(0, 3 * n));
    v.elevationRad.set(this.elevationRad.subarray(0, n)); v.arc.set(this.arc.subarray(0, n)); v.sat.set(this.sat.subarray(0, n)); v.fixable.set(this.fixable.subarray(0, n));
    v.timeGpsS.set(this.timeGpsS.subarray(0, m)); v.tagGpsS.set(this.tagGpsS.subarray(0, m)); v.x0.set(this.x0.subarray(0, 3 * m)); v.velocity.set(this.velocity.subarray(0, 4 * m));
    v.referenceAgeS.set(this.referenceAgeS.subarray(0, m)); v.satStart.set(this.satStart.subarray(0, m)); v.context.set(this.context.subarray(0, m));
    v.satCount.set(this.satCount.subarray(0, m)); v.isStatic.set(this.isStatic.subarray(0, m)); v.reason.set(this.reason.subarray(0, m));
    this.chunkEntries.push(n);
    this.chunkBase.push(this.satTotal - this.recorded);
    this.chunkBlock.push(this.store.put(bytes));
    // The entries and epochs kept move to the front of the arrays.
    const r = this.recorded - n;
    this.phaseM.copyWithin(0, n, n + r); this.codeM.copyWithin(0, n, n + r); this.los.copyWithin(0, 3 * n, 3 * (n + r));
    this.elevationRad.copyWithin(0, n, n + r); this.arc.copyWithin(0, n, n + r); this.sat.copyWithin(0, n, n + r); this.fixable.copyWithin(0, n, n + r);
    this.timeGpsS.copyWithin(0, m, m + kept); this.tagGpsS.copyWithin(0, m, m + kept); this.x0.copyWithin(0, 3 * m, 3 * (m + kept)); this.velocity.copyWithin(0, 4 * m, 4 * (m + kept));
    this.referenceAgeS.copyWithin(0, m, m + kept); this.satStart.copyWithin(0, m, m + kept); this.context.copyWithin(0, m, m + kept);
    this.satCount.copyWithin(0, m, m + kept); this.isStatic.copyWithin(0, m, m + kept); this.reason.copyWithin(0, m, m + kept);
    for (let e = 0; e < kept; e++) this.satStart[e] -= n;
    this.recorded = r;
    this.firstEpoch = until;
  }

  /** Starts an epoch; returns its index k (of the session). */
  beginEpoch(timeGpsS: number, tagGpsS: number, x0: { x: number; y: number; z: number }, isStatic: boolean, referenceAgeS: number, context: number): number {
    if (this.recorded < 0) throw new Error('EpochRecords: recording has ended (visit was called)');
    if (this.count === 0) this.chunkFirstEpoch.push(0);
    else if (this.recorded >= CHUNK_SATELLITES) {
      // The last epoch with satellites stays in the chunk being recorded with the new one: the reading
      // compares an epoch's entries with the previous epoch's (time-differenced slips).
      let keep = this.count - 1;
      while (keep > this.firstEpoch && this.satCount[keep - this.firstEpoch] === 0) keep--;
      if (keep > this.firstEpoch) {
        this.sealChunk(keep);
        this.chunkFirstEpoch.push(keep);
      }
    }
    if (this.count > 0 && this.firstIntervalsS.length < 2000) {
      const d = timeGpsS - this.timeGpsS[this.count - 1 - this.firstEpoch];
      if (d > 0) this.firstIntervalsS.push(d);
    }
    const k = this.count++;
    const e = k - this.firstEpoch;
    if (e >= this.timeGpsS.length) this.growEpochs(e + 1);
    this.timeGpsS[e] = timeGpsS;
    this.tagGpsS[e] = tagGpsS;
    this.x0[3 * e] = x0.x; this.x0[3 * e + 1] = x0.y; this.x0[3 * e + 2] = x0.z;
    this.velocity.fill(NaN, 4 * e, 4 * e + 4);
    this.satStart[e] = this.recorded;
    this.satCount[e] = 0;
    this.isStatic[e] = isStatic ? 1 : 0;
    this.referenceAgeS[e] = referenceAgeS;
    this.context[e] = context;
    this.reason[e] = 0;
    return k;
  }

  /** Marks the epochs before `k` static (read back so: the chunks already stored are not rewritten). */
  staticBefore(k: number): void {
    this.staticUntil = k;
    const end = Math.min(k, this.count) - this.firstEpoch;
    if (this.recorded >= 0 && end > 0) this.isStatic.fill(1, 0, end);
  }

  /** Index of epoch k in the per-epoch arrays (its chunk being recorded, or current). */
  indexOf(k: number): number {
    const e = k - this.firstEpoch;
    const epochs = this.recorded >= 0 ? this.count - this.firstEpoch : this.current >= 0 ? this.chunkSpan(this.current).epochs : 0;
    if (!(e >= 0 && e < epochs)) throw new RangeError(`EpochRecords: epoch ${k} is not in the current chunk`);
    return e;
  }

  setVelocity(k: number, vx: number, vy: number, vz: number, sigmaMS: number): void {
    const e = this.indexOf(k);
    this.velocity[4 * e] = vx; this.velocity[4 * e + 1] = vy; this.velocity[4 * e + 2] = vz; this.velocity[4 * e + 3] = sigmaMS;
  }

  /** Adds a satellite to epoch k, the last one begun. */
  addSatellite(k: number, sat: number, arc: number, phaseM: number, codeM: number, ux: number, uy: number, uz: number, elevationRad: number, fixable: boolean): void {
    if (k !== this.count - 1) throw new Error(`EpochRecords: epoch ${k} is not the last one begun`);
    if (this.recorded + 1 > this.sat.length) this.growSats(this.recorded + 1);
    const j = this.recorded++;
    this.satTotal++;
    this.sat[j] = sat; this.arc[j] = arc; this.phaseM[j] = phaseM; this.codeM[j] = codeM;
    this.los[3 * j] = ux; this.los[3 * j + 1] = uy; this.los[3 * j + 2] = uz;
    this.elevationRad[j] = elevationRad; this.fixable[j] = fixable ? 1 : 0;
    this.satCount[k - this.firstEpoch]++;
  }

  /**
   * Session-wide index of the current chunk's first entry: entry j of the per-satellite arrays is entry
   * satBase + j of the session (0 <= satBase + j < satTotal), for results kept per entry of the session.
   */
  get satBase(): number {
    return this.recorded >= 0 ? this.satTotal - this.recorded : this.current >= 0 ? this.chunkBase[this.current] : 0;
  }

  /** The chunk holding epoch k (once recording has ended: after the first visit). */
  chunkOf(k: number): number {
    const c = this.current;
    if (c >= 0 && k >= this.chunkFirstEpoch[c] && (c + 1 === this.chunkFirstEpoch.length || k < this.chunkFirstEpoch[c + 1])) return c;
    if (!(k >= 0 && k < this.count)) throw new RangeError(`EpochRecords: no epoch ${k} (${this.count} recorded)`);
    // The last chunk starting at or before k.
    let lo = 0, hi = this.chunkFirstEpoch.length - 1;
    while (lo < hi) {
      const mid = (lo + hi + 1) >> 1;
      if (this.chunkFirstEpoch[mid] <= k) lo = mid; else hi = mid - 1;
    }
    return lo;
  }

  /** Chunk c's first epoch, its number of epochs and of satellite entries (once recording has ended). */
  chunkSpan(c: number): { readonly firstEpoch: number; readonly epochs: number; readonly entries: number } {
    const firstEpoch = this.chunkFirstEpoch[c];
    const end = c + 1 < this.chunkFirstEpoch.length ? this.chunkFirstEpoch[c + 1] : this.count;
    return { firstEpoch, epochs: end - firstEpoch, entries: this.chunkEntries[c] };
  }

  /**
   * Makes epoch k's chunk current: its values are then at index e (returned) of the per-epoch arrays, and
   * its satellites are entries satStart[e].. of the per-satellite arrays.
   */
  visit(k: number): number {
    if (this.recorded >= 0) this.endRecording();
    const c = this.chunkOf(k);
    if (c !== this.current) {
      // Copied out of the store: what get returns is valid only until its next get (by anyone).
      const src = this.store.get(this.chunkBlock[c]);
      if (this.loaded.length < src.length) this.loaded = new Uint8Array(src.length);
      this.loaded.set(src);
      const span = this.chunkSpan(c);
      this.useViews(chunkViews(this.loaded, span.entries, span.epochs));
      const staticEnd = Math.min(this.staticUntil - span.firstEpoch, span.epochs);
      if (staticEnd > 0) this.isStatic.fill(1, 0, staticEnd);
      this.current = c;
      this.firstEpoch = span.firstEpoch;
    }
    return k - this.firstEpoch;
  }

  /** Seals the last chunk; the recording arrays are released. */
  private endRecording(): void {
    if (this.count > 0) this.sealChunk(this.count);
    this.recorded = -1;
    this.packed = new Uint8Array(0);
  }

  /** The arrays of a chunk made current. */
  private useViews(v: ReturnType<typeof chunkViews>): void {
    this.phaseM = v.phaseM; this.codeM = v.codeM; this.los = v.los; this.elevationRad = v.elevationRad; this.arc = v.arc; this.sat = v.sat; this.fixable = v.fixable;
    this.timeGpsS = v.timeGpsS; this.tagGpsS = v.tagGpsS; this.x0 = v.x0; this.velocity = v.velocity; this.referenceAgeS = v.referenceAgeS;
    this.satStart = v.satStart; this.context = v.context; this.satCount = v.satCount; this.isStatic = v.isStatic; this.reason = v.reason;
  }

  /** Releases the store and the arrays (the records cannot be visited afterwards; `count` and `satTotal` stay). */
  close(): void {
    this.store.close();
    this.current = -1;
    this.loaded = new Uint8Array(0);
    this.packed = new Uint8Array(0);
    this.useViews(chunkViews(this.loaded, 0, 0));
  }
}
