/**
 * The rover's scripted path: static occupations of named points, walks along straight lines between
 * them. The antenna reference point (ARP) is the mark plus the antenna height along the local up
 * (RINEX ANTENNA: DELTA H/E/N with E = N = 0); while walking, the ARP moves in a straight line (in ECEF)
 * from the last occupation's ARP to the next one's, at the given horizontal speed.
 */
import type { EcefM } from '@refdelta/core';
import { ecefToGeodetic, enuToEcefDelta, geodeticToEcef } from '@refdelta/core';

export type PlanStep =
  | { readonly kind: 'static'; readonly point: string; readonly durationS: number; readonly antennaHeightM: number }
  | { readonly kind: 'walk'; readonly to: string; readonly speedMS?: number };

/** One static occupation as it happened. */
export interface Occupation {
  readonly name: string;
  readonly markEcef: EcefM;
  readonly antennaHeightM: number;
  readonly startGpsS: number;
  readonly endGpsS: number;
}

interface Segment {
  readonly t0: number;
  readonly t1: number;
  readonly from: EcefM;
  readonly to: EcefM;
  /** Index into occupations for a static segment, -1 when walking. */
  readonly occupation: number;
}

/** Default walking speed (m/s): a surveyor carrying a pole (common practice). */
export const DEFAULT_WALK_SPEED_MS = 1.2;

/** ARP of an antenna `heightM` above a mark (ANTENNA: DELTA H along the ellipsoidal normal). */
export function antennaPosition(mark: EcefM, heightM: number): EcefM {
  const g = ecefToGeodetic(mark);
  const d = enuToEcefDelta({ e: 0, n: 0, u: heightM }, g.latRad, g.lonRad);
  return { x: mark.x + d.x, y: mark.y + d.y, z: mark.z + d.z };
}

export class RoverTrajectory {
  readonly occupations: Occupation[] = [];
  private readonly segments: Segment[] = [];
  readonly startGpsS: number;
  readonly endGpsS: number;

  constructor(plan: readonly PlanStep[], marks: ReadonlyMap<string, EcefM>, startGpsS: number) {
    const first = plan[0];
    if (first === undefined || first.kind !== 'static') throw new RangeError('the rover plan must start with a static occupation');
    let t = startGpsS;
    let here: EcefM | null = null;
    for (let i = 0; i < plan.length; i++) {
      const step = plan[i]!;
      if (step.kind === 'static') {
        const mark = marks.get(step.point);
        if (mark === undefined) throw new RangeError(`plan step ${i + 1}: unknown point '${step.point}'`);
        if (!(step.durationS > 0)) throw new RangeError(`plan step ${i + 1}: durationS must be > 0`);
        const arp = antennaPosition(mark, step.antennaHeightM);
        this.occupations.push({ name: step.point, markEcef: mark, antennaHeightM: step.antennaHeightM, startGpsS: t, endGpsS: t + step.durationS });
        this.segments.push({ t0: t, t1: t + step.durationS, from: arp, to: arp, occupation: this.occupations.length - 1 });
        t += step.durationS;
        here = arp;
      } else {
        const mark = marks.get(step.to);
        if (mark === undefined) throw new RangeError(`plan step ${i + 1}: unknown point '${step.to}'`);
        const next = plan[i + 1];
        if (next === undefined || next.kind !== 'static' || next.point !== step.to) {
          throw new RangeError(`plan step ${i + 1}: a walk to '${step.to}' must be followed by a static occupation of '${step.to}'`);
        }
        const dest = antennaPosition(mark, next.antennaHeightM);
        const from = here!;
        const g = ecefToGeodetic(from);
        // Horizontal distance: the ECEF difference less its component along the local up.
        const dx = dest.x - from.x, dy = dest.y - from.y, dz = dest.z - from.z;
        const ux = Math.cos(g.latRad) * Math.cos(g.lonRad), uy = Math.cos(g.latRad) * Math.sin(g.lonRad), uz = Math.sin(g.latRad);
        const up = dx * ux + dy * uy + dz * uz;
        const horizontalM = Math.sqrt(Math.max(0, dx * dx + dy * dy + dz * dz - up * up));
        const durationS = Math.max(1, Math.round(horizontalM / (step.speedMS ?? DEFAULT_WALK_SPEED_MS)));
        this.segments.push({ t0: t, t1: t + durationS, from, to: dest, occupation: -1 });
        t += durationS;
        here = dest;
      }
    }
    this.startGpsS = startGpsS;
    this.endGpsS = t;
  }

  private segmentAt(tGpsS: number): Segment {
    const segs = this.segments;
    if (tGpsS < segs[0]!.t0) return segs[0]!;
    for (const s of segs) if (tGpsS < s.t1) return s;
    return segs[segs.length - 1]!;
  }

  /** ARP at true GPS time t (clamped to the plan's ends). */
  positionAt(tGpsS: number): EcefM {
    const s = this.segmentAt(tGpsS);
    if (s.occupation >= 0) return s.from;
    const f = Math.min(1, Math.max(0, (tGpsS - s.t0) / (s.t1 - s.t0)));
    return { x: s.from.x + f * (s.to.x - s.from.x), y: s.from.y + f * (s.to.y - s.from.y), z: s.from.z + f * (s.to.z - s.from.z) };
  }

  /** ARP velocity (m/s) at t. */
  velocityAt(tGpsS: number): EcefM {
    const s = this.segmentAt(tGpsS);
    if (s.occupation >= 0 || tGpsS < s.t0 || tGpsS >= s.t1) return { x: 0, y: 0, z: 0 };
    const d = s.t1 - s.t0;
    return { x: (s.to.x - s.from.x) / d, y: (s.to.y - s.from.y) / d, z: (s.to.z - s.from.z) / d };
  }

  /** The occupation in progress at t, or null while walking. */
  occupationAt(tGpsS: number): Occupation | null {
    const s = this.segmentAt(tGpsS);
    return s.occupation >= 0 ? this.occupations[s.occupation]! : null;
  }
}

/** Geodetic degrees/metres to ECEF (WGS 84). */
export function ecefFromDegrees(latDeg: number, lonDeg: number, heightM: number): EcefM {
  return geodeticToEcef({ latRad: (latDeg * Math.PI) / 180, lonRad: (lonDeg * Math.PI) / 180, heightM });
}
