/**
 * The carrier-phase filter of one pass (forwards or backwards over the prepared epochs): a Kalman filter
 * (e.g. Teunissen & Montenbruck 2017, Springer Handbook of GNSS, ch. 22) on
 *   [position (3), relative receiver clocks per group (a code and a phase clock per constellation's band and
 *    signal pair: SatelliteInfo.group), one single-difference ambiguity per arc, and with further bands one
 *    single-difference ionosphere per satellite (ionosphere-weighting.ts)],
 * with between-receiver single differences as measurements. A clock state per group, free every
 * epoch, is the same as forming double differences (the clocks are eliminated), but keeps the measurement
 * noise diagonal so measurements are processed one at a time (sequential scalar updates).
 *
 * Process model:
 *  - static epochs: the position carries over with no process noise;
 *  - moving epochs: the position moves by the mean Doppler velocity of the two epochs times the interval,
 *    with a process noise of ((sigma_v + 0.05 m/s) * dt)^2 per axis (sigma_v the velocity's formal sigma,
 *    0.05 m/s for the change of velocity within the interval; common practice for pedestrian and vehicle
 *    rovers at 1 Hz), plus per axis half the change of velocity between the two epochs times the interval
 *    (the trapezoid rule's largest miss when the antenna starts or stops within the interval); without
 *    Doppler the position is free (re-initialised from the code, sigma 10 m);
 *  - clocks: free every epoch (white noise of unbounded variance, started at the median code difference);
 *  - ambiguities: constant within an arc (no process noise); a new arc starts a new state at the value
 *    implied by the code, sigma 5 m; a state not met for longer than 30 s is dropped.
 * Measurement noise per receiver sigma^2 = a^2 + b^2 / sin^2(el), doubled for the single difference.
 * Outliers: a code innovation beyond 5 sigma is not used; a phase innovation beyond 5 sigma on an arc whose
 * ambiguity is already known to better than 0.25 cycle is a slip the receivers did not flag: the arc's
 * ambiguity is started again. No fix is tried in a disturbed epoch: one whose phase innovations fail their
 * test, or in which more than half of the arcs start or end.
 *
 * Integer ambiguities: double differences per constellation against a pivot (the previous pivot while it
 * stays above the ambiguity mask, else the highest satellite), fixed with LAMBDA and the ratio test,
 * partially (lowest satellites left float first) down to a minimum number; the position is conditioned on
 * the fixed integers (Teunissen 1995, eq. 2.8). A double difference fixed to the same integer for
 * `holdAfterEpochs` epochs in a row is held: added as a measurement of 0.001 cycle precision, so the arc
 * keeps it (fix-and-hold within arcs).
 */
import { fixPartially } from '../ambiguity/index.js';
import { chiSquareQuantile } from '../solve/index.js';
import type { CarrierOptions } from './options.js';
import type { EpochRecords } from './epoch-records.js';
import type { GnssSystem, SatId } from '../gnss/index.js';
import { ionosphereObliquity, type IonosphereWeighting } from './ionosphere-weighting.js';

/** One entry of the signal table: a satellite's signal on one band (the primary band, or a further one). */
export interface SatelliteInfo {
  readonly id: SatId;
  readonly system: GnssSystem;
  readonly wavelengthM: number;
  /**
   * Clock group: single differences of one group share a code clock and a phase clock (so ambiguities are
   * double-differenced within it). The constellation for the primary band; constellation, band and signal
   * pair for a further band (further-bands.ts).
   */
  readonly group: string;
  /** The primary band's signal (its code counts towards the satellites used). */
  readonly primary: boolean;
  /** The rover's pseudorange and phase observation codes ('C2W', 'L2W'; the primary band's as first met), for the outputs. */
  readonly code: string;
  readonly phaseCode: string;
  /** mu = (lambda / lambda of the satellite's primary band)^2: the ionosphere on this band per unit on the primary. */
  readonly ionoFactor: number;
}

/**
 * One epoch's result of a pass, handed to the pass's consumer as the epoch ends (the same object is
 * refilled for the next epoch: a consumer keeps what it needs, so a pass holds no session-long arrays).
 */
export class EpochResult {
  /** 0 no solution, 1 float, 2 fixed. */
  kind = 0;
  /** Ratio test statistic of the epoch's integer search (NaN when none ran). */
  ratio = NaN;
  fixedAmbiguities = 0;
  satellitesUsed = 0;
  /** The epoch's solution: fixed when kind is 2, else float. */
  readonly position = new Float64Array(3);
  /** Position covariance xx, xy, xz, yy, yz, zz (m^2). */
  readonly covariance = new Float64Array(6);
  /** The float solution (before any fix), when kind > 0. */
  readonly floatPosition = new Float64Array(3);
  readonly floatCovariance = new Float64Array(6);
  /**
   * Post-fit residual (m) of each of the epoch's record entries (index i for entry satStart[k] + i): of the
   * phase single difference when its phase was used, else of the code; at the epoch's solution (fixed:
   * position, clocks and ambiguities conditioned on the fixed integers before they are held; float: the
   * filter's state after the epoch's updates). NaN below the elevation mask or without a solution.
   * Single precision, as kept for the outputs.
   */
  residualM = new Float32Array(64);

  /** Clears the result for an epoch of `entries` record entries. */
  start(entries: number): void {
    this.kind = 0; this.ratio = NaN; this.fixedAmbiguities = 0; this.satellitesUsed = 0;
    this.position.fill(NaN); this.covariance.fill(NaN); this.floatPosition.fill(NaN); this.floatCovariance.fill(NaN);
    if (this.residualM.length < entries) this.residualM = new Float32Array(2 * entries);
    this.residualM.fill(NaN, 0, entries);
  }
}

export interface PassCounts {
  readonly unflaggedSlips: number;
  readonly codeOutliers: number;
  /** Epochs whose phase innovations failed their test (left float). */
  readonly disturbedEpochs: number;
}

const INITIAL_POSITION_VAR_M2 = 100;
const CLOCK_VAR_M2 = 1e4;
const AMBIGUITY_SIGMA_M = 5;
const DROP_AFTER_S = 30;
const HOLD_VAR_CYCLES2 = 1e-6;

/**
 * State and covariance of the filter. Slots are numbered in the order their states were added (fixed slots
 * first) and stay contiguous: removing a state moves the later ones down one slot, so the updates run over
 * rows 0..n-1 without an index list. Only the upper triangle of the covariance (row <= column) is kept up
 * to date: `cov` reads it for any pair. Each pair is computed as before the layout changed (the earlier
 * slot's gain times the later one's P h'), so the results are the same to the last bit.
 */
class KalmanState {
  cap: number;
  /** States in use: slots 0..n-1. */
  n: number;
  x: Float64Array;
  /** Covariance, row-major with `cap` columns; valid where row <= column. */
  p: Float64Array;
  private ph: Float64Array;

  constructor(fixedSlots: number) {
    this.cap = fixedSlots + 32;
    this.n = fixedSlots;
    this.x = new Float64Array(this.cap);
    this.p = new Float64Array(this.cap * this.cap);
    this.ph = new Float64Array(this.cap);
  }

  private grow(): void {
    const old = this.cap;
    const cap = old * 2;
    const x = new Float64Array(cap);
    x.set(this.x);
    const p = new Float64Array(cap * cap);
    for (let i = 0; i < old; i++) p.set(this.p.subarray(i * old, i * old + old), i * cap);
    this.x = x; this.p = p; this.cap = cap; this.ph = new Float64Array(cap);
  }

  /** Covariance of slots i and j. */
  cov(i: number, j: number): number {
    return i <= j ? this.p[i * this.cap + j] : this.p[j * this.cap + i];
  }

  /** out[s] += (P[s][a] - P[s][b]) * w for every slot s. */
  addColumnDifference(out: Float64Array, a: number, b: number, w: number): void {
    for (let s = 0; s < this.n; s++) out[s] += (this.cov(s, a) - this.cov(s, b)) * w;
  }

  /** Clears a slot's correlations and sets its value and variance. */
  reset(slot: number, value: number, variance: number): void {
    const c = this.cap, p = this.p;
    for (let i = 0; i < this.n; i++) { p[i * c + slot] = 0; p[slot * c + i] = 0; }
    p[slot * c + slot] = variance;
    this.x[slot] = value;
  }

  /** A new state, uncorrelated with the others, in the next slot. */
  allocate(value: number, variance: number): number {
    if (this.n === this.cap) this.grow();
    const s = this.n++;
    this.reset(s, value, variance);
    return s;
  }

  /** Removes a state: every later slot moves down by one (slot > removed becomes slot - 1). */
  remove(slot: number): void {
    const c = this.cap, p = this.p, n = this.n;
    for (let i = 0; i < n; i++) {
      if (i === slot) continue;
      const to = (i < slot ? i : i - 1) * c;
      if (to !== i * c) p.copyWithin(to, i * c, i * c + slot);
      p.copyWithin(to + slot, i * c + slot + 1, i * c + n);
    }
    this.x.copyWithin(slot, slot + 1, n);
    this.n = n - 1;
  }

  /** Innovation variance h P h' + r for a sparse h. */
  innovationVariance(idx: Int32Array, val: Float64Array, nh: number, r: number): number {
    let s = r;
    for (let a = 0; a < nh; a++) for (let b = 0; b < nh; b++) s += val[a] * this.cov(idx[a], idx[b]) * val[b];
    return s;
  }

  /** Sequential scalar update with a sparse row h (slots idx, values val, nh of them), innovation v and measurement variance r. */
  update(idx: Int32Array, val: Float64Array, nh: number, v: number, r: number): void {
    const c = this.cap, p = this.p, ph = this.ph, x = this.x;
    const n = this.n;
    // ph = P h', one column of P per entry of h, in the order of h (each column read from the upper triangle:
    // down to the diagonal, then along the row).
    ph.fill(0, 0, n);
    for (let m = 0; m < nh; m++) {
      const a = idx[m], w = val[m], row = a * c;
      for (let i = 0; i < a; i++) ph[i] += p[i * c + a] * w;
      for (let i = a; i < n; i++) ph[i] += p[row + i] * w;
    }
    let s = r;
    for (let m = 0; m < nh; m++) s += val[m] * ph[idx[m]];
    if (!(s > 0)) return;
    const inv = 1 / s;
    // P - ph ph' / s, upper triangle; the row loop unrolled by four (each element is its own operation, so the
    // results are the same; the loop overhead, bound checks included, is a large part of so short a loop).
    for (let i = 0; i < n; i++) {
      const f = ph[i] * inv;
      x[i] += f * v;
      if (f === 0) continue;
      const row = i * c;
      let j = i;
      for (; j + 3 < n; j += 4) {
        const e = row + j;
        p[e] -= f * ph[j]; p[e + 1] -= f * ph[j + 1]; p[e + 2] -= f * ph[j + 2]; p[e + 3] -= f * ph[j + 3];
      }
      for (; j < n; j++) p[row + j] -= f * ph[j];
    }
  }
}

function choleskySolve(a: Float64Array, n: number, rhs: Float64Array[], ): boolean {
  // In-place Cholesky a = G G' (lower), then solves for each right-hand side.
  for (let j = 0; j < n; j++) {
    let d = a[j * n + j];
    for (let k = 0; k < j; k++) d -= a[j * n + k] * a[j * n + k];
    if (!(d > 0)) return false;
    d = Math.sqrt(d);
    a[j * n + j] = d;
    for (let i = j + 1; i < n; i++) {
      let s = a[i * n + j];
      for (let k = 0; k < j; k++) s -= a[i * n + k] * a[j * n + k];
      a[i * n + j] = s / d;
    }
  }
  for (const b of rhs) {
    for (let i = 0; i < n; i++) { let s = b[i]; for (let k = 0; k < i; k++) s -= a[i * n + k] * b[k]; b[i] = s / a[i * n + i]; }
    for (let i = n - 1; i >= 0; i--) { let s = b[i]; for (let k = i + 1; k < n; k++) s -= a[k * n + i] * b[k]; b[i] = s / a[i * n + i]; }
  }
  return true;
}

/**
 * Integer search around the ambiguities already held. A held ambiguity is within 0.01 cycle of an integer
 * with a standard deviation below 0.01 cycle: rounding is its integer least-squares value (no other integer
 * comes near). The others are conditioned on the held integers (a_o|h = a_o - Q_oh Q_hh^-1 (a_h - z_h),
 * Q_o|h = Q_oo - Q_oh Q_hh^-1 Q_ho; Teunissen 1995, eq. 2.8) and searched alone, which is the same search
 * with far fewer dimensions. Null when fewer than the minimum are held (the full search is then run).
 */
function fixAroundHeld(a: Float64Array, q: Float64Array, m: number, order: readonly number[], options: { ratioThreshold: number; minFixed: number; minSuccessRate: number }): { indices: number[]; integers: Float64Array; ratio: number; bestNorm: number; successRate: number } | null {
  const held: number[] = [], other: number[] = [];
  for (let u = 0; u < m; u++) (Math.abs(a[u] - Math.round(a[u])) <= 0.01 && q[u * m + u] < 1e-4 ? held : other).push(u);
  if (held.length < options.minFixed) return null;
  const h = held.length, o = other.length;
  // Plain loops and typed arrays below (no spreads or array callbacks): arrays of one element kind each, so
  // the optimised code of this function, called every epoch, is not thrown away for a new array shape.
  const heldInts = new Float64Array(h);
  for (let i = 0; i < h; i++) heldInts[i] = Math.round(a[held[i]]);
  if (o === 0) return { indices: held, integers: heldInts, ratio: Infinity, bestNorm: 0, successRate: 1 };
  const qhh = new Float64Array(h * h);
  for (let i = 0; i < h; i++) for (let j = 0; j < h; j++) qhh[i * h + j] = q[held[i] * m + held[j]];
  const d = new Float64Array(h);
  for (let i = 0; i < h; i++) d[i] = a[held[i]] - heldInts[i];
  const cols: Float64Array[] = [];
  const rhs: Float64Array[] = [d];
  for (let i = 0; i < o; i++) {
    const col = new Float64Array(h);
    for (let k = 0; k < h; k++) col[k] = q[held[k] * m + other[i]];
    cols.push(col);
    rhs.push(col.slice());
  }
  if (!choleskySolve(qhh, h, rhs)) return null;
  const ac = new Float64Array(o), qc = new Float64Array(o * o);
  for (let i = 0; i < o; i++) {
    let s = 0;
    for (let k = 0; k < h; k++) s += cols[i][k] * rhs[0][k];
    ac[i] = a[other[i]] - s;
    for (let j = 0; j < o; j++) {
      let t = 0;
      for (let k = 0; k < h; k++) t += cols[i][k] * rhs[1 + j][k];
      qc[i * o + j] = q[other[i] * m + other[j]] - t;
    }
  }
  const subOrder: number[] = [];
  for (const u of order) {
    const i = other.indexOf(u);
    if (i >= 0) subOrder.push(i);
  }
  const r = fixPartially(ac, qc, o, subOrder, { ratioThreshold: options.ratioThreshold, minFixed: 1, minSuccessRate: options.minSuccessRate });
  if (!('integers' in r)) return { indices: held, integers: heldInts, ratio: Infinity, bestNorm: 0, successRate: 1 };
  const indices = held.slice();
  for (const i of r.indices) indices.push(other[i]);
  const integers = new Float64Array(h + r.integers.length);
  integers.set(heldInts);
  integers.set(r.integers, h);
  return { indices, integers, ratio: r.ratio, bestNorm: r.bestNorm, successRate: r.successRate };
}

/** Variance (m^2) of a between-receiver single difference: twice a^2 + b^2 / sin^2(el) (file comment). */
export function singleDifferenceVarianceM2(aM: number, bM: number, elevationRad: number): number {
  const s = Math.sin(Math.max(elevationRad, 0.05));
  return 2 * (aM * aM + (bM * bM) / (s * s));
}

/** Factor on the code variance for its time correlation: max(1, correlation time / logging interval) (options.ts). */
export function codeVarianceScale(rec: EpochRecords, opt: CarrierOptions): number {
  return Math.max(1, opt.codeCorrelationTimeS / nominalIntervalS(rec));
}

/** Median spacing of the epochs (s): the logging interval. */
function nominalIntervalS(rec: EpochRecords): number {
  const d = rec.firstIntervalsS;
  return d.length ? median(d) : 1;
}

function median(v: number[]): number {
  const s = [...v].sort((a, b) => a - b);
  const m = s.length >> 1;
  return s.length % 2 ? s[m] : 0.5 * (s[m - 1] + s[m]);
}

/** One fixed double-difference ambiguity: satellite minus pivot, single differences rover minus reference (cycles). */
export interface FixedDoubleDifference {
  readonly sat: SatId;
  readonly pivot: SatId;
  /** The phase signal ('L1C', 'L2W'...): one double difference per band. */
  readonly signal: string;
  readonly cycles: number;
}

/** Told every epoch's fixed integers (record index and the double differences). */
export type FixListener = (k: number, fixed: readonly FixedDoubleDifference[]) => void;

export interface PassSetup {
  readonly satellites: readonly SatelliteInfo[];
  /** Constellations whose ambiguities may be fixed. */
  readonly fixableSystems: ReadonlySet<GnssSystem>;
  readonly elevationMaskRad: number;
  readonly options: CarrierOptions;
  /** Estimate the differential ionosphere of satellites with further bands (ionosphere-weighting.ts); null: neglected. */
  readonly ionosphere?: IonosphereWeighting | null;
}

/** Key of a double difference (arc, pivot arc); arcs are numbered below 2^26. */
function pairKey(arcI: number, arcP: number): number {
  return arcI * 67_108_864 + arcP;
}

/** A pass of runPasses: its direction, its fixes' listener, and the consumer of its epochs' results. */
export interface PassSpec {
  readonly direction: 1 | -1;
  readonly onFix?: FixListener;
  /**
   * Given each epoch's result as the epoch ends (the same object refilled for the next epoch: valid during
   * the call), with the epoch's records current (EpochRecords.visit).
   */
  readonly onEpoch: (k: number, result: EpochResult) => void;
}

/**
 * Runs the filter over the records once per pass given, forwards (direction 1) or backwards (-1), each from
 * a fresh state, in order, each handing its epochs' results to its onEpoch and its fixes to its onFix. The
 * passes share their functions: the second starts with the code the first had the engine optimise, where
 * functions made anew for it would have to be optimised again (and calls between them sent the shared
 * optimised code back at every epoch).
 */
export function runPasses(rec: EpochRecords, setup: PassSetup, passes: readonly PassSpec[]): PassCounts[] {
  // The setup's fields read once: the objects handed in differ in shape from call to call (spread), and
  // reading them in the epoch loop made the optimised code start over at every new shape.
  const opt = setup.options;
  const sats = setup.satellites;
  const maskRad = setup.elevationMaskRad;
  const fixableSystems = setup.fixableSystems;
  let onFix: FixListener | undefined;
  // One code clock per group (SatelliteInfo.group: a constellation, or a constellation's further band).
  const systems = [...new Set(sats.map((s) => s.group))];
  const groupSystem = new Map<string, GnssSystem>(sats.map((s) => [s.group, s.system]));
  const clockSlot = new Map<string, number>(systems.map((s, i) => [s, 3 + i]));
  // CDMA systems get a phase clock of their own (free every epoch, so still exactly double differences):
  // some receivers step the code clock by milliseconds while the phase runs on. GLONASS phase keeps the
  // code clock (see the file comment).
  const cdma = systems.filter((s) => groupSystem.get(s) !== 'R');
  const phaseClockSlot = new Map<string, number>(cdma.map((s, i) => [s, 3 + systems.length + i]));
  for (const g of systems) if (groupSystem.get(g) === 'R') phaseClockSlot.set(g, clockSlot.get(g)!);
  // Per entry of the signal table: its code and phase clock slots, and its satellite's index (the
  // ionosphere state is the satellite's, shared by its bands).
  const clockOfEntry = Int32Array.from(sats, (s) => clockSlot.get(s.group)!);
  const phaseClockOfEntry = Int32Array.from(sats, (s) => phaseClockSlot.get(s.group)!);
  const satIds = [...new Set(sats.map((s) => s.id))];
  const satOfEntry = Int32Array.from(sats, (s) => satIds.indexOf(s.id));
  // The state of a pass (set again at the start of each).
  let st = new KalmanState(3 + systems.length + cdma.length);
  const arcSlot = new Map<number, number>();
  const arcSeen = new Map<number, number>();
  const out = new EpochResult();
  const ambMask = opt.ambiguityMaskDeg * Math.PI / 180;
  const pivots = new Map<string, number>();
  const holdCount = new Map<number, { value: number; count: number }>();
  const holdSeen = new Set<number>();
  const fixOptions = { ratioThreshold: opt.ratioThreshold, minFixed: opt.minFixedAmbiguities, minSuccessRate: opt.minSuccessRate };
  /** Constellations of the satellites used in the current epoch. */
  const usedSys = new Set<GnssSystem>();
  let unflaggedSlips = 0, codeOutliers = 0, disturbedEpochs = 0;
  let arcsBefore = new Set<number>();
  /** The previous epoch's index (-1 before the first), time, static flag and velocity (its chunk may be gone). */
  let prev = -1, prevTimeS = NaN, prevStatic = 0;
  const prevVelocity = new Float64Array(4);
  const remember = (k: number, e: number): void => {
    prev = k; prevTimeS = rec.timeGpsS[e]; prevStatic = rec.isStatic[e];
    for (let i = 0; i < 4; i++) prevVelocity[i] = rec.velocity[4 * e + i];
  };
  // The sparse row of a measurement: slots and coefficients (position, clock, ambiguity, ionosphere).
  const idx = new Int32Array(6);
  const val = new Float64Array(6);
  const holdIdx = new Int32Array(2);
  const holdVal = Float64Array.of(1, -1);
  const varOf = singleDifferenceVarianceM2;
  // Code errors correlated over codeCorrelationTimeS: the variance of each epoch's code is scaled up by the
  // number of epochs in a correlation time (options.ts).
  const codeScale = codeVarianceScale(rec, opt);
  // Differential ionosphere per satellite with further bands (ionosphere-weighting.ts): its state, when last
  // met, and the states of the current epoch's satellites.
  const iono = setup.ionosphere ?? null;
  const ionoSlot = new Map<SatId, number>();
  const ionoSeen = new Map<SatId, number>();
  /** The ionosphere state of each satellite (satIds) at the current epoch; -1: none. */
  const ionoNow = new Int32Array(satIds.length).fill(-1);
  /** The ionosphere's part of entry j's single difference on the code (phase: minus it), at the state xs (by slot). */
  const ionoTerm = (j: number, xs: Float64Array): number => {
    const io = ionoNow[satOfEntry[rec.sat[j]]];
    return io < 0 ? 0 : sats[rec.sat[j]].ionoFactor * xs[io];
  };
  /** The state conditioned on the fixed integers (fixEpoch), by slot. */
  let conditioned = new Float64Array(0);
  // fixEpoch's scratch: double-difference ambiguities and covariance, the fixed subset's covariance and
  // misfit, the position's covariance with it and its copies solved in place.
  let fixA = new Float64Array(0), fixD = new Float64Array(0), fixQ = new Float64Array(0), fixQs = new Float64Array(0);
  let fixQxa: Float64Array[] = [], fixRhs: Float64Array[] = [];
  // Per-epoch scratch: the clock samples, the arcs of this epoch and of the previous one.
  const samples: number[] = [];
  let arcsNow = new Set<number>();
  /** Removes a state and renumbers the slots after it (KalmanState.remove). */
  const release = (slot: number): void => {
    st.remove(slot);
    for (const [key, s] of arcSlot) if (s > slot) arcSlot.set(key, s - 1);
    for (const [key, s] of ionoSlot) if (s > slot) ionoSlot.set(key, s - 1);
  };

  const outputs: PassCounts[] = [];
  for (const pass of passes) {
    st = new KalmanState(3 + systems.length + cdma.length);
    arcSlot.clear(); arcSeen.clear(); pivots.clear(); holdCount.clear();
    ionoSlot.clear(); ionoSeen.clear(); ionoNow.fill(-1);
    unflaggedSlips = 0; codeOutliers = 0; disturbedEpochs = 0;
    arcsBefore = new Set<number>(); arcsNow = new Set<number>();
    prev = -1; prevTimeS = NaN; prevStatic = 0; prevVelocity.fill(NaN);
    onFix = pass.onFix;
    // The epoch's work in a function of its own: called once per epoch, it is optimised like any function
    // (the epoch loop alone would wait for on-stack replacement, and start over at each deoptimisation).
    // The pass's consumer is called here, not in epochStep: each pass has its own, and a call inlined in
    // epochStep's optimised code would be deoptimised at every epoch of the next pass.
    const onEpoch = pass.onEpoch;
    for (let n = 0; n < rec.count; n++) {
      const k = pass.direction === 1 ? n : rec.count - 1 - n;
      epochStep(k);
      onEpoch(k, out);
    }
    outputs.push({ unflaggedSlips, codeOutliers, disturbedEpochs });
  }
  return outputs;

  /** One epoch of the pass: prediction, clocks, code and phase updates, the epoch's test, float and fixed solutions. */
  function epochStep(k: number): void {
    const e = rec.visit(k);
    const t = rec.timeGpsS[e];
    const x0x = rec.x0[3 * e], x0y = rec.x0[3 * e + 1], x0z = rec.x0[3 * e + 2];
    // Position prediction.
    if (prev < 0) {
      for (let i = 0; i < 3; i++) st.reset(i, rec.x0[3 * e + i], INITIAL_POSITION_VAR_M2);
    } else {
      const dt = t - prevTimeS;
      const staticPair = rec.isStatic[e] === 1 && prevStatic === 1;
      if (!staticPair) {
        const v0 = prevVelocity, v1 = 4 * e;
        if (Number.isFinite(v0[0]) && Number.isFinite(rec.velocity[v1]) && Math.abs(dt) <= 5) {
          const sig = Math.max(v0[3], rec.velocity[v1 + 3]);
          const q = ((Number.isFinite(sig) ? sig : 0.1) + 0.05) ** 2 * dt * dt;
          for (let i = 0; i < 3; i++) {
            // The mean of the two velocities times the interval (trapezoid rule) misses the displacement by up
            // to half the velocity change times the interval when the change is not uniform in the interval
            // (an antenna that starts or stops within it): that bound is added to the process noise per axis.
            const dv = 0.5 * (rec.velocity[v1 + i] - v0[i]) * dt;
            st.x[i] += 0.5 * (v0[i] + rec.velocity[v1 + i]) * dt;
            st.p[i * st.cap + i] += q + dv * dv;
          }
        } else {
          for (let i = 0; i < 3; i++) st.reset(i, rec.x0[3 * e + i], INITIAL_POSITION_VAR_M2);
        }
      }
    }
    // Drop ambiguity states of arcs not met for a while.
    for (const [arc, seen] of arcSeen) {
      if (Math.abs(t - seen) > DROP_AFTER_S) { const slot = arcSlot.get(arc)!; arcSlot.delete(arc); arcSeen.delete(arc); release(slot); }
    }
    const j0 = rec.satStart[e], j1 = j0 + rec.satCount[e];
    out.start(j1 - j0);
    if (iono) {
      // Random walk since the previous epoch; states not met for a while dropped; new ones at their prior.
      const dtS = prev < 0 ? 0 : Math.abs(t - prevTimeS);
      for (const [sat, slot] of ionoSlot) {
        if (Math.abs(t - ionoSeen.get(sat)!) > DROP_AFTER_S) { ionoSlot.delete(sat); ionoSeen.delete(sat); release(slot); continue; }
        st.p[slot * st.cap + slot] += iono.randomWalkM2PerS * dtS;
      }
      ionoNow.fill(-1);
      for (let j = j0; j < j1; j++) {
        const info = sats[rec.sat[j]];
        if (info.primary || rec.elevationRad[j] < maskRad) continue;
        let slot = ionoSlot.get(info.id);
        if (slot === undefined) {
          const sig = iono.verticalSigmaM * ionosphereObliquity(rec.elevationRad[j]);
          slot = st.allocate(0, sig * sig);
          ionoSlot.set(info.id, slot);
        }
        ionoSeen.set(info.id, t);
        ionoNow[satOfEntry[rec.sat[j]]] = slot;
      }
    }
    // Clocks: free every epoch, started at the median code difference of the constellation.
    const dx = st.x[0] - x0x, dy = st.x[1] - x0y, dz = st.x[2] - x0z;
    const geo = (j: number): number => -(rec.los[3 * j] * dx + rec.los[3 * j + 1] * dy + rec.los[3 * j + 2] * dz);
    for (const [sys, slot] of clockSlot) {
      samples.length = 0;
      for (let j = j0; j < j1; j++) if (clockOfEntry[rec.sat[j]] === slot && Number.isFinite(rec.codeM[j])) samples.push(rec.codeM[j] - geo(j));
      st.reset(slot, samples.length ? median(samples) : 0, CLOCK_VAR_M2);
      const ps = phaseClockSlot.get(sys)!;
      if (ps === slot) continue;
      samples.length = 0;
      for (let j = j0; j < j1; j++) {
        if (clockOfEntry[rec.sat[j]] !== slot || !Number.isFinite(rec.phaseM[j])) continue;
        const a = arcSlot.get(rec.arc[j]);
        if (a !== undefined) samples.push(rec.phaseM[j] - geo(j) - sats[rec.sat[j]].wavelengthM * st.x[a] + ionoTerm(j, st.x));
      }
      st.reset(ps, samples.length ? median(samples) : 0, CLOCK_VAR_M2);
    }
    let used = 0;
    usedSys.clear();
    // Code.
    for (let j = j0; j < j1; j++) {
      const el = rec.elevationRad[j];
      if (el < maskRad || !Number.isFinite(rec.codeM[j])) continue;
      const cs = clockOfEntry[rec.sat[j]];
      idx[0] = 0; idx[1] = 1; idx[2] = 2; idx[3] = cs;
      val[0] = -rec.los[3 * j]; val[1] = -rec.los[3 * j + 1]; val[2] = -rec.los[3 * j + 2]; val[3] = 1;
      let nh = 4;
      const io = ionoNow[satOfEntry[rec.sat[j]]];
      if (io >= 0) { idx[nh] = io; val[nh++] = sats[rec.sat[j]].ionoFactor; }
      const pred = -(rec.los[3 * j] * (st.x[0] - x0x) + rec.los[3 * j + 1] * (st.x[1] - x0y) + rec.los[3 * j + 2] * (st.x[2] - x0z)) + st.x[cs] + ionoTerm(j, st.x);
      const v = rec.codeM[j] - pred;
      const r = codeScale * varOf(opt.codeAM, opt.codeBM, el);
      const s = st.innovationVariance(idx, val, nh, r);
      if (v * v > 25 * s && prev >= 0) { codeOutliers++; continue; }
      st.update(idx, val, nh, v, r);
      // Satellites used and their constellations: counted on the primary band.
      if (!sats[rec.sat[j]].primary) continue;
      used++;
      usedSys.add(sats[rec.sat[j]].system);
    }
    // Phase. The normalised innovations of arcs already known are summed for the epoch's test.
    let nis = 0, nisDof = 0;
    for (let j = j0; j < j1; j++) {
      const el = rec.elevationRad[j];
      if (el < maskRad || !Number.isFinite(rec.phaseM[j])) continue;
      const info = sats[rec.sat[j]];
      const cs = phaseClockOfEntry[rec.sat[j]];
      const lam = info.wavelengthM;
      const arc = rec.arc[j];
      // Geometry less the ionosphere (which delays the code and advances the phase).
      const geoNow = -(rec.los[3 * j] * (st.x[0] - x0x) + rec.los[3 * j + 1] * (st.x[1] - x0y) + rec.los[3 * j + 2] * (st.x[2] - x0z)) - ionoTerm(j, st.x);
      let slot = arcSlot.get(arc);
      const n0 = (rec.phaseM[j] - geoNow - st.x[cs]) / lam;
      if (slot === undefined) {
        slot = st.allocate(n0, (AMBIGUITY_SIGMA_M / lam) ** 2);
        arcSlot.set(arc, slot);
      }
      arcSeen.set(arc, t);
      idx[0] = 0; idx[1] = 1; idx[2] = 2; idx[3] = cs; idx[4] = slot;
      val[0] = -rec.los[3 * j]; val[1] = -rec.los[3 * j + 1]; val[2] = -rec.los[3 * j + 2]; val[3] = 1; val[4] = lam;
      let nh = 5;
      const io = ionoNow[satOfEntry[rec.sat[j]]];
      if (io >= 0) { idx[nh] = io; val[nh++] = -info.ionoFactor; }
      const r = varOf(opt.phaseAM, opt.phaseBM, el);
      let v = rec.phaseM[j] - (geoNow + st.x[cs] + lam * st.x[slot]);
      const s = st.innovationVariance(idx, val, nh, r);
      if (v * v > 25 * s && st.p[slot * st.cap + slot] < 0.0625) {
        unflaggedSlips++;
        st.reset(slot, n0, (AMBIGUITY_SIGMA_M / lam) ** 2);
        for (const key of [...holdCount.keys()]) if (Math.floor(key / 67_108_864) === arc || key % 67_108_864 === arc) holdCount.delete(key);
        v = rec.phaseM[j] - (geoNow + st.x[cs] + lam * st.x[slot]);
      } else if (st.p[slot * st.cap + slot] < 0.0625) { nis += (v * v) / s; nisDof++; }
      st.update(idx, val, nh, v, r);
    }
    // Sequential innovations are independent: their normalised squares sum to a chi-square with one degree
    // of freedom each (the normalised innovation squared test, e.g. Bar-Shalom et al. 2001, 5.4). An epoch
    // that fails it at 0.1 % holds a disturbance the slip tests did not catch: no fix is tried in it.
    // Arc turnover: when more than half of the arcs start or end at once, the receiver's tracking was
    // disturbed as a whole (shock, power, a shaded sky) and the arcs that kept lock are suspect too.
    arcsNow.clear();
    for (let j = j0; j < j1; j++) if (rec.arc[j] > 0 && rec.elevationRad[j] >= maskRad) arcsNow.add(rec.arc[j]);
    let turnover = 0;
    for (const a of arcsNow) if (!arcsBefore.has(a)) turnover++;
    for (const a of arcsBefore) if (!arcsNow.has(a)) turnover++;
    const turned = arcsBefore.size > 0 && turnover > 0.5 * Math.max(arcsBefore.size, arcsNow.size);
    const spare = arcsBefore;
    arcsBefore = arcsNow;
    arcsNow = spare;
    const disturbed = turned || (nisDof > 0 && nis > chiSquareQuantile(0.999, nisDof));
    if (disturbed) disturbedEpochs++;
    out.satellitesUsed = used;
    if (used < 4 + usedSys.size) { remember(k, e); return; }
    // Float solution.
    const c = st.cap;
    out.kind = 1;
    out.position[0] = st.x[0]; out.position[1] = st.x[1]; out.position[2] = st.x[2];
    out.covariance[0] = st.p[0]; out.covariance[1] = st.p[1]; out.covariance[2] = st.p[2];
    out.covariance[3] = st.p[c + 1]; out.covariance[4] = st.p[c + 2]; out.covariance[5] = st.p[2 * c + 2];
    out.floatPosition.set(out.position);
    out.floatCovariance.set(out.covariance);
    if (!disturbed) fixEpoch(k, e);
    // Fixed: at the state conditioned on the integers (fixEpoch, before they were held); float: the filter's.
    writeResiduals(e, out.kind === 2 ? conditioned : st.x);
    remember(k, e);
  }

  /** Post-fit residuals of an epoch's entries at the state given by X (EpochResult.residualM). */
  function writeResiduals(e: number, xs: Float64Array): void {
    const j0 = rec.satStart[e], j1 = j0 + rec.satCount[e];
    const px = xs[0] - rec.x0[3 * e], py = xs[1] - rec.x0[3 * e + 1], pz = xs[2] - rec.x0[3 * e + 2];
    for (let j = j0; j < j1; j++) {
      if (rec.elevationRad[j] < maskRad) continue;
      const info = sats[rec.sat[j]];
      const geoNow = -(rec.los[3 * j] * px + rec.los[3 * j + 1] * py + rec.los[3 * j + 2] * pz);
      const slot = arcSlot.get(rec.arc[j]);
      const ionoM = ionoTerm(j, xs);
      if (Number.isFinite(rec.phaseM[j]) && slot !== undefined) {
        out.residualM[j - j0] = rec.phaseM[j] - (geoNow - ionoM + xs[phaseClockOfEntry[rec.sat[j]]] + info.wavelengthM * xs[slot]);
      } else if (Number.isFinite(rec.codeM[j])) {
        out.residualM[j - j0] = rec.codeM[j] - (geoNow + ionoM + xs[clockOfEntry[rec.sat[j]]]);
      }
    }
  }

  /** Double differences of the epoch's fixable arcs, LAMBDA with partial fixing, conditioning and hold. */
  function fixEpoch(k: number, e: number): void {
    const j0 = rec.satStart[e], j1 = j0 + rec.satCount[e];
    const bySys = new Map<string, { slot: number; arc: number; el: number; sat: number }[]>();
    for (let j = j0; j < j1; j++) {
      const info = sats[rec.sat[j]];
      if (!fixableSystems.has(info.system) || rec.fixable[j] !== 1 || !Number.isFinite(rec.phaseM[j]) || rec.elevationRad[j] < ambMask) continue;
      const slot = arcSlot.get(rec.arc[j]);
      if (slot === undefined) continue;
      let l = bySys.get(info.group);
      if (!l) bySys.set(info.group, (l = []));
      l.push({ slot, arc: rec.arc[j], el: rec.elevationRad[j], sat: rec.sat[j] });
    }
    const dd: { i: number; p: number; arcI: number; arcP: number; el: number; satI: number; satP: number }[] = [];
    for (const [sys, list] of bySys) {
      if (list.length < 2) continue;
      const prevPivot = pivots.get(sys);
      let piv = list.find((q) => q.arc === prevPivot);
      if (!piv) {
        piv = list[0];
        for (const q of list) if (q.el > piv.el) piv = q;
      }
      pivots.set(sys, piv.arc);
      for (const q of list) if (q !== piv) dd.push({ i: q.slot, p: piv.slot, arcI: q.arc, arcP: piv.arc, el: q.el, satI: q.sat, satP: piv.sat });
    }
    const m = dd.length;
    if (m < opt.minFixedAmbiguities) return;
    const x = st.x;
    // Scratch arrays of the pass, grown as needed (larger than needed: every reader indexes with m or ns).
    if (fixA.length < m) { fixA = new Float64Array(2 * m); fixD = new Float64Array(2 * m); fixQxa = [0, 1, 2].map(() => new Float64Array(2 * m)); fixRhs = [0, 1, 2].map(() => new Float64Array(2 * m)); }
    if (fixQ.length < m * m) { fixQ = new Float64Array(4 * m * m); fixQs = new Float64Array(4 * m * m); }
    const a = fixA, q = fixQ;
    for (let u = 0; u < m; u++) {
      a[u] = x[dd[u].i] - x[dd[u].p];
      for (let w = 0; w <= u; w++) {
        const v = st.cov(dd[u].i, dd[w].i) - st.cov(dd[u].i, dd[w].p) - st.cov(dd[u].p, dd[w].i) + st.cov(dd[u].p, dd[w].p);
        q[u * m + w] = v; q[w * m + u] = v;
      }
    }
    const order = dd.map((_, u) => u).sort((u, w) => dd[u].el - dd[w].el);
    const fix = fixAroundHeld(a, q, m, order, fixOptions) ?? fixPartially(a, q, m, order, fixOptions);
    out.ratio = fix.ratio;
    if (!('integers' in fix)) return;
    const sub = fix.indices;
    const ns = sub.length;
    const qs = fixQs;
    for (let u = 0; u < ns; u++) for (let w = 0; w < ns; w++) qs[u * ns + w] = q[sub[u] * m + sub[w]];
    const d = fixD;
    for (let u = 0; u < ns; u++) d[u] = a[sub[u]] - fix.integers[u];
    // Q_xa: covariance of position with the fixed double differences.
    const qxa = fixQxa;
    for (let r = 0; r < 3; r++) for (let u = 0; u < ns; u++) qxa[r][u] = st.cov(r, dd[sub[u]].i) - st.cov(r, dd[sub[u]].p);
    for (let r = 0; r < 3; r++) for (let u = 0; u < ns; u++) fixRhs[r][u] = qxa[r][u];
    const rhs = [d, fixRhs[0], fixRhs[1], fixRhs[2]];
    if (!choleskySolve(qs, ns, rhs)) return;
    for (let r = 0; r < 3; r++) {
      let s = 0;
      for (let u = 0; u < ns; u++) s += qxa[r][u] * rhs[0][u];
      out.position[r] = x[r] - s;
    }
    const cov = (r: number, s: number): number => {
      let t = 0;
      for (let u = 0; u < ns; u++) t += qxa[r][u] * rhs[1 + s][u];
      return st.cov(r, s) - t;
    };
    out.covariance[0] = cov(0, 0); out.covariance[1] = cov(0, 1); out.covariance[2] = cov(0, 2);
    out.covariance[3] = cov(1, 1); out.covariance[4] = cov(1, 2); out.covariance[5] = cov(2, 2);
    out.kind = 2;
    out.fixedAmbiguities = ns;
    onFix?.(k, sub.map((u, w) => ({ sat: sats[dd[u].satI].id, pivot: sats[dd[u].satP].id, signal: sats[dd[u].satI].phaseCode, cycles: fix.integers[w] })));
    // Residuals at the fixed solution (written by the caller): every state conditioned on the fixed integers,
    // x_s|a = x_s - Q_sa Q_a^-1 (a - z) (Teunissen 1995, eq. 2.8), rhs[0] holding Q_a^-1 (a - z).
    // Q_sa Q_a^-1 (a - z) for every slot s, summed over the fixed double differences in order.
    const nst = st.n;
    if (conditioned.length < nst) conditioned = new Float64Array(st.cap);
    conditioned.fill(0, 0, nst);
    for (let u = 0; u < ns; u++) st.addColumnDifference(conditioned, dd[sub[u]].i, dd[sub[u]].p, rhs[0][u]);
    for (let slot = 0; slot < nst; slot++) conditioned[slot] = x[slot] - conditioned[slot];
    // Fix-and-hold.
    holdSeen.clear();
    for (let u = 0; u < ns; u++) {
      const e = dd[sub[u]];
      const key = pairKey(e.arcI, e.arcP);
      holdSeen.add(key);
      let h = holdCount.get(key);
      const value = fix.integers[u];
      if (h && h.value === value) h.count++;
      else if (h) { h.value = value; h.count = 1; }
      else holdCount.set(key, (h = { value, count: 1 }));
      const count = h.count;
      if (count >= opt.holdAfterEpochs) {
        // Already held to well below the constraint's precision: nothing to add.
        const v2 = st.cov(e.i, e.i) - 2 * st.cov(e.i, e.p) + st.cov(e.p, e.p);
        const miss = value - (st.x[e.i] - st.x[e.p]);
        if (v2 < 10 * HOLD_VAR_CYCLES2 && Math.abs(miss) < 0.005) continue;
        holdIdx[0] = e.i; holdIdx[1] = e.p;
        st.update(holdIdx, holdVal, 2, miss, HOLD_VAR_CYCLES2);
      }
    }
    for (const key of holdCount.keys()) if (!holdSeen.has(key)) holdCount.delete(key);
  }
}
