/**
 * The metadata sidecar of a table (`<file>.meta.json`): what a '#' preamble would say, kept out of the
 * CSV so the table opens as it is in a GIS or a spreadsheet (the header is the first line). It names
 * the frame and epoch, the EPSG CRS of the coordinates (or why there is none), the point the positions
 * refer to, the projection and height reference when there are any, notes, and every column with its
 * unit and meaning from the one output vocabulary (vocabulary.ts).
 */
import type { FrameEpoch } from '../gnss/index.js';
import { crsOfFrame } from '../frames/index.js';
import { jsonNumber } from './format.js';
import { columnsDescribed } from './vocabulary.js';

export interface TableMetadataInput {
  /** File name of the table described. */
  readonly file: string;
  /** One sentence: what a row is. */
  readonly title: string;
  readonly columns: readonly string[];
  /** The frame of the coordinates (null: the table has no coordinates of its own). */
  readonly frame: FrameEpoch | null;
  readonly pointReference?: string;
  /** Projected coordinates: EPSG code (or null when given as a PROJ string) and description. */
  readonly projection?: { readonly epsg: number | null; readonly name: string; readonly definition: string; readonly datum?: string };
  readonly heights?: string;
  readonly notes?: readonly string[];
}

export interface CrsStatement {
  readonly geographic_epsg: number | null;
  readonly geographic_3d_epsg: number | null;
  readonly geocentric_epsg: number | null;
  /** Why no CRS is given, when none is. */
  readonly note: string | null;
}

/** The EPSG codes of a frame, or a note saying why the coordinates are left unlabelled. */
export function crsStatement(frame: FrameEpoch): CrsStatement {
  const c = crsOfFrame(frame.name);
  if (!c) {
    return {
      geographic_epsg: null, geographic_3d_epsg: null, geocentric_epsg: null,
      note: `the frame '${frame.name}' has no EPSG CRS known to refdelta: the coordinates are left without a CRS (a GIS must not assume WGS 84)`,
    };
  }
  return { geographic_epsg: c.geographic2d, geographic_3d_epsg: c.geographic3d, geocentric_epsg: c.geocentric, note: null };
}

export function tableMetadata(m: TableMetadataInput): Record<string, unknown> {
  return {
    refdelta_table: 1,
    file: m.file,
    title: m.title,
    format: 'CSV (RFC 4180): comma-separated, first line the column names, UTF-8, LF line ends; an empty cell means "no value"',
    ...(m.frame
      ? { frame: m.frame.name, frame_epoch: jsonNumber(m.frame.epochYear, 4), crs: crsStatement(m.frame) }
      : {}),
    ...(m.pointReference ? { point_reference: m.pointReference } : {}),
    ...(m.projection ? { projection: { epsg: m.projection.epsg, name: m.projection.name, definition: m.projection.definition, applied: 'to latitude/longitude in the frame above, without any datum shift', ...(m.projection.datum ? { datum: m.projection.datum } : {}) } } : {}),
    ...(m.heights ? { heights: m.heights } : {}),
    notes: [...(m.notes ?? [])],
    columns: columnsDescribed(m.columns),
  };
}
