/**
 * Reference-receiver phase and code, reduced by the modelled range at the reference antenna and kept
 * over a short window, then aligned to a rover epoch's estimated GPS time.
 *
 * At reference epoch k and satellite s: z_k = lambda Phi - rho(t_k) + c dt^s - T (phase) and
 * P - rho + c dt^s - T (code), with rho the range to the broadcast satellite at transmission from the
 * known antenna position at the epoch's estimated GPS time. What is left is c dt_ref(t_k) + lambda N
 * plus errors that change slowly, so z can be carried to the rover's time:
 *  - between the bracketing epochs (k0 <= t < k1) by linear interpolation, with one pair of epochs and one
 *    weight for every satellite of the rover epoch (so the reference clock, interpolated alike for all,
 *    cancels between satellites), when the pair is at most 2 nominal intervals apart and the satellite has
 *    the same arc at both (never across a slip or a gap in the reference's logging);
 *  - otherwise from the nearest single epoch within `maxAgeS`, again common to all satellites, across a gap
 *    in the reference's logging; before its first epoch and after its last, within one logging interval.
 * Between satellites (double differences) the reference clock cancels exactly either way; the error left
 * is the change over the interval of the orbit, satellite-clock and atmospheric errors: millimetres for a
 * few seconds.
 */
import type { GeodeticRad, SatId } from '../gnss/index.js';
import type { Ephemeris } from '../gnss/index.js';
import type { ReceiverEpoch } from './receiver-epoch.js';
import { azimuthElevation } from '../geodesy/index.js';
import { dayOfYear, troposphereDelayM } from '../observables/index.js';
import type { EcefM } from '../gnss/index.js';
import { keepShape } from './kept-shapes.js';

/** z values of a signal on a further band (further-bands.ts): its code and phase, arc and half-cycle state. */
export interface ReferenceSignal {
  readonly band: string;
  readonly code: string;
  readonly phaseM: number;
  readonly codeM: number;
  readonly arc: number;
  readonly halfCycle: boolean;
}

export interface ReferenceSat {
  readonly phaseM: number;
  readonly codeM: number;
  readonly arc: number;
  readonly halfCycle: boolean;
  readonly elevationRad: number;
  readonly eph: Ephemeris;
  /** Signals on further bands (none unless asked for). */
  readonly more?: readonly ReferenceSignal[];
}

/** Arcs of one further band's signals at the reference (arc-tracker.ts). */
export interface BandArcs {
  readonly arcs: ReadonlyMap<SatId, number>;
  readonly halfCycle: (sat: SatId) => boolean;
}

export interface ReferencePhaseEpoch {
  readonly timeGpsS: number;
  readonly sats: ReadonlyMap<SatId, ReferenceSat>;
}

export interface AlignedReferenceSat {
  readonly phaseM: number;
  readonly codeM: number;
  readonly arc: number;
  readonly halfCycle: boolean;
  readonly elevationRad: number;
  readonly eph: Ephemeris;
  readonly more?: readonly ReferenceSignal[];
}

export interface AlignedReference {
  readonly sats: Map<SatId, AlignedReferenceSat>;
  /** Largest distance in time to a reference epoch used (s). */
  readonly ageS: number;
  readonly interpolated: boolean;
  /** Times of the reference epochs used: the bracketing pair, or the nearest epoch twice. */
  readonly fromGpsS: number;
  readonly toGpsS: number;
}

/** z values of one prepared reference epoch (see the file comment). */
export function reduceReferenceEpoch(ep: ReceiverEpoch, arpM: EcefM, geodetic: GeodeticRad, arcs: ReadonlyMap<SatId, number>, halfCycle: (sat: SatId) => boolean, codeClockStepsM = 0, further?: ReadonlyMap<string, BandArcs>): ReferencePhaseEpoch {
  const sats = new Map<SatId, ReferenceSat>();
  const doy = dayOfYear(ep.tagGpsS);
  for (const s of ep.sats) {
    const ae = azimuthElevation(arpM, s.posM, geodetic.latRad, geodetic.lonRad);
    if (ae.elevationRad < 0) continue;
    const rho = Math.hypot(s.posM.x - arpM.x, s.posM.y - arpM.y, s.posM.z - arpM.z);
    const t = troposphereDelayM(geodetic, ae.elevationRad, doy);
    const model = rho - s.satClockM + t;
    const arc = arcs.get(s.sat) ?? 0;
    const more: ReferenceSignal[] = s.more.length ? [] : NO_REFERENCE_SIGNALS;
    for (const m of s.more) {
      const b = further?.get(m.band);
      const a = b?.arcs.get(s.sat) ?? 0;
      more.push({ band: m.band, code: m.code, phaseM: a > 0 ? m.phaseCycles * m.wavelengthM + codeClockStepsM - model : NaN, codeM: m.codeM - model, arc: a, halfCycle: b ? b.halfCycle(s.sat) : false });
    }
    sats.set(s.sat, {
      // The code clock's steps added to the phase: one receiver clock for both (arc-tracker.ts).
      phaseM: arc > 0 ? s.phaseCycles * s.wavelengthM + codeClockStepsM - model : NaN,
      codeM: s.codeM - model,
      arc, halfCycle: halfCycle(s.sat), elevationRad: ae.elevationRad, eph: s.eph, more,
    });
  }
  return { timeGpsS: ep.timeGpsS, sats };
}

const NO_REFERENCE_SIGNALS: ReferenceSignal[] = [];

/** Further-band signals of two bracketing epochs carried to weight w: the same band and code at both, phase within one arc. */
function interpolateSignals(a: readonly ReferenceSignal[], b: readonly ReferenceSignal[], w: number): ReferenceSignal[] {
  const out: ReferenceSignal[] = [];
  for (const x of a) {
    const y = b.find((q) => q.band === x.band && q.code === x.code);
    if (!y) continue;
    const sameArc = x.arc > 0 && x.arc === y.arc;
    out.push({
      band: x.band, code: x.code, phaseM: sameArc ? x.phaseM + w * (y.phaseM - x.phaseM) : NaN,
      codeM: x.codeM + w * (y.codeM - x.codeM), arc: sameArc ? x.arc : 0, halfCycle: x.halfCycle || y.halfCycle,
    });
  }
  return out;
}

export class ReferencePhaseBuffer {
  private readonly epochs: ReferencePhaseEpoch[] = [];
  /** Smallest spacing of reference epochs seen (s): the nominal logging interval. */
  private nominalS = Infinity;

  constructor(private readonly maxAgeS: number, headerIntervalS: number | null) {
    if (headerIntervalS && headerIntervalS > 0) this.nominalS = headerIntervalS;
    keepShape(this);
  }

  get latestTimeGpsS(): number {
    return this.epochs.length ? this.epochs[this.epochs.length - 1].timeGpsS : -Infinity;
  }

  add(e: ReferencePhaseEpoch): void {
    const last = this.epochs[this.epochs.length - 1];
    if (last) {
      const d = e.timeGpsS - last.timeGpsS;
      if (!(d > 1e-3)) return;
      if (d < this.nominalS) this.nominalS = Math.max(0.05, d);
    }
    this.epochs.push(e);
  }

  /** Drops epochs that can no longer serve a rover epoch at or after t (keeps one before the window). */
  prune(tGpsS: number): void {
    let drop = 0;
    while (drop + 1 < this.epochs.length && this.epochs[drop + 1].timeGpsS < tGpsS - this.maxAgeS) drop++;
    if (drop > 0) this.epochs.splice(0, drop);
  }

  /** The reference carried to a rover time; `further`: with the signals of further bands (when the rover has some). */
  align(tGpsS: number, further = true): AlignedReference | null {
    let i1 = this.epochs.findIndex((e) => e.timeGpsS > tGpsS + 1e-4);
    if (i1 < 0) i1 = this.epochs.length;
    const e0 = i1 > 0 ? this.epochs[i1 - 1] : null;
    const e1 = i1 < this.epochs.length ? this.epochs[i1] : null;
    const sats = new Map<SatId, AlignedReferenceSat>();
    if (e0 && e1 && e1.timeGpsS - e0.timeGpsS <= 2 * this.nominalS + 1e-3) {
      const w = (tGpsS - e0.timeGpsS) / (e1.timeGpsS - e0.timeGpsS);
      for (const [sat, a] of e0.sats) {
        const b = e1.sats.get(sat);
        if (!b || b.eph !== a.eph) continue;
        const sameArc = a.arc > 0 && a.arc === b.arc;
        const more = further && a.more?.length && b.more?.length ? interpolateSignals(a.more, b.more, w) : NO_REFERENCE_SIGNALS;
        sats.set(sat, {
          phaseM: sameArc ? a.phaseM + w * (b.phaseM - a.phaseM) : NaN,
          codeM: a.codeM + w * (b.codeM - a.codeM),
          arc: sameArc ? a.arc : 0, halfCycle: a.halfCycle || b.halfCycle,
          elevationRad: a.elevationRad + w * (b.elevationRad - a.elevationRad), eph: a.eph, more,
        });
      }
      return { sats, ageS: Math.max(tGpsS - e0.timeGpsS, e1.timeGpsS - tGpsS), interpolated: true, fromGpsS: e0.timeGpsS, toGpsS: e1.timeGpsS };
    }
    const d0 = e0 ? tGpsS - e0.timeGpsS : Infinity;
    const d1 = e1 ? e1.timeGpsS - tGpsS : Infinity;
    const near = d0 <= d1 ? e0 : e1;
    const age = Math.min(d0, d1);
    if (!near || age > this.maxAgeS) return null;
    // Held values bridge a gap in the reference's logging (an epoch on each side). Before its first epoch
    // or after its last (the caller reads the reference until an epoch beyond the rover's time or its
    // end: no later epoch means the data ended) there is no gap to bridge: a rover epoch there is not
    // given values older than one logging interval. A pass starting there would begin its ambiguities on
    // the oldest values carried, whose change over the age the phase variance does not hold.
    // (A logging interval not known yet, no INTERVAL in the header and one epoch read: none.)
    if ((e0 === null || e1 === null) && age > (Number.isFinite(this.nominalS) ? this.nominalS : 0) + 1e-3) return null;
    for (const [sat, a] of near.sats) sats.set(sat, a);
    return { sats, ageS: age, interpolated: false, fromGpsS: near.timeGpsS, toGpsS: near.timeGpsS };
  }
}
