/**
 * Directions (azimuth, elevation) of satellites from a receiver at a known position, from broadcast
 * ephemerides at the reception time. The signal's flight time (~70 ms, a satellite moves ~0.01° in it)
 * is ignored: this is for drawing a sky plot, not for positioning.
 */
import { ecefToGeodetic, azimuthElevation } from '../geodesy/index.js';
import { satelliteState, type EphemerisStore } from '../orbit/index.js';
import type { EcefM, SatId } from '../gnss/index.js';

export interface SatelliteDirection {
  readonly satellite: SatId;
  readonly azimuthDeg: number;
  readonly elevationDeg: number;
}

/** Columns of sky.csv, the companion of report.html: one row per satellite per sampled reference epoch. */
export const SKY_CSV_COLUMNS = ['receiver', 'gps_week', 'gps_tow_s', 'satellite', 'azimuth_deg', 'elevation_deg'] as const;

/** Satellites with a usable ephemeris at t, seen from `receiver`; the others are left out. */
export function satelliteDirections(store: EphemerisStore, receiver: EcefM, tGpsS: number, sats: readonly SatId[]): SatelliteDirection[] {
  const g = ecefToGeodetic(receiver);
  const out: SatelliteDirection[] = [];
  for (const sat of sats) {
    const sel = store.select(sat, tGpsS);
    if (!sel.eph) continue;
    const p = satelliteState(sel.eph, tGpsS).posM;
    const ae = azimuthElevation(receiver, p, g.latRad, g.lonRad);
    out.push({ satellite: sat, azimuthDeg: (ae.azimuthRad * 180) / Math.PI, elevationDeg: (ae.elevationRad * 180) / Math.PI });
  }
  return out;
}
