/**
 * Control marks from a CSV file (our format). A header row names the columns (any order, case-insensitive):
 *
 *   name                                       required
 *   lat_deg, lon_deg, h_m                      geodetic (h_m ellipsoidal height), or
 *   x_m, y_m, z_m                              ECEF, or
 *   easting_m, northing_m, h_m, projection     grid coordinates: projection is an EPSG code or a PROJ
 *                                              string (see projection/; every EPSG code through the
 *                                              caller's EpsgLookup, as for points), h_m ellipsoidal height
 *   frame                                      optional; blank or absent -> 'unstated'
 *   epoch                                      decimal year; optional (blank -> epoch unknown: NaN,
 *                                              no epoch check can be made, a warning says so)
 *   accuracy_h_m, accuracy_v_m                 optional, the mark's own 1-sigma accuracy: accuracy_h_m the
 *                                              horizontal standard error sqrt(sd_e^2 + sd_n^2) (as a points
 *                                              table's sigma_mean_* give it, marks-file.ts), accuracy_v_m
 *                                              the vertical one
 *
 * A row may use any one coordinate form for which it has all values (so one file can mix forms).
 * Geodetic and grid coordinates are converted to ECEF on GRS80, or on WGS 84 when the frame is WGS84
 * (the two differ by 0.1 mm in height). Fields may be quoted with "..." (a PROJ string may hold spaces).
 * Lines starting with '#' and empty lines are skipped. A bad row is an InputError naming the file, line,
 * column and what was expected.
 */
import type { FramedEcef } from '../gnss/index.js';
import { InputError, type WarningSink } from '../errors.js';
import { degToRad, geodeticToEcef, GRS80, WGS84, type Ellipsoid } from '../geodesy/index.js';
import { normaliseFrameName } from '../frames/index.js';
import { gridAreaWarning, makeProjection, marksGridDatumSentence, projectionDatumRelation, type AreaPoint, type EpsgLookup, type Projection } from '../projection/index.js';
import { csvRecords } from '../csv/index.js';

export interface ControlMark {
  readonly name: string;
  readonly position: FramedEcef;
  readonly accuracyHorizontalM?: number;
  readonly accuracyVerticalM?: number;
  /** Where it was read from. */
  readonly file: string;
  readonly line: number;
  /** The coordinate values as the file gives them, when geodetic or grid (far-match.ts tries other readings of them). */
  readonly given?: GivenCoordinate;
}

/** A mark's coordinate values as written: latitude/longitude, or easting/northing with the projection named. */
export type GivenCoordinate =
  | { readonly kind: 'geodetic'; readonly latDeg: number; readonly lonDeg: number; readonly heightM: number }
  | { readonly kind: 'grid'; readonly projection: string; readonly eastingM: number; readonly northingM: number; readonly heightM: number };

export { splitCsvLine } from '../csv/index.js';

export function ellipsoidForFrame(frameName: string): Ellipsoid {
  return normaliseFrameName(frameName) === 'WGS84' ? WGS84 : GRS80;
}

const KNOWN = ['name', 'lat_deg', 'lon_deg', 'h_m', 'x_m', 'y_m', 'z_m', 'easting_m', 'northing_m', 'projection', 'frame', 'epoch', 'accuracy_h_m', 'accuracy_v_m'];

/** `lookup`: the EPSG dataset for grid coordinates (the command line gives the one `points --projection` uses). */
export function parseControlCsv(file: string, text: string, onWarning?: WarningSink, lookup?: EpsgLookup): ControlMark[] {
  let header: string[] | undefined;
  let headerLine = 0;
  const marks: ControlMark[] = [];
  const projections = new Map<string, Projection>();
  // One warning per projection and frame whose datums differ (projection-datum.ts), at its first row.
  const datumWarned = new Set<string>();
  // Grid marks by projection, to say which fall outside its usable area (grid-area.ts).
  const gridMarks = new Map<string, { line: number; points: AreaPoint[] }>();
  for (const { lineNo, fields: f } of csvRecords(text)) {
    if (!header) {
      header = f.map((h) => h.toLowerCase());
      headerLine = lineNo;
      const unknown = header.filter((h) => !KNOWN.includes(h));
      // A spreadsheet saved where the decimal separator is a comma writes ';' between fields: the header is then one field.
      if (header.length === 1 && header[0]!.split(';').length > 2) {
        throw new InputError(file, lineNo, `the header has its columns separated by ';' ('${header[0]!.slice(0, 60)}'): save the file with ',' between columns and '.' as the decimal point`);
      }
      if (!header.includes('name')) throw new InputError(file, lineNo, `expected a header row with a 'name' column (columns: ${KNOWN.join(', ')})`);
      if (unknown.length > 0) throw new InputError(file, lineNo, `unknown column(s) ${unknown.join(', ')}: expected some of ${KNOWN.join(', ')}`);
      const has = (...c: string[]) => c.every((x) => header!.includes(x));
      if (!has('lat_deg', 'lon_deg', 'h_m') && !has('x_m', 'y_m', 'z_m') && !has('easting_m', 'northing_m', 'h_m', 'projection')) {
        throw new InputError(file, lineNo, 'expected coordinate columns: lat_deg,lon_deg,h_m or x_m,y_m,z_m or easting_m,northing_m,h_m,projection');
      }
      continue;
    }
    if (f.length !== header.length) throw new InputError(file, lineNo, `expected ${header.length} columns as in the header (line ${headerLine}), found ${f.length}`);
    const get = (c: string): string => {
      const k = header!.indexOf(c);
      return k < 0 ? '' : f[k]!;
    };
    const num = (c: string, what: string, lo = -Infinity, hi = Infinity): number => {
      const s = get(c);
      const v = Number(s);
      if (s === '' || !Number.isFinite(v) || v < lo || v > hi) throw new InputError(file, lineNo, `column ${c}: expected ${what}, found '${s}'`);
      return v;
    };
    const optNum = (c: string, what: string, lo: number, hi: number): number | undefined => (get(c) === '' ? undefined : num(c, what, lo, hi));
    const name = get('name');
    if (name === '') throw new InputError(file, lineNo, 'column name: expected a mark name');
    const frameName = normaliseFrameName(get('frame'));
    const epochText = get('epoch');
    let epochYear = NaN;
    if (epochText !== '') epochYear = num('epoch', 'a decimal year between 1980 and 2100', 1980, 2100);
    else onWarning?.({ file, line: lineNo, code: 'control-epoch-missing', message: `mark ${name}: no epoch given; epoch differences cannot be checked` });
    const ell = ellipsoidForFrame(frameName);
    const filled = (...c: string[]) => c.every((x) => get(x) !== '');
    let ecef;
    let given: GivenCoordinate | undefined;
    if (filled('x_m', 'y_m', 'z_m')) {
      ecef = { x: num('x_m', 'an ECEF X in metres'), y: num('y_m', 'an ECEF Y in metres'), z: num('z_m', 'an ECEF Z in metres') };
      const r = Math.hypot(ecef.x, ecef.y, ecef.z);
      if (r < 6.2e6 || r > 6.5e6) throw new InputError(file, lineNo, `columns x_m,y_m,z_m: expected a point near the Earth's surface (|X| = ${r.toFixed(0)} m)`);
    } else if (filled('lat_deg', 'lon_deg', 'h_m')) {
      const lat = num('lat_deg', 'a latitude in degrees (-90..90)', -90, 90);
      const lon = num('lon_deg', 'a longitude in degrees (-180..360)', -180, 360);
      const h = num('h_m', 'an ellipsoidal height in metres (-1000..10000)', -1000, 10000);
      ecef = geodeticToEcef({ latRad: degToRad(lat), lonRad: degToRad(lon), heightM: h }, ell);
      given = { kind: 'geodetic', latDeg: lat, lonDeg: lon, heightM: h };
    } else if (filled('easting_m', 'northing_m', 'h_m', 'projection')) {
      const spec = get('projection');
      let proj = projections.get(spec);
      if (!proj) {
        try {
          proj = makeProjection(spec, undefined, lookup);
        } catch (e) {
          throw new InputError(file, lineNo, `column projection: ${e instanceof Error ? e.message : String(e)}`);
        }
        if (proj.units !== 'm') throw new InputError(file, lineNo, `column projection: expected a projection in metres, '${spec}' is geographic`);
        projections.set(spec, proj);
      }
      const warnKey = `${spec}\u0000${frameName}`;
      if (!datumWarned.has(warnKey) && projectionDatumRelation(proj, frameName) === 'differs') {
        datumWarned.add(warnKey);
        onWarning?.({ file, line: lineNo, code: 'marks-projection-datum', message: `marks in ${spec} with frame ${frameName} (from ${name} on): ${marksGridDatumSentence(proj, frameName)}` });
      }
      const eastingM = num('easting_m', 'an easting in metres'), northingM = num('northing_m', 'a northing in metres');
      const ll = proj.inverse(eastingM, northingM);
      const h = num('h_m', 'an ellipsoidal height in metres (-1000..10000)', -1000, 10000);
      given = { kind: 'grid', projection: spec, eastingM, northingM, heightM: h };
      if (!Number.isFinite(ll.latDeg) || !Number.isFinite(ll.lonDeg)) throw new InputError(file, lineNo, `columns easting_m,northing_m: expected a point inside the projection ${proj.name}`);
      ecef = geodeticToEcef({ latRad: degToRad(ll.latDeg), lonRad: degToRad(ll.lonDeg), heightM: h }, ell);
      const inGrid = gridMarks.get(spec) ?? { line: lineNo, points: [] };
      gridMarks.set(spec, inGrid);
      inGrid.points.push({ name, latDeg: ll.latDeg, lonDeg: ll.lonDeg });
    } else {
      throw new InputError(file, lineNo, 'expected a complete coordinate: lat_deg,lon_deg,h_m or x_m,y_m,z_m or easting_m,northing_m,h_m,projection');
    }
    const ah = optNum('accuracy_h_m', 'a non-negative accuracy in metres', 0, 1000);
    const av = optNum('accuracy_v_m', 'a non-negative accuracy in metres', 0, 1000);
    marks.push({
      name,
      position: { ecef, frame: { name: frameName, epochYear } },
      ...(ah !== undefined ? { accuracyHorizontalM: ah } : {}),
      ...(av !== undefined ? { accuracyVerticalM: av } : {}),
      file,
      line: lineNo,
      ...(given ? { given } : {}),
    });
  }
  if (!header) throw new InputError(file, 0, 'expected a header row and at least one control mark: the file is empty');
  for (const [spec, g] of gridMarks) {
    const outside = gridAreaWarning(projections.get(spec)!, g.points, 'marks');
    if (outside) onWarning?.({ file, line: g.line, code: 'marks-outside-grid-area', message: outside });
  }
  return marks;
}
