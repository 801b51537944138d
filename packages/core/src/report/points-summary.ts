/**
 * Per-point results of a session: the epochs of each occupation (points/occupations.ts) summarised by
 * points/summarise-point.ts (Huber robust mean, scatter, effective number of epochs, precision of the
 * mean with time correlation), with the occupation's own antenna height applied when one was given.
 *
 * Epoch choice: the differential and smoothed epochs of the occupation; only when it has none, its
 * standalone epochs (never a mix: standalone positions are metres off and in the broadcast frame).
 * An epoch belongs to an occupation when its tag is within [start - 0.01 s, end + 0.01 s] (receiver tags
 * are a few ms off GPS time: data README; our tolerance).
 *
 * Antenna height of an occupation (windows CSV antenna_height_m, vertical or slant): the session's
 * position is taken back to the antenna reference point with the height it used (EpochSolution
 * antennaHeightM, along the ellipsoidal normal) and then down to the mark with the occupation's height
 * (points/antenna-height.ts: verticalHeightToArpM, reduceToMark).
 *
 * Tolerance flag (our choice, documented in the outputs): 'too-few-epochs' below minEpochs (10);
 * 'exceeds-horizontal' when the horizontal per-epoch scatter sqrt(sd_e^2 + sd_n^2) is above the
 * horizontal tolerance (default 1.0 m), 'exceeds-vertical' when sd_u is above the vertical tolerance
 * (default 2.0 m), 'exceeds-horizontal-and-vertical' for both; else 'ok'. Defaults as control/compare-to-mark.ts.
 */
import type { EcefM, EnuM, FrameEpoch } from '../gnss/index.js';
import type { PointReference, SolutionKind } from '../session/index.js';
import { ecefToGeodetic, enuToEcefDelta } from '../geodesy/index.js';
import {
  reduceToMark, summarisePoint, verticalHeightToArpM, WINDOW_TAG_TOLERANCE_S,
  type AntennaGeometry, type HeightKind, type Occupation, type PointSummary, type ReferenceSigma,
} from '../points/index.js';

/** What the points stage keeps of one epoch solution. */
export interface PointEpoch {
  /** Epoch tag (receiver time), GPS seconds. */
  readonly tagGpsS: number;
  /** Position as the session reported it (see pointReference). */
  readonly ecef: EcefM;
  readonly kind: SolutionKind;
  /** Baseline length of the epoch (m), when it is relative to a reference. */
  readonly baselineM?: number;
  /** Frame of this epoch's position (standalone epochs are in the broadcast-orbit frame). */
  readonly frame?: FrameEpoch;
  /** Formal precision of the epoch (sigma E/N/U), when the solution gave it. */
  readonly sigmaEnuM?: EnuM;
  readonly varianceFactor?: number;
  readonly pdop: number;
  /** Antenna height the session used for this epoch (m). */
  readonly antennaHeightM: number;
}

export type PointToleranceFlag = 'ok' | 'too-few-epochs' | 'exceeds-horizontal' | 'exceeds-vertical' | 'exceeds-horizontal-and-vertical';

export interface PointsOptions {
  /** What the session's positions refer to. */
  readonly pointReference: PointReference;
  readonly frame: FrameEpoch;
  readonly horizontalToleranceM?: number;
  readonly verticalToleranceM?: number;
  readonly minEpochs?: number;
  /** Needed for slant heights. */
  readonly antenna?: AntennaGeometry;
  /** The reference coordinate's own uncertainty, added to each point's stated precision. */
  readonly referenceSigma?: ReferenceSigma;
}

/**
 * The smallest precision stated for a point from carrier-phase epochs: what their scatter cannot show
 * (antenna phase centres, phase multipath, the differential troposphere) is covered by the usual
 * precision statement of carrier-phase receivers, 8 mm + 1 ppm horizontal and 15 mm + 1 ppm vertical
 * (common practice), with the baseline length of the epochs (median).
 */
export function carrierPointFloor(epochs: readonly { readonly baselineM?: number }[]): { horizontalM: number; verticalM: number } {
  const lengths = epochs.map((e) => e.baselineM ?? NaN).filter(Number.isFinite).sort((a, b) => a - b);
  const l = lengths.length ? lengths[lengths.length >> 1] : 0;
  return { horizontalM: 0.008 + 1e-6 * l, verticalM: 0.015 + 1e-6 * l };
}

/** Which epochs a point is averaged from: the best kind the occupation has enough of. */
export type PointBasis = 'fixed' | 'fixed+float' | 'code' | 'standalone';

/**
 * Least share of an occupation's carrier epochs (fixed and float) that must be fixed for a point from its
 * fixed epochs alone (our choice): one half. The antenna stands still through an occupation, so a right fix
 * is held by the forward pass to the end of its arcs and carried back to their start by the backward pass,
 * and nearly every epoch ends fixed (98.8 % on the real static run, 60-s occupations included). A minority
 * of fixed epochs is a fix the two passes did not confirm over the occupation: on the real static run
 * processed with GLONASS alone (8 satellites), 2 to 8 % of the epochs were fixed, all about 1 m off, and a
 * point from them alone claimed a 95 % radius of 2 cm.
 */
export const MIN_FIXED_SHARE = 0.5;

/**
 * Carrier phase with fixed ambiguities when the occupation has at least `minEpochs` of them (centimetres)
 * and they are at least MIN_FIXED_SHARE of its carrier epochs, else fixed and float together when they are
 * enough, else code (differential or smoothed), else standalone: a point never mixes centimetre epochs
 * with metre ones.
 */
export function chooseEpochs<E extends { readonly kind: SolutionKind }>(inside: readonly E[], minEpochs: number): { chosen: E[]; basis: PointBasis } {
  const fixed = inside.filter((e) => e.kind === 'fixed');
  const carrier = inside.filter((e) => e.kind === 'fixed' || e.kind === 'float');
  if (fixed.length >= minEpochs && fixed.length >= MIN_FIXED_SHARE * carrier.length) return { chosen: fixed, basis: 'fixed' };
  if (carrier.length >= minEpochs) return { chosen: carrier, basis: 'fixed+float' };
  const code = inside.filter((e) => e.kind === 'differential' || e.kind === 'smoothed');
  if (code.length > 0) return { chosen: code, basis: 'code' };
  if (carrier.length > 0) return { chosen: carrier, basis: 'fixed+float' };
  return { chosen: inside.filter((e) => e.kind === 'standalone'), basis: 'standalone' };
}

export interface PointResult {
  /** Which epochs the point is averaged from (chooseEpochs). */
  readonly basis: PointBasis;
  readonly name: string;
  readonly source: Occupation['source'];
  readonly startGpsS: number;
  readonly endGpsS: number;
  readonly summary: PointSummary;
  /** Epochs used, by solution kind. */
  readonly kinds: Readonly<Partial<Record<SolutionKind, number>>>;
  /** Vertical antenna height mark -> ARP applied by the points stage (m); NaN when the session's was kept. */
  readonly antennaHeightM: number;
  readonly measuredHeightM?: number;
  readonly heightKind?: HeightKind;
  readonly pointReference: PointReference;
  readonly frame: FrameEpoch;
  readonly tolerance: PointToleranceFlag;
}

export interface PointsOutcome {
  readonly points: readonly PointResult[];
  /** Occupations without a usable epoch. */
  readonly empty: readonly Occupation[];
}

import { DEFAULT_POINT_TOLERANCE_H_M, DEFAULT_POINT_TOLERANCE_V_M } from './tolerances.js';
export { DEFAULT_POINT_TOLERANCE_H_M, DEFAULT_POINT_TOLERANCE_V_M };
/**
 * An epoch belongs to an occupation when its tag is within this of the occupation's first and last
 * epoch (s): the tolerance the epochs' point names use too (points/window-names.ts).
 */
export const OCCUPATION_TAG_TOLERANCE_S = WINDOW_TAG_TOLERANCE_S;

/** The ARP above a ground-mark position, given the vertical height used. */
function markToArpAlongNormal(mark: EcefM, heightM: number): EcefM {
  const g = ecefToGeodetic(mark);
  const d = enuToEcefDelta({ e: 0, n: 0, u: heightM }, g.latRad, g.lonRad);
  return { x: mark.x + d.x, y: mark.y + d.y, z: mark.z + d.z };
}

export function toleranceFlagOf(s: PointSummary, tolHM: number, tolVM: number, minEpochs: number): PointToleranceFlag {
  if (s.epochs < minEpochs) return 'too-few-epochs';
  const h = Math.hypot(s.sdEastM, s.sdNorthM) > tolHM;
  const v = s.sdUpM > tolVM;
  return h && v ? 'exceeds-horizontal-and-vertical' : h ? 'exceeds-horizontal' : v ? 'exceeds-vertical' : 'ok';
}

export function summariseOccupations(epochs: readonly PointEpoch[], occupations: readonly Occupation[], opts: PointsOptions): PointsOutcome {
  const tolH = opts.horizontalToleranceM ?? DEFAULT_POINT_TOLERANCE_H_M;
  const tolV = opts.verticalToleranceM ?? DEFAULT_POINT_TOLERANCE_V_M;
  const minEpochs = opts.minEpochs ?? 10;
  const points: PointResult[] = [];
  const empty: Occupation[] = [];
  for (const occ of occupations) {
    const inside = epochs.filter((e) => e.tagGpsS >= occ.startGpsS - OCCUPATION_TAG_TOLERANCE_S && e.tagGpsS <= occ.endGpsS + OCCUPATION_TAG_TOLERANCE_S);
    const { chosen, basis } = chooseEpochs(inside, minEpochs);
    if (chosen.length === 0) { empty.push(occ); continue; }
    let heightM = NaN;
    if (occ.antennaHeightM !== undefined) heightM = verticalHeightToArpM(occ.antennaHeightM, occ.heightKind ?? 'vertical', opts.antenna);
    const samples = chosen.map((e) => {
      let ecef = e.ecef;
      if (Number.isFinite(heightM)) {
        const arp = opts.pointReference === 'ground-mark' ? markToArpAlongNormal(e.ecef, e.antennaHeightM) : e.ecef;
        ecef = reduceToMark(arp, heightM);
      }
      return { ecef, tGpsS: e.tagGpsS, pdop: e.pdop, ...(e.sigmaEnuM ? { sigmaEnuM: e.sigmaEnuM } : {}), ...(e.varianceFactor !== undefined ? { varianceFactor: e.varianceFactor } : {}) };
    });
    const summary = summarisePoint(samples, {
      minEpochs, horizontalToleranceM: tolH, ...(opts.referenceSigma ? { referenceSigma: opts.referenceSigma } : {}),
      ...(basis === 'fixed' || basis === 'fixed+float' ? { sigmaFloor: carrierPointFloor(chosen) } : {}),
      ...(basis === 'fixed+float' ? { formalErrorsPersist: true } : {}),
    });
    const kinds: Partial<Record<SolutionKind, number>> = {};
    for (const e of chosen) kinds[e.kind] = (kinds[e.kind] ?? 0) + 1;
    points.push({
      name: occ.name, source: occ.source, startGpsS: occ.startGpsS, endGpsS: occ.endGpsS, summary, kinds,
      // Without a height of its own the occupation has the session's (header or event record) heights.
      antennaHeightM: Number.isFinite(heightM) ? heightM : medianHeight(chosen),
      ...(occ.antennaHeightM !== undefined ? { measuredHeightM: occ.antennaHeightM, heightKind: occ.heightKind ?? 'vertical' } : {}),
      pointReference: Number.isFinite(heightM) ? 'ground-mark' : opts.pointReference,
      basis,
      frame: chosen[0].frame ?? opts.frame,
      tolerance: toleranceFlagOf(summary, tolH, tolV, minEpochs),
    });
  }
  return { points, empty };
}

function medianHeight(epochs: readonly PointEpoch[]): number {
  const h = epochs.map((e) => e.antennaHeightM).filter(Number.isFinite).sort((a, b) => a - b);
  if (h.length === 0) return NaN;
  const m = h.length >> 1;
  return h.length % 2 ? h[m]! : 0.5 * (h[m - 1]! + h[m]!);
}
