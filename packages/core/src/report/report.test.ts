import { describe, expect, it } from 'vitest';
import { degToRad, ecefToGeodetic, geodeticToEcef } from '../geodesy/index.js';
import { gpsSFromWeekTow } from '../time/index.js';
import type { EpochSolution, SessionSummary } from '../session/solution-types.js';
import { DEFAULT_OPTIONS } from '../session/options.js';
import { csvPreamble, epochColumns, epochRows } from './epoch-rows.js';
import { residualRows, RESIDUAL_COLUMNS } from './residual-rows.js';
import { geojson } from './geojson.js';
import { CAUTIONS, summaryJson } from './summary-json.js';
import { POINTS_OUTPUT_FORMATS, SOLVE_OUTPUT_FORMATS } from './output-registry.js';
import { POINTS_OUTPUT_KINDS, SOLVE_OUTPUT_KINDS } from './output-kinds.js';

// check-values.md #8: 2000-01-01 20:45:00 GPST = week 1042, tow 593100 s.
const T = gpsSFromWeekTow(1042, 593100);
// check-values.md #2: 33.3 N 44.4 E 6000 m = (3816209.60, 3737108.55, 3485109.57) on WGS-84.
const G = { latRad: degToRad(33.3), lonRad: degToRad(44.4), heightM: 6000 };
const P = geodeticToEcef(G);
const FRAME = { name: 'ITRF2014', epochYear: 2018.76 };

function solution(over: Partial<EpochSolution> = {}): EpochSolution {
  return {
    tagGpsS: T + 0.004, timeGpsS: T, kind: 'differential', reason: '', pointName: 'PT1',
    position: { ecef: P, frame: FRAME }, geodetic: ecefToGeodetic(P), pointReference: 'ground-mark',
    baselineEcef: { x: 3, y: 4, z: 12 }, baselineEnu: { e: 1, n: 2, u: 3 },
    relativeClockM: { G: 12.5, R: -3.25 }, satellitesUsed: 9,
    dops: { gdop: 2, pdop: 1.8, hdop: 1, vdop: 1.5, tdop: 0.9 },
    sigmaEnuM: { e: 0.3, n: 0.4, u: 0.9 },
    quality: { varianceFactor: 1.1, chiSquare: 5.5, dof: 5, critical: 20.5, passed: true },
    correctionAgeS: 0.5, speedMS: 0.25, occupationEvent: null, antennaHeightM: 1.8,
    satellites: [
      { sat: 'G05', signal: 'C1C', elevationDeg: 45, azimuthDeg: 120, residualM: 0.25, weight: 4, wTest: 0.8, used: true, reason: '' },
      { sat: 'R17', signal: 'C1C', elevationDeg: 7, azimuthDeg: 300, residualM: NaN, weight: 0, wTest: NaN, used: false, reason: 'below elevation mask' },
    ],
    ...over,
  };
}

describe('epoch CSV rows', () => {
  it('has unit-suffixed columns, one relative clock per system, and the epoch values', () => {
    const t = epochRows([solution()]);
    expect(t.header).toContain('rel_clock_gps_m');
    expect(t.header).toContain('rel_clock_glonass_m');
    const row = Object.fromEntries(t.header.map((h, i) => [h, t.rows[0][i]]));
    expect(row.gps_week).toBe('1042'); // check-values.md #8
    expect(row.gps_tow_s).toBe('593100.000'); // check-values.md #8
    // GPS - UTC = 13 s during 2000 (IERS Bulletin C: 13 s from 1999-01-01).
    expect(row.utc_time).toBe('2000-01-01T20:44:47.000Z');
    expect(Number(row.latitude_deg)).toBeCloseTo(33.3, 8); // check-values.md #2
    expect(Number(row.longitude_deg)).toBeCloseTo(44.4, 8);
    expect(Number(row.height_m)).toBeCloseTo(6000, 3);
    expect(Number(row.ecef_x_m)).toBeCloseTo(3816209.6, 1); // check-values.md #2
    expect(Number(row.ecef_y_m)).toBeCloseTo(3737108.55, 1);
    expect(Number(row.ecef_z_m)).toBeCloseTo(3485109.57, 1);
    expect(row.baseline_length_m).toBe('13.0000'); // 3-4-12 right triangle: sqrt(9+16+144) = 13
    expect(row.solution).toBe('differential');
    expect(row.rel_clock_glonass_m).toBe('-3.2500');
    expect(row.pdop).toBe('1.80');
    expect(row.chi_square_critical).toBe('20.5000');
    expect(row.speed_m_s).toBe('0.250');
    expect(row.antenna_height_m).toBe('1.8000');
  });

  it('leaves cells empty (never NaN) for an epoch without a solution', () => {
    const s = solution({ kind: 'none', reason: 'fewer than 5 satellites', position: null, geodetic: null, baselineEcef: null, baselineEnu: null, dops: null, sigmaEnuM: null, quality: null, relativeClockM: {} });
    const t = epochRows([s], ['G']);
    expect(t.header).toEqual(epochColumns(['G']));
    expect(t.rows[0].length).toBe(t.header.length);
    expect(t.rows[0].join('|')).not.toMatch(/NaN|undefined|null/);
    expect(t.rows[0][t.header.indexOf('reason')]).toBe('fewer than 5 satellites');
  });

  it('states frame, epoch and point reference in # comment lines', () => {
    const lines = csvPreamble({ frame: FRAME, pointReference: 'ground-mark' });
    expect(lines.every((l) => l.startsWith('#'))).toBe(true);
    expect(lines.join('\n')).toContain('# frame: ITRF2014 epoch 2018.76; position refers to: ground mark');
  });
});

describe('residual rows', () => {
  it('one row per satellite with status and reason words', () => {
    const t = residualRows([solution()]);
    expect(t.header).toEqual(RESIDUAL_COLUMNS);
    expect(t.rows.length).toBe(2);
    expect(t.rows[0].slice(2, 4)).toEqual(['G05', 'C1C']);
    expect(t.rows[0][9]).toBe('used');
    expect(t.rows[1][9]).toBe('rejected');
    expect(t.rows[1][10]).toBe('below elevation mask');
    expect(t.rows[1][6]).toBe('');
  });
});

describe('GeoJSON (RFC 7946)', () => {
  it('is a FeatureCollection of Point features [lon, lat, h] with the frame stated', () => {
    const fc = geojson([solution(), solution({ kind: 'none', position: null, geodetic: null })], { frame: FRAME, pointReference: 'ground-mark' });
    const parsed = JSON.parse(JSON.stringify(fc));
    expect(parsed.type).toBe('FeatureCollection'); // RFC 7946 3.3
    expect(parsed.features.length).toBe(1);
    const f = parsed.features[0];
    expect(f.type).toBe('Feature'); // RFC 7946 3.2
    expect(f.geometry.type).toBe('Point'); // RFC 7946 3.1.2
    // RFC 7946 3.1.1: longitude first, then latitude, then height. check-values.md #2.
    expect(f.geometry.coordinates[0]).toBeCloseTo(44.4, 8);
    expect(f.geometry.coordinates[1]).toBeCloseTo(33.3, 8);
    expect(f.geometry.coordinates[2]).toBeCloseTo(6000, 3);
    expect(parsed.refdelta.frame).toBe('ITRF2014');
    expect(parsed.refdelta.frame_epoch).toBe(2018.76);
    expect(parsed.refdelta.note).toMatch(/RFC 7946 assumes WGS 84/);
    expect(parsed.refdelta.note).toMatch(/NOT transformed/);
    expect(f.properties.frame).toBe('ITRF2014');
    expect(f.properties.solution).toBe('differential');
  });
});

describe('run summary', () => {
  it('carries inputs with hashes, counts, rejections, outputs and cautions; JSON-safe', () => {
    const summary: SessionSummary = {
      frame: FRAME, referencePosition: { ecef: P, frame: FRAME }, referencePositionSource: '--ref-xyz',
      epochsRover: 10, epochsByKind: { differential: 7, smoothed: 0, standalone: 1, none: 2 }, epochsWithoutCorrections: 3,
      satelliteRejections: [{ reason: 'below elevation mask', count: 4 }], epochRejections: [{ reason: 'no reference epoch within 65 s', count: 2 }],
      systemsUsed: ['G'], notes: [], firstGpsS: T, lastGpsS: T + 9, codeOffsets: [], passes: 1,
    };
    // SHA-256 of the empty string (FIPS 180-4 test vector).
    const emptySha = 'e3b0c44298fc1c149afbf4c8996fb92427ae41e4649b934ca495991b7852b855';
    const doc = summaryJson(summary, [{ path: '/x/rover.obs', sha256: emptySha, kind: 'rover' }], DEFAULT_OPTIONS,
      [{ kind: 'epochs', path: '/o/epochs.csv', bytes: 10 }]);
    const j = JSON.parse(JSON.stringify(doc));
    expect(j.inputs[0].sha256).toBe(emptySha);
    expect(j.counts.by_kind.differential).toBe(7);
    expect(j.counts.without_corrections).toBe(3);
    expect(j.rejected_epochs[0].reason).toMatch(/no reference epoch/);
    expect(j.frame.name).toBe('ITRF2014');
    expect(j.outputs[0].path).toBe('/o/epochs.csv');
    expect(j.cautions).toEqual([...CAUTIONS]);
    expect(j.cautions.join(' ')).toMatch(/mapping-grade/);
    expect(j.cautions.join(' ')).toMatch(/licensed surveyors/);
    expect(j.time_span.first_utc).toBe('2000-01-01T20:44:47.000Z'); // check-values.md #8 minus 13 leap seconds
  });
});

describe('output kinds listed apart from their writers', () => {
  it('are the registry\'s kinds, in its order, with its defaults', () => {
    expect(SOLVE_OUTPUT_KINDS).toEqual(SOLVE_OUTPUT_FORMATS.map((f) => ({ kind: f.kind, defaultOn: f.defaultOn })));
    expect(POINTS_OUTPUT_KINDS).toEqual(POINTS_OUTPUT_FORMATS.map((f) => f.kind));
  });
});
