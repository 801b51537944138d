import { readFileSync } from 'node:fs';
import { resolve } from 'node:path';
import proj4 from 'proj4';
import { describe, expect, it } from 'vitest';
import { InputError, ProcessingError, type Warning } from '../errors.js';
import { distanceM, ecefToGeodetic, enuToEcefDelta } from '../geodesy/index.js';
import { DEFAULT_HELMERT_SETS } from '../frames/index.js';
import { makeProjection } from '../projection/index.js';
import { geodeticToEcef, WGS84 } from '../geodesy/index.js';
import { CHI2_1_95, CHI2_2_95, closerReading, compareToMark, differenceTestWord, FAR_NAME_MATCH_M, farNameMatchSentence, matchPointsToMarks, parseControlCsv, parseMarksFile, testDifference } from './index.js';

const FIXTURE = resolve(__dirname, '../../../../fixtures/geo/control-marks.csv');
const text = readFileSync(FIXTURE, 'utf8');

describe('parseControlCsv', () => {
  const warnings: Warning[] = [];
  const marks = parseControlCsv('control-marks.csv', text, (w) => warnings.push(w));
  it('reads the three coordinate forms', () => {
    expect(marks.map((m) => m.name)).toEqual(['Ferry Stone', 'Willow Bend', 'Willow Bend grid', 'Lantern Hill']);
    expect(marks[0]!.position.ecef).toEqual({ x: 3774089.212, y: -601661.6157, z: 5089321.2474 });
    expect(marks[0]!.position.frame).toEqual({ name: 'WGS84', epochYear: 2018.76 });
    expect(marks[0]!.accuracyHorizontalM).toBe(0.02);
    expect(marks[0]!.line).toBe(4);
    // lat/lon on GRS80 (ETRF2000) against proj4's geocentric conversion (reference library)
    const ref = proj4('+proj=longlat +ellps=GRS80 +no_defs', '+proj=geocent +ellps=GRS80 +units=m +no_defs').forward([-9.0612, 53.2801, 55]) as number[];
    const wb = marks[1]!.position.ecef;
    expect(Math.hypot(wb.x - ref[0]!, wb.y - ref[1]!, wb.z - ref[2]!)).toBeLessThan(1e-6);
    // the grid row is the same place in EPSG:25829 (values written with 0.1 mm rounding): self-consistency
    expect(distanceM(marks[2]!.position.ecef, wb)).toBeLessThan(1e-3);
    expect(marks[2]!.position.frame.name).toBe('ETRF2000');
    expect(marks[3]!.position.frame.name).toBe('unstated');
    expect(Number.isNaN(marks[3]!.position.frame.epochYear)).toBe(true);
    // Line 6: EPSG:25829 is on ETRS89, the row's frame ETRF2000 (the rule of report/grid-crs.ts for points); line 7: no epoch.
    expect(warnings.map((w) => [w.code, w.line])).toEqual([['marks-projection-datum', 6], ['control-epoch-missing', 7]]);
  });
  it('names file, line and column for bad rows', () => {
    const hdr = 'name,lat_deg,lon_deg,h_m,frame,epoch\n';
    expect(() => parseControlCsv('c.csv', hdr + 'A,95,10,5,ITRF2014,2020.0\n')).toThrow(InputError);
    expect(() => parseControlCsv('c.csv', hdr + 'A,95,10,5,ITRF2014,2020.0\n')).toThrow(/^c\.csv:2: column lat_deg: expected a latitude/);
    expect(() => parseControlCsv('c.csv', hdr + 'A,50,10,5,ITRF2014\n')).toThrow(/^c\.csv:2: expected 6 columns/);
    expect(() => parseControlCsv('c.csv', hdr + 'A,50,,5,ITRF2014,2020.0\n')).toThrow(/^c\.csv:2: expected a complete coordinate/);
    expect(() => parseControlCsv('c.csv', hdr + 'A,50,10,5,ITRF2014,20x0\n')).toThrow(/^c\.csv:2: column epoch: expected a decimal year/);
    expect(() => parseControlCsv('c.csv', 'name,easting_m,northing_m,h_m,projection\nB,500000,5900000,3,EPSG:9999\n')).toThrow(/^c\.csv:2: column projection: .*PROJ string/);
    expect(() => parseControlCsv('c.csv', 'name,height\nB,3\n')).toThrow(/^c\.csv:1: unknown column/);
    expect(() => parseControlCsv('c.csv', 'name,x_m,y_m,z_m\nB,1,2,3\n')).toThrow(/^c\.csv:2: columns x_m,y_m,z_m: expected a point near the Earth/);
    expect(() => parseControlCsv('c.csv', '')).toThrow(/empty/);
  });
});

describe('matching and comparison', () => {
  const marks = parseControlCsv('control-marks.csv', text);
  const ferry = marks[0]!;
  const g = ecefToGeodetic(ferry.position.ecef);
  const offset = (p: typeof ferry.position.ecef, e: number, n: number, u: number, lat = g.latRad, lon = g.lonRad) => {
    const d = enuToEcefDelta({ e, n, u }, lat, lon);
    return { x: p.x + d.x, y: p.y + d.y, z: p.z + d.z };
  };
  it('by name (case-insensitive, trimmed), then by proximity within 5 m', () => {
    const lantern = marks[3]!;
    const lg = ecefToGeodetic(lantern.position.ecef);
    const frame = { name: 'WGS84', epochYear: 2018.76 };
    const points = [
      { name: ' FERRY stone', position: { ecef: offset(ferry.position.ecef, 3, 0, 0), frame } },
      { name: 'P7', position: { ecef: offset(lantern.position.ecef, 1.2, -1.6, 0.5, lg.latRad, lg.lonRad), frame } },
      { name: 'P8', position: { ecef: offset(lantern.position.ecef, 6, 0, 0, lg.latRad, lg.lonRad), frame } },
    ];
    const m = matchPointsToMarks(points, marks);
    expect(m.map((x) => [x.point.name, x.mark.name, x.by])).toEqual([[' FERRY stone', 'Ferry Stone', 'name'], ['P7', 'Lantern Hill', 'proximity']]);
    expect(m[1]!.horizontalDistanceM).toBeCloseTo(2.0, 6);
    expect(m[0]!.horizontalDistanceM).toBeCloseTo(3.0, 6);
    expect(matchPointsToMarks(points.slice(2), marks, 10).map((x) => x.mark.name)).toEqual(['Lantern Hill']);
  });
  it('compareToMark in ENU at the mark, with the tolerance', () => {
    const p = { ecef: offset(ferry.position.ecef, 0.3, -0.4, 1.2), frame: { name: 'WGS-84(G1762)', epochYear: 2018.76 } };
    const c = compareToMark(p, ferry);
    expect(c.dE).toBeCloseTo(0.3, 6);
    expect(c.dN).toBeCloseTo(-0.4, 6);
    expect(c.dU).toBeCloseTo(1.2, 6);
    expect(c.horizontalM).toBeCloseTo(0.5, 6);
    expect(c.threeDM).toBeCloseTo(1.3, 6);
    expect(c.pass).toBe(true);
    expect(compareToMark(p, ferry, { toleranceHorizontalM: 0.4 }).pass).toBe(false);
    expect(compareToMark(p, ferry, { toleranceVerticalM: 1.0 }).pass).toBe(false);
  });
  it('the frame rule: refused across frames unless a transformation is configured', () => {
    const willow = marks[1]!;
    const p = { ecef: willow.position.ecef, frame: { name: 'ITRF2014', epochYear: 2018.76 } };
    expect(() => compareToMark(p, willow)).toThrow(ProcessingError);
    expect(() => compareToMark(p, willow)).toThrow(/Willow Bend.*ITRF2014.*ETRF2000/);
    const c = compareToMark(p, willow, { transformations: DEFAULT_HELMERT_SETS });
    expect(c.frame).toBe('ETRF2000');
    // same place in two frames: the ITRF2014 -> ETRF2000 shift of 2018.76, ~0.7 m (README, from memory)
    expect(c.horizontalM).toBeGreaterThan(0.6);
    expect(c.horizontalM).toBeLessThan(0.8);
  });
  it('warns for an unstated frame and a mark not 3x more accurate than the tolerance (NSSDA 3.2.1)', () => {
    const w: Warning[] = [];
    const lantern = marks[3]!;
    compareToMark({ ecef: lantern.position.ecef, frame: { name: 'WGS84', epochYear: 2018.76 } }, lantern, { onWarning: (x) => w.push(x) });
    expect(w.map((x) => x.code).sort()).toEqual(['control-not-accurate-enough', 'frame-unstated']);
  });
});

describe('difference test against the combined uncertainty', () => {
  it('critical values: chi-square(2) 95 % is -2 ln 0.05 (an exponential distribution), chi-square(1) 95 % is 1.96^2', () => {
    expect(CHI2_2_95).toBeCloseTo(-2 * Math.log(0.05), 3);
    expect(CHI2_1_95).toBeCloseTo(1.959964 ** 2, 3);
  });
  it('statistics from the point sigmas and the mark accuracy (horizontal split between east and north); untested without either', () => {
    const t = testDifference({ dE: 0, dN: -0.031, dU: -0.007 }, { sigmaMeanEastM: 0.009, sigmaMeanNorthM: 0.009, sigmaMeanUpM: 0.017 }, { accuracyHorizontalM: 0.01, accuracyVerticalM: 0.02 });
    const s = Math.sqrt(0.009 ** 2 + 0.01 ** 2 / 2);
    expect(t.sigmaNorthM).toBeCloseTo(s, 12);
    expect(t.chi2Horizontal).toBeCloseTo((0.031 / s) ** 2, 10);
    expect(t.chi2Vertical).toBeCloseTo(0.007 ** 2 / (0.017 ** 2 + 0.02 ** 2), 10);
    expect(differenceTestWord(t)).toBe('rejected-horizontal');
    const none = testDifference({ dE: 1, dN: 1, dU: 1 }, {}, { accuracyHorizontalM: 0.01 });
    expect(Number.isNaN(none.chi2Horizontal) && Number.isNaN(none.chi2Vertical)).toBe(true);
    expect(differenceTestWord(none)).toBe('');
    const v = testDifference({ dE: 0.01, dN: 0, dU: 0.5 }, { sigmaMeanEastM: 0.1, sigmaMeanNorthM: 0.1, sigmaMeanUpM: 0.1 }, { accuracyHorizontalM: 0.1, accuracyVerticalM: 0.1 });
    expect(differenceTestWord(v)).toBe('rejected-vertical');
  });
});

describe('marks files: one row per name, grid datums stated', () => {
  const head = 'name,easting_m,northing_m,h_m,projection,frame,epoch';
  it('a name given twice (also in another case) is an InputError naming the file, both lines and the name', () => {
    const t = `${head}\nP1,496144.81,5903472.94,67.76,EPSG:32629,WGS84,2018.76\nP2,496150.00,5903472.94,67.76,EPSG:32629,WGS84,2018.76\np1 ,496144.31,5903472.94,67.76,EPSG:32629,WGS84,2018.76\n`;
    expect(() => parseMarksFile('dup.csv', t)).toThrow(InputError);
    expect(() => parseMarksFile('dup.csv', t)).toThrow(/^dup\.csv:4: the mark names 'P1' and 'p1' are one name \(names are compared without case\), on lines 2 and 4: marks are matched by name/);
    expect(() => parseMarksFile('dup.csv', t.replace('p1 ', 'P1'))).toThrow(/^dup\.csv:4: the mark name 'P1' is given twice, on lines 2 and 4: /);
  });
  it("a batch's points table given as marks, one mark occupied in two sessions: one sentence naming the file, both lines with their sessions, the name and what to do", () => {
    const t = 'session,name,ecef_x_m,ecef_y_m,ecef_z_m,frame,frame_epoch\nday1,P1,3774089.2,-601661.6,5089321.2,WGS84,2018.76\n'
      + 'day1,P2,3774099.2,-601661.6,5089321.2,WGS84,2018.76\nday2,P1,3774089.3,-601661.6,5089321.2,WGS84,2018.76\n';
    let message = '';
    try { parseMarksFile('batch-points.csv', t); } catch (e) { message = (e as Error).message; }
    expect(message).toBe("batch-points.csv:4: the point 'P1' is in this points table twice, on line 2 (session day1) and line 4 (session day2), and marks are matched by name: "
      + "keep one row of 'P1' for the mark and delete the other, or give the other its own name, such as 'day2/P1'");
    expect(message).not.toMatch(/[.!?;]\s/);
    // Without a session column (a points.csv with a point occupied twice): the same advice, the lines alone.
    expect(() => parseMarksFile('points.csv', t.replace(/^session,/, '').replace(/\nday\d,/g, '\n'))).toThrow(/^points\.csv:4: the point 'P1' is in this points table twice, on line 2 and line 4, .*such as 'P1-2'$/);
  });
  it('a grid on another datum than the stated frame: one warning per projection and frame, in the words of the points check', () => {
    const warnings: Warning[] = [];
    const t = `${head}\nA,496144.81,5903472.94,67.76,EPSG:25829,WGS84,2018.76\nB,496150.00,5903472.94,67.76,EPSG:25829,WGS84,2018.76\nC,496150.00,5903482.94,67.76,EPSG:25829,ETRS89,2018.76\nD,496150.00,5903492.94,67.76,EPSG:32629,WGS84,2018.76\n`;
    parseMarksFile('m.csv', t, (w) => warnings.push(w));
    expect(warnings.map((w) => [w.code, w.line])).toEqual([['marks-projection-datum', 2]]);
    expect(warnings[0]!.message).toMatch(/^marks in EPSG:25829 with frame WGS84 \(from A on\): ETRS89 \/ UTM zone 29N \(EPSG:25829\) is on a datum other than the marks' stated frame WGS84 \(ETRS89\): .*without a datum shift.*frames differ by up to about a metre, datums by more/);
  });
});

describe('a marks file with ; between columns', () => {
  it('says so, and what to save instead', () => {
    const t = 'name;easting_m;northing_m;h_m;projection;frame;epoch\nP1;496144,8099;5903472,9357;67,7553;EPSG:32629;WGS84;2018,76\n';
    expect(() => parseMarksFile('semi.csv', t)).toThrow(/^semi\.csv:1: the header has its columns separated by ';' \('name;easting_m;northing_m;h_m;projection;frame;epoch'\): save the file with ',' between columns and '\.' as the decimal point$/);
  });
});

describe('a match by name kilometres away', () => {
  it('is said once, naming the pairs and what to check; 1 km and below is not', () => {
    const pair = (pointName: string, horizontalM: number, by: 'name' | 'proximity' = 'name') => ({ pointName, markName: pointName, by, horizontalM });
    expect(farNameMatchSentence([pair('P1', 999), pair('P2', 4.2, 'proximity')], 'm.csv')).toBeNull();
    const s = farNameMatchSentence([pair('P1', 4630645.1), pair('P2', 1500)], 'm.csv')!;
    expect(s).toBe('2 point(s) matched by name lie more than 1 km from their mark, far more than a measurement, frame or datum difference explains: '
      + 'P1 is 4631 km from mark P1; P2 is 1.50 km from mark P2; check the CRS of m.csv (its projection code, UTM zone and hemisphere, '
      + 'and the order of its coordinates: easting before northing, latitude before longitude) or whether the names pair different places');
    expect(farNameMatchSentence([{ ...pair('P1', 4630645.1), markLine: 7 }], 'm.csv')).toMatch(/: P1 is 4631 km from mark P1 on line 7; check the CRS/);
    expect(FAR_NAME_MATCH_M).toBe(1000);
  });
  it('names the reading of the mark\'s values that puts it at the point: another UTM zone, swapped axes (self-consistency: values made by our own projection)', () => {
    const [lat, lon, h] = [47.1311, 8.7813, 408.5];
    const point = geodeticToEcef({ latRad: (lat * Math.PI) / 180, lonRad: (lon * Math.PI) / 180, heightM: h }, WGS84);
    const z32 = makeProjection('EPSG:32632').forward(lat, lon);
    const text = `name,lat_deg,lon_deg,easting_m,northing_m,h_m,projection,frame,epoch\n` +
      `A,,,${z32.eastingM},${z32.northingM},${h},EPSG:32629,WGS84,2024.37\nB,,,${z32.northingM},${z32.eastingM},${h},EPSG:32632,WGS84,2024.37\nC,${lon},${lat},,,${h},,WGS84,2024.37\n`;
    const [a, b, c] = parseMarksFile('m.csv', text);
    expect(closerReading(a!, point)).toMatchObject({ words: 'as WGS 84 / UTM zone 32N (EPSG:32632)' });
    expect(closerReading(a!, point)!.horizontalM).toBeLessThan(1e-3);
    expect(closerReading(b!, point)).toMatchObject({ words: 'with easting and northing swapped (EPSG:32632)' });
    expect(closerReading(c!, point)).toMatchObject({ words: 'with latitude and longitude swapped' });
    const s = farNameMatchSentence([{ pointName: 'P', markName: 'A', by: 'name', horizontalM: 1846e3, closer: closerReading(a!, point) }], 'm.csv')!;
    expect(s).toMatch(/: P is 1846 km from mark A \(its values read as WGS 84 \/ UTM zone 32N \(EPSG:32632\) put it 0\.000 m from the point\); check the CRS/);
  });
});
