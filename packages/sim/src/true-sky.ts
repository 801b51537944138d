/**
 * The simulated satellites as they "really" are: the broadcast orbit and clock (orbit/ user algorithms on
 * the simulated ephemerides; for GLONASS the integrated truth the records were sampled from,
 * glonass-constellation.ts) plus the orbit error (radial / along-track / cross-track) and the clock
 * error of the error model, both common to every receiver. Also the light-time solution between a
 * receiver and a satellite.
 */
import type { EcefM, SatId } from '@refdelta/core';
import type { KeplerEphemeris, NavData } from '@refdelta/core';
import { keplerStateInto } from '@refdelta/core';
import { satelliteClock, type SignalKind } from '@refdelta/core';
import { GPS_CONSTANTS } from '@refdelta/core';
import type { OrbitErrorParams, SatClockErrorParams } from './errors.js';
import { Rng } from './rng.js';
import { glonassTruthOf } from './constellation.js';
import type { GlonassOrbitTruth } from './glonass-constellation.js';
import { sumOfSinusoids, ZERO_PROCESS, type SlowProcess } from './slow-process.js';

/** Speed of light (m/s), SI definition (check-values.md constants). */
export const C_MS = 299_792_458;
/** WGS 84 Earth rotation rate (rad/s): IS-GPS-200 / NIMA TR8350.2 (check-values.md constants). */
export const OMEGA_E_RAD_S = GPS_CONSTANTS.omegaERadS;

interface SatTruth {
  readonly ephs: readonly KeplerEphemeris[];
  /** GLONASS: the integrated orbit and clock (ephs is then empty). */
  readonly glonass: GlonassOrbitTruth | null;
  readonly radial: SlowProcess;
  readonly along: SlowProcess;
  readonly cross: SlowProcess;
  readonly clock: SlowProcess;
}

/** Result of the light-time solution. */
export interface LightTimeSolution {
  /** Geometric range (m) from the satellite at transmission (in the frame rotated to reception time) to the receiver. */
  readonly rangeM: number;
  /** d(range)/dt (m/s) for a receiver moving with the given velocity. */
  readonly rangeRateMS: number;
  /** Transmission time (GPS s, true). */
  readonly txGpsS: number;
  /** Satellite position at transmission expressed in the ECEF frame of reception time (m). */
  readonly satPosM: EcefM;
}

export class TrueSky {
  private readonly sats = new Map<SatId, SatTruth>();
  private readonly scratch = new Float64Array(6);

  constructor(nav: NavData, seed: number | string, orbit: OrbitErrorParams | null, clock: SatClockErrorParams | null) {
    const bySat = new Map<SatId, KeplerEphemeris[]>();
    for (const e of nav.ephemerides) {
      if (e.kind !== 'kepler') continue;
      let a = bySat.get(e.sat);
      if (a === undefined) bySat.set(e.sat, (a = []));
      a.push(e);
    }
    const glonass = glonassTruthOf(nav);
    for (const sat of glonass.keys()) bySat.set(sat, []);
    for (const [sat, ephs] of [...bySat.entries()].sort((x, y) => (x[0] < y[0] ? -1 : 1))) {
      ephs.sort((a, b) => a.toeGpsS - b.toeGpsS);
      const proc = (label: string, sigma: number, p: { minPeriodS: number; maxPeriodS: number } | null) =>
        p === null ? ZERO_PROCESS : sumOfSinusoids(new Rng(seed, 'sky', sat, label), sigma, p.minPeriodS, p.maxPeriodS);
      this.sats.set(sat, {
        ephs,
        glonass: glonass.get(sat) ?? null,
        radial: proc('radial', orbit?.radialSigmaM ?? 0, orbit),
        along: proc('along', orbit?.alongSigmaM ?? 0, orbit),
        cross: proc('cross', orbit?.crossSigmaM ?? 0, orbit),
        clock: proc('clock', (clock?.sigmaM ?? 0) / C_MS, clock),
      });
    }
  }

  satellites(): SatId[] {
    return [...this.sats.keys()];
  }

  /** The issue whose toe is nearest t (all issues describe the same orbit: constellation.ts). */
  ephemerisAt(sat: SatId, tGpsS: number): KeplerEphemeris {
    const s = this.sats.get(sat);
    if (s === undefined) throw new RangeError(`no simulated ephemeris for ${sat}`);
    const ephs = s.ephs;
    let best = ephs[0]!;
    for (const e of ephs) if (Math.abs(e.toeGpsS - tGpsS) < Math.abs(best.toeGpsS - tGpsS)) best = e;
    return best;
  }

  /** True ECEF position and velocity at GPS time t into out[0..5]: broadcast + radial/along/cross error. */
  stateInto(sat: SatId, tGpsS: number, out: Float64Array): void {
    const s = this.sats.get(sat)!;
    if (s.glonass !== null) s.glonass.stateInto(tGpsS, out);
    else keplerStateInto(this.ephemerisAt(sat, tGpsS), tGpsS, out);
    if (s.radial === ZERO_PROCESS && s.along === ZERO_PROCESS && s.cross === ZERO_PROCESS) return;
    const x = out[0]!, y = out[1]!, z = out[2]!, vx = out[3]!, vy = out[4]!, vz = out[5]!;
    // Radial / along / cross unit vectors: r/|r|, cross = r x v / |r x v|, along = cross x radial (common practice).
    const r = Math.hypot(x, y, z);
    const rx = x / r, ry = y / r, rz = z / r;
    let cx = y * vz - z * vy, cy = z * vx - x * vz, cz = x * vy - y * vx;
    const cn = Math.hypot(cx, cy, cz);
    cx /= cn; cy /= cn; cz /= cn;
    const ax = cy * rz - cz * ry, ay = cz * rx - cx * rz, az = cx * ry - cy * rx;
    const dr = s.radial.at(tGpsS), da = s.along.at(tGpsS), dc = s.cross.at(tGpsS);
    out[0] = x + dr * rx + da * ax + dc * cx;
    out[1] = y + dr * ry + da * ay + dc * cy;
    out[2] = z + dr * rz + da * az + dc * cz;
  }

  /** True satellite clock offset for the signal (s): broadcast polynomial + relativity - group delay + clock error. */
  clockOffsetS(sat: SatId, tGpsS: number, signal: SignalKind): number {
    const s = this.sats.get(sat)!;
    // GLONASS broadcasts no group delay: one clock for G1 and G2 (ICD 5.1 3.3.3).
    if (s.glonass !== null) return s.glonass.clockOffsetS(tGpsS) + s.clock.at(tGpsS);
    return satelliteClock(this.ephemerisAt(sat, tGpsS), tGpsS, signal).offsetS + s.clock.at(tGpsS);
  }

  /** True satellite clock drift (s/s). */
  clockDriftSS(sat: SatId, tGpsS: number): number {
    const s = this.sats.get(sat)!;
    if (s.glonass !== null) return s.glonass.clockRateSS + s.clock.rateAt(tGpsS);
    return satelliteClock(this.ephemerisAt(sat, tGpsS), tGpsS).driftSS + s.clock.rateAt(tGpsS);
  }

  /**
   * Light-time solution for reception at true GPS time tRx by a receiver at rx moving with velocity v:
   * tau = |R_z(omegaE tau) r_sat(tRx - tau) - r_rx| / c, iterated (each pass shrinks the error by about
   * v/c ~ 1e-5, so three passes from tau = 0.075 s leave < 1e-15 s); the rotation R_z accounts for the
   * Earth turning during the signal's flight (Earth rotation correction of IS-GPS-200 20.3.3.4.3.4, section number
   * from memory; common practice).
   */
  lightTime(sat: SatId, rx: EcefM, rxVel: EcefM, tRxGpsS: number): LightTimeSolution {
    const o = this.scratch;
    let tau = 0.075;
    let px = 0, py = 0, pz = 0, range = 0;
    for (let k = 0; k < 4; k++) {
      this.stateInto(sat, tRxGpsS - tau, o);
      const th = OMEGA_E_RAD_S * tau;
      const c = Math.cos(th), s = Math.sin(th);
      px = c * o[0]! + s * o[1]!;
      py = -s * o[0]! + c * o[1]!;
      pz = o[2]!;
      range = Math.hypot(px - rx.x, py - rx.y, pz - rx.z);
      tau = range / C_MS;
    }
    const th = OMEGA_E_RAD_S * tau;
    const c = Math.cos(th), s = Math.sin(th);
    // Velocity rotated the same way (the small d(theta)/dt term is below 1 mm/s: neglected).
    const vx = c * o[3]! + s * o[4]!;
    const vy = -s * o[3]! + c * o[4]!;
    const vz = o[5]!;
    const ux = (px - rx.x) / range, uy = (py - rx.y) / range, uz = (pz - rx.z) / range;
    const rangeRateMS = (vx - rxVel.x) * ux + (vy - rxVel.y) * uy + (vz - rxVel.z) * uz;
    return { rangeM: range, rangeRateMS, txGpsS: tRxGpsS - tau, satPosM: { x: px, y: py, z: pz } };
  }
}
