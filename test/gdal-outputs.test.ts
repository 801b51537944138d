/**
 * Every table and every GeoPackage, KML and DXF output read with GDAL (Debian's gdal-bin: ogrinfo,
 * ogr2ogr) and one projected coordinate checked against PROJ's own transformation (cs2cs, proj-bin):
 * GDAL and PROJ are the outside references. Run on the simulated demo scenario (self-consistency of
 * the data; the readers and PROJ are independent of the project). Skipped with a one-line reason when
 * GDAL is not installed (.ci/run installs it).
 */
import { spawnSync } from 'node:child_process';
import { readFileSync, writeFileSync } from 'node:fs';
import { join } from 'node:path';
import { beforeAll, describe, expect, it } from 'vitest';
import { parseIsgGrid } from '@refdelta/core';
import { fixturePath } from './support/shared.js';
import { parseCsv, requireBuiltCli, runCli, tempDir } from './cli-support.js';

const HAVE_GDAL = spawnSync('ogrinfo', ['--version'], { encoding: 'utf8' }).status === 0 && spawnSync('cs2cs', [], { encoding: 'utf8' }).error === undefined;
const DEMO = (f: string) => fixturePath(`demo/${f}`);
const RUN = ['--rover', DEMO('rover-1s.obs'), '--reference', DEMO('KFRD-reference-5s.obs'), '--nav', DEMO('broadcast-mixed.nav'), '--ref-coord', 'KFRD', '--marks', DEMO('control-marks.csv')];
const ALL_OUTPUTS = ['--outputs', 'epochs,residuals,geojson,kml,gpkg,dxf,summary'];

function tool(cmd: string, args: readonly string[], input?: string): string {
  const r = spawnSync(cmd, args, { encoding: 'utf8', input, maxBuffer: 256 * 1024 * 1024 });
  if (r.status !== 0) throw new Error(`${cmd} ${args.join(' ')} failed: ${r.stderr}`);
  return r.stdout;
}

interface GdalLayer {
  readonly features: { readonly properties: Record<string, unknown>; readonly geometry: { type: string; coordinates: number[] } | null }[];
  readonly crs: string | null;
}

/** A layer as GDAL reads it (ogr2ogr to GeoJSON on stdout, coordinates as stored, no reprojection). */
function readLayer(file: string, layer?: string, openOptions: readonly string[] = [], where?: string): GdalLayer {
  const args = ['-f', 'GeoJSON', '/vsistdout/', ...openOptions.flatMap((o) => ['-oo', o]), ...(where ? ['-where', where] : []), file, ...(layer ? [layer] : [])];
  const j = JSON.parse(tool('ogr2ogr', args));
  return { features: j.features, crs: j.crs?.properties?.name ?? null };
}

/** EPSG code of a layer's CRS as GDAL identifies it (ogrinfo's WKT: the last ID is the CRS's own). */
function layerEpsg(file: string, layer: string, openOptions: readonly string[] = []): number | null {
  const out = tool('ogrinfo', ['-so', ...openOptions.flatMap((o) => ['-oo', o]), file, layer]);
  const ids = [...out.matchAll(/ID\["EPSG",(\d+)\]/g)];
  return ids.length ? Number(ids[ids.length - 1]![1]) : null;
}

const CSV_XY = ['X_POSSIBLE_NAMES=longitude_deg', 'Y_POSSIBLE_NAMES=latitude_deg', 'Z_POSSIBLE_NAMES=height_m', 'KEEP_GEOM_COLUMNS=YES'];
const CSV_EN = ['X_POSSIBLE_NAMES=easting_m', 'Y_POSSIBLE_NAMES=northing_m', 'KEEP_GEOM_COLUMNS=YES'];

if (!HAVE_GDAL) console.warn('[skip] outputs read with GDAL: ogrinfo/ogr2ogr/cs2cs not installed (apt-get install gdal-bin proj-bin)');

describe.skipIf(!HAVE_GDAL)('outputs read with GDAL, projected coordinates against PROJ (demo scenario, simulated)', () => {
  let out = '';
  let out2 = '';
  let chk = '';
  beforeAll(() => {
    requireBuiltCli();
    out = tempDir('rd-gdal-');
    const r = runCli(['points', ...RUN, ...ALL_OUTPUTS, '--smooth', '100', '--projection', 'EPSG:2157', '--geoid', 'egm96', '--out', out]);
    expect(r.status, r.stderr).toBe(0);
    // A second national grid: the Swiss LV95 (EPSG:2056), on another datum (CH1903+): projected as given, with a warning.
    out2 = tempDir('rd-gdal2-');
    const r2 = runCli(['points', ...RUN, '--outputs', 'summary', '--projection', 'EPSG:2056', '--out', out2]);
    expect(r2.status, r2.stderr).toBe(0);
    expect(r2.stderr).toMatch(/CH1903\+ \/ LV95 \(EPSG:2056\) is on a datum other than the points' frame WGS84/);
    chk = tempDir('rd-gdal-chk-');
    const r3 = runCli(['check', '--points', join(out, 'points.csv'), '--marks', DEMO('control-marks.csv'), '--outputs', 'gpkg', '--out', chk]);
    expect([0, 3]).toContain(r3.status);
  }, 240_000);

  it('epochs.csv: one feature per epoch, geometry on every positioned row, CRS from epochs.prj (WGS84 frame -> EPSG:4326)', () => {
    const rows = parseCsv(readFileSync(join(out, 'epochs.csv'), 'utf8')).rows;
    const l = readLayer(join(out, 'epochs.csv'), undefined, CSV_XY);
    expect(l.features.length).toBe(rows.length);
    expect(l.features.filter((f) => f.geometry).length).toBe(rows.filter((r) => r.latitude_deg !== '').length);
    expect(layerEpsg(join(out, 'epochs.csv'), 'epochs', CSV_XY)).toBe(4326);
    // Types are detected from the values (numbers stay numbers, the header is the first line).
    expect(typeof l.features[0]!.properties.frame_epoch).toBe('number');
  });

  it('residuals.csv, control-check.csv and points.csv open as tables with their own header', () => {
    const res = parseCsv(readFileSync(join(out, 'residuals.csv'), 'utf8')).rows;
    expect(readLayer(join(out, 'residuals.csv')).features.length).toBe(res.length);
    const chkRows = parseCsv(readFileSync(join(chk, 'control-check.csv'), 'utf8')).rows;
    expect(readLayer(join(chk, 'control-check.csv')).features.length).toBe(chkRows.length);
    const pts = readLayer(join(out, 'points.csv'), undefined, CSV_EN);
    expect(pts.features.length).toBe(4);
    expect(pts.features.every((f) => f.geometry?.type === 'Point')).toBe(true);
    // CRS as stated: points.prj is the EPSG dataset's WKT of the projection asked for.
    expect(pts.crs).toBe('urn:ogc:def:crs:EPSG::2157');
  });

  it('GeoPackage: epochs, residuals and points layers; counts, geometry and the frame CRS', () => {
    const gpkg = join(out, 'positions.gpkg');
    const rows = parseCsv(readFileSync(join(out, 'epochs.csv'), 'utf8')).rows;
    const ep = readLayer(gpkg, 'epochs');
    expect(ep.features.length).toBe(rows.length);
    expect(ep.features.filter((f) => f.geometry).length).toBe(rows.filter((r) => r.latitude_deg !== '').length);
    expect(layerEpsg(gpkg, 'epochs')).toBe(4326);
    expect(readLayer(gpkg, 'residuals').features.length).toBe(parseCsv(readFileSync(join(out, 'residuals.csv'), 'utf8')).rows.length);
    const pts = readLayer(gpkg, 'points');
    expect(pts.features.length).toBe(4);
    expect(pts.features.every((f) => f.geometry?.coordinates.length === 3)).toBe(true);
    expect(layerEpsg(gpkg, 'points')).toBe(4326);
    const csv = parseCsv(readFileSync(join(out, 'points.csv'), 'utf8')).rows;
    // The geometry is the row's own latitude/longitude/height (to the 1e-9 deg of the CSV).
    const f0 = pts.features.find((f) => f.properties.name === csv[0]!.name)!;
    expect(Math.abs(f0.geometry!.coordinates[0]! - Number(csv[0]!.longitude_deg))).toBeLessThan(1e-8);
    expect(Math.abs(f0.geometry!.coordinates[1]! - Number(csv[0]!.latitude_deg))).toBeLessThan(1e-8);
  });

  it('GeoPackage of the check: one point per comparison at its mark, in the marks\' CRS', () => {
    const rows = parseCsv(readFileSync(join(chk, 'control-check.csv'), 'utf8')).rows;
    const l = readLayer(join(chk, 'control-check.gpkg'), 'control_check');
    expect(l.features.length).toBe(rows.length);
    expect(l.features.every((f) => f.geometry?.coordinates.length === 3)).toBe(true);
    expect(layerEpsg(join(chk, 'control-check.gpkg'), 'control_check')).toBe(4326);
  });

  it('KML: one placemark per positioned epoch and per point', () => {
    const rows = parseCsv(readFileSync(join(out, 'epochs.csv'), 'utf8')).rows;
    expect(readLayer(join(out, 'positions.kml')).features.length).toBe(rows.filter((r) => r.latitude_deg !== '').length);
    const k = readLayer(join(out, 'points.kml'));
    expect(k.features.map((f) => f.properties.Name ?? f.properties.name).sort()).toEqual(['ELMCORNER', 'FERRYPOST', 'MILLSTONE', 'WELLHEAD']);
  });

  it('DXF: the points as 3-D points on their layer, at the grid coordinates and heights of points.csv', () => {
    const d = readLayer(join(out, 'points.dxf'), undefined, [], "Layer = 'REFDELTA_POINTS'");
    expect(d.features.length).toBe(4);
    const csv = parseCsv(readFileSync(join(out, 'points.csv'), 'utf8')).rows;
    for (const f of d.features) {
      const [e, n, h] = f.geometry!.coordinates;
      const row = csv.find((r) => Math.abs(Number(r.easting_m) - e!) < 1e-3);
      expect(row).toBeDefined();
      expect(Math.abs(Number(row!.northing_m) - n!)).toBeLessThan(1e-3);
      expect(Math.abs(Number(row!.orthometric_height_m) - h!)).toBeLessThan(1e-3);
    }
  });

  it('projected coordinates within 1 mm of PROJ (cs2cs) for EPSG:2157 and EPSG:2056, from the base geographic CRS named in the .prj', () => {
    for (const dir of [out, out2]) {
      const prj = readFileSync(join(dir, 'points.prj'), 'utf8');
      const projected = /AUTHORITY\["EPSG","(\d+)"\]\]\s*$/.exec(prj)![1];
      // GEOGCS[...,AUTHORITY["EPSG","4173"]]: the base geographic CRS; no datum shift between the two.
      const base = /GEOGCS\[.*?AUTHORITY\["EPSG","(\d+)"\]\],PROJECTION/.exec(prj.replace(/\n/g, ''))![1];
      const row = parseCsv(readFileSync(join(dir, 'points.csv'), 'utf8')).rows[0]!;
      // EPSG axis order of a geographic CRS: latitude, longitude.
      const [e, n] = tool('cs2cs', ['-f', '%.6f', `EPSG:${base}`, `EPSG:${projected}`], `${row.latitude_deg} ${row.longitude_deg}\n`).trim().split(/\s+/).map(Number);
      expect(Math.abs(Number(row.easting_m) - e!), `${projected} easting`).toBeLessThan(1e-3);
      expect(Math.abs(Number(row.northing_m) - n!), `${projected} northing`).toBeLessThan(1e-3);
    }
  });

  it("GDAL's ISG driver and ours read the same node values from an ISG grid whose limits are the outer cell edges", () => {
    // GDAL 3.6 reads ISG limits as cell edges (nodes at the cell centres); the fixture states node limits
    // (ISG 2.0): the same nodes written with edge limits, read by both.
    const text = readFileSync(fixturePath('geo/egm96-crop.isg'), 'utf8')
      .replace(/lat min += +46\.500000/, 'lat min = 46.375').replace(/lat max += +47\.250000/, 'lat max = 47.375')
      .replace(/lon min += +102\.000000/, 'lon min = 101.875').replace(/lon max += +102\.750000/, 'lon max = 102.875')
      .replace(/ISG format += +2\.0/, 'ISG format = 1.01');
    const file = join(tempDir('rd-isg-'), 'edges.isg');
    writeFileSync(file, text);
    const ours = parseIsgGrid(file, text);
    for (const [lon, lat] of [[102.25, 47.0], [102.75, 46.5], [102.0, 47.25], [102.5, 46.75]] as const) {
      const gdal = Number(tool('gdallocationinfo', ['-valonly', '-geoloc', file, String(lon), String(lat)]));
      expect(Math.abs(ours.undulationM(lat, lon) - gdal)).toBeLessThan(5e-5);
    }
  });
});
