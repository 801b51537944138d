/**
 * Every output format in one place: its kind (the name in --outputs, summaries and events), its file
 * name, which run writes it, whether it is written by default, and its writer. The CLI iterates this
 * registry (it owns file access: writers return text or bytes, never touch files).
 *
 * Per-epoch formats are streams (start, one chunk per epoch, end) so a day at 1 Hz never sits in
 * memory as text; per-point formats are built whole. Each table names its metadata sidecar
 * (`<file>.meta.json`, table-metadata.ts) and each output with projected coordinates its `.prj`.
 */
import type { FrameEpoch, GnssSystem } from '../gnss/index.js';
import type { EpochSolution, PointReference } from '../session/solution-types.js';
import { epochFeature, geojsonNote } from './geojson.js';
import { jsonNumber } from './format.js';
import { epochTableColumns, epochTableRow, standaloneFrameNote } from './epoch-table.js';
import { RESIDUAL_COLUMNS, residualRowsOf } from './residual-rows.js';
import { pointReferenceWords } from './point-reference.js';
import { tableMetadata } from './table-metadata.js';
import { crsOfFrame } from '../frames/index.js';
import { radToDeg } from '../geodesy/index.js';
import { gpsToUtcS, isoFromSeconds } from '../time/index.js';
import { kmlEnd, kmlPlacemark, kmlStart } from './kml.js';
import { GeoPackageWriter, csvtText, gpkgFieldType, type GpkgSrs, type SqliteDatabase } from './geopackage.js';
import { DXF_NAMES_LAYER, DXF_POINTS_LAYER, pointsDxf } from './dxf.js';
import { frameWords } from './point-reference.js';
import type { PointResult } from './points-summary.js';
import type { PointsTableOptions } from './points-table.js';
import type { WindowPointNames } from '../points/index.js';

export type OutputChunk = string | Uint8Array;

/** Serialises rows of cells as CSV text (given by the caller: quoting and cell escaping are its choice). */
export type CsvSerialiser = (rows: readonly (readonly string[])[]) => string;

export interface SolveOutputContext {
  readonly frame: FrameEpoch;
  readonly pointReference: PointReference;
  /** Systems whose relative clocks get a column. */
  readonly systems: readonly GnssSystem[];
  /** Free-text notes for the metadata (how the reference coordinate was given...). */
  readonly notes: readonly string[];
  /** True when standalone rows (another frame) can occur. */
  readonly standaloneRows: boolean;
  readonly csv: CsvSerialiser;
  /** OGC WKT 1 of an EPSG code (for GeoPackage CRS rows and .prj files), null when unknown. */
  readonly wkt: (epsg: number) => string | null;
  /** A new empty SQLite database (GeoPackage output); absent when the caller has none. */
  readonly openDatabase?: () => SqliteDatabase;
  /** The epochs' point names from occupation windows; absent: the session's own (marker name, event flags). */
  readonly pointNames?: WindowPointNames;
}

/** The point column of an epoch: the window holding it when windows name the points, else the session's name. */
function pointNameOf(s: EpochSolution, ctx: SolveOutputContext): string {
  return ctx.pointNames ? ctx.pointNames.nameAt(s.tagGpsS) : s.pointName;
}

/** What a run adds after its epochs, for formats that hold more than the epochs (GeoPackage). */
export interface RunExtras {
  readonly points?: { readonly columns: readonly string[]; readonly rows: readonly (readonly string[])[]; readonly lonLatH: readonly (readonly [number, number, number])[] };
}

/** A per-epoch output: the chunks written in order; `end` may return the whole file (binary formats). */
export interface EpochOutputWriter {
  start(): OutputChunk;
  epoch(s: EpochSolution): OutputChunk;
  end(extras?: RunExtras): OutputChunk;
}

/** A file written beside an output (metadata sidecar, .prj). */
export interface SidecarFile {
  readonly kind: string;
  readonly fileName: string;
  readonly text: string;
}

export interface SolveOutputFormat {
  readonly kind: string;
  readonly fileName: string;
  readonly defaultOn: boolean;
  readonly description: string;
  open(ctx: SolveOutputContext): EpochOutputWriter;
  sidecars(ctx: SolveOutputContext): readonly SidecarFile[];
  /** True when the file is completed only when the whole run is (it takes the RunExtras). */
  readonly endsAtCommit?: boolean;
}

/** The metadata sidecar's file name for a table. */
export function metadataFileName(fileName: string): string {
  return `${fileName}.meta.json`;
}

function metaSidecar(kind: string, fileName: string, doc: Record<string, unknown>): SidecarFile {
  return { kind: `${kind}-metadata`, fileName: metadataFileName(fileName), text: JSON.stringify(doc, null, 2) + '\n' };
}

/**
 * A .prj (OGC WKT 1, as GDAL's CSV driver and shapefile readers take it) with the geographic 2-D CRS of
 * the frame, beside a table of latitude/longitude; none for a frame without a CRS (never WGS 84 by default).
 */
function geographicPrj(kind: string, fileName: string, ctx: SolveOutputContext): SidecarFile[] {
  const c = crsOfFrame(ctx.frame.name);
  const w = c ? ctx.wkt(c.geographic2d) : null;
  return w ? [{ kind: `${kind}-prj`, fileName, text: w + '\n' }] : [];
}

/*
 * The streamed writers are classes, not object literals of closures made per run: one class's epoch()
 * is one function whatever the run, so the optimised code of the loop calling it (and of epoch() itself)
 * serves every session of a batch. A closure made per run is a new call target each session, and the
 * code that had it inlined is thrown away when the run ends.
 */

/** epochs.csv: each epoch's row as text at once (the CLI buffers the bytes): rows held back for a batch
 * would outlive the collector's young generation and be copied into its old one. */
class EpochsCsvWriter implements EpochOutputWriter {
  constructor(private readonly ctx: SolveOutputContext) {}
  start(): OutputChunk { return this.ctx.csv([epochTableColumns(this.ctx.systems)]); }
  epoch(s: EpochSolution): OutputChunk { return this.ctx.csv([epochTableRow(s, this.ctx.systems, pointNameOf(s, this.ctx))]); }
  end(): OutputChunk { return ''; }
}

/** residuals.csv: one row per satellite per epoch. */
class ResidualsCsvWriter implements EpochOutputWriter {
  constructor(private readonly ctx: SolveOutputContext) {}
  start(): OutputChunk { return this.ctx.csv([[...RESIDUAL_COLUMNS]]); }
  epoch(s: EpochSolution): OutputChunk { return this.ctx.csv(residualRowsOf(s)); }
  end(): OutputChunk { return ''; }
}

/** The frame of a feature without a position of its own. */
const UNSTATED_FRAME: FrameEpoch = { name: 'unstated', epochYear: NaN };

/** positions.geojson: the features array streamed, the collection written around it. */
class GeojsonWriter implements EpochOutputWriter {
  private features = 0;
  constructor(private readonly ctx: SolveOutputContext) {}
  start(): OutputChunk {
    const ctx = this.ctx;
    const head = {
      type: 'FeatureCollection',
      refdelta: { frame: ctx.frame.name, frame_epoch: jsonNumber(ctx.frame.epochYear, 4), point_reference: pointReferenceWords(ctx.pointReference), note: geojsonNote(ctx.frame) },
    };
    // The features array is streamed: the collection is written as its members, then the array.
    return JSON.stringify(head).slice(0, -1) + ',"features":[\n';
  }
  epoch(s: EpochSolution): OutputChunk {
    // Each feature carries its own row's frame (standalone rows: the broadcast orbits' frame).
    const f = epochFeature(s, s.position?.frame ?? UNSTATED_FRAME, pointNameOf(s, this.ctx));
    return f ? (this.features++ ? ',\n' : '') + JSON.stringify(f) : '';
  }
  end(): OutputChunk { return '\n]}\n'; }
}

/** positions.kml: one placemark per epoch with a position. */
class KmlWriter implements EpochOutputWriter {
  constructor(private readonly ctx: SolveOutputContext) {}
  start(): OutputChunk { return kmlStart('refdelta epoch positions', this.ctx.frame); }
  epoch(s: EpochSolution): OutputChunk {
    if (!s.geodetic || s.kind === 'none') return '';
    const f = epochFeature(s, s.position?.frame ?? this.ctx.frame, pointNameOf(s, this.ctx));
    if (!f) return '';
    return kmlPlacemark(isoFromSeconds(gpsToUtcS(s.timeGpsS), 'Z'), radToDeg(s.geodetic.lonRad), radToDeg(s.geodetic.latRad), s.geodetic.heightM,
      { ...f.properties, height_m: jsonNumber(s.geodetic.heightM, 4) });
  }
  end(): OutputChunk { return kmlEnd(); }
}

const EPOCHS: SolveOutputFormat = {
  kind: 'epochs',
  fileName: 'epochs.csv',
  defaultOn: true,
  description: 'one row per rover epoch: position, baseline, clocks, precision, tests',
  open: (ctx) => new EpochsCsvWriter(ctx),
  sidecars(ctx) {
    return [...geographicPrj('epochs', 'epochs.prj', ctx), { kind: 'epochs-csvt', fileName: 'epochs.csvt', text: csvtText(epochTableColumns(ctx.systems)) }, metaSidecar('epochs', 'epochs.csv', tableMetadata({
      file: 'epochs.csv',
      title: 'refdelta per-epoch positions: one row per rover epoch',
      columns: epochTableColumns(ctx.systems),
      frame: ctx.frame,
      pointReference: pointReferenceWords(ctx.pointReference),
      heights: 'height_m is ellipsoidal (GRS80 / WGS 84 ellipsoid)',
      notes: [
        'gps_week/gps_tow_s are estimated GPS time; epoch_tag_tow_s is the receiver\'s tag',
        'each row states the frame and epoch of its own position (frame, frame_epoch columns)',
        ...(ctx.standaloneRows ? [standaloneFrameNote()] : []),
        ...(ctx.pointNames ? [ctx.pointNames.note()] : []),
        ...ctx.notes,
      ],
    }))];
  },
};

const RESIDUALS: SolveOutputFormat = {
  kind: 'residuals',
  fileName: 'residuals.csv',
  defaultOn: true,
  description: 'one row per satellite per rover epoch (long form): residual, weight, w-test, used or rejected with the reason',
  open: (ctx) => new ResidualsCsvWriter(ctx),
  sidecars(ctx) {
    return [{ kind: 'residuals-csvt', fileName: 'residuals.csvt', text: csvtText(RESIDUAL_COLUMNS) }, metaSidecar('residuals', 'residuals.csv', tableMetadata({
      file: 'residuals.csv',
      title: 'refdelta per-satellite residuals: one row per satellite per rover epoch (long form); join to epochs.csv on gps_week, gps_tow_s',
      columns: RESIDUAL_COLUMNS,
      frame: null,
      notes: [
        `positions of these epochs: ${ctx.frame.name} epoch ${jsonNumber(ctx.frame.epochYear, 4) ?? 'not stated'}, referring to the ${pointReferenceWords(ctx.pointReference)} (see epochs.csv)`,
        'residual_m: post-fit residual of the single difference (rover minus reference) or, for standalone rows, of the code',
        'carrier-phase epochs (solution fixed or float): one row per satellite and band; residual_m of the phase single difference where signal is a phase code (L1C, L2W...), at the fixed solution with ambiguities, clocks and position conditioned on the fixed integers, or at the float solution; of the code where signal is a pseudorange code (no phase at both receivers); from the pass (forward or backward) whose solution the epoch carries, empty when both passes fixed and disagreed',
      ],
    }))];
  },
};

const GEOJSON: SolveOutputFormat = {
  kind: 'geojson',
  fileName: 'positions.geojson',
  defaultOn: true,
  description: 'RFC 7946 FeatureCollection of the epoch positions; the actual frame in the member "refdelta" and each feature',
  open: (ctx) => new GeojsonWriter(ctx),
  sidecars: () => [],
};

const KML: SolveOutputFormat = {
  kind: 'kml',
  fileName: 'positions.kml',
  defaultOn: false,
  description: 'KML 2.2 of the epoch positions (points: also points.kml); the actual frame stated in the document',
  open: (ctx) => new KmlWriter(ctx),
  sidecars: () => [],
};

/** The GeoPackage CRS of a frame: its geographic 2-D EPSG CRS, or srs_id 0 (undefined geographic) when it has none. */
export function gpkgSrsOfFrame(frame: FrameEpoch, wkt: (epsg: number) => string | null): GpkgSrs {
  const c = crsOfFrame(frame.name);
  const w = c ? wkt(c.geographic2d) : null;
  if (!c || !w) return { srsId: 0, name: 'Undefined geographic SRS', wkt: 'undefined' };
  return { srsId: c.geographic2d, name: c.epsgName, wkt: w };
}

const GPKG: SolveOutputFormat = {
  kind: 'gpkg',
  fileName: 'positions.gpkg',
  defaultOn: false,
  description: 'GeoPackage: layers epochs (points, with the CRS of the frame), residuals (table) and, from points, points',
  endsAtCommit: true,
  open(ctx) {
    if (!ctx.openDatabase) throw new Error('GeoPackage output needs an SQLite database (openDatabase)');
    const gp = new GeoPackageWriter(ctx.openDatabase());
    const srs = gpkgSrsOfFrame(ctx.frame, ctx.wkt);
    const epochCols = epochTableColumns(ctx.systems);
    gp.addLayer({ name: 'epochs', description: `refdelta per-epoch positions in ${ctx.frame.name}`, fields: epochCols.map((name) => ({ name, type: gpkgFieldType(name) })), geometry: { srs, hasZ: true } });
    gp.addLayer({ name: 'residuals', description: 'refdelta per-satellite residuals (long form)', fields: RESIDUAL_COLUMNS.map((name) => ({ name, type: gpkgFieldType(name) })) });
    return {
      start: () => '',
      epoch: (s) => {
        const g = s.geodetic;
        // Standalone rows are in another frame: their geometry is left empty rather than mislabelled (their columns hold the values).
        const sameFrame = s.kind !== 'standalone';
        gp.addRow('epochs', g && s.kind !== 'none' && sameFrame ? [radToDeg(g.lonRad), radToDeg(g.latRad), g.heightM] : null, epochTableRow(s, ctx.systems, pointNameOf(s, ctx)));
        for (const r of residualRowsOf(s)) gp.addRow('residuals', null, r);
        return '';
      },
      end: (extras) => {
        if (extras?.points) {
          const p = extras.points;
          gp.addLayer({ name: 'points', description: `refdelta points in ${ctx.frame.name}`, fields: p.columns.map((name) => ({ name, type: gpkgFieldType(name) })), geometry: { srs, hasZ: true } });
          p.rows.forEach((r, i) => gp.addRow('points', p.lonLatH[i] ?? null, r));
        }
        return gp.finish();
      },
    };
  },
  sidecars: () => [],
};

/** The per-epoch outputs of a solve run, in the order they are written; `summary` is the run's index, written last by the CLI. */
export const SOLVE_OUTPUT_FORMATS: readonly SolveOutputFormat[] = [EPOCHS, RESIDUALS, GEOJSON, KML, GPKG];

/** What per-point formats are built from. */
export interface PointsOutputContext {
  readonly points: readonly PointResult[];
  readonly table: PointsTableOptions;
  readonly columns: readonly string[];
  readonly rows: readonly (readonly string[])[];
}

/** A per-point output of `points`, asked for by the same kind in --outputs. */
export interface PointsOutputFormat {
  readonly kind: string;
  readonly fileName: string;
  readonly description: string;
  /** Why the format cannot be written with these options, or null. */
  refuse(table: Pick<PointsTableOptions, 'projection'>): string | null;
  build(ctx: PointsOutputContext): OutputChunk;
}

const POINTS_KML: PointsOutputFormat = {
  kind: 'kml',
  fileName: 'points.kml',
  description: 'KML 2.2 of the points',
  refuse: () => null,
  build(ctx) {
    const cols = ctx.columns;
    const at = (r: readonly string[], c: string) => r[cols.indexOf(c)] ?? '';
    return kmlStart('refdelta points', ctx.table.frame) + ctx.rows.map((r) => {
      const fields: Record<string, string> = {};
      cols.forEach((c, i) => { fields[c] = r[i] ?? ''; });
      return kmlPlacemark(at(r, 'name'), Number(at(r, 'longitude_deg')), Number(at(r, 'latitude_deg')), Number(at(r, 'height_m')), fields);
    }).join('') + kmlEnd();
  },
};

const POINTS_DXF: PointsOutputFormat = {
  kind: 'dxf',
  fileName: 'points.dxf',
  description: 'DXF for CAD: the points as named 3-D points in the projected CRS (needs --projection; heights orthometric with --geoid, else ellipsoidal)',
  refuse: (t) => (!t.projection ? 'dxf holds grid coordinates: give --projection (an EPSG code or utm)' : t.projection.units !== 'm' ? 'dxf holds grid coordinates in metres: give a projected CRS, not a geographic one' : null),
  build(ctx) {
    const cols = ctx.columns;
    const at = (r: readonly string[], c: string) => r[cols.indexOf(c)] ?? '';
    return pointsDxf(ctx.rows.map((r) => ({
      name: at(r, 'name'), eastingM: Number(at(r, 'easting_m')), northingM: Number(at(r, 'northing_m')),
      heightM: Number(at(r, 'orthometric_height_m') !== '' ? at(r, 'orthometric_height_m') : at(r, 'height_m')),
    })), dxfComments(ctx.table));
  },
};

/** The DXF's comment lines: what x, y and z are (DXF has no place for a CRS). */
function dxfComments(t: PointsTableOptions): string[] {
  const grid = t.grid ? t.grid.name : t.projection ? t.projection.name : 'no projection';
  return [
    'refdelta points: POINT entities on layer ' + DXF_POINTS_LAYER + ', their names as MTEXT on ' + DXF_NAMES_LAYER,
    `x = easting, y = northing in metres: ${grid} (its WKT in points.prj)`,
    t.geoid
      ? `z = orthometric height in metres above ${t.geoid.heightReference} (${t.geoid.name}): ellipsoidal height minus the geoid undulation`
      : 'z = ellipsoidal height in metres (GRS80 / WGS 84 ellipsoid), not a height above sea level',
    `positions in the frame ${frameWords(t.frame)}, projected without a datum shift`,
  ];
}

/** Per-point outputs besides points.csv, points.geojson (always written by `points`) and the GeoPackage layer. */
export const POINTS_OUTPUT_FORMATS: readonly PointsOutputFormat[] = [POINTS_KML, POINTS_DXF];

export const SUMMARY_FILE_NAME = 'summary.json';

/** What `check` outputs are built from: control-check.csv's columns and rows, and the frames compared in. */
export interface CheckOutputContext {
  readonly columns: readonly string[];
  readonly rows: readonly (readonly string[])[];
  /** The frame of each row's comparison (the mark's). */
  readonly frames: readonly FrameEpoch[];
  readonly wkt: (epsg: number) => string | null;
  readonly openDatabase?: () => SqliteDatabase;
}

export interface CheckOutputFormat {
  readonly kind: string;
  readonly fileName: string;
  readonly description: string;
  build(ctx: CheckOutputContext): OutputChunk;
}

const CHECK_GPKG: CheckOutputFormat = {
  kind: 'gpkg',
  fileName: 'control-check.gpkg',
  description: 'GeoPackage layer control_check: one 3-D point per comparison at the mark, with every column of control-check.csv',
  build(ctx) {
    if (!ctx.openDatabase) throw new Error('GeoPackage output needs an SQLite database (openDatabase)');
    const gp = new GeoPackageWriter(ctx.openDatabase());
    // One CRS for the layer: the marks' frame when they share one, else undefined (srs_id 0), never a guess.
    const names = new Set(ctx.frames.map((f) => crsOfFrame(f.name)?.geographic2d ?? -1));
    const srs = names.size === 1 && ctx.frames[0] ? gpkgSrsOfFrame(ctx.frames[0], ctx.wkt) : { srsId: 0, name: 'Undefined geographic SRS', wkt: 'undefined' };
    gp.addLayer({ name: 'control_check', description: 'refdelta control check: computed point minus published mark', fields: ctx.columns.map((name) => ({ name, type: gpkgFieldType(name) })), geometry: { srs, hasZ: true } });
    const at = (r: readonly string[], c: string) => Number(r[ctx.columns.indexOf(c)]);
    for (const r of ctx.rows) gp.addRow('control_check', [at(r, 'mark_longitude_deg'), at(r, 'mark_latitude_deg'), at(r, 'mark_height_m')], r);
    return gp.finish();
  },
};

/** Outputs of `check` besides control-check.csv and control-check.json (always written). */
export const CHECK_OUTPUT_FORMATS: readonly CheckOutputFormat[] = [CHECK_GPKG];
