/**
 * Antenna height reduction.
 *
 * A vertical height is measured from the ground mark up to the antenna reference point (ARP) and is used
 * as is. A slant height s is measured from the mark to the antenna's slant measure point (usually the
 * edge of the ground plane or a notch on the housing) at horizontal radius r from the antenna axis and
 * a vertical offset o above the ARP (both from the antenna's manufacturer sheet or the IGS antenna
 * file). By Pythagoras in the vertical plane through the axis (common practice, e.g. receiver manuals):
 *
 *   h_ARP = sqrt(s^2 - r^2) - o
 *
 * The ARP is then taken to the mark along the local ellipsoidal vertical (ENU up at the ARP):
 * mark = ARP - h_ARP * up (reduceToMark). The phase-centre offset above the ARP is not applied here
 * (sub-decimetre: a code-differential concern of the engine, not of the point).
 */
import type { EcefM } from '../gnss/index.js';
import { ecefToGeodetic, enuToEcefDelta, WGS84, type Ellipsoid } from '../geodesy/index.js';

export type HeightKind = 'vertical' | 'slant';

export interface AntennaGeometry {
  /** Horizontal distance from the antenna axis to the slant measure point, metres. */
  readonly radiusM: number;
  /** Height of the slant measure point above the ARP, metres (negative when below). */
  readonly slantPointAboveArpM?: number;
}

/** Vertical height mark -> ARP from a measured height. */
export function verticalHeightToArpM(measuredM: number, kind: HeightKind, antenna?: AntennaGeometry): number {
  if (!Number.isFinite(measuredM) || measuredM < 0) throw new RangeError(`antenna height ${measuredM} m must be a non-negative number`);
  if (kind === 'vertical') return measuredM;
  if (!antenna) throw new RangeError('a slant height needs the antenna radius (and the slant point offset above the ARP)');
  if (measuredM <= antenna.radiusM) throw new RangeError(`slant height ${measuredM} m is not longer than the antenna radius ${antenna.radiusM} m`);
  return Math.sqrt(measuredM * measuredM - antenna.radiusM * antenna.radiusM) - (antenna.slantPointAboveArpM ?? 0);
}

/** Ground mark below an ARP given in ECEF, along the local ellipsoidal vertical. */
export function reduceToMark(arpEcef: EcefM, verticalHeightM: number, ell: Ellipsoid = WGS84): EcefM {
  const g = ecefToGeodetic(arpEcef, ell);
  const d = enuToEcefDelta({ e: 0, n: 0, u: -verticalHeightM }, g.latRad, g.lonRad);
  return { x: arpEcef.x + d.x, y: arpEcef.y + d.y, z: arpEcef.z + d.z };
}
