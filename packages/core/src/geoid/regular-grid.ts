/**
 * A geoid model on a regular latitude/longitude grid of nodes: rows from north to south, columns from
 * west to east, bilinear interpolation in the cell holding the point (common practice for geoid grids:
 * PROJ's grid interpolation, NGA's EGM96 interpolation program). A point outside the grid, or in a cell
 * with a no-data node, throws a RangeError.
 */
import type { GeoidModel } from './geoid-model.js';

export interface RegularGrid {
  readonly name: string;
  readonly heightReference: string;
  /** Latitude of the first (northernmost) row of nodes and the spacing, degrees. */
  readonly northLatDeg: number;
  readonly dLatDeg: number;
  /** Longitude of the first (westernmost) column of nodes and the spacing, degrees. */
  readonly westLonDeg: number;
  readonly dLonDeg: number;
  readonly rows: number;
  readonly cols: number;
  /** rows x cols undulations (m), row-major from the north-west node. */
  readonly values: ArrayLike<number>;
  /** A value meaning "no data" (compared exactly), if any. */
  readonly noData?: number | null;
}

export function regularGridModel(g: RegularGrid): GeoidModel {
  const southLat = g.northLatDeg - (g.rows - 1) * g.dLatDeg;
  const eastLon = g.westLonDeg + (g.cols - 1) * g.dLonDeg;
  const eps = 1e-9;
  return {
    name: g.name,
    heightReference: g.heightReference,
    undulationM(latDeg: number, lonDeg: number): number {
      // A grid given in 0..360 longitudes takes -180..180 points and the reverse.
      let lon = lonDeg;
      if (lon < g.westLonDeg - eps) lon += 360;
      if (lon > eastLon + eps) lon -= 360;
      if (!(latDeg >= southLat - eps && latDeg <= g.northLatDeg + eps && lon >= g.westLonDeg - eps && lon <= eastLon + eps)) {
        throw new RangeError(`${g.name}: point ${latDeg}, ${lonDeg} deg is outside the grid (${southLat}..${g.northLatDeg} N, ${g.westLonDeg}..${eastLon} E)`);
      }
      const fr = Math.min(Math.max((g.northLatDeg - latDeg) / g.dLatDeg, 0), g.rows - 1);
      const fc = Math.min(Math.max((lon - g.westLonDeg) / g.dLonDeg, 0), g.cols - 1);
      const r0 = Math.min(Math.floor(fr), g.rows - 2), c0 = Math.min(Math.floor(fc), g.cols - 2);
      const tr = fr - r0, tc = fc - c0;
      const at = (r: number, c: number): number => {
        const v = g.values[r * g.cols + c]!;
        if (!Number.isFinite(v) || (g.noData !== undefined && g.noData !== null && v === g.noData)) {
          throw new RangeError(`${g.name}: no geoid value at the grid node next to ${latDeg}, ${lonDeg} deg`);
        }
        return v;
      };
      const north = at(r0, c0) * (1 - tc) + at(r0, c0 + 1) * tc;
      const south = at(r0 + 1, c0) * (1 - tc) + at(r0 + 1, c0 + 1) * tc;
      return north * (1 - tr) + south * tr;
    },
  };
}
