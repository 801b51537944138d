/**
 * SBAS GEO satellite position from the broadcast state (RINEX SBAS navigation record, taken from the
 * GEO navigation message, RTCA DO-229 A.4.4.11 message type 9): position, velocity and acceleration at
 * t0, propagated with the quadratic of the message definition:
 *   X(t) = X0 + Xdot (t - t0) + 1/2 Xddot (t - t0)^2   (DO-229 A.4.4.11; from memory, not confirmed here).
 * Frame: WGS 84 ECEF.
 */
import type { SbasEphemeris } from '../gnss/index.js';

export function sbasStateInto(eph: SbasEphemeris, tGpsS: number, out: Float64Array): void {
  const dt = tGpsS - eph.t0GpsS;
  for (let i = 0; i < 3; i++) {
    out[i] = eph.posM[i] + eph.velMS[i] * dt + 0.5 * eph.accMS2[i] * dt * dt;
    out[i + 3] = eph.velMS[i] + eph.accMS2[i] * dt;
  }
}
