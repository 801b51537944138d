/**
 * Dilution of precision from the geometry alone (unit weights): Q = (G^T G)^-1 with rows
 * G_i = [-e_i, -n_i, -u_i, clock columns], e/n/u the receiver-to-satellite unit line of sight in the local
 * east-north-up frame. GDOP = sqrt(tr Q), PDOP = sqrt(Qee + Qnn + Quu), HDOP = sqrt(Qee + Qnn),
 * VDOP = sqrt(Quu), TDOP = sqrt(Q of the first clock column).
 * Source: Misra & Enge, "Global Positioning System: Signals, Measurements and Performance", 2nd ed., 6.1.
 */
import type { EcefM, GeodeticRad } from '../gnss/index.js';
import { ecefToGeodetic } from '../geodesy/index.js';
import { choleskyInPlace, choleskyInverse } from './dense-cholesky.js';

export interface Dop {
  readonly gdop: number;
  readonly pdop: number;
  readonly hdop: number;
  readonly vdop: number;
  readonly tdop: number;
}

export interface DopGeometry {
  /** Receiver-to-satellite unit vectors, flat [x0, y0, z0, x1, ...] (length 3 m). */
  readonly lineOfSight: Float64Array | readonly number[];
  /**
   * 'enu': vectors already east/north/up. 'ecef': vectors in ECEF, rotated to ENU at `receiver`
   * (ECEF position, or geodetic latitude/longitude).
   */
  readonly frame: 'enu' | 'ecef';
  readonly receiver?: EcefM | GeodeticRad;
  /** Clock column (0-based) of each satellite; default all 0 (one receiver clock). TDOP is from column 0. */
  readonly clockIndex?: readonly number[] | Int32Array;
}

function latLonOf(receiver: EcefM | GeodeticRad): { latRad: number; lonRad: number } {
  if ('latRad' in receiver) return receiver;
  return ecefToGeodetic(receiver);
}

/** DOPs of a geometry, or null when the geometry does not determine all unknowns (too few or collinear). */
export function dilutionOfPrecision(g: DopGeometry): Dop | null {
  const los = g.lineOfSight;
  const m = Math.floor(los.length / 3);
  const clocks = g.clockIndex ?? new Int32Array(m);
  let nClock = 1;
  for (let i = 0; i < m; i++) nClock = Math.max(nClock, clocks[i] + 1);
  const n = 3 + nClock;
  if (m < n) return null;
  let r: number[] | null = null;
  if (g.frame === 'ecef') {
    if (!g.receiver) throw new RangeError('dilutionOfPrecision: ECEF line-of-sight vectors need the receiver position');
    const { latRad, lonRad } = latLonOf(g.receiver);
    const sl = Math.sin(latRad), cl = Math.cos(latRad), so = Math.sin(lonRad), co = Math.cos(lonRad);
    // ECEF -> ENU rotation (Misra & Enge 2006, 4.A; NIMA TR8350.2 local frame)
    r = [-so, co, 0, -sl * co, -sl * so, cl, cl * co, cl * so, sl];
  }
  const normal = new Float64Array(n * n);
  const row = new Float64Array(n);
  for (let i = 0; i < m; i++) {
    let e = los[3 * i], nn = los[3 * i + 1], u = los[3 * i + 2];
    if (r) {
      const x = e, y = nn, z = u;
      e = r[0] * x + r[1] * y + r[2] * z;
      nn = r[3] * x + r[4] * y + r[5] * z;
      u = r[6] * x + r[7] * y + r[8] * z;
    }
    row.fill(0);
    row[0] = -e; row[1] = -nn; row[2] = -u; row[3 + clocks[i]] = 1;
    for (let j = 0; j < n; j++) for (let k = 0; k <= j; k++) normal[j * n + k] += row[j] * row[k];
  }
  if (!choleskyInPlace(normal, n)) return null;
  const q = choleskyInverse(normal, n);
  let trace = 0;
  for (let j = 0; j < n; j++) trace += q[j * n + j];
  const qee = q[0], qnn = q[n + 1], quu = q[2 * n + 2], qtt = q[3 * n + 3];
  return {
    gdop: Math.sqrt(trace),
    pdop: Math.sqrt(qee + qnn + quu),
    hdop: Math.sqrt(qee + qnn),
    vdop: Math.sqrt(quu),
    tdop: Math.sqrt(qtt),
  };
}

/** East/north/up unit line of sight from azimuth (from north, clockwise) and elevation (Misra & Enge 2006, 2.3). */
export function lineOfSightEnu(azimuthRad: number, elevationRad: number): [number, number, number] {
  const ce = Math.cos(elevationRad);
  return [ce * Math.sin(azimuthRad), ce * Math.cos(azimuthRad), Math.sin(elevationRad)];
}
