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
  let out3 = '';
  let out4 = '';
  let chk = '';
  beforeAll(() => {
    requireBuiltCli();
    out = tempDir('rd-gdal-');
    // The demo's frame is WGS84: 'utm' is WGS 84 / UTM zone 32N (EPSG:32632).
    const r = runCli(['points', ...RUN, ...ALL_OUTPUTS, '--smooth', '100', '--projection', 'utm', '--geoid', 'egm96', '--out', out]);
    expect(r.status, r.stderr).toBe(0);
    expect(r.stderr).not.toMatch(/projection-datum|on a datum other than/);
    expect(r.stderr).not.toMatch(/usable area/);
    // National grids on other datums: the Swiss LV95 (EPSG:2056, CH1903+ on Bessel 1841) and the Irish ITM
    // (EPSG:2157, IRENET95 on GRS80): projected as given, with a warning, and labelled as what they are.
    out2 = tempDir('rd-gdal2-');
    const r2 = runCli(['points', ...RUN, '--outputs', 'summary', '--projection', 'EPSG:2056', '--out', out2]);
    expect(r2.status, r2.stderr).toBe(0);
    expect(r2.stderr).toMatch(/CH1903\+ \/ LV95 \(EPSG:2056\) is on a datum other than the points' frame WGS84/);
    expect(r2.stderr).not.toMatch(/usable area/); // Switzerland is EPSG:2056's area of use (EPSG dataset)
    out3 = tempDir('rd-gdal3-');
    const r3 = runCli(['points', ...RUN, '--outputs', 'summary', '--projection', 'EPSG:2157', '--out', out3]);
    expect(r3.status, r3.stderr).toBe(0);
    expect(r3.stderr).toMatch(/IRENET95 \/ Irish Transverse Mercator \(EPSG:2157\) is on a datum other than the points' frame WGS84/);
    // The demo is in Switzerland, far outside Ireland (EPSG dataset area of use of EPSG:2157: 51.39 N to 55.43 N, 10.56 W to 5.34 W).
    expect(r3.stderr).toMatch(/warning: 4 of 4 point\(s\) lie outside the usable area of IRENET95 \/ Irish Transverse Mercator \(EPSG:2157\): MILLSTONE .*outside its area of use in the EPSG dataset, 51\.3900 N to 55\.4300 N, 10\.5600 W to 5\.3400 W/);
    // The reference coordinate from the file header: its frame is unstated.
    out4 = tempDir('rd-gdal4-');
    const r4 = runCli(['points', '--rover', DEMO('rover-1s.obs'), '--reference', DEMO('KFRD-reference-5s.obs'), '--nav', DEMO('broadcast-mixed.nav'), '--ref-coord', 'header', '--outputs', 'summary', '--projection', 'utm', '--out', out4]);
    expect(r4.status, r4.stderr).toBe(0);
    expect(r4.stderr).toMatch(/frame is not stated \('unstated'\): easting\/northing are UTM zone 32N grid coordinates on an unknown datum/);
    chk = tempDir('rd-gdal-chk-');
    const rc = runCli(['check', '--points', join(out, 'points.csv'), '--marks', DEMO('control-marks.csv'), '--outputs', 'gpkg', '--out', chk]);
    expect([0, 3]).toContain(rc.status);
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
    // CRS as stated: points.prj is the EPSG dataset's WKT of the projection asked for (same datum as the points).
    expect(pts.crs).toBe('urn:ogc:def:crs:EPSG::32632');
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

  it('DXF: point names outside ASCII (in and outside Windows-1252) and with %% codes read back by GDAL as given, with no --config option', () => {
    const o = tempDir('rd-gdal-dxf-names-');
    // The last with the DXF special-character codes %%d, %%c, %%p, which GDAL otherwise shows as °, ⌀, ±.
    const names = ['Ráth Éile', 'Zürich', 'Łódź', 'a\\b {c} ^d 10%%d %%c%%%p 5%'];
    const times = ['09:33:00', '09:37:00', '09:40:20', '09:44:20', '09:48:09', '09:51:09', '09:53:24', '09:56:24'];
    const win = join(o, 'windows.csv');
    writeFileSync(win, 'name,start,end\n' + names.map((n, i) => `"${n}",2024-05-14T${times[2 * i]} GPST,2024-05-14T${times[2 * i + 1]} GPST`).join('\n') + '\n');
    const r = runCli(['points', ...RUN, '--smooth', '100', '--windows', win, '--projection', 'utm', '--outputs', 'dxf', '--out', join(o, 'out')]);
    expect(r.status, r.stderr).toBe(0);
    const file = join(o, 'out', 'points.dxf');
    // The file is ASCII (the same bytes as UTF-8 or Windows-1252), its other characters escaped as \U+XXXX.
    expect([...readFileSync(file)].every((b) => b < 0x80)).toBe(true);
    const l = readLayer(file, undefined, [], "Layer = 'REFDELTA_NAMES'");
    expect(l.features.map((f) => f.properties.Text)).toEqual(names);
    // The comment lines (group code 999) say what x, y and z are; GDAL skips them.
    const text = readFileSync(file, 'utf8');
    expect(text).toMatch(/^999\nrefdelta points/);
    expect(text).toMatch(/999\nx = easting, y = northing in metres: WGS 84 \/ UTM zone 32N \(EPSG:32632\)/);
    expect(text).toMatch(/999\nz = ellipsoidal height in metres/);
    expect(text).toMatch(/\$DWGCODEPAGE\n3\nANSI_1252\n/);
  });

  it('points.prj as GDAL reads it: the EPSG CRS when the datum is the points\' frame, else the grid on the points\' datum or an unknown one, never the code asked for', () => {
    const info = (dir: string) => tool('ogrinfo', ['-so', ...CSV_EN.flatMap((o) => ['-oo', o]), join(dir, 'points.csv'), 'points']);
    expect(layerEpsg(join(out, 'points.csv'), 'points', CSV_EN)).toBe(32632);
    // EPSG:2157 on WGS 84 points: the ITM parameters on WGS 84 (GRS80 and WGS 84 agree to 0.1 mm); not EPSG:2157.
    expect(info(out3)).toMatch(/PROJCRS\["WGS 84 \/ Irish Transverse Mercator parameters \(not EPSG:2157\)"[\s\S]*DATUM\["World Geodetic System 1984"/);
    expect(layerEpsg(join(out3, 'points.csv'), 'points', CSV_EN)).not.toBe(2157);
    // EPSG:2056 (Bessel 1841) on WGS 84 points: an unknown datum on Bessel 1841.
    expect(info(out2)).toMatch(/DATUM\["unknown"[\s\S]*ELLIPSOID\["Bessel 1841"/);
    expect(info(out2)).not.toMatch(/CH1903/);
    // Unstated frame: an unknown datum, and no EPSG code anywhere in the CRS.
    expect(info(out4)).toMatch(/PROJCRS\["unknown datum \/ UTM zone 32N"[\s\S]*DATUM\["unknown"/);
    expect(layerEpsg(join(out4, 'points.csv'), 'points', CSV_EN)).toBe(9001);
    const meta = JSON.parse(readFileSync(join(out4, 'points.csv.meta.json'), 'utf8'));
    expect(meta.projection).toMatchObject({ epsg: null, name: 'unknown datum / UTM zone 32N' });
    expect(meta.projection.definition).not.toMatch(/datum|towgs84/);
    const gj = JSON.parse(readFileSync(join(out4, 'points.geojson'), 'utf8'));
    expect(gj.refdelta.projection_epsg).toBeNull();
    expect(gj.refdelta.projection).not.toMatch(/WGS ?84/);
  });

  it('projected coordinates within 1 mm of PROJ (cs2cs) from the base geographic CRS of points.prj to points.prj itself', () => {
    for (const dir of [out, out2, out3, out4]) {
      const prj = readFileSync(join(dir, 'points.prj'), 'utf8').trim();
      // The base geographic CRS of the .prj (its GEOGCS element): no datum shift between the two.
      const start = prj.indexOf('GEOGCS[');
      let depth = 0, end = start;
      for (let i = start; i < prj.length; i++) {
        if (prj[i] === '[') depth++;
        else if (prj[i] === ']' && --depth === 0) { end = i + 1; break; }
      }
      const row = parseCsv(readFileSync(join(dir, 'points.csv'), 'utf8')).rows[0]!;
      // Without its EPSG code PROJ reads a WKT 1 geographic CRS as longitude, latitude (with it, in the EPSG order).
      const base = prj.slice(start, end).replace(/,AUTHORITY\["EPSG","\d+"\]\]$/, ']');
      const [e, n] = tool('cs2cs', ['-f', '%.6f', base, prj], `${row.longitude_deg} ${row.latitude_deg}\n`).trim().split(/\s+/).map(Number);
      expect(Math.abs(Number(row.easting_m) - e!), `${dir} easting`).toBeLessThan(1e-3);
      expect(Math.abs(Number(row.northing_m) - n!), `${dir} northing`).toBeLessThan(1e-3);
    }
  });

  it('--projection refusals in plain words, exit 2 (kinds as PROJ\'s projinfo names them: VERTCRS, GEODCRS, COMPOUNDCRS)', () => {
    const o = tempDir('rd-gdal-refuse-');
    const kind = (code: string) => /^(\w+)\[/m.exec(tool('projinfo', [code, '-o', 'WKT2_2019', '-q']))?.[1];
    for (const [spec, kindWord, sentence] of [
      ['EPSG:5773', 'VERTCRS', /EPSG:5773 \(EGM96 height\) is a vertical CRS \(heights only\), not a map grid: give a projected CRS/],
      ['EPSG:4978', 'GEODCRS', /EPSG:4978 \(WGS 84\) is a geocentric CRS \(Earth-centred X, Y, Z\), not a map grid/],
      ['EPSG:7405', 'COMPOUNDCRS', /EPSG:7405 .* is a compound CRS .*: give its projected part, EPSG:27700/],
      ['+proj=foo', null, /--projection \+proj=foo: the PROJ string names a projection proj4 does not know \('\+proj=foo'\)/],
      ['2157', null, /--projection 2157: unknown projection '2157': did you mean EPSG:2157\?/],
    ] as const) {
      if (kindWord) expect(kind(spec)).toBe(kindWord);
      const r = runCli(['points', ...RUN, '--projection', spec, '--out', o]);
      expect(r.status, `${spec}: ${r.stderr}`).toBe(2);
      expect(r.stderr).toMatch(sentence);
      expect(r.stderr).not.toMatch(/internal error|geographic 2-D|vertcrs|gcencrs/);
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
