/**
 * The passes' results per epoch, in typed-array columns held one chunk of epochs at a time (the chunks of
 * the records, epoch-records.ts) and kept in the records' RecordStore between the stages:
 *  1. the forward pass writes each epoch's result (solution, float solution, residuals);
 *  2. the backward pass combines each epoch with the forward result read back (combine-passes.ts), in place;
 *  3. the outputs read the combined results.
 * So the results of a session take one chunk's columns in memory whatever its length (a day at 1 Hz
 * would hold about 13 MB per pass in whole-session columns); the store keeps two blocks per chunk (the
 * forward results, then the combined ones), in a temporary file with the command line's store.
 *
 * Columns of a chunk of n epochs and m satellite entries: position, covariance (xx, xy, xz, yy, yz, zz),
 * floatPosition, floatCovariance (f64); ratio, chiSquare, the causes' numbers of each pass (forwardCauseA,
 * forwardCauseB, backwardCauseA, backwardCauseB), residualM (f32, per entry, indexed like the records'
 * per-satellite arrays: EpochRecords.satStart[e] + i); fixedAmbiguities, satellitesUsed, dof (u16); kind,
 * forwardKind, backwardKind (u8: 0 none, 1 float, 2 fixed), forwardCause, backwardCause (u8: float-causes.ts).
 * 179 n + 4 m bytes.
 */
import type { EpochRecords, RecordStore } from './epoch-records.js';
import type { EpochResult } from './float-filter.js';
import { keepShape } from './kept-shapes.js';

/** Bytes of a chunk's columns for n epochs and m entries (widest first, so each view is aligned). */
const chunkBytes = (n: number, m: number): number => 144 * n + 8 * n + 16 * n + 4 * m + 6 * n + 3 * n + 2 * n;

/** The stage whose columns are current: what a change of chunk stores and loads. */
type Stage = 'forward' | 'combine' | 'read';

export class PassResults {
  position = new Float64Array(0);
  covariance = new Float64Array(0);
  floatPosition = new Float64Array(0);
  floatCovariance = new Float64Array(0);
  ratio = new Float32Array(0);
  /** The epoch's innovation test (EpochResult.chiSquare, dof) of the pass whose residuals it carries. */
  chiSquare = new Float32Array(0);
  residualM = new Float32Array(0);
  fixedAmbiguities = new Uint16Array(0);
  satellitesUsed = new Uint16Array(0);
  dof = new Uint16Array(0);
  kind = new Uint8Array(0);
  forwardKind = new Uint8Array(0);
  backwardKind = new Uint8Array(0);
  /** Why each pass left the epoch float or unsolved (float-causes.ts), with the cause's two numbers. */
  forwardCause = new Uint8Array(0);
  backwardCause = new Uint8Array(0);
  forwardCauseA = new Float32Array(0);
  forwardCauseB = new Float32Array(0);
  backwardCauseA = new Float32Array(0);
  backwardCauseB = new Float32Array(0);

  /** Per chunk: its block of forward results, of combined results (-1 until stored). */
  private readonly forwardBlock: number[] = [];
  private readonly combinedBlock: number[] = [];
  /** The current chunk's bytes (one buffer, reused). */
  private bytes = new Uint8Array(0);
  private current = -1;
  private stage: Stage | null = null;
  /** The current chunk's first epoch. */
  private firstEpoch = 0;

  constructor(private readonly rec: EpochRecords, private readonly store: RecordStore) {
    keepShape(this);
  }

  /**
   * Makes epoch k's chunk current for a stage (the records of epoch k current already, EpochRecords.visit);
   * returns k's index in the per-epoch columns. The residuals of epoch k are residualM[rec.satStart[e] + i],
   * e = rec.indexOf(k).
   */
  at(k: number, stage: Stage): number {
    const c = this.rec.chunkOf(k);
    if (c !== this.current || stage !== this.stage) {
      this.finish();
      const span = this.rec.chunkSpan(c);
      const size = chunkBytes(span.epochs, span.entries);
      if (this.bytes.length < size) this.bytes = new Uint8Array(size);
      const block = stage === 'forward' ? -1 : stage === 'combine' ? this.forwardBlock[c] : this.combinedBlock[c];
      if (stage !== 'forward' && block === undefined) throw new Error(`PassResults: chunk ${c} has no ${stage === 'combine' ? 'forward' : 'combined'} results`);
      if (block >= 0) this.bytes.set(this.store.get(block));
      this.views(span.epochs, span.entries);
      if (stage === 'forward') {
        // No solution until the pass says otherwise (EpochResult.start).
        this.position.fill(NaN); this.covariance.fill(NaN); this.floatPosition.fill(NaN); this.floatCovariance.fill(NaN);
        this.ratio.fill(NaN); this.chiSquare.fill(NaN); this.residualM.fill(NaN); this.fixedAmbiguities.fill(0); this.satellitesUsed.fill(0); this.dof.fill(0);
        this.kind.fill(0); this.forwardKind.fill(0); this.backwardKind.fill(0);
        this.forwardCause.fill(0); this.backwardCause.fill(0);
        this.forwardCauseA.fill(NaN); this.forwardCauseB.fill(NaN); this.backwardCauseA.fill(NaN); this.backwardCauseB.fill(NaN);
      }
      this.current = c;
      this.stage = stage;
      this.firstEpoch = span.firstEpoch;
    }
    return k - this.firstEpoch;
  }

  /** Epoch k's result from the forward pass (its records current). */
  putForward(k: number, r: EpochResult): void {
    const i = this.at(k, 'forward');
    this.kind[i] = r.kind;
    this.forwardKind[i] = r.kind;
    this.position.set(r.position, 3 * i);
    this.covariance.set(r.covariance, 6 * i);
    this.floatPosition.set(r.floatPosition, 3 * i);
    this.floatCovariance.set(r.floatCovariance, 6 * i);
    this.ratio[i] = r.ratio;
    this.fixedAmbiguities[i] = r.fixedAmbiguities;
    this.satellitesUsed[i] = r.satellitesUsed;
    this.chiSquare[i] = r.chiSquare;
    this.dof[i] = r.dof;
    this.forwardCause[i] = r.cause;
    this.forwardCauseA[i] = r.causeA;
    this.forwardCauseB[i] = r.causeB;
    const e = this.rec.indexOf(k);
    this.residualM.set(r.residualM.subarray(0, this.rec.satCount[e]), this.rec.satStart[e]);
  }

  /** Stores the current chunk's columns if a pass wrote them. */
  finish(): void {
    const c = this.current;
    if (c < 0 || this.stage === 'read' || this.stage === null) return;
    const span = this.rec.chunkSpan(c);
    const block = this.store.put(this.bytes.subarray(0, chunkBytes(span.epochs, span.entries)));
    (this.stage === 'forward' ? this.forwardBlock : this.combinedBlock)[c] = block;
    this.stage = null;
    this.current = -1;
  }

  /** Releases the current chunk's buffer. */
  release(): void {
    this.finish();
    this.bytes = new Uint8Array(0);
    this.views(0, 0);
  }

  private views(n: number, m: number): void {
    const b = this.bytes.buffer, o = this.bytes.byteOffset;
    let at = o;
    const next = <T>(make: (at: number) => T, bytes: number): T => { const v = make(at); at += bytes; return v; };
    this.position = next((p) => new Float64Array(b, p, 3 * n), 24 * n);
    this.covariance = next((p) => new Float64Array(b, p, 6 * n), 48 * n);
    this.floatPosition = next((p) => new Float64Array(b, p, 3 * n), 24 * n);
    this.floatCovariance = next((p) => new Float64Array(b, p, 6 * n), 48 * n);
    this.ratio = next((p) => new Float32Array(b, p, n), 4 * n);
    this.chiSquare = next((p) => new Float32Array(b, p, n), 4 * n);
    this.forwardCauseA = next((p) => new Float32Array(b, p, n), 4 * n);
    this.forwardCauseB = next((p) => new Float32Array(b, p, n), 4 * n);
    this.backwardCauseA = next((p) => new Float32Array(b, p, n), 4 * n);
    this.backwardCauseB = next((p) => new Float32Array(b, p, n), 4 * n);
    this.residualM = next((p) => new Float32Array(b, p, m), 4 * m);
    this.fixedAmbiguities = next((p) => new Uint16Array(b, p, n), 2 * n);
    this.satellitesUsed = next((p) => new Uint16Array(b, p, n), 2 * n);
    this.dof = next((p) => new Uint16Array(b, p, n), 2 * n);
    this.kind = next((p) => new Uint8Array(b, p, n), n);
    this.forwardKind = next((p) => new Uint8Array(b, p, n), n);
    this.backwardKind = next((p) => new Uint8Array(b, p, n), n);
    this.forwardCause = next((p) => new Uint8Array(b, p, n), n);
    this.backwardCause = next((p) => new Uint8Array(b, p, n), n);
  }
}
