/**
 * A user-supplied geoid grid in our own plain-text format (refdelta-geoid-grid 1):
 *
 *   refdelta-geoid-grid 1
 *   lat_min lat_max lon_min lon_max dlat_deg dlon_deg
 *   name: <model name>
 *   height_reference: <the vertical datum the heights will be in>
 *   <row at lat_max: undulations (m) from lon_min to lon_max, whitespace-separated>
 *   ...
 *   <row at lat_min>
 *
 * Rows go north to south; (lat_max - lat_min)/dlat + 1 rows of (lon_max - lon_min)/dlon + 1 values.
 * Empty lines and lines starting with '#' are ignored. Values may wrap over several lines: they are
 * read in order. Interpolation is bilinear in latitude/longitude (common practice for geoid grids;
 * e.g. NGA's own EGM96 interpolation program). Points outside the grid throw a RangeError.
 */
import { InputError } from '../errors.js';
import type { GeoidModel } from './geoid-model.js';

const MAGIC = 'refdelta-geoid-grid 1';

export function parseGeoidGrid(file: string, text: string): GeoidModel {
  const lines = text.split(/\r?\n/);
  let i = 0;
  const next = (): { line: number; text: string } | undefined => {
    while (i < lines.length) {
      const t = lines[i]!.trim();
      i++;
      if (t === '' || t.startsWith('#')) continue;
      return { line: i, text: t };
    }
    return undefined;
  };
  const first = next();
  if (!first || first.text !== MAGIC) {
    throw new InputError(file, first?.line ?? 1, `expected the header line '${MAGIC}' (not a refdelta geoid grid)`);
  }
  const ext = next();
  if (!ext) throw new InputError(file, lines.length, 'expected the extent line: lat_min lat_max lon_min lon_max dlat_deg dlon_deg');
  const nums = ext.text.split(/\s+/).map(Number);
  if (nums.length !== 6 || nums.some((v) => !Number.isFinite(v))) {
    throw new InputError(file, ext.line, 'expected six numbers: lat_min lat_max lon_min lon_max dlat_deg dlon_deg');
  }
  const [latMin, latMax, lonMin, lonMax, dLat, dLon] = nums as [number, number, number, number, number, number];
  if (!(latMin < latMax && lonMin < lonMax && dLat > 0 && dLon > 0 && latMin >= -90 && latMax <= 90)) {
    throw new InputError(file, ext.line, 'expected lat_min < lat_max within -90..90, lon_min < lon_max and positive spacings');
  }
  const nRows = Math.round((latMax - latMin) / dLat) + 1;
  const nCols = Math.round((lonMax - lonMin) / dLon) + 1;
  if (nRows < 2 || nCols < 2) throw new InputError(file, ext.line, 'expected at least two rows and two columns (spacing larger than the extent)');
  if (Math.abs((nRows - 1) * dLat - (latMax - latMin)) > 1e-9 * Math.max(1, latMax - latMin) ||
      Math.abs((nCols - 1) * dLon - (lonMax - lonMin)) > 1e-9 * Math.max(1, lonMax - lonMin)) {
    throw new InputError(file, ext.line, 'expected the extent to be a whole number of spacings');
  }
  const keyed = (key: string): string => {
    const l = next();
    const m = l ? new RegExp(`^${key}:\\s*(.+)$`).exec(l.text) : null;
    if (!l || !m) throw new InputError(file, l?.line ?? lines.length, `expected a '${key}: ...' line`);
    return m[1]!.trim();
  };
  const name = keyed('name');
  const heightReference = keyed('height_reference');
  // Each value takes at least two characters ('0' and a separator): a larger count is a damaged extent
  // line, refused before an array of that size is asked for.
  if (nRows * nCols > text.length / 2) {
    throw new InputError(file, ext.line, `the extent and spacings declare ${nRows} rows of ${nCols} values (${(nRows * nCols).toExponential(2)}), more than the file's ${text.length} characters can hold`);
  }
  const values = new Float64Array(nRows * nCols);
  let k = 0;
  for (let l = next(); l; l = next()) {
    for (const tok of l.text.split(/\s+/)) {
      const v = Number(tok);
      if (!Number.isFinite(v)) throw new InputError(file, l.line, `expected an undulation in metres, found '${tok}'`);
      if (k >= values.length) throw new InputError(file, l.line, `expected ${nRows} rows of ${nCols} values: too many values`);
      values[k++] = v;
    }
  }
  if (k !== values.length) {
    throw new InputError(file, lines.length, `expected ${nRows} rows of ${nCols} values (${values.length}), found ${k}: file truncated?`);
  }
  return {
    name,
    heightReference,
    undulationM(latDeg: number, lonDeg: number): number {
      const eps = 1e-12;
      if (!(latDeg >= latMin - eps && latDeg <= latMax + eps && lonDeg >= lonMin - eps && lonDeg <= lonMax + eps)) {
        throw new RangeError(`${name}: point ${latDeg}, ${lonDeg} deg is outside the grid (${latMin}..${latMax} N, ${lonMin}..${lonMax} E)`);
      }
      // Row 0 is lat_max (north); bilinear interpolation in the cell holding the point.
      const fr = Math.min(Math.max((latMax - latDeg) / dLat, 0), nRows - 1);
      const fc = Math.min(Math.max((lonDeg - lonMin) / dLon, 0), nCols - 1);
      const r0 = Math.min(Math.floor(fr), nRows - 2), c0 = Math.min(Math.floor(fc), nCols - 2);
      const tr = fr - r0, tc = fc - c0;
      const at = (r: number, c: number) => values[r * nCols + c]!;
      const north = at(r0, c0) * (1 - tc) + at(r0, c0 + 1) * tc;
      const south = at(r0 + 1, c0) * (1 - tc) + at(r0 + 1, c0 + 1) * tc;
      return north * (1 - tr) + south * tr;
    },
  };
}
