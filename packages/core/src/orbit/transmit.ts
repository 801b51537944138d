/**
 * Signal transmission time and satellite position at transmission, expressed in the ECEF frame of the
 * receive time (Earth rotation during the signal flight, "Sagnac" correction).
 *
 * Transmission time from a pseudorange (IS-GPS-200 20.3.3.3.3.1, 20.3.3.4.3.3.2):
 *   t_tx = t_rx - P / c - dt_sv(t_tx), one fixed-point step (dt_sv changes by < 1e-11 s per ms).
 * Without a pseudorange (simulation), the light time is iterated geometrically:
 *   tau = |R_Z(omegaE tau) r_sat(t_rx - tau) - r_rx| / c.
 * Earth rotation (IS-GPS-200 20.3.3.4.3.3.2; Galileo/BeiDou/GLONASS with their own omegaE):
 *   r' = R_Z(omegaE tau) r, i.e. x' = x cos(we tau) + y sin(we tau), y' = -x sin(we tau) + y cos(we tau).
 */
import type { Ephemeris } from '../gnss/index.js';
import type { EcefM } from '../gnss/index.js';
import { SPEED_OF_LIGHT_MS, earthRotationRadS } from './constants.js';
import { satelliteClock, satelliteClockOffsetS, type SatelliteClock, type SignalKind } from './clock.js';
import { satelliteStateInto } from './state.js';

export interface SatelliteAtTransmission {
  /** Satellite position at transmission, in the ECEF frame of the receive time (m). */
  readonly posM: EcefM;
  /** Satellite velocity at transmission, rotated into the same frame (m/s). */
  readonly velMS: EcefM;
  /** Satellite clock at the transmission time. */
  readonly clock: SatelliteClock;
  /** Transmission time (true GPS s); resolution ~0.24 us (double at 1.3e9 s): use flightTimeS for ranges. */
  readonly txTimeGpsS: number;
  /** Signal flight time t_rx - t_tx (s), carried at full precision. */
  readonly flightTimeS: number;
  /** Geometric range satellite (at t_tx, rotated) to receiver (m), when a receiver position is given. */
  readonly rangeM?: number;
}

const buf = new Float64Array(6);

/** Rotates buf (position and velocity) about z by angle (rad): frame of t_tx -> frame of t_rx. */
function rotateZ(angleRad: number, s: Float64Array): void {
  const c = Math.cos(angleRad);
  const sn = Math.sin(angleRad);
  const x = s[0], y = s[1], vx = s[3], vy = s[4];
  s[0] = c * x + sn * y;
  s[1] = -sn * x + c * y;
  s[3] = c * vx + sn * vy;
  s[4] = -sn * vx + c * vy;
}

function distance(s: Float64Array, rx: EcefM): number {
  const dx = s[0] - rx.x, dy = s[1] - rx.y, dz = s[2] - rx.z;
  return Math.sqrt(dx * dx + dy * dy + dz * dz);
}

/**
 * Satellite position, velocity and clock at the transmission time of a signal received at rxTimeGpsS
 * (estimated true GPS time). Give the pseudorange (m) when it is measured, or null and a receiver
 * position to iterate the light time geometrically. rxPos, when given, also yields rangeM.
 */
export function satelliteAtTransmission(
  eph: Ephemeris,
  rxTimeGpsS: number,
  pseudorangeM: number | null,
  rxPos: EcefM | null,
  signal?: SignalKind,
): SatelliteAtTransmission {
  const we = earthRotationRadS(eph.system);
  // The flight time is carried on its own: GPS seconds since 1980 (~1.3e9) resolve only 0.24 us
  // (a double's ulp), i.e. 71 m of light travel, so tau must never be recovered as t_rx - t_tx.
  let tauS: number;
  let clock: SatelliteClock;
  if (pseudorangeM !== null) {
    tauS = pseudorangeM / SPEED_OF_LIGHT_MS;
    // One fixed-point step suffices: dt_sv changes by drift * dt_sv ~ 1e-11 * 1e-3 s between passes.
    tauS = pseudorangeM / SPEED_OF_LIGHT_MS + satelliteClockOffsetS(eph, rxTimeGpsS - tauS, signal);
    clock = satelliteClock(eph, rxTimeGpsS - tauS, signal);
    satelliteStateInto(eph, rxTimeGpsS - tauS, buf);
    rotateZ(we * tauS, buf);
  } else {
    if (rxPos === null) throw new RangeError('satelliteAtTransmission: give a pseudorange or a receiver position');
    tauS = 0.075; // typical MEO flight time: a start value only
    for (let k = 0; k < 6; k++) {
      satelliteStateInto(eph, rxTimeGpsS - tauS, buf);
      rotateZ(we * tauS, buf);
      const next = distance(buf, rxPos) / SPEED_OF_LIGHT_MS;
      const done = Math.abs(next - tauS) < 1e-12;
      tauS = next;
      if (done) break;
    }
    satelliteStateInto(eph, rxTimeGpsS - tauS, buf);
    rotateZ(we * tauS, buf);
    clock = satelliteClock(eph, rxTimeGpsS - tauS, signal);
  }
  const posM = { x: buf[0], y: buf[1], z: buf[2] };
  const velMS = { x: buf[3], y: buf[4], z: buf[5] };
  const flightTimeS = tauS;
  const txTimeGpsS = rxTimeGpsS - tauS;
  if (rxPos === null) return { posM, velMS, clock, txTimeGpsS, flightTimeS };
  return { posM, velMS, clock, txTimeGpsS, flightTimeS, rangeM: distance(buf, rxPos) };
}

/** Rotation of a satellite position about z for a flight time (m): the Earth-rotation correction alone. */
export function earthRotationCorrection(posM: EcefM, flightTimeS: number, omegaERadS: number): EcefM {
  const a = omegaERadS * flightTimeS;
  const c = Math.cos(a);
  const s = Math.sin(a);
  return { x: c * posM.x + s * posM.y, y: -s * posM.x + c * posM.y, z: posM.z };
}
