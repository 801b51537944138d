/**
 * Reference ellipsoids. WGS-84: a = 6378137 m, 1/f = 298.257223563 (NIMA TR8350.2, table 3.1).
 * GRS80 (used by ITRF/ETRF/NAD83 coordinates): 1/f = 298.257222101 (Moritz 1980, Geodetic Reference System 1980).
 */
export interface Ellipsoid {
  readonly name: string;
  readonly aM: number;
  readonly f: number;
}

export const WGS84: Ellipsoid = { name: 'WGS-84', aM: 6378137, f: 1 / 298.257223563 };
export const GRS80: Ellipsoid = { name: 'GRS80', aM: 6378137, f: 1 / 298.257222101 };
