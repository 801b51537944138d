/**
 * The prepared between-receiver single differences of a whole session, kept compactly in typed arrays so
 * that the filter can run over them forwards and then backwards without reading the files again.
 *
 * Per satellite: single difference (rover minus reference) of phase and of code, each reduced by the
 * modelled range from the rover's linearisation point x0 (range, broadcast satellite clock, troposphere),
 * so that sd = -u . (x - x0) + c (dt_rover - dt_reference) [+ lambda N for phase] + noise, with u the unit
 * vector from x0 to the satellite.
 *
 * Memory: per epoch 8 * 8 + 4 * 4 bytes (times, linearisation point, velocity, indices: about 80 bytes),
 * kept in memory; per satellite and epoch 2 + 4 + 8 + 8 + 3 * 4 + 4 + 1 = 39 bytes, kept in chunks of
 * about CHUNK_SATELLITES entries (1.3 MB) handed to a RecordStore as they fill. A day at 1 Hz with 9
 * satellites is 86,400 * 80 = 7 MB in memory and 86,400 * 9 * 39 = 30 MB in the store: in memory too with
 * the default store (MemoryRecordStore, exact size), in a temporary file with the command line's.
 *
 * Reading back: `visit(k)` makes the chunk of epoch k current; the per-satellite arrays (sat, arc,
 * phaseM...) are then that chunk's, and epoch k's satellites are its entries satStart[k] to
 * satStart[k] + satCount[k] - 1 (satStart counts from the start of the epoch's chunk). The first visit
 * ends the recording.
 */

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

/** The per-satellite arrays of one chunk of `n` entries, as views on one buffer of n * ENTRY_BYTES bytes (widest first, so each is aligned). */
function chunkViews(bytes: Uint8Array, n: number) {
  const b = bytes.buffer, o = bytes.byteOffset;
  return {
    phaseM: new Float64Array(b, o, n),
    codeM: new Float64Array(b, o + 8 * n, n),
    los: new Float32Array(b, o + 16 * n, 3 * n),
    elevationRad: new Float32Array(b, o + 28 * n, n),
    arc: new Int32Array(b, o + 32 * n, n),
    sat: new Uint16Array(b, o + 36 * n, n),
    fixable: new Uint8Array(b, o + 38 * n, n),
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
  // Per epoch.
  timeGpsS = new Float64Array(1024);
  tagGpsS = new Float64Array(1024);
  x0 = new Float64Array(3 * 1024);
  velocity = new Float64Array(4 * 1024); // vx, vy, vz, sigma (m/s); NaN when none
  /** First satellite entry of the epoch, counted from the start of its chunk. */
  satStart = new Int32Array(1024);
  satCount = new Uint16Array(1024);
  /** 1: static epoch (the position of the previous epoch carries over exactly). */
  isStatic = new Uint8Array(1024);
  referenceAgeS = new Float32Array(1024);
  /** Index of the epoch's context (point name, event, antenna height) in `contexts`. */
  context = new Int32Array(1024);
  // Per satellite, of the current chunk (being recorded, or made current by visit()).
  sat: Uint16Array = new Uint16Array(CHUNK_SATELLITES);
  arc: Int32Array = new Int32Array(CHUNK_SATELLITES);
  phaseM: Float64Array = new Float64Array(CHUNK_SATELLITES);
  codeM: Float64Array = new Float64Array(CHUNK_SATELLITES);
  los: Float32Array = new Float32Array(3 * CHUNK_SATELLITES);
  elevationRad: Float32Array = new Float32Array(CHUNK_SATELLITES);
  /** 1 when the ambiguity may be fixed (constellation fixable, half cycle resolved at both receivers). */
  fixable: Uint8Array = new Uint8Array(CHUNK_SATELLITES);

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
  /** The chunk whose entries are in the per-satellite arrays (after recording). */
  private current = -1;

  constructor(private readonly store: RecordStore = new MemoryRecordStore()) {}

  private growEpochs(): void {
    const n = this.timeGpsS.length * 2;
    this.timeGpsS = grown(this.timeGpsS, n); this.tagGpsS = grown(this.tagGpsS, n); this.x0 = grown(this.x0, n, 3); this.velocity = grown(this.velocity, n, 4);
    this.satStart = grown(this.satStart, n); this.satCount = grown(this.satCount, n); this.isStatic = grown(this.isStatic, n);
    this.referenceAgeS = grown(this.referenceAgeS, n); this.context = grown(this.context, n);
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
    const n = until < this.count ? this.satStart[until] : this.recorded;
    if (this.packed.length < n * ENTRY_BYTES) this.packed = new Uint8Array(n * ENTRY_BYTES);
    const bytes = this.packed.subarray(0, n * ENTRY_BYTES);
    const v = chunkViews(bytes, n);
    v.phaseM.set(this.phaseM.subarray(0, n)); v.codeM.set(this.codeM.subarray(0, n)); v.los.set(this.los.subarray(0, 3 * n));
    v.elevationRad.set(this.elevationRad.subarray(0, n)); v.arc.set(this.arc.subarray(0, n)); v.sat.set(this.sat.subarray(0, n)); v.fixable.set(this.fixable.subarray(0, n));
    this.chunkEntries.push(n);
    this.chunkBase.push(this.satTotal - this.recorded);
    this.chunkBlock.push(this.store.put(bytes));
    // The epochs kept move to the front of the per-satellite arrays.
    const m = this.recorded - n;
    this.phaseM.copyWithin(0, n, n + m); this.codeM.copyWithin(0, n, n + m); this.los.copyWithin(0, 3 * n, 3 * (n + m));
    this.elevationRad.copyWithin(0, n, n + m); this.arc.copyWithin(0, n, n + m); this.sat.copyWithin(0, n, n + m); this.fixable.copyWithin(0, n, n + m);
    for (let e = until; e < this.count; e++) this.satStart[e] -= n;
    this.recorded = m;
  }

  /** Starts an epoch; returns its index. */
  beginEpoch(timeGpsS: number, tagGpsS: number, x0: { x: number; y: number; z: number }, isStatic: boolean, referenceAgeS: number, context: number): number {
    if (this.recorded < 0) throw new Error('EpochRecords: recording has ended (visit was called)');
    if (this.count === this.timeGpsS.length) this.growEpochs();
    if (this.count === 0) this.chunkFirstEpoch.push(0);
    else if (this.recorded >= CHUNK_SATELLITES) {
      // The last epoch with satellites stays in the chunk being recorded with the new one: the reading
      // compares an epoch's entries with the previous epoch's (time-differenced slips).
      let keep = this.count - 1;
      while (keep > 0 && this.satCount[keep] === 0) keep--;
      const first = this.chunkFirstEpoch[this.chunkFirstEpoch.length - 1];
      if (keep > first) {
        this.sealChunk(keep);
        this.chunkFirstEpoch.push(keep);
      }
    }
    const k = this.count++;
    this.timeGpsS[k] = timeGpsS;
    this.tagGpsS[k] = tagGpsS;
    this.x0[3 * k] = x0.x; this.x0[3 * k + 1] = x0.y; this.x0[3 * k + 2] = x0.z;
    this.velocity.fill(NaN, 4 * k, 4 * k + 4);
    this.satStart[k] = this.recorded;
    this.satCount[k] = 0;
    this.isStatic[k] = isStatic ? 1 : 0;
    this.referenceAgeS[k] = referenceAgeS;
    this.context[k] = context;
    return k;
  }

  setVelocity(k: number, vx: number, vy: number, vz: number, sigmaMS: number): void {
    this.velocity[4 * k] = vx; this.velocity[4 * k + 1] = vy; this.velocity[4 * k + 2] = vz; this.velocity[4 * k + 3] = sigmaMS;
  }

  /** Adds a satellite to epoch k, the last one begun. */
  addSatellite(k: number, sat: number, arc: number, phaseM: number, codeM: number, ux: number, uy: number, uz: number, elevationRad: number, fixable: boolean): void {
    if (this.recorded + 1 > this.sat.length) this.growSats(this.recorded + 1);
    const j = this.recorded++;
    this.satTotal++;
    this.sat[j] = sat; this.arc[j] = arc; this.phaseM[j] = phaseM; this.codeM[j] = codeM;
    this.los[3 * j] = ux; this.los[3 * j + 1] = uy; this.los[3 * j + 2] = uz;
    this.elevationRad[j] = elevationRad; this.fixable[j] = fixable ? 1 : 0;
    this.satCount[k]++;
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

  /** Makes epoch k's chunk current: its satellites are then entries satStart[k].. of the per-satellite arrays. */
  visit(k: number): void {
    if (this.recorded >= 0) this.endRecording();
    const lo = this.chunkOf(k);
    if (lo === this.current) return;
    // Copied out of the store: what get returns is valid only until its next get (by anyone).
    const src = this.store.get(this.chunkBlock[lo]);
    if (this.loaded.length < src.length) this.loaded = new Uint8Array(src.length);
    this.loaded.set(src);
    const v = chunkViews(this.loaded, this.chunkEntries[lo]);
    this.phaseM = v.phaseM; this.codeM = v.codeM; this.los = v.los; this.elevationRad = v.elevationRad; this.arc = v.arc; this.sat = v.sat; this.fixable = v.fixable;
    this.current = lo;
  }

  /**
   * Seals the last chunk. The per-epoch arrays keep their spare room: never written, it takes no memory
   * (fresh zeroed pages), where a trimmed copy would sit beside the old arrays until the collector runs.
   */
  private endRecording(): void {
    if (this.count > 0) this.sealChunk(this.count);
    this.recorded = -1;
    this.packed = new Uint8Array(0);
  }

  /** Releases the store (the records cannot be visited afterwards). */
  close(): void {
    this.store.close();
    this.current = -1;
    this.loaded = new Uint8Array(0);
  }
}
