/**
 * GLONASS satellite position and velocity from the broadcast state vector (PZ-90), by 4th-order
 * Runge-Kutta integration of the equations of motion in the rotating Earth-fixed frame with the
 * central term, J2 and the broadcast luni-solar accelerations held constant: GLONASS ICD 5.1 (2008),
 * appendix A.3.1.2. Step <= 60 s. The broadcast state is valid within +-15 min of t_b (ICD A.3.1.2).
 *
 * Frame: the result is in PZ-90 (PZ-90.11 since 2014). PZ-90.11 and WGS 84 (G1762) agree at the
 * centimetre level, so no transformation is applied (documented choice; below the broadcast orbit error).
 *
 * Integration nodes are cached per ephemeris at t_b + k*60 s, and a position at t is obtained from the
 * node nearest t_b side of t with one partial step: the result does not depend on call order.
 */
import type { GlonassEphemeris } from '../gnss/index.js';
import { PZ90 } from './constants.js';

/** Integration step (s): the ICD asks for a step small enough; 60 s keeps the RK4 error well below 1 mm. */
export const GLONASS_STEP_S = 60;

/**
 * Right-hand side of the equations of motion, GLONASS ICD 5.1 A.3.1.2:
 *  dv_x/dt = -mu/r^3 x - 3/2 J2 mu ae^2 / r^5 x (1 - 5 z^2/r^2) + we^2 x + 2 we v_y + a_x
 *  dv_y/dt = -mu/r^3 y - 3/2 J2 mu ae^2 / r^5 y (1 - 5 z^2/r^2) + we^2 y - 2 we v_x + a_y
 *  dv_z/dt = -mu/r^3 z - 3/2 J2 mu ae^2 / r^5 z (3 - 5 z^2/r^2) + a_z
 * s = [x, y, z, vx, vy, vz]; writes ds/dt into out.
 */
function derivative(s: Float64Array, acc: readonly [number, number, number], out: Float64Array): void {
  const x = s[0], y = s[1], z = s[2], vx = s[3], vy = s[4], vz = s[5];
  const r2 = x * x + y * y + z * z;
  const r = Math.sqrt(r2);
  const mu = PZ90.muM3S2;
  const we = PZ90.omegaERadS;
  const muR3 = mu / (r2 * r);
  const j2Term = (1.5 * PZ90.j2 * mu * PZ90.aeM * PZ90.aeM) / (r2 * r2 * r);
  const z2r2 = (z * z) / r2;
  out[0] = vx;
  out[1] = vy;
  out[2] = vz;
  out[3] = -muR3 * x - j2Term * x * (1 - 5 * z2r2) + we * we * x + 2 * we * vy + acc[0];
  out[4] = -muR3 * y - j2Term * y * (1 - 5 * z2r2) + we * we * y - 2 * we * vx + acc[1];
  out[5] = -muR3 * z - j2Term * z * (3 - 5 * z2r2) + acc[2];
}

const k1 = new Float64Array(6), k2 = new Float64Array(6), k3 = new Float64Array(6), k4 = new Float64Array(6);
const tmp = new Float64Array(6);

/** One classical RK4 step of size h (s) from s into out (may alias s). */
function rk4Step(s: Float64Array, h: number, acc: readonly [number, number, number], out: Float64Array): void {
  derivative(s, acc, k1);
  for (let i = 0; i < 6; i++) tmp[i] = s[i] + 0.5 * h * k1[i];
  derivative(tmp, acc, k2);
  for (let i = 0; i < 6; i++) tmp[i] = s[i] + 0.5 * h * k2[i];
  derivative(tmp, acc, k3);
  for (let i = 0; i < 6; i++) tmp[i] = s[i] + h * k3[i];
  derivative(tmp, acc, k4);
  for (let i = 0; i < 6; i++) out[i] = s[i] + (h / 6) * (k1[i] + 2 * k2[i] + 2 * k3[i] + k4[i]);
}

/**
 * Longest integration accepted (s): the broadcast state is meant for +-15 min (ICD A.3.1.2); selection
 * allows 20 min; past an hour the J2-only model is metres off and nothing legitimate asks for it.
 */
export const GLONASS_MAX_INTEGRATION_S = 3600;

/** Cached integration nodes: forward[k] = state at tb + k*step, backward[k] = at tb - k*step. */
interface NodeCache {
  readonly forward: Float64Array[];
  readonly backward: Float64Array[];
}
const nodeCache = new WeakMap<GlonassEphemeris, NodeCache>();

function nodes(eph: GlonassEphemeris): NodeCache {
  let c = nodeCache.get(eph);
  if (c === undefined) {
    const s0 = new Float64Array([...eph.posM, ...eph.velMS]);
    c = { forward: [s0], backward: [s0] };
    nodeCache.set(eph, c);
  }
  return c;
}

/**
 * Integrates the broadcast state vector to GPS time t; writes x, y, z (m), vx, vy, vz (m/s) into out.
 * Integrating further than 15 min (+ margin) from t_b is the caller's choice (EphemerisStore refuses it).
 */
export function glonassStateInto(eph: GlonassEphemeris, tGpsS: number, out: Float64Array): void {
  const dt = tGpsS - eph.tbGpsS;
  if (!(Math.abs(dt) <= GLONASS_MAX_INTEGRATION_S)) {
    throw new RangeError(`${eph.sat}: t - t_b = ${dt} s, beyond the ${GLONASS_MAX_INTEGRATION_S} s integration limit`);
  }
  const c = nodes(eph);
  const list = dt >= 0 ? c.forward : c.backward;
  const sign = dt >= 0 ? 1 : -1;
  const k = Math.floor(Math.abs(dt) / GLONASS_STEP_S);
  while (list.length <= k) {
    const next = new Float64Array(6);
    rk4Step(list[list.length - 1], sign * GLONASS_STEP_S, eph.accMS2, next);
    list.push(next);
  }
  const node = list[k];
  const rest = dt - sign * k * GLONASS_STEP_S;
  if (rest === 0) {
    for (let i = 0; i < 6; i++) out[i] = node[i];
    return;
  }
  rk4Step(node, rest, eph.accMS2, out);
}
