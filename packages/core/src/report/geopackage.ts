/**
 * GeoPackage (OGC 12-128r18, GeoPackage Encoding Standard 1.3) written into an SQLite database the
 * caller opens (the CLI uses sql.js, SQLite compiled to WebAssembly): layers of points with their CRS,
 * and attribute tables without geometry. Only what the standard requires is written: the
 * application_id and user_version (clause 1.1.1.1), gpkg_spatial_ref_sys with its three mandatory rows
 * (1.1.2), gpkg_contents (1.1.3), gpkg_geometry_columns (2.1.5) and geometry blobs in GeoPackageBinary:
 * header 'GP', version 0, flags, srs_id, then ISO WKB (2.1.3; WKB Point Z type 1001, ISO/IEC 13249-3).
 * A frame without an EPSG CRS is stored with srs_id 0, the standard's "undefined geographic
 * coordinate reference system" (clause 1.1.2.1.2), never as WGS 84.
 */

/** The little of an SQLite database this module uses (sql.js' Database has these methods). */
export interface SqliteDatabase {
  run(sql: string, params?: unknown[]): unknown;
  prepare(sql: string): { run(params?: unknown[]): unknown; free(): unknown };
  export(): Uint8Array;
}

export interface GpkgSrs {
  /** EPSG code, or 0 for an undefined geographic CRS. */
  readonly srsId: number;
  readonly name: string;
  /** OGC WKT 1 of the CRS ('undefined' for srs_id 0, as the standard's own row). */
  readonly wkt: string;
}

export type GpkgFieldType = 'TEXT' | 'REAL' | 'INTEGER';

export interface GpkgLayer {
  readonly name: string;
  readonly description: string;
  /** Column names and their SQLite types (geometry excluded). */
  readonly fields: readonly { readonly name: string; readonly type: GpkgFieldType }[];
  /** Point geometry and its CRS; absent for an attribute table. */
  readonly geometry?: { readonly srs: GpkgSrs; readonly hasZ: boolean };
}

const GPKG_APPLICATION_ID = 0x47504b47; // 'GPKG' (clause 1.1.1.1.1)
const GPKG_USER_VERSION = 10300; // version 1.3.0 (clause 1.1.1.1.1)

/** Double-quoted SQL identifier. */
function ident(name: string): string {
  return `"${name.replace(/"/g, '""')}"`;
}

/** GeoPackageBinary of a point (clause 2.1.3): header without envelope, little-endian ISO WKB Point or Point Z. */
export function gpkgPointBlob(srsId: number, x: number, y: number, z?: number): Uint8Array {
  const hasZ = z !== undefined;
  const buf = new ArrayBuffer(8 + 5 + (hasZ ? 24 : 16));
  const v = new DataView(buf);
  v.setUint8(0, 0x47); // 'G'
  v.setUint8(1, 0x50); // 'P'
  v.setUint8(2, 0); // version 1
  v.setUint8(3, 0b00000001); // flags: standard, not empty, no envelope, little-endian
  v.setInt32(4, srsId, true);
  v.setUint8(8, 1); // WKB little-endian
  v.setUint32(9, hasZ ? 1001 : 1, true); // ISO WKB Point Z = 1001, Point = 1
  v.setFloat64(13, x, true);
  v.setFloat64(21, y, true);
  if (hasZ) v.setFloat64(29, z, true);
  return new Uint8Array(buf);
}

/** Creates the GeoPackage core tables in an empty database. */
export function initGeoPackage(db: SqliteDatabase): void {
  db.run(`PRAGMA application_id = ${GPKG_APPLICATION_ID}`);
  db.run(`PRAGMA user_version = ${GPKG_USER_VERSION}`);
  db.run(`CREATE TABLE gpkg_spatial_ref_sys (srs_name TEXT NOT NULL, srs_id INTEGER NOT NULL PRIMARY KEY, organization TEXT NOT NULL,
    organization_coordsys_id INTEGER NOT NULL, definition TEXT NOT NULL, description TEXT)`);
  db.run(`CREATE TABLE gpkg_contents (table_name TEXT NOT NULL PRIMARY KEY, data_type TEXT NOT NULL, identifier TEXT UNIQUE, description TEXT DEFAULT '',
    last_change DATETIME NOT NULL DEFAULT (strftime('%Y-%m-%dT%H:%M:%fZ','now')), min_x DOUBLE, min_y DOUBLE, max_x DOUBLE, max_y DOUBLE, srs_id INTEGER,
    CONSTRAINT fk_gc_r_srs_id FOREIGN KEY (srs_id) REFERENCES gpkg_spatial_ref_sys(srs_id))`);
  db.run(`CREATE TABLE gpkg_geometry_columns (table_name TEXT NOT NULL, column_name TEXT NOT NULL, geometry_type_name TEXT NOT NULL, srs_id INTEGER NOT NULL,
    z TINYINT NOT NULL, m TINYINT NOT NULL, CONSTRAINT pk_geom_cols PRIMARY KEY (table_name, column_name),
    CONSTRAINT fk_gc_tn FOREIGN KEY (table_name) REFERENCES gpkg_contents(table_name), CONSTRAINT fk_gc_srs FOREIGN KEY (srs_id) REFERENCES gpkg_spatial_ref_sys (srs_id))`);
  // The three rows every GeoPackage holds (clause 1.1.2.1.2, table 3).
  const ins = `INSERT INTO gpkg_spatial_ref_sys (srs_name, srs_id, organization, organization_coordsys_id, definition, description) VALUES (?, ?, ?, ?, ?, ?)`;
  db.run(ins, ['Undefined cartesian SRS', -1, 'NONE', -1, 'undefined', 'undefined cartesian coordinate reference system']);
  db.run(ins, ['Undefined geographic SRS', 0, 'NONE', 0, 'undefined', 'undefined geographic coordinate reference system']);
  db.run(ins, ['WGS 84 geodetic', 4326, 'EPSG', 4326,
    'GEOGCS["WGS 84",DATUM["WGS_1984",SPHEROID["WGS 84",6378137,298.257223563,AUTHORITY["EPSG","7030"]],AUTHORITY["EPSG","6326"]],PRIMEM["Greenwich",0,AUTHORITY["EPSG","8901"]],UNIT["degree",0.0174532925199433,AUTHORITY["EPSG","9122"]],AUTHORITY["EPSG","4326"]]',
    'longitude/latitude coordinates in decimal degrees on the WGS 84 spheroid']);
}

/** Adds a CRS row once. */
function ensureSrs(db: SqliteDatabase, srs: GpkgSrs, known: Set<number>): void {
  if (known.has(srs.srsId) || srs.srsId === 0 || srs.srsId === -1 || srs.srsId === 4326) return;
  db.run(`INSERT INTO gpkg_spatial_ref_sys (srs_name, srs_id, organization, organization_coordsys_id, definition, description) VALUES (?, ?, 'EPSG', ?, ?, ?)`,
    [srs.name, srs.srsId, srs.srsId, srs.wkt, srs.name]);
  known.add(srs.srsId);
}

/** A GeoPackage being filled: layers created, rows inserted, then exported as bytes. */
export class GeoPackageWriter {
  private readonly srsKnown = new Set<number>();
  private readonly inserts = new Map<string, { stmt: ReturnType<SqliteDatabase['prepare']>; layer: GpkgLayer; extent: number[] }>();

  constructor(private readonly db: SqliteDatabase) {
    initGeoPackage(db);
    db.run('BEGIN');
  }

  addLayer(layer: GpkgLayer): void {
    const g = layer.geometry;
    if (g) ensureSrs(this.db, g.srs, this.srsKnown);
    const cols = ['fid INTEGER PRIMARY KEY AUTOINCREMENT NOT NULL', ...(g ? ['geom POINT'] : []), ...layer.fields.map((f) => `${ident(f.name)} ${f.type}`)];
    this.db.run(`CREATE TABLE ${ident(layer.name)} (${cols.join(', ')})`);
    this.db.run(`INSERT INTO gpkg_contents (table_name, data_type, identifier, description, srs_id) VALUES (?, ?, ?, ?, ?)`,
      [layer.name, g ? 'features' : 'attributes', layer.name, layer.description, g ? g.srs.srsId : null]);
    if (g) {
      this.db.run(`INSERT INTO gpkg_geometry_columns (table_name, column_name, geometry_type_name, srs_id, z, m) VALUES (?, 'geom', 'POINT', ?, ?, 0)`,
        [layer.name, g.srs.srsId, g.hasZ ? 1 : 0]);
    }
    const names = [...(g ? ['geom'] : []), ...layer.fields.map((f) => f.name)];
    const stmt = this.db.prepare(`INSERT INTO ${ident(layer.name)} (${names.map(ident).join(', ')}) VALUES (${names.map(() => '?').join(', ')})`);
    this.inserts.set(layer.name, { stmt, layer, extent: [Infinity, Infinity, -Infinity, -Infinity] });
  }

  /** One row: `point` [x, y, z?] in the layer's CRS (x = longitude / easting), cells aligned with the layer's fields. */
  addRow(layerName: string, point: readonly number[] | null, cells: readonly (string | number | null)[]): void {
    const ins = this.inserts.get(layerName);
    if (!ins) throw new Error(`GeoPackage layer ${layerName} was not created`);
    const g = ins.layer.geometry;
    const values: unknown[] = [];
    if (g) {
      if (point && point.every(Number.isFinite)) {
        values.push(gpkgPointBlob(g.srs.srsId, point[0]!, point[1]!, g.hasZ ? point[2] ?? 0 : undefined));
        const e = ins.extent;
        e[0] = Math.min(e[0]!, point[0]!); e[1] = Math.min(e[1]!, point[1]!); e[2] = Math.max(e[2]!, point[0]!); e[3] = Math.max(e[3]!, point[1]!);
      } else {
        values.push(null);
      }
    }
    ins.layer.fields.forEach((f, i) => {
      const c = cells[i];
      if (c === null || c === undefined || c === '') values.push(null);
      else if (f.type === 'TEXT') values.push(String(c));
      else {
        const n = Number(c);
        values.push(Number.isFinite(n) ? n : null);
      }
    });
    ins.stmt.run(values);
  }

  /** Writes the extents, commits and returns the file's bytes. */
  finish(): Uint8Array {
    for (const { stmt, layer, extent } of this.inserts.values()) {
      stmt.free();
      if (layer.geometry && Number.isFinite(extent[0])) {
        this.db.run('UPDATE gpkg_contents SET min_x = ?, min_y = ?, max_x = ?, max_y = ? WHERE table_name = ?', [...extent, layer.name]);
      }
    }
    this.db.run('COMMIT');
    return this.db.export();
  }
}

/** SQLite type of one of our columns, from its name (vocabulary.ts: units as suffixes). */
export function gpkgFieldType(column: string): GpkgFieldType {
  if (/^(gps_week|start_gps_week|end_gps_week|epochs|satellites_used|fixed_ambiguities|ambiguities_held)$/.test(column)) return 'INTEGER';
  if (/(_m|_deg|_s|_m_s|_m2)$/.test(column) || /^(pdop|hdop|vdop|variance_factor|chi_square|chi_square_critical|chi2_h|chi2_v|w_test|n_eff|mean_pdop|frame_epoch|ratio)$/.test(column)) return 'REAL';
  return 'TEXT';
}

/**
 * The GDAL CSV driver's column-type sidecar (`<name>.csvt`: one line of quoted types; GDAL CSV driver
 * documentation, also read by QGIS): numbers open as numbers, without any option.
 */
export function csvtText(columns: readonly string[]): string {
  return columns.map((c) => `"${gpkgFieldType(c) === 'TEXT' ? 'String' : gpkgFieldType(c) === 'INTEGER' ? 'Integer' : 'Real'}"`).join(',') + '\n';
}
