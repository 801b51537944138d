/** Satellite ECEF position and velocity from any broadcast ephemeris kind. */
import type { Ephemeris } from '../gnss/index.js';
import type { EcefM } from '../gnss/index.js';
import { keplerStateInto } from './kepler.js';
import { glonassStateInto } from './glonass.js';
import { sbasStateInto } from './sbas.js';

export interface SatelliteState {
  /** ECEF position (m): WGS 84 / Galileo GTRF / CGCS2000 / PZ-90.11, which agree at the cm level. */
  readonly posM: EcefM;
  /** ECEF velocity (m/s), in the rotating frame. */
  readonly velMS: EcefM;
}

/** Writes x, y, z (m), vx, vy, vz (m/s) at GPS time t into out[0..5]; allocation-free for Kepler/SBAS. */
export function satelliteStateInto(eph: Ephemeris, tGpsS: number, out: Float64Array): void {
  switch (eph.kind) {
    case 'kepler': keplerStateInto(eph, tGpsS, out); return;
    case 'glonass': glonassStateInto(eph, tGpsS, out); return;
    case 'sbas': sbasStateInto(eph, tGpsS, out); return;
  }
}

const scratch = new Float64Array(6);

/** Satellite position and velocity at GPS time t (s). */
export function satelliteState(eph: Ephemeris, tGpsS: number): SatelliteState {
  satelliteStateInto(eph, tGpsS, scratch);
  return {
    posM: { x: scratch[0], y: scratch[1], z: scratch[2] },
    velMS: { x: scratch[3], y: scratch[4], z: scratch[5] },
  };
}
