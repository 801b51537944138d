/**
 * batch-points.csv and its CRS: sessions in different UTM zones (the demo in Switzerland, zone 32; the
 * real static run in Ireland, zone 29) and sessions in one zone. Read as a GIS reads it: GDAL's CSV
 * driver (ogrinfo, ogr2ogr) with the .prj beside it, and every easting/northing checked against PROJ's
 * own projection of the row's latitude/longitude (cs2cs) in the zone the row's grid_crs names. Never reads
 * walking-run/ (reserved).
 */
import { spawnSync } from 'node:child_process';
import { existsSync, mkdirSync, readFileSync, symlinkSync } from 'node:fs';
import { join } from 'node:path';
import { beforeAll, expect, it } from 'vitest';
import { combinedCrs } from '../packages/cli/src/commands/batch.js';
import { dataPath, describeShared, fixturePath } from './support/shared.js';
import { parseCsv, requireBuiltCli, runCli, tempDir, type CliRun } from './cli-support.js';

const HAVE_GDAL = spawnSync('ogrinfo', ['--version'], { encoding: 'utf8' }).status === 0 && spawnSync('cs2cs', [], { encoding: 'utf8' }).error === undefined;
const S = 'cors-and-rover-2018-277/static-run';
const DEMO = (f: string) => fixturePath(`demo/${f}`);
// data README: the base's own coordinate (APPROX POSITION XYZ of base.obs).
const BASE_XYZ = '3774089.2120,-601661.6157,5089321.2474';

function tool(cmd: string, args: readonly string[], input?: string): string {
  const r = spawnSync(cmd, args, { encoding: 'utf8', input });
  if (r.status !== 0) throw new Error(`${cmd} ${args.join(' ')} failed: ${r.stderr}`);
  return r.stdout;
}

/** A folder of links to the given files. */
function folderOf(prefix: string, files: readonly string[]): string {
  const d = tempDir(prefix);
  for (const f of files) symlinkSync(f, join(d, f.split('/').pop()!));
  return d;
}

/** PROJ's UTM easting/northing of a latitude/longitude (cs2cs, on the WGS 84 ellipsoid as the rows' grids are). */
function projUtm(zone: number, latDeg: number, lonDeg: number): [number, number] {
  const out = tool('cs2cs', ['-f', '%.4f', '+proj=longlat', '+ellps=WGS84', '+to', '+proj=utm', `+zone=${zone}`, '+ellps=WGS84'], `${lonDeg} ${latDeg}\n`);
  const [e, n] = out.trim().split(/\s+/).map(Number);
  return [e!, n!];
}

it('combinedCrs: one grid gives the .prj and the statement; several give a grid_crs per session and a warning naming the zone of most points', () => {
  const z = (zone: number) => ({ epsg: null, name: `unknown datum / UTM zone ${zone}N`, definition: `+proj=utm +zone=${zone}`, datum: 'unstated' });
  const one = combinedCrs([{ session: 'a', statement: z(29), prjWkt: 'PROJCS[...]', places: [] }, { session: 'b', statement: z(29), prjWkt: 'PROJCS[...]', places: [] }], 'utm');
  expect(one).toMatchObject({ hasGrid: true, prjWkt: 'PROJCS[...]', warning: null, statement: z(29) });
  expect([...one.gridCrsOf.values()]).toEqual(['unknown datum / UTM zone 29N', 'unknown datum / UTM zone 29N']);
  const two = combinedCrs([
    { session: 'swiss', statement: z(32), prjWkt: 'P32', places: [{ latDeg: 47.13, lonDeg: 8.78, frame: 'WGS84' }] },
    { session: 'irish', statement: z(29), prjWkt: 'P29', places: [{ latDeg: 53.28, lonDeg: -9.06, frame: 'WGS84' }, { latDeg: 53.28, lonDeg: -9.06, frame: 'WGS84' }] },
  ], 'utm');
  expect(two.prjWkt).toBeNull();
  expect(two.statement).toBeNull();
  expect(two.warning).toMatch(/^batch-points\.csv holds easting\/northing in 2 different grids, named per row in its grid_crs column \(unknown datum \/ UTM zone 32N: swiss; unknown datum \/ UTM zone 29N: irish\)/);
  expect(two.warning).toMatch(/run again with --projection EPSG:32629 \(the zone of 2 of the 3 points\)/);
  // One zone, two frames (WGS 84 and ETRS89 sessions): the frames are what differ.
  const frames = combinedCrs([
    { session: 'w', statement: { epsg: 32629, name: 'WGS 84 / UTM zone 29N (EPSG:32629)', definition: '' }, prjWkt: 'W', places: [{ latDeg: 53.28, lonDeg: -9.06, frame: 'WGS84' }] },
    { session: 'e', statement: { epsg: 25829, name: 'ETRS89 / UTM zone 29N (EPSG:25829)', definition: '' }, prjWkt: 'E', places: [{ latDeg: 53.28, lonDeg: -9.06, frame: 'ETRS89' }] },
  ], 'utm');
  expect(frames.warning).toMatch(/\(WGS 84 \/ UTM zone 29N \(EPSG:32629\): w; ETRS89 \/ UTM zone 29N \(EPSG:25829\): e\).*The sessions are in different frames \(frame column\)/);
  expect([...frames.gridCrsOf.values()]).toEqual(['EPSG:32629', 'EPSG:25829']);
  // Without a projection: no grid_crs, the .prj when every session's is the same.
  expect(combinedCrs([{ session: 'a', statement: null, prjWkt: 'G', places: [] }], undefined)).toMatchObject({ hasGrid: false, prjWkt: 'G', warning: null });
});

describeShared('batch-points.csv in one grid or several (demo in zone 32, static run in zone 29)', () => {
  let mixed = '';
  let one = '';
  let mixedRun: CliRun;
  let oneRun: CliRun;
  beforeAll(() => {
    requireBuiltCli();
    if (!existsSync(DEMO('rover-1s.obs'))) throw new Error('fixtures/demo/ not generated (node fixtures/demo/make-demo.mjs)');
    const refs = folderOf('rd-bg-ref-', [DEMO('KFRD-reference-5s.obs'), dataPath(`${S}/base.obs`)]);
    const navs = folderOf('rd-bg-nav-', [DEMO('broadcast-mixed.nav'), dataPath(`${S}/../reference/glw1277m.18n`), dataPath(`${S}/../reference/glw1277m.18g`)]);
    const sessions = tempDir('rd-bg-ses-');
    mkdirSync(sessions, { recursive: true });
    symlinkSync(DEMO('rover-1s.obs'), join(sessions, 'demo.obs'));
    symlinkSync(dataPath(`${S}/rover.obs`), join(sessions, 'galway.obs'));
    mixed = tempDir('rd-bg-mixed-');
    mixedRun = runCli(['batch', '--sessions', sessions, '--reference-dir', refs, '--nav-dir', navs, '--ref-coord', 'header', '--projection', 'utm', '--outputs', 'summary', '--jobs', '1', '--out', mixed], 300_000);
    one = tempDir('rd-bg-one-');
    oneRun = runCli(['batch', '--sessions', folderOf('rd-bg-one-ses-', [dataPath(`${S}/rover.obs`)]), '--reference', dataPath(`${S}/base.obs`), '--nav', dataPath(`${S}/../reference/glw1277m.18n`), dataPath(`${S}/../reference/glw1277m.18g`),
      '--ref-coord', BASE_XYZ, '--ref-frame', 'WGS84', '--ref-epoch', '2018.76', '--projection', 'utm', '--outputs', 'summary', '--out', one], 300_000);
  });

  it('two zones: a grid_crs per row, no batch-points.prj, and a warning naming the sessions of each zone and the one projection for all', () => {
    expect(mixedRun.status, mixedRun.stderr).toBe(0);
    const t = parseCsv(readFileSync(join(mixed, 'batch-points.csv'), 'utf8'));
    expect(t.header.slice(t.header.indexOf('northing_m'), t.header.indexOf('northing_m') + 2)).toEqual(['northing_m', 'grid_crs']);
    // Both reference headers state no frame (data README; fixtures/demo): the grids are on an unknown datum, named without an EPSG code.
    expect(new Set(t.rows.filter((r) => r.session === 'demo').map((r) => r.grid_crs))).toEqual(new Set(['unknown datum / UTM zone 32N']));
    expect(new Set(t.rows.filter((r) => r.session === 'galway').map((r) => r.grid_crs))).toEqual(new Set(['unknown datum / UTM zone 29N']));
    expect(existsSync(join(mixed, 'batch-points.prj'))).toBe(false);
    expect(mixedRun.stderr).toMatch(/warning: batch-points\.csv holds easting\/northing in 2 different grids, named per row in its grid_crs column \(unknown datum \/ UTM zone 32N: demo; unknown datum \/ UTM zone 29N: galway\).*run again with --projection EPSG:326(32|29) /);
    const meta = JSON.parse(readFileSync(join(mixed, 'batch-points.csv.meta.json'), 'utf8'));
    expect(meta.projection).toBeUndefined();
    expect(meta.columns.find((c: { name: string }) => c.name === 'grid_crs').meaning).toMatch(/the CRS of the row's easting\/northing/);
    if (!HAVE_GDAL) return;
    // PROJ (cs2cs) projects each row's latitude/longitude into the zone its grid_crs names: the same easting/northing to 1 mm.
    for (const r of t.rows) {
      const zone = Number(/UTM zone (\d+)N/.exec(r.grid_crs!)![1]);
      const [e, n] = projUtm(zone, Number(r.latitude_deg), Number(r.longitude_deg));
      expect(Math.abs(e - Number(r.easting_m)), `${r.session}/${r.name}`).toBeLessThan(1e-3);
      expect(Math.abs(n - Number(r.northing_m)), `${r.session}/${r.name}`).toBeLessThan(1e-3);
    }
  });

  it('one zone: batch-points.prj is the sessions\' CRS; GDAL reads EPSG:32629 and its reprojection to EPSG:4326 gives the rows\' latitude/longitude', () => {
    expect(oneRun.status, oneRun.stderr).toBe(0);
    expect(oneRun.stderr).not.toMatch(/different grids/);
    const t = parseCsv(readFileSync(join(one, 'batch-points.csv'), 'utf8'));
    expect(t.rows.every((r) => r.grid_crs === 'EPSG:32629')).toBe(true);
    expect(readFileSync(join(one, 'batch-points.prj'), 'utf8')).toBe(readFileSync(join(one, 'rover', 'points.prj'), 'utf8'));
    const meta = JSON.parse(readFileSync(join(one, 'batch-points.csv.meta.json'), 'utf8'));
    expect(meta.projection).toMatchObject({ epsg: 32629, name: 'WGS 84 / UTM zone 29N (EPSG:32629)' });
    if (!HAVE_GDAL) return;
    const oo = ['-oo', 'X_POSSIBLE_NAMES=easting_m', '-oo', 'Y_POSSIBLE_NAMES=northing_m', '-oo', 'KEEP_GEOM_COLUMNS=YES'];
    const info = tool('ogrinfo', ['-ro', '-so', ...oo, join(one, 'batch-points.csv'), 'batch-points']);
    const ids = [...info.matchAll(/ID\["EPSG",(\d+)\]/g)];
    expect(Number(ids[ids.length - 1]![1])).toBe(32629);
    const gj = JSON.parse(tool('ogr2ogr', ['-f', 'GeoJSON', '-t_srs', 'EPSG:4326', '/vsistdout/', ...oo, join(one, 'batch-points.csv'), 'batch-points']));
    expect(gj.features.length).toBe(t.rows.length);
    for (const f of gj.features as { properties: Record<string, string>; geometry: { coordinates: number[] } }[]) {
      // GeoJSON (RFC 7946) order: longitude, latitude. 1e-8 deg is about 1 mm.
      expect(Math.abs(f.geometry.coordinates[0]! - Number(f.properties.longitude_deg))).toBeLessThan(1e-8);
      expect(Math.abs(f.geometry.coordinates[1]! - Number(f.properties.latitude_deg))).toBeLessThan(1e-8);
    }
  });
});
