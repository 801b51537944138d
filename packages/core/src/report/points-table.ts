/**
 * points.csv and points.geojson: one row / feature per occupation. The columns are the same whatever
 * the options (easting/northing and orthometric height empty when not computed); the frame, epoch,
 * projection and height reference are stated in the metadata sidecar (pointsMetadata) and the GeoJSON
 * top-level foreign member "refdelta" (RFC 7946 section 6.1).
 *
 * Projection: applied to latitude/longitude in the points' own frame (projection/projection.ts never
 * shifts datums): easting/northing are in that frame too, and the CRS stated for them follows it
 * (grid-crs.ts), not the code asked for. Orthometric heights: H = h - N with the
 * chosen geoid (geoid/geoid-model.ts); EGM96 is a global model, not a national vertical datum.
 */
import type { FrameEpoch } from '../gnss/index.js';
import { gpsToUtcS, isoFromSeconds, weekTowFromGpsS } from '../time/index.js';
import { radToDeg } from '../geodesy/index.js';
import { withoutDatumShift, type Projection } from '../projection/index.js';
import { orthometricHeightM, type GeoidModel } from '../geoid/index.js';
import { fixed, jsonNumber } from './format.js';
import { frameEpochCell } from './epoch-table.js';
import { tableMetadata } from './table-metadata.js';
import { frameWords, pointReferenceWords } from './point-reference.js';
import { geojsonNote } from './geojson.js';
import type { PointResult } from './points-summary.js';
import type { GridCrs } from './grid-crs.js';

/** How the outputs name the CRS of the grid coordinates. */
export interface GridLabel { readonly epsg: number | null; readonly name: string; readonly definition: string; readonly datum?: string }

/** What the outputs say the grid coordinates are: the grid CRS when known, else the projection as asked. */
export function gridLabel(o: Pick<PointsTableOptions, 'projection' | 'grid'>): GridLabel | undefined {
  if (!o.projection) return undefined;
  // Outside the projection's own datum only its parameters are meant: the definition carries no datum.
  const definition = o.grid && o.grid.datum !== 'same' && o.grid.datum !== 'as-given' ? withoutDatumShift(o.projection.projString) : o.projection.projString;
  return o.grid
    ? { epsg: o.grid.epsg, name: o.grid.name, definition, datum: o.grid.datumNote }
    : { epsg: o.projection.epsg, name: o.projection.name, definition: o.projection.projString };
}

export interface PointsTableOptions {
  readonly frame: FrameEpoch;
  readonly projection?: Projection;
  /** The CRS the grid coordinates are actually in (grid-crs.ts); with a projection, what outputs state. */
  readonly grid?: GridCrs;
  readonly geoid?: GeoidModel;
  readonly horizontalToleranceM: number;
  readonly verticalToleranceM: number;
  /** Further free-text lines. */
  readonly notes?: readonly string[];
}

export const EGM96_NOT_A_DATUM_NOTE = 'EGM96 is a global geoid model, not a national vertical datum: national levelling heights can differ by decimetres to a metre or more';

/** The points.csv columns: one schema whatever the options (`_o` is kept for callers that pass them). */
export function pointsColumns(_o?: Pick<PointsTableOptions, 'projection' | 'geoid'>): string[] {
  return [
    'name', 'source', 'start_utc', 'end_utc', 'start_gps_week', 'start_gps_tow_s', 'end_gps_week', 'end_gps_tow_s',
    'epochs', 'duration_s', 'latitude_deg', 'longitude_deg', 'height_m',
    'easting_m', 'northing_m', 'orthometric_height_m',
    'ecef_x_m', 'ecef_y_m', 'ecef_z_m', 'frame', 'frame_epoch', 'point_reference',
    'sd_east_m', 'sd_north_m', 'sd_up_m', 'n_eff', 'sigma_mean_east_m', 'sigma_mean_north_m', 'sigma_mean_up_m',
    'mean_pdop', 'antenna_height_m', 'solution_kinds', 'tolerance',
    'radius95_relative_m', 'up95_relative_m', 'sigma_reference_horizontal_m', 'sigma_reference_up_m', 'radius95_m', 'up95_m', 'solution_basis',
  ];
}

function isIsoUtc(gpsS: number): string {
  return isoFromSeconds(gpsToUtcS(gpsS), 'Z');
}

function kindsText(p: PointResult): string {
  return Object.entries(p.kinds).map(([k, n]) => `${k}:${n}`).join(';');
}

interface Derived {
  readonly latDeg: number;
  readonly lonDeg: number;
  readonly hM: number;
  readonly eastingM: number;
  readonly northingM: number;
  readonly orthometricM: number;
}

function derive(p: PointResult, o: Pick<PointsTableOptions, 'projection' | 'geoid'>): Derived {
  const g = p.summary.meanGeodetic;
  const latDeg = radToDeg(g.latRad), lonDeg = radToDeg(g.lonRad);
  const en = o.projection ? o.projection.forward(latDeg, lonDeg) : { eastingM: NaN, northingM: NaN };
  const orthometricM = o.geoid ? orthometricHeightM(o.geoid, latDeg, lonDeg, g.heightM) : NaN;
  return { latDeg, lonDeg, hM: g.heightM, eastingM: en.eastingM, northingM: en.northingM, orthometricM };
}

export function pointRow(p: PointResult, o: Pick<PointsTableOptions, 'projection' | 'geoid'>): string[] {
  const d = derive(p, o);
  const s = p.summary;
  const ws = weekTowFromGpsS(p.startGpsS), we = weekTowFromGpsS(p.endGpsS);
  return [
    p.name, p.source, isIsoUtc(p.startGpsS), isIsoUtc(p.endGpsS), String(ws.week), fixed(ws.towS, 3), String(we.week), fixed(we.towS, 3),
    String(s.epochs), fixed(s.durationS, 1), fixed(d.latDeg, 9), fixed(d.lonDeg, 9), fixed(d.hM, 4),
    fixed(d.eastingM, o.projection?.units === 'deg' ? 9 : 4), fixed(d.northingM, o.projection?.units === 'deg' ? 9 : 4), fixed(d.orthometricM, 4),
    fixed(s.meanEcef.x, 4), fixed(s.meanEcef.y, 4), fixed(s.meanEcef.z, 4), p.frame.name, frameEpochCell(p.frame.epochYear),
    pointReferenceWords(p.pointReference),
    fixed(s.sdEastM, 4), fixed(s.sdNorthM, 4), fixed(s.sdUpM, 4), fixed(s.nEff, 1),
    fixed(s.sigmaMeanEastM, 4), fixed(s.sigmaMeanNorthM, 4), fixed(s.sigmaMeanUpM, 4),
    fixed(s.meanPdop, 2), fixed(p.antennaHeightM, 4), kindsText(p), p.tolerance,
    fixed(s.radius95RelativeM, 4), fixed(s.up95RelativeM, 4), fixed(s.sigmaReferenceHorizontalM, 4), fixed(s.sigmaReferenceUpM, 4), fixed(s.radius95M, 4), fixed(s.up95M, 4), p.basis,
  ];
}

/** The metadata sidecar of points.csv (table-metadata.ts): what used to be its '#' header lines. */
export function pointsMetadata(o: PointsTableOptions, file = 'points.csv', columns: readonly string[] = pointsColumns(o)): Record<string, unknown> {
  return tableMetadata({
    file,
    title: 'refdelta points: one row per occupation',
    columns,
    frame: o.frame,
    ...(o.projection ? { projection: gridLabel(o)! } : {}),
    heights: `height_m is ellipsoidal${o.geoid ? `; orthometric_height_m = height_m - N above ${o.geoid.heightReference} (${o.geoid.name})` : '; orthometric_height_m is empty (no --geoid)'}`,
    notes: [
      'ecef_*, latitude/longitude/height and easting/northing are all in the frame of each row (frame, frame_epoch)',
      ...(o.projection ? [] : ['easting_m and northing_m are empty (no --projection)']),
      ...(o.geoid && /egm96/i.test(o.geoid.name + o.geoid.heightReference) ? [EGM96_NOT_A_DATUM_NOTE] : []),
      "position: Huber robust mean (k = 1.5, MAD scale) of the occupation's differential/smoothed epochs (standalone only when it has none); point_reference says which point it is",
      "radius95_relative_m / up95_relative_m: 95 % horizontal radius / vertical half-interval of the point relative to the reference (from sigma_mean_*); sigma_reference_*: the reference coordinate's own uncertainty (1 sigma); radius95_m / up95_m: both together (where the point is in the frame)",
      'sd_*: per-epoch scatter (1 sigma) in east/north/up; sigma_mean_* = sd / sqrt(n_eff) per component, where n_eff = n / tau and tau is the integrated autocorrelation time ' +
        "(initial positive sequence estimator); n_eff column: the smallest of the three components; sigma_mean_* is never below the epochs' median formal sigma " +
        '(scaled by the median variance factor) / sqrt(duration / 300 s): errors that stay constant for minutes (multipath, reference) do not show in the scatter',
      `tolerance: ok | too-few-epochs (< 10) | exceeds-horizontal (sqrt(sd_e^2+sd_n^2) > ${o.horizontalToleranceM} m) | exceeds-vertical (sd_u > ${o.verticalToleranceM} m) | exceeds-horizontal-and-vertical`,
      'times: start/end are the first/last epoch tags of the occupation (UTC ISO 8601; GPS week and time of week)',
      ...(o.notes ?? []),
    ],
  });
}

export interface PointsGeoJson {
  readonly type: 'FeatureCollection';
  readonly refdelta: Readonly<Record<string, string | number | null>>;
  readonly features: readonly {
    readonly type: 'Feature';
    readonly geometry: { readonly type: 'Point'; readonly coordinates: readonly [number, number, number] };
    readonly properties: Readonly<Record<string, string | number | null>>;
  }[];
}

/** GeoJSON (RFC 7946) FeatureCollection of the points; properties as the CSV columns (numbers as numbers). */
export function pointsGeoJson(points: readonly PointResult[], o: PointsTableOptions): PointsGeoJson {
  const cols = pointsColumns(o);
  const numeric = new Set(cols.filter((c) => /_(deg|m|s|week)$/.test(c) || c === 'epochs' || c === 'n_eff' || c === 'mean_pdop' || c === 'frame_epoch'));
  return {
    type: 'FeatureCollection',
    refdelta: {
      frame: o.frame.name,
      frame_epoch: jsonNumber(o.frame.epochYear, 4),
      projection: o.projection ? `${gridLabel(o)!.name} (${gridLabel(o)!.definition})` : 'none',
      projection_epsg: gridLabel(o)?.epsg ?? null,
      ...(o.grid ? { projection_datum: o.grid.datumNote } : {}),
      height_reference: o.geoid ? `ellipsoidal (height_m); orthometric_height_m above ${o.geoid.heightReference} (${o.geoid.name})` : 'ellipsoidal',
      ...(o.geoid && /egm96/i.test(o.geoid.name + o.geoid.heightReference) ? { vertical_datum_note: EGM96_NOT_A_DATUM_NOTE } : {}),
      precision_note: 'sigma_mean_* = max(sd / sqrt(n_eff), median formal epoch sigma x sqrt(median variance factor) / sqrt(max(1, duration / 300 s))); n_eff from the autocorrelation of each component (initial positive sequence estimator)',
      note: geojsonNote(o.frame),
    },
    features: points.map((p) => {
      const row = pointRow(p, o);
      const d = derive(p, o);
      const properties: Record<string, string | number | null> = {};
      cols.forEach((c, i) => {
        properties[c] = numeric.has(c) ? (row[i] === '' ? null : Number(row[i])) : row[i];
      });
      return {
        type: 'Feature' as const,
        geometry: { type: 'Point' as const, coordinates: [jsonNumber(d.lonDeg, 9) ?? 0, jsonNumber(d.latDeg, 9) ?? 0, jsonNumber(d.hM, 4) ?? 0] as const },
        properties,
      };
    }),
  };
}
