/**
 * The satellite as seen by a receiver whose epoch tag is in receiver time. The transmission time follows
 * from the tag and the pseudorange alone (t_tx = tag - P/c - dt_sv: the receiver clock is in both and
 * drops out), but the Earth rotation during the flight must use the true flight time
 * tau = (tag - dt_rx) - t_tx (IS-GPS-200 20.3.3.4.3.3.2): with dt_rx of a millisecond the rotation would
 * otherwise be wrong by omegaE * 1 ms (about 1 m of satellite position, decimetres of range).
 * So the orbit code is handed the estimated true receive time and the pseudorange less the clock.
 */
import type { EcefM } from '../gnss/index.js';
import type { Ephemeris } from '../gnss/index.js';
import { satelliteAtTransmission, SPEED_OF_LIGHT_MS, type SatelliteAtTransmission, type SignalKind } from '../orbit/index.js';

export function satelliteForTag(
  eph: Ephemeris, tagGpsS: number, pseudorangeM: number, receiverClockM: number, rxPos: EcefM | null, signal?: SignalKind,
): SatelliteAtTransmission {
  const clk = Number.isFinite(receiverClockM) ? receiverClockM : 0;
  return satelliteAtTransmission(eph, tagGpsS - clk / SPEED_OF_LIGHT_MS, pseudorangeM - clk, rxPos, signal);
}
