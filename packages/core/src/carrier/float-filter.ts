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
 * Outliers: a code innovation beyond 5 sigma is not used. Phase innovations restart no arc and hold back
 * no fix: slips the receivers did not flag are found before the filter (arc-tracker.ts,
 * time-differenced-slips.ts). A test of a phase innovation against its variance cannot see a slip in a
 * group's first phase update of the epoch (that variance holds the free clock's); where it can, on the real
 * static run it failed on fractions of a cycle where nothing else found a slip, more often the older the
 * reference's phase carried to the rover's epoch, and on the base against the CORS the arcs it restarted
 * left the two passes' fixes disagreeing (1.6 % of the epochs fixed instead of 96.9 %). The innovations are
 * summed for the epoch's reported test only (EpochResult.chiSquare). No fix is tried in a disturbed epoch:
 * one in which more than half of the arcs start or end.
 *
 * Integer ambiguities: double differences per constellation against a pivot (the previous pivot while it
 * stays above the ambiguity mask, else the highest satellite), fixed with LAMBDA and the ratio test,
 * partially (lowest satellites left float first) down to a minimum number; the position is conditioned on
 * the fixed integers (Teunissen 1995, eq. 2.8). A double difference fixed to the same integer for
 * `holdAfterEpochs` epochs in a row is held: added as a measurement of 0.001 cycle precision, so the arc
 * keeps it (fix-and-hold within arcs).
 */
import { fixPartially } from '../ambiguity/index.js';
import type { CarrierOptions } from './options.js';
import type { EpochRecords } from './epoch-records.js';
import type { GnssSystem, SatId } from '../gnss/index.js';
import { ionosphereObliquity, type IonosphereWeighting } from './ionosphere-weighting.js';
import { keepShape } from './kept-shapes.js';
import {
  CAUSE_CONDITIONING_FAILED, CAUSE_DISTURBED, CAUSE_NONE, CAUSE_RATIO, CAUSE_SEARCH_FAILED, CAUSE_SUCCESS_RATE, CAUSE_TOO_FEW_AMBIGUITIES, CAUSE_TOO_FEW_SATELLITES,
} from './float-causes.js';

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
  /** Why the epoch is float or unsolved (float-causes.ts: CAUSE_*), with its two numbers (NaN when unused). */
  cause = CAUSE_NONE;
  causeA = NaN;
  causeB = NaN;
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
  /**
   * The epoch's test of its measurements against the filter's prediction: the sum of the squared
   * innovations of the measurements whose residuals are given (phase where used, else code), each over its
   * variance, and its degrees of freedom (those innovations less the states they started:
   * PassRunner.countInnovation). The same for float and fixed epochs: the integers are fixed after the
   * updates (their own test is the ratio). NaN and 0 without a solution.
   */
  chiSquare = NaN;
  dof = 0;

  constructor() {
    keepShape(this);
  }

  /** Clears the result for an epoch of `entries` record entries. */
  start(entries: number): void {
    this.kind = 0; this.ratio = NaN; this.fixedAmbiguities = 0; this.satellitesUsed = 0; this.chiSquare = NaN; this.dof = 0;
    this.cause = CAUSE_NONE; this.causeA = NaN; this.causeB = NaN;
    this.position.fill(NaN); this.covariance.fill(NaN); this.floatPosition.fill(NaN); this.floatCovariance.fill(NaN);
    if (this.residualM.length < entries) this.residualM = new Float32Array(2 * entries);
    this.residualM.fill(NaN, 0, entries);
  }
}

export interface PassCounts {
  readonly codeOutliers: number;
  /** Epochs in which more than half of the arcs started or ended (left float: arcTurnover). */
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
    keepShape(this);
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

  /**
   * Sequential scalar update with a sparse row h (slots idx, values val, nh of them), innovation v and
   * measurement variance r; returns the innovation variance h P h' + r (no update when it is not positive).
   */
  update(idx: Int32Array, val: Float64Array, nh: number, v: number, r: number): number {
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
    if (!(s > 0)) return s;
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
    return s;
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

/** The median of the first n values of v (sorted in place). */
function medianInPlace(v: Float64Array, n: number): number {
  const s = v.subarray(0, n).sort();
  const m = n >> 1;
  return n % 2 ? s[m] : 0.5 * (s[m - 1] + s[m]);
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

/** Takes each epoch's result of a pass as the epoch ends. */
export interface EpochConsumer {
  /**
   * Given each epoch's result as the epoch ends (the same object refilled for the next epoch: valid during
   * the call), with the epoch's records current (EpochRecords.visit).
   */
  epoch(k: number, result: EpochResult): void;
}

/** A pass of runPasses: its direction, its fixes' listener, and the consumer of its epochs' results. */
export interface PassSpec {
  readonly direction: 1 | -1;
  readonly onFix?: FixListener;
  readonly consumer: EpochConsumer;
}

/**
 * Runs the filter over the records once per pass given, forwards (direction 1) or backwards (-1), each from
 * a fresh state, in order, each handing its epochs' results to its consumer and its fixes to its onFix.
 *
 * The work is done by methods of a PassRunner, not by functions made anew for each call: the engine's
 * optimised code of a method serves every pass and every session of the process, where optimised code of
 * a per-call closure is bound to that call's objects and thrown away with them (so each session, and
 * sometimes each pass, had it compiled again).
 */
export function runPasses(rec: EpochRecords, setup: PassSetup, passes: readonly PassSpec[]): PassCounts[] {
  const runner = new PassRunner(rec, setup);
  const outputs: PassCounts[] = [];
  try {
    for (const pass of passes) outputs.push(runner.run(pass));
  } finally {
    // The runner is kept beyond the session (kept-shapes.ts): its state goes, whether the passes ended or failed.
    runner.dropPassState();
  }
  return outputs;
}

/** The filter of runPasses: what the passes share (signal table, clock slots, options), and the state of the current pass. */
class PassRunner {
  private readonly rec: EpochRecords;
  private readonly sats: readonly SatelliteInfo[];
  private readonly maskRad: number;
  /** Elevation mask of the fixable ambiguities (rad). */
  private readonly ambMask: number;
  private readonly fixableSystems: ReadonlySet<GnssSystem>;
  // The options used per epoch, read once: the objects handed in differ in shape from call to call
  // (spread), and reading them in the epoch loop made the optimised code start over at every new shape.
  private readonly codeAM: number;
  private readonly codeBM: number;
  private readonly phaseAM: number;
  private readonly phaseBM: number;
  private readonly minFixedAmbiguities: number;
  private readonly holdAfterEpochs: number;
  private readonly fixOptions: { ratioThreshold: number; minFixed: number; minSuccessRate: number };
  /** Code errors correlated over codeCorrelationTimeS: the variance of each epoch's code is scaled up by the number of epochs in a correlation time (options.ts). */
  private readonly codeScale: number;
  /** Code clock slot per group (SatelliteInfo.group), and phase clock slot (the code clock's for GLONASS). */
  private readonly clockSlot: Map<string, number>;
  private readonly phaseClockSlot: Map<string, number>;
  /** Slots of the position and clocks (the states every pass starts with). */
  private readonly fixedSlots: number;
  // Per entry of the signal table: its code and phase clock slots, and its satellite's index (the
  // ionosphere state is the satellite's, shared by its bands).
  private readonly clockOfEntry: Int32Array;
  private readonly phaseClockOfEntry: Int32Array;
  private readonly satOfEntry: Int32Array;
  /** Differential ionosphere per satellite with further bands (ionosphere-weighting.ts); null: neglected. */
  private readonly iono: IonosphereWeighting | null;

  // The state of a pass (set again at the start of each).
  private st: KalmanState;
  private onFix: FixListener | undefined = undefined;
  private readonly arcSlot = new Map<number, number>();
  private readonly arcSeen = new Map<number, number>();
  private readonly out = new EpochResult();
  private readonly pivots = new Map<string, number>();
  private readonly holdCount = new Map<number, { value: number; count: number }>();
  private readonly holdSeen = new Set<number>();
  /** Constellations of the satellites used in the current epoch. */
  private readonly usedSys = new Set<GnssSystem>();
  private codeOutliers = 0;
  private disturbedEpochs = 0;
  /** The current epoch's arcs started or ended, and the larger of the arcs before and after (arcTurnover). */
  private turnover = 0;
  private turnoverOf = 0;
  /** The previous epoch's index (-1 before the first), time, static flag and velocity (its chunk may be gone). */
  private prev = -1;
  private prevTimeS = NaN;
  private prevStatic = 0;
  private readonly prevVelocity = new Float64Array(4);
  // The sparse row of a measurement: slots and coefficients (position, clock, ambiguity, ionosphere).
  private readonly idx = new Int32Array(6);
  private readonly val = new Float64Array(6);
  private readonly holdIdx = new Int32Array(2);
  private readonly holdVal = Float64Array.of(1, -1);
  // The ionosphere states: their slots, when last met, and the states of the current epoch's satellites.
  private readonly ionoSlot = new Map<SatId, number>();
  private readonly ionoSeen = new Map<SatId, number>();
  /** The ionosphere state of each satellite (satOfEntry) at the current epoch; -1: none. */
  private readonly ionoNow: Int32Array;
  /** The state conditioned on the fixed integers (fixEpoch), by slot. */
  private conditioned = new Float64Array(0);
  // fixEpoch's scratch: double-difference ambiguities and covariance, the fixed subset's covariance and
  // misfit, the position's covariance with it and its copies solved in place.
  private fixA = new Float64Array(0);
  private fixD = new Float64Array(0);
  private fixQ = new Float64Array(0);
  private fixQs = new Float64Array(0);
  private fixQxa: Float64Array[] = [];
  private fixRhs: Float64Array[] = [];
  // Per-epoch scratch: the clock samples (a typed array: a plain one started each pass as an array of small
  // integers, and its first fraction changed its shape under the optimised code), the arcs of this epoch
  // and of the previous one.
  private samples = new Float64Array(64);
  private arcsNow = new Set<number>();
  private arcsBefore = new Set<number>();
  /** The epoch's innovation test (EpochResult.chiSquare): its sum, its innovations and the states they started. */
  private innovationChiSquare = 0;
  private innovationCount = 0;
  private startedStates = 0;
  /** Per clock slot: 1 once the epoch's phase has met it (updatePhase). */
  private readonly phaseClockMet: Uint8Array;

  constructor(rec: EpochRecords, setup: PassSetup) {
    const opt = setup.options;
    const sats = setup.satellites;
    this.rec = rec;
    this.sats = sats;
    this.maskRad = setup.elevationMaskRad;
    this.ambMask = opt.ambiguityMaskDeg * Math.PI / 180;
    this.fixableSystems = setup.fixableSystems;
    this.codeAM = opt.codeAM; this.codeBM = opt.codeBM; this.phaseAM = opt.phaseAM; this.phaseBM = opt.phaseBM;
    this.minFixedAmbiguities = opt.minFixedAmbiguities;
    this.holdAfterEpochs = opt.holdAfterEpochs;
    this.fixOptions = { ratioThreshold: opt.ratioThreshold, minFixed: opt.minFixedAmbiguities, minSuccessRate: opt.minSuccessRate };
    this.codeScale = codeVarianceScale(rec, opt);
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
    this.clockSlot = clockSlot;
    this.phaseClockSlot = phaseClockSlot;
    this.fixedSlots = 3 + systems.length + cdma.length;
    this.clockOfEntry = Int32Array.from(sats, (s) => clockSlot.get(s.group)!);
    this.phaseClockOfEntry = Int32Array.from(sats, (s) => phaseClockSlot.get(s.group)!);
    const satIds = [...new Set(sats.map((s) => s.id))];
    this.satOfEntry = Int32Array.from(sats, (s) => satIds.indexOf(s.id));
    this.iono = setup.ionosphere ?? null;
    this.ionoNow = new Int32Array(satIds.length).fill(-1);
    this.st = new KalmanState(this.fixedSlots);
    this.phaseClockMet = new Uint8Array(this.fixedSlots);
    keepShape(this);
  }

  /** Drops the last pass's state and scratch (the runner itself is kept: kept-shapes.ts). */
  dropPassState(): void {
    this.st = new KalmanState(0);
    this.onFix = undefined;
    this.arcSlot.clear(); this.arcSeen.clear(); this.pivots.clear(); this.holdCount.clear(); this.holdSeen.clear();
    this.ionoSlot.clear(); this.ionoSeen.clear();
    this.conditioned = new Float64Array(0);
    this.fixA = new Float64Array(0); this.fixD = new Float64Array(0); this.fixQ = new Float64Array(0); this.fixQs = new Float64Array(0);
    this.fixQxa = []; this.fixRhs = [];
  }

  /** One pass from a fresh state: its epochs' results to its consumer, its fixes to its onFix. */
  run(pass: PassSpec): PassCounts {
    const rec = this.rec;
    this.st = new KalmanState(this.fixedSlots);
    this.arcSlot.clear(); this.arcSeen.clear(); this.pivots.clear(); this.holdCount.clear();
    this.ionoSlot.clear(); this.ionoSeen.clear(); this.ionoNow.fill(-1);
    this.codeOutliers = 0; this.disturbedEpochs = 0;
    this.arcsBefore = new Set<number>(); this.arcsNow = new Set<number>();
    this.prev = -1; this.prevTimeS = NaN; this.prevStatic = 0; this.prevVelocity.fill(NaN);
    this.onFix = pass.onFix;
    // The epoch's work in a method of its own: called once per epoch, it is optimised like any function
    // (the epoch loop alone would wait for on-stack replacement, and start over at each deoptimisation).
    // The pass's consumer is called here, not in epochStep: each pass has its own, and a call inlined in
    // epochStep's optimised code would be deoptimised at every epoch of the next pass.
    const consumer = pass.consumer;
    const out = this.out;
    for (let n = 0; n < rec.count; n++) {
      const k = pass.direction === 1 ? n : rec.count - 1 - n;
      this.epochStep(k);
      consumer.epoch(k, out);
    }
    return { codeOutliers: this.codeOutliers, disturbedEpochs: this.disturbedEpochs };
  }

  /** Keeps what the next epoch's prediction needs of epoch k (record e). */
  private remember(k: number, e: number): void {
    const rec = this.rec;
    this.prev = k; this.prevTimeS = rec.timeGpsS[e]; this.prevStatic = rec.isStatic[e];
    for (let i = 0; i < 4; i++) this.prevVelocity[i] = rec.velocity[4 * e + i];
  }

  /** The ionosphere's part of entry j's single difference on the code (phase: minus it), at the state xs (by slot). */
  private ionoTerm(j: number, xs: Float64Array): number {
    const s = this.rec.sat[j];
    const io = this.ionoNow[this.satOfEntry[s]];
    return io < 0 ? 0 : this.sats[s].ionoFactor * xs[io];
  }

  /** Removes a state and renumbers the slots after it (KalmanState.remove). */
  private release(slot: number): void {
    this.st.remove(slot);
    for (const [key, s] of this.arcSlot) if (s > slot) this.arcSlot.set(key, s - 1);
    for (const [key, s] of this.ionoSlot) if (s > slot) this.ionoSlot.set(key, s - 1);
  }

  /** The geometric part of entry j's single difference for a position change (dx, dy, dz) from the linearisation point. */
  private geometry(j: number, dx: number, dy: number, dz: number): number {
    const los = this.rec.los;
    return -(los[3 * j] * dx + los[3 * j + 1] * dy + los[3 * j + 2] * dz);
  }

  /**
   * One epoch of the pass: prediction, clocks, code and phase updates, the epoch's test, float and fixed
   * solutions. In steps of their own: each is optimised on its own, so a deoptimisation in one (a branch met
   * for the first time) has only that step compiled again.
   */
  private epochStep(k: number): void {
    const rec = this.rec, st = this.st, out = this.out;
    const e = rec.visit(k);
    const t = rec.timeGpsS[e];
    this.innovationChiSquare = 0; this.innovationCount = 0; this.startedStates = 0;
    this.predictPosition(e, t);
    this.dropUnseenArcs(t);
    const j0 = rec.satStart[e], j1 = j0 + rec.satCount[e];
    out.start(j1 - j0);
    if (this.iono) this.predictIonosphere(e, t, j0, j1);
    this.startClocks(e, j0, j1);
    const used = this.updateCode(e, j0, j1);
    this.updatePhase(e, t, j0, j1);
    const disturbed = this.arcTurnover(j0, j1);
    if (disturbed) this.disturbedEpochs++;
    out.satellitesUsed = used;
    if (used < 4 + this.usedSys.size) {
      // Needed: as the test above, with one constellation at least when none was used (the words say 'need 5', not 4).
      out.cause = CAUSE_TOO_FEW_SATELLITES; out.causeA = used; out.causeB = 4 + Math.max(1, this.usedSys.size);
      this.remember(k, e);
      return;
    }
    // Float solution.
    const c = st.cap;
    out.kind = 1;
    out.chiSquare = this.innovationChiSquare;
    out.dof = Math.max(0, this.innovationCount - this.startedStates);
    out.position[0] = st.x[0]; out.position[1] = st.x[1]; out.position[2] = st.x[2];
    out.covariance[0] = st.p[0]; out.covariance[1] = st.p[1]; out.covariance[2] = st.p[2];
    out.covariance[3] = st.p[c + 1]; out.covariance[4] = st.p[c + 2]; out.covariance[5] = st.p[2 * c + 2];
    out.floatPosition.set(out.position);
    out.floatCovariance.set(out.covariance);
    if (!disturbed) this.fixEpoch(k, e);
    else { out.cause = CAUSE_DISTURBED; out.causeA = this.turnover; out.causeB = this.turnoverOf; }
    // Fixed: at the state conditioned on the integers (fixEpoch, before they were held); float: the filter's.
    this.writeResiduals(e, out.kind === 2 ? this.conditioned : st.x);
    this.remember(k, e);
  }

  /** Position prediction to epoch record e at time t (file comment: process model). */
  private predictPosition(e: number, t: number): void {
    const rec = this.rec, st = this.st;
    if (this.prev < 0) {
      for (let i = 0; i < 3; i++) st.reset(i, rec.x0[3 * e + i], INITIAL_POSITION_VAR_M2);
      this.startedStates += 3;
      return;
    }
    const dt = t - this.prevTimeS;
    const staticPair = rec.isStatic[e] === 1 && this.prevStatic === 1;
    if (staticPair) return;
    const v0 = this.prevVelocity, v1 = 4 * e;
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
      this.startedStates += 3;
    }
  }

  /** Drops the ambiguity states of arcs not met for a while. */
  private dropUnseenArcs(t: number): void {
    const arcSlot = this.arcSlot, arcSeen = this.arcSeen;
    for (const [arc, seen] of arcSeen) {
      if (Math.abs(t - seen) > DROP_AFTER_S) { const slot = arcSlot.get(arc)!; arcSlot.delete(arc); arcSeen.delete(arc); this.release(slot); }
    }
  }

  /**
   * The ionosphere states: a random walk since the previous epoch; states not met for a while dropped; new
   * ones at their prior; the states of the epoch's satellites (ionoNow).
   */
  private predictIonosphere(e: number, t: number, j0: number, j1: number): void {
    const rec = this.rec, sats = this.sats, st = this.st, iono = this.iono!;
    const ionoSlot = this.ionoSlot, ionoSeen = this.ionoSeen;
    const dtS = this.prev < 0 ? 0 : Math.abs(t - this.prevTimeS);
    for (const [sat, slot] of ionoSlot) {
      if (Math.abs(t - ionoSeen.get(sat)!) > DROP_AFTER_S) { ionoSlot.delete(sat); ionoSeen.delete(sat); this.release(slot); continue; }
      st.p[slot * st.cap + slot] += iono.randomWalkM2PerS * dtS;
    }
    this.ionoNow.fill(-1);
    for (let j = j0; j < j1; j++) {
      const info = sats[rec.sat[j]];
      if (info.primary || rec.elevationRad[j] < this.maskRad) continue;
      let slot = ionoSlot.get(info.id);
      if (slot === undefined) {
        const sig = iono.verticalSigmaM * ionosphereObliquity(rec.elevationRad[j]);
        slot = st.allocate(0, sig * sig);
        ionoSlot.set(info.id, slot);
      }
      ionoSeen.set(info.id, t);
      this.ionoNow[this.satOfEntry[rec.sat[j]]] = slot;
    }
  }

  /** Clocks: free every epoch, started at the median code (and phase) difference of their group. */
  private startClocks(e: number, j0: number, j1: number): void {
    const rec = this.rec, sats = this.sats, st = this.st, arcSlot = this.arcSlot;
    const dx = st.x[0] - rec.x0[3 * e], dy = st.x[1] - rec.x0[3 * e + 1], dz = st.x[2] - rec.x0[3 * e + 2];
    if (this.samples.length < j1 - j0) this.samples = new Float64Array(2 * (j1 - j0));
    const samples = this.samples, clockOfEntry = this.clockOfEntry;
    for (const [sys, slot] of this.clockSlot) {
      let ns = 0;
      for (let j = j0; j < j1; j++) if (clockOfEntry[rec.sat[j]] === slot && Number.isFinite(rec.codeM[j])) samples[ns++] = rec.codeM[j] - this.geometry(j, dx, dy, dz);
      st.reset(slot, ns ? medianInPlace(samples, ns) : 0, CLOCK_VAR_M2);
      const ps = this.phaseClockSlot.get(sys)!;
      if (ps === slot) continue;
      ns = 0;
      for (let j = j0; j < j1; j++) {
        if (clockOfEntry[rec.sat[j]] !== slot || !Number.isFinite(rec.phaseM[j])) continue;
        const a = arcSlot.get(rec.arc[j]);
        if (a !== undefined) samples[ns++] = rec.phaseM[j] - this.geometry(j, dx, dy, dz) - sats[rec.sat[j]].wavelengthM * st.x[a] + this.ionoTerm(j, st.x);
      }
      st.reset(ps, ns ? medianInPlace(samples, ns) : 0, CLOCK_VAR_M2);
    }
  }

  /** The code updates of the epoch's entries; returns the satellites used (their constellations: usedSys). */
  private updateCode(e: number, j0: number, j1: number): number {
    const rec = this.rec, sats = this.sats, st = this.st, idx = this.idx, val = this.val, maskRad = this.maskRad;
    const x0x = rec.x0[3 * e], x0y = rec.x0[3 * e + 1], x0z = rec.x0[3 * e + 2];
    const usedSys = this.usedSys, codeR = this.codeScale;
    let used = 0;
    usedSys.clear();
    for (let j = j0; j < j1; j++) {
      const el = rec.elevationRad[j];
      if (el < maskRad || !Number.isFinite(rec.codeM[j])) continue;
      const cs = this.clockOfEntry[rec.sat[j]];
      idx[0] = 0; idx[1] = 1; idx[2] = 2; idx[3] = cs;
      val[0] = -rec.los[3 * j]; val[1] = -rec.los[3 * j + 1]; val[2] = -rec.los[3 * j + 2]; val[3] = 1;
      let nh = 4;
      const io = this.ionoNow[this.satOfEntry[rec.sat[j]]];
      if (io >= 0) { idx[nh] = io; val[nh++] = sats[rec.sat[j]].ionoFactor; }
      const pred = -(rec.los[3 * j] * (st.x[0] - x0x) + rec.los[3 * j + 1] * (st.x[1] - x0y) + rec.los[3 * j + 2] * (st.x[2] - x0z)) + st.x[cs] + this.ionoTerm(j, st.x);
      const v = rec.codeM[j] - pred;
      const r = codeR * singleDifferenceVarianceM2(this.codeAM, this.codeBM, el);
      const s = st.innovationVariance(idx, val, nh, r);
      if (v * v > 25 * s && this.prev >= 0) { this.codeOutliers++; continue; }
      // The group's clock is started by its first update of the epoch (its variance still the prior's).
      const started = st.p[cs * st.cap + cs] === CLOCK_VAR_M2 ? 1 : 0;
      const sM2 = st.update(idx, val, nh, v, r);
      // Tested where the phase is not used, as the residuals are given (writeResiduals).
      if (!Number.isFinite(rec.phaseM[j])) this.countInnovation(v, sM2, started);
      // Satellites used and their constellations: counted on the primary band.
      if (!sats[rec.sat[j]].primary) continue;
      used++;
      usedSys.add(sats[rec.sat[j]].system);
    }
    return used;
  }

  /** The phase updates of the epoch's entries (new arcs get a state; file comment: phase innovations are not tested). */
  private updatePhase(e: number, t: number, j0: number, j1: number): void {
    const rec = this.rec, sats = this.sats, st = this.st, idx = this.idx, val = this.val, maskRad = this.maskRad;
    const arcSlot = this.arcSlot, arcSeen = this.arcSeen, phaseClockMet = this.phaseClockMet;
    const x0x = rec.x0[3 * e], x0y = rec.x0[3 * e + 1], x0z = rec.x0[3 * e + 2];
    phaseClockMet.fill(0);
    for (let j = j0; j < j1; j++) {
      const el = rec.elevationRad[j];
      if (el < maskRad || !Number.isFinite(rec.phaseM[j])) continue;
      const info = sats[rec.sat[j]];
      const cs = this.phaseClockOfEntry[rec.sat[j]];
      const lam = info.wavelengthM;
      const arc = rec.arc[j];
      // Geometry less the ionosphere (which delays the code and advances the phase).
      const geoNow = -(rec.los[3 * j] * (st.x[0] - x0x) + rec.los[3 * j + 1] * (st.x[1] - x0y) + rec.los[3 * j + 2] * (st.x[2] - x0z)) - this.ionoTerm(j, st.x);
      let slot = arcSlot.get(arc);
      // The group's first phase update of the epoch sets its phase clock (a CDMA group's own, free; a GLONASS
      // group's, the code clock, known only from the code, whose variance is scaled up: countInnovation).
      let started = phaseClockMet[cs] === 0 ? 1 : 0;
      phaseClockMet[cs] = 1;
      if (slot === undefined) {
        slot = st.allocate((rec.phaseM[j] - geoNow - st.x[cs]) / lam, (AMBIGUITY_SIGMA_M / lam) ** 2);
        arcSlot.set(arc, slot);
        started++;
      }
      arcSeen.set(arc, t);
      idx[0] = 0; idx[1] = 1; idx[2] = 2; idx[3] = cs; idx[4] = slot;
      val[0] = -rec.los[3 * j]; val[1] = -rec.los[3 * j + 1]; val[2] = -rec.los[3 * j + 2]; val[3] = 1; val[4] = lam;
      let nh = 5;
      const io = this.ionoNow[this.satOfEntry[rec.sat[j]]];
      if (io >= 0) { idx[nh] = io; val[nh++] = -info.ionoFactor; }
      const r = singleDifferenceVarianceM2(this.phaseAM, this.phaseBM, el);
      const v = rec.phaseM[j] - (geoNow + st.x[cs] + lam * st.x[slot]);
      this.countInnovation(v, st.update(idx, val, nh, v, r), started);
    }
  }

  /**
   * Adds an update's innovation v (m) of variance sM2 to the epoch's test, with the number of states it
   * started (a clock at its first update of the epoch, a new arc's ambiguity). Sequential innovations are
   * independent, so the sum of v^2 / s over the epoch, or over any set of its innovations chosen before
   * seeing them, is chi-square distributed with one degree of freedom per innovation when the filter's model
   * and variances hold (the local overall model test, Teunissen & Salzmann 1989, A recursive slippage test
   * for use in state-space filtering, Manuscripta Geodaetica 14; the normalised innovation squared,
   * Bar-Shalom et al. 2001, 5.4). A state started in the epoch, from a prior far wider than its
   * measurements (clock 100 m, ambiguity 5 m, position 10 m), takes one degree of freedom and adds next to
   * nothing to the sum (the limit of a diffuse prior). The code of satellites whose phase is used is not
   * tested: its variance is scaled up for its correlation in time (codeVarianceScale), so against one
   * epoch's prediction it would add far less than one per degree of freedom.
   */
  private countInnovation(v: number, sM2: number, started: number): void {
    if (!(sM2 > 0)) return;
    this.innovationChiSquare += (v * v) / sM2;
    this.innovationCount++;
    this.startedStates += started;
  }

  /**
   * Arc turnover: when more than half of the arcs start or end at once, the receiver's tracking was
   * disturbed as a whole (shock, power, a shaded sky) and the arcs that kept lock are suspect too.
   */
  private arcTurnover(j0: number, j1: number): boolean {
    const rec = this.rec, arcsNow = this.arcsNow, arcsBefore = this.arcsBefore;
    arcsNow.clear();
    for (let j = j0; j < j1; j++) if (rec.arc[j] > 0 && rec.elevationRad[j] >= this.maskRad) arcsNow.add(rec.arc[j]);
    let turnover = 0;
    for (const a of arcsNow) if (!arcsBefore.has(a)) turnover++;
    for (const a of arcsBefore) if (!arcsNow.has(a)) turnover++;
    const turned = arcsBefore.size > 0 && turnover > 0.5 * Math.max(arcsBefore.size, arcsNow.size);
    this.turnover = turnover;
    this.turnoverOf = Math.max(arcsBefore.size, arcsNow.size);
    this.arcsBefore = arcsNow;
    this.arcsNow = arcsBefore;
    return turned;
  }

  /** Post-fit residuals of an epoch's entries at the state given by X (EpochResult.residualM). */
  private writeResiduals(e: number, xs: Float64Array): void {
    const rec = this.rec, out = this.out;
    const j0 = rec.satStart[e], j1 = j0 + rec.satCount[e];
    const px = xs[0] - rec.x0[3 * e], py = xs[1] - rec.x0[3 * e + 1], pz = xs[2] - rec.x0[3 * e + 2];
    for (let j = j0; j < j1; j++) {
      if (rec.elevationRad[j] < this.maskRad) continue;
      const info = this.sats[rec.sat[j]];
      const geoNow = -(rec.los[3 * j] * px + rec.los[3 * j + 1] * py + rec.los[3 * j + 2] * pz);
      const slot = this.arcSlot.get(rec.arc[j]);
      const ionoM = this.ionoTerm(j, xs);
      if (Number.isFinite(rec.phaseM[j]) && slot !== undefined) {
        out.residualM[j - j0] = rec.phaseM[j] - (geoNow - ionoM + xs[this.phaseClockOfEntry[rec.sat[j]]] + info.wavelengthM * xs[slot]);
      } else if (Number.isFinite(rec.codeM[j])) {
        out.residualM[j - j0] = rec.codeM[j] - (geoNow + ionoM + xs[this.clockOfEntry[rec.sat[j]]]);
      }
    }
  }

  /** Double differences of the epoch's fixable arcs, LAMBDA with partial fixing, conditioning and hold. */
  private fixEpoch(k: number, e: number): void {
    const st = this.st, out = this.out;
    const dd = this.doubleDifferences(e);
    const m = dd.length;
    if (m < this.minFixedAmbiguities) { out.cause = CAUSE_TOO_FEW_AMBIGUITIES; out.causeA = m; out.causeB = this.minFixedAmbiguities; return; }
    const x = st.x;
    // Scratch arrays of the pass, grown as needed (larger than needed: every reader indexes with m or ns).
    if (this.fixA.length < m) {
      this.fixA = new Float64Array(2 * m); this.fixD = new Float64Array(2 * m);
      this.fixQxa = [new Float64Array(2 * m), new Float64Array(2 * m), new Float64Array(2 * m)];
      this.fixRhs = [new Float64Array(2 * m), new Float64Array(2 * m), new Float64Array(2 * m)];
    }
    if (this.fixQ.length < m * m) { this.fixQ = new Float64Array(4 * m * m); this.fixQs = new Float64Array(4 * m * m); }
    const a = this.fixA, q = this.fixQ;
    for (let u = 0; u < m; u++) {
      a[u] = x[dd[u].i] - x[dd[u].p];
      for (let w = 0; w <= u; w++) {
        const v = st.cov(dd[u].i, dd[w].i) - st.cov(dd[u].i, dd[w].p) - st.cov(dd[u].p, dd[w].i) + st.cov(dd[u].p, dd[w].p);
        q[u * m + w] = v; q[w * m + u] = v;
      }
    }
    // Lowest first (the order in which partial fixing leaves ambiguities float). Built with push: an array
    // of one shape for the sort call (an array from map had a shape the optimised code did not expect).
    const order: number[] = [];
    for (let u = 0; u < m; u++) order.push(u);
    order.sort((u, w) => dd[u].el - dd[w].el);
    const fixOptions = this.fixOptions;
    const fix = fixAroundHeld(a, q, m, order, fixOptions) ?? fixPartially(a, q, m, order, fixOptions);
    out.ratio = fix.ratio;
    if (!('integers' in fix)) {
      // fixPartially gives the best ratio of the subsets tried: one at or above the threshold was refused for its success rate.
      out.cause = Number.isNaN(fix.ratio) ? CAUSE_SEARCH_FAILED : fix.ratio >= fixOptions.ratioThreshold ? CAUSE_SUCCESS_RATE : CAUSE_RATIO;
      out.causeA = fix.ratio;
      return;
    }
    this.conditionOnFixed(k, dd, m, fix.indices, fix.integers);
  }

  /**
   * The epoch's solution conditioned on the integers fixed for the double differences `sub` (indices into
   * dd, of which m were searched): position and covariance (Teunissen 1995, eq. 2.8), the conditioned state
   * for the residuals, and the hold.
   */
  private conditionOnFixed(k: number, dd: readonly DoubleDifference[], m: number, sub: readonly number[], integers: Float64Array): void {
    const sats = this.sats, st = this.st, out = this.out, x = st.x, a = this.fixA, q = this.fixQ;
    const ns = sub.length;
    const qs = this.fixQs;
    for (let u = 0; u < ns; u++) for (let w = 0; w < ns; w++) qs[u * ns + w] = q[sub[u] * m + sub[w]];
    const d = this.fixD;
    for (let u = 0; u < ns; u++) d[u] = a[sub[u]] - integers[u];
    // Q_xa: covariance of position with the fixed double differences.
    const qxa = this.fixQxa, fixRhs = this.fixRhs;
    for (let r = 0; r < 3; r++) for (let u = 0; u < ns; u++) qxa[r][u] = st.cov(r, dd[sub[u]].i) - st.cov(r, dd[sub[u]].p);
    for (let r = 0; r < 3; r++) for (let u = 0; u < ns; u++) fixRhs[r][u] = qxa[r][u];
    const rhs = [d, fixRhs[0], fixRhs[1], fixRhs[2]];
    if (!choleskySolve(qs, ns, rhs)) { out.cause = CAUSE_CONDITIONING_FAILED; return; }
    for (let r = 0; r < 3; r++) {
      let s = 0;
      for (let u = 0; u < ns; u++) s += qxa[r][u] * rhs[0][u];
      out.position[r] = x[r] - s;
    }
    out.covariance[0] = conditionedCovariance(st, qxa, rhs, ns, 0, 0); out.covariance[1] = conditionedCovariance(st, qxa, rhs, ns, 0, 1);
    out.covariance[2] = conditionedCovariance(st, qxa, rhs, ns, 0, 2); out.covariance[3] = conditionedCovariance(st, qxa, rhs, ns, 1, 1);
    out.covariance[4] = conditionedCovariance(st, qxa, rhs, ns, 1, 2); out.covariance[5] = conditionedCovariance(st, qxa, rhs, ns, 2, 2);
    out.kind = 2;
    out.fixedAmbiguities = ns;
    const onFix = this.onFix;
    if (onFix) onFix(k, sub.map((u, w) => ({ sat: sats[dd[u].satI].id, pivot: sats[dd[u].satP].id, signal: sats[dd[u].satI].phaseCode, cycles: integers[w] })));
    // Residuals at the fixed solution (written by the caller): every state conditioned on the fixed integers,
    // x_s|a = x_s - Q_sa Q_a^-1 (a - z) (Teunissen 1995, eq. 2.8), rhs[0] holding Q_a^-1 (a - z).
    // Q_sa Q_a^-1 (a - z) for every slot s, summed over the fixed double differences in order.
    const nst = st.n;
    if (this.conditioned.length < nst) this.conditioned = new Float64Array(st.cap);
    const conditioned = this.conditioned;
    conditioned.fill(0, 0, nst);
    for (let u = 0; u < ns; u++) st.addColumnDifference(conditioned, dd[sub[u]].i, dd[sub[u]].p, rhs[0][u]);
    for (let slot = 0; slot < nst; slot++) conditioned[slot] = x[slot] - conditioned[slot];
    this.hold(dd, sub, integers);
  }

  /** Double differences of the ambiguities of epoch record e's fixable arcs, per clock group against a pivot (file comment). */
  private doubleDifferences(e: number): DoubleDifference[] {
    const rec = this.rec, sats = this.sats;
    const j0 = rec.satStart[e], j1 = j0 + rec.satCount[e];
    const bySys = new Map<string, FixableArc[]>();
    for (let j = j0; j < j1; j++) {
      const info = sats[rec.sat[j]];
      if (!this.fixableSystems.has(info.system) || rec.fixable[j] !== 1 || !Number.isFinite(rec.phaseM[j]) || rec.elevationRad[j] < this.ambMask) continue;
      const slot = this.arcSlot.get(rec.arc[j]);
      if (slot === undefined) continue;
      let l = bySys.get(info.group);
      if (!l) bySys.set(info.group, (l = []));
      l.push({ slot, arc: rec.arc[j], el: rec.elevationRad[j], sat: rec.sat[j] });
    }
    const dd: DoubleDifference[] = [];
    for (const [sys, list] of bySys) {
      if (list.length < 2) continue;
      // -1 when none: arcs are numbered from 1 (and the comparison below stays one of small integers).
      const prevPivot = this.pivots.get(sys) ?? -1;
      let piv: FixableArc | undefined;
      for (const q of list) if (q.arc === prevPivot) { piv = q; break; }
      if (!piv) {
        piv = list[0];
        for (const q of list) if (q.el > piv.el) piv = q;
      }
      this.pivots.set(sys, piv.arc);
      for (const q of list) if (q !== piv) dd.push({ i: q.slot, p: piv.slot, arcI: q.arc, arcP: piv.arc, el: q.el, satI: q.sat, satP: piv.sat });
    }
    return dd;
  }

  /**
   * Fix-and-hold: a double difference fixed to the same integer for holdAfterEpochs epochs in a row is
   * added as a measurement of HOLD_VAR_CYCLES2 (unless the filter already holds it that well).
   */
  private hold(dd: readonly DoubleDifference[], sub: readonly number[], integers: Float64Array): void {
    const st = this.st, holdCount = this.holdCount, holdSeen = this.holdSeen;
    holdSeen.clear();
    for (let u = 0; u < sub.length; u++) {
      const e = dd[sub[u]];
      const key = pairKey(e.arcI, e.arcP);
      holdSeen.add(key);
      let h = holdCount.get(key);
      const value = integers[u];
      if (h && h.value === value) h.count++;
      else if (h) { h.value = value; h.count = 1; }
      else holdCount.set(key, (h = { value, count: 1 }));
      const count = h.count;
      if (count >= this.holdAfterEpochs) {
        // Already held to well below the constraint's precision: nothing to add.
        const v2 = st.cov(e.i, e.i) - 2 * st.cov(e.i, e.p) + st.cov(e.p, e.p);
        const miss = value - (st.x[e.i] - st.x[e.p]);
        if (v2 < 10 * HOLD_VAR_CYCLES2 && Math.abs(miss) < 0.005) continue;
        this.holdIdx[0] = e.i; this.holdIdx[1] = e.p;
        st.update(this.holdIdx, this.holdVal, 2, miss, HOLD_VAR_CYCLES2);
      }
    }
    for (const key of holdCount.keys()) if (!holdSeen.has(key)) holdCount.delete(key);
  }
}

/** An arc of the epoch that may be fixed: its ambiguity's slot, arc number, elevation and signal table entry. */
interface FixableArc {
  readonly slot: number;
  readonly arc: number;
  readonly el: number;
  readonly sat: number;
}

/** A double difference of two arcs' ambiguities (slots i - p), with the arcs, the satellite's elevation and the entries. */
interface DoubleDifference {
  readonly i: number;
  readonly p: number;
  readonly arcI: number;
  readonly arcP: number;
  readonly el: number;
  readonly satI: number;
  readonly satP: number;
}

/**
 * Position covariance (r, s) conditioned on the fixed double differences: Q_rs - Q_ra Q_a^-1 Q_as, with
 * rhs[1 + s] holding Q_a^-1 Q_as (Teunissen 1995, eq. 2.8).
 */
function conditionedCovariance(st: KalmanState, qxa: readonly Float64Array[], rhs: readonly Float64Array[], ns: number, r: number, s: number): number {
  let t = 0;
  for (let u = 0; u < ns; u++) t += qxa[r][u] * rhs[1 + s][u];
  return st.cov(r, s) - t;
}
