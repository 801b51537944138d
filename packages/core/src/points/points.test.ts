import { describe, expect, it } from 'vitest';
import { InputError, type Warning } from '../errors.js';
import { degToRad, ecefToGeodetic, enuToEcefDelta, geodeticToEcef } from '../geodesy/index.js';
import { gpsSFromWeekTow } from '../time/index.js';
import { batchMeansStandardError, effectiveSampleSize, standardDeviation } from '../solve/index.js';
import {
  parseOccupationCsv,
  reduceToMark,
  robustMean,
  splitOccupations,
  summarisePoint,
  verticalHeightToArpM,
  OVERLAPPING_WINDOWS_JOINER,
  WindowPointNames,
  type EpochMark,
} from './index.js';

/** Deterministic normal deviates: mulberry32 uniform generator + Box-Muller (common practice). */
function normals(seed: number, n: number): Float64Array {
  let a = seed >>> 0;
  const uni = () => {
    a = (a + 0x6d2b79f5) >>> 0;
    let t = a;
    t = Math.imul(t ^ (t >>> 15), t | 1);
    t ^= t + Math.imul(t ^ (t >>> 7), t | 61);
    return ((t ^ (t >>> 14)) >>> 0) / 4294967296;
  };
  const out = new Float64Array(n);
  for (let i = 0; i < n; i += 2) {
    const u1 = Math.max(uni(), 1e-300), u2 = uni();
    const r = Math.sqrt(-2 * Math.log(u1));
    out[i] = r * Math.cos(2 * Math.PI * u2);
    if (i + 1 < n) out[i + 1] = r * Math.sin(2 * Math.PI * u2);
  }
  return out;
}

function ar1(seed: number, n: number, phi: number): Float64Array {
  const w = normals(seed, n);
  const x = new Float64Array(n);
  x[0] = w[0]! / Math.sqrt(1 - phi * phi);
  for (let i = 1; i < n; i++) x[i] = phi * x[i - 1]! + w[i]!;
  return x;
}

describe('robustMean (Huber M-estimator, MAD scale, k = 1.5)', () => {
  it('solves the Huber estimating equation sum psi((x - mu) / s) = 0 (Huber 1964 definition)', () => {
    const x = normals(7, 201);
    x[3] = 40; x[50] = -25; x[90] = 60; // gross outliers
    const r = robustMean(x);
    expect(r.converged).toBe(true);
    const k = 1.5;
    let psiSum = 0;
    for (const v of x) psiSum += Math.max(-k, Math.min(k, (v - r.mean) / r.scale));
    expect(Math.abs(psiSum)).toBeLessThan(1e-6);
    // the arithmetic mean is dragged by the outliers by ~ 75/201 = 0.37; Huber's is not
    expect(Math.abs(r.mean)).toBeLessThan(0.2);
    let mean = 0;
    for (const v of x) mean += v;
    expect(mean / x.length - r.mean).toBeGreaterThan(0.25);
  });
  it('MAD scale of normal data estimates sigma (1.4826 MAD, Hampel et al. 1986)', () => {
    const x = normals(11, 20000).map((v) => 3 * v);
    expect(robustMean(x).scale).toBeCloseTo(3, 1);
  });
  it('degenerate inputs', () => {
    expect(robustMean(new Float64Array([2, 2, 2, 5])).mean).toBe(2);
    expect(Number.isNaN(robustMean(new Float64Array(0)).mean)).toBe(true);
  });
});

describe('effective number of epochs (Geyer 1992 initial positive sequence) - self-consistency', () => {
  it('white noise: n_eff ~ n', () => {
    const x = normals(3, 5000);
    const { nEff } = effectiveSampleSize(x);
    expect(nEff / 5000).toBeGreaterThan(0.8);
    expect(nEff).toBeLessThanOrEqual(5000);
  });
  it('AR(1), phi = 0.9: n_eff ~ n (1 - phi) / (1 + phi) within 30 %, batch means agree within 30 %', () => {
    const n = 20000, phi = 0.9;
    const x = ar1(5, n, phi);
    const { nEff } = effectiveSampleSize(x);
    // AR(1): tau = (1 + phi) / (1 - phi) (e.g. Geyer 1992, or any time-series text)
    const expected = (n * (1 - phi)) / (1 + phi);
    expect(Math.abs(nEff / expected - 1)).toBeLessThan(0.3);
    const se = standardDeviation(x) / Math.sqrt(nEff);
    const bm = batchMeansStandardError(x);
    expect(Math.abs(bm / se - 1)).toBeLessThan(0.3);
  });
});

describe('occupation windows CSV', () => {
  const csv = [
    'name,start,end,antenna_height_m,height_kind',
    '# invented points',
    'Heron Gate,2018-10-04T12:38:00Z,2018-10-04T12:45:00Z,1.500,vertical',
    'Mill Post,2018-10-04 12:47:00 GPST,2018-10-04 12:55:00 GPST,1.62,slant',
    'Old Pier,2018-10-04T13:47:00+01:00,2018-10-04T13:49:00+01:00',
  ].join('\n');
  it('reads UTC, GPST and offset times', () => {
    const w = parseOccupationCsv('win.csv', csv);
    expect(w.map((x) => x.name)).toEqual(['Heron Gate', 'Mill Post', 'Old Pier']);
    // 2018-10-04 is day 4 of GPS week 2021 (starts Sunday 2018-09-30); GPS - UTC = 18 s (check-values.md, IERS Bulletin C)
    expect(w[0]!.startGpsS).toBe(gpsSFromWeekTow(2021, 4 * 86400 + 12 * 3600 + 38 * 60 + 18));
    expect(w[1]!.startGpsS).toBe(gpsSFromWeekTow(2021, 4 * 86400 + 12 * 3600 + 47 * 60));
    expect(w[2]!.startGpsS).toBe(gpsSFromWeekTow(2021, 4 * 86400 + 12 * 3600 + 47 * 60 + 18));
    expect(w[0]!.antennaHeightM).toBe(1.5);
    expect(w[1]!.heightKind).toBe('slant');
    expect(w[2]!.antennaHeightM).toBeUndefined();
  });
  it('overlapping windows: one warning per pair, at the later one\'s line, naming both with their lines and times as written, and the overlap', () => {
    const warnings: Warning[] = [];
    const text = 'name,start,end\nP1,2018-10-04T12:39:00Z,2018-10-04T12:45:00Z\nP2,2018-10-04T12:44:00Z,2018-10-04T12:48:00Z\nP3,2018-10-04 12:48:18 GPST,2018-10-04 12:50:18 GPST\n';
    expect(parseOccupationCsv('win.csv', text, (w) => warnings.push(w))).toHaveLength(3);
    // P3 starts at 12:48:18 GPST = 12:48:00 UTC (GPS - UTC = 18 s in 2018), when P2 ends: touching, not overlapping.
    expect(warnings).toEqual([{
      file: 'win.csv', line: 3, code: 'windows-overlap',
      message: 'the windows P1 (line 2, 2018-10-04T12:39:00Z to 2018-10-04T12:45:00Z) and P2 (line 3, 2018-10-04T12:44:00Z to 2018-10-04T12:48:00Z) overlap from 2018-10-04T12:44:00Z to 2018-10-04T12:45:00Z (60 s), '
        + 'so the epochs of that time are counted in both points: end the first window before the second starts',
    }]);
    // A window inside another: the overlap is the inner one.
    const inner: Warning[] = [];
    parseOccupationCsv('win.csv', 'A,2018-10-04T12:00:00Z,2018-10-04T13:00:00Z\nB,2018-10-04T12:10:00Z,2018-10-04T12:20:00Z\n', (w) => inner.push(w));
    expect(inner.map((w) => [w.line, /overlap from 2018-10-04T12:10:00Z to 2018-10-04T12:20:00Z \(600 s\)/.test(w.message)])).toEqual([[2, true]]);
  });
  it('names file, line and column on errors', () => {
    expect(() => parseOccupationCsv('win.csv', csv.replace('12:45:00Z', '12:45Z'))).toThrow(InputError);
    expect(() => parseOccupationCsv('win.csv', csv.replace('12:45:00Z', '12:45Z'))).toThrow(/^win\.csv:3: column end: expected an ISO time/);
    expect(() => parseOccupationCsv('win.csv', csv.replace('1.62,slant', '1.62,tilted'))).toThrow(/^win\.csv:4: column height_kind/);
    expect(() => parseOccupationCsv('win.csv', csv.replace('1.500', 'abc'))).toThrow(/^win\.csv:3: column antenna_height_m/);
    expect(() => parseOccupationCsv('win.csv', 'A,2018-10-04T12:38:00Z\n')).toThrow(/^win\.csv:1: expected 3 to 5 columns/);
    expect(() => parseOccupationCsv('win.csv', 'A,2018-10-04T12:38:00Z,2018-10-04T12:30:00Z\n')).toThrow(/after start/);
  });
});

describe('splitOccupations', () => {
  const t0 = 1_222_000_000;
  it('user windows take priority over events', () => {
    const epochs: EpochMark[] = Array.from({ length: 100 }, (_, i) => ({ tGpsS: t0 + i, ...(i === 50 ? { event: { kind: 'start-moving' as const } } : {}) }));
    const occ = splitOccupations({ epochs, windows: [{ name: 'W', startGpsS: t0 + 10, endGpsS: t0 + 40 }] });
    expect(occ).toEqual([{ name: 'W', startGpsS: t0 + 10, endGpsS: t0 + 40, source: 'windows' }]);
  });
  it('RINEX event flags: 3 starts a point with its marker, 2 ends it', () => {
    const epochs: EpochMark[] = [];
    for (let i = 0; i < 200; i++) {
      const ev = i === 30 ? { kind: 'start-moving' as const } : i === 60 ? { kind: 'new-occupation' as const, markerName: 'Beacon 2' } : i === 120 ? { kind: 'start-moving' as const } : i === 150 ? { kind: 'new-occupation' as const, markerName: 'Beacon 3' } : undefined;
      epochs.push({ tGpsS: t0 + i, ...(ev ? { event: ev } : {}) });
    }
    const occ = splitOccupations({ epochs, initialMarkerName: 'Beacon 1' });
    expect(occ).toEqual([
      { name: 'Beacon 1', startGpsS: t0, endGpsS: t0 + 29, source: 'events' },
      { name: 'Beacon 2', startGpsS: t0 + 60, endGpsS: t0 + 119, source: 'events' },
      { name: 'Beacon 3', startGpsS: t0 + 150, endGpsS: t0 + 199, source: 'events' },
    ]);
  });
  it('Doppler speed: static spans with hysteresis, merged short interruptions, minimum 20 s', () => {
    const speed = (i: number): number => {
      if (i < 40) return 0.05; // static 40 s
      if (i < 42) return 1.0; // 2 s jolt -> merged (static again at 42: gap 3 s < 5 s)
      if (i < 80) return i % 2 ? 0.25 : 0.05; // noise between the thresholds stays static
      if (i < 120) return 1.3; // walking
      if (i < 130) return 0.05; // 10 s pause: too short
      if (i < 160) return 1.2;
      return 0.1; // static to the end (160..199)
    };
    const epochs: EpochMark[] = Array.from({ length: 200 }, (_, i) => ({ tGpsS: t0 + i, speedMS: speed(i) }));
    const occ = splitOccupations({ epochs });
    expect(occ).toEqual([
      { name: 'S1', startGpsS: t0, endGpsS: t0 + 79, source: 'doppler' },
      { name: 'S2', startGpsS: t0 + 160, endGpsS: t0 + 199, source: 'doppler' },
    ]);
    // A session's prefix keeps the spans of different sessions apart; windows and events keep their names.
    expect(splitOccupations({ epochs, detectedNamePrefix: 'ptA-' }).map((o) => o.name)).toEqual(['ptA-S1', 'ptA-S2']);
    const windows = [{ name: 'P1', startGpsS: t0, endGpsS: t0 + 50 }];
    expect(splitOccupations({ epochs, windows, detectedNamePrefix: 'ptA-' }).map((o) => o.name)).toEqual(['P1']);
    const flagged: EpochMark[] = [{ tGpsS: t0, event: { kind: 'new-occupation', markerName: 'Beacon 1' } }, { tGpsS: t0 + 1 }];
    expect(splitOccupations({ epochs: flagged, detectedNamePrefix: 'ptA-' }).map((o) => o.name)).toEqual(['Beacon 1']);
  });
});

describe('point names of epochs from windows', () => {
  const t0 = 1_222_000_000;
  const windows = [
    { name: 'P2', startGpsS: t0 + 100, endGpsS: t0 + 200 },
    { name: 'P1', startGpsS: t0, endGpsS: t0 + 60 },
    { name: 'P3', startGpsS: t0 + 180, endGpsS: t0 + 240 },
  ];
  const names = new WindowPointNames(windows, 'w.csv');
  it('the window holding the instant, start and end included within 0.01 s; empty between windows', () => {
    expect(names.nameAt(t0 - 0.02)).toBe('');
    expect(names.nameAt(t0 - 0.009)).toBe('P1');
    expect(names.nameAt(t0 + 60.009)).toBe('P1');
    expect(names.nameAt(t0 + 80)).toBe('');
    expect(names.nameAt(t0 + 100)).toBe('P2');
    expect(names.nameAt(t0 + 240)).toBe('P3');
    expect(names.nameAt(t0 + 241)).toBe('');
  });
  it('an instant inside overlapping windows carries both names, earlier start first', () => {
    expect(names.nameAt(t0 + 190)).toBe(`P2${OVERLAPPING_WINDOWS_JOINER}P3`);
  });
  it('the metadata note names the windows file', () => {
    expect(names.note()).toMatch(/^point: the name of the occupation window of w\.csv holding the epoch/);
  });
});

describe('antenna height and reduction to the mark', () => {
  it('slant to vertical by Pythagoras: sqrt(s^2 - r^2) - offset', () => {
    // s = 1.5, r = 0.1, offset 0.02: sqrt(2.25 - 0.01) - 0.02 = 1.496663 - 0.02 = 1.476663
    expect(verticalHeightToArpM(1.5, 'slant', { radiusM: 0.1, slantPointAboveArpM: 0.02 })).toBeCloseTo(1.476663, 6);
    expect(verticalHeightToArpM(1.5, 'vertical')).toBe(1.5);
    expect(() => verticalHeightToArpM(1.5, 'slant')).toThrow(/radius/);
  });
  it('the mark lies straight below the ARP on the ellipsoidal normal', () => {
    const arp = geodeticToEcef({ latRad: degToRad(53.3), lonRad: degToRad(-9.06), heightM: 60 });
    const mark = reduceToMark(arp, 1.8);
    const g = ecefToGeodetic(mark);
    expect(g.heightM).toBeCloseTo(58.2, 8);
    expect(g.latRad).toBeCloseTo(degToRad(53.3), 13);
    expect(g.lonRad).toBeCloseTo(degToRad(-9.06), 13);
  });
});

describe('summarisePoint', () => {
  it('robust mean, scatter, precision and flags of a synthetic occupation', () => {
    const lat = degToRad(53.3), lon = degToRad(-9.06);
    const truth = geodeticToEcef({ latRad: lat, lonRad: lon, heightM: 40 });
    const n = 600;
    const e = ar1(21, n, 0.8), nn = ar1(22, n, 0.8), u = ar1(23, n, 0.8);
    const sc = Math.sqrt(1 - 0.8 * 0.8); // unit marginal variance
    const samples = Array.from({ length: n }, (_, i) => {
      const d = enuToEcefDelta({ e: 0.3 * sc * e[i]!, n: 0.3 * sc * nn[i]!, u: 0.6 * sc * u[i]! + (i === 100 ? 50 : 0) }, lat, lon);
      return { ecef: { x: truth.x + d.x, y: truth.y + d.y, z: truth.z + d.z }, tGpsS: 1000 + i, pdop: i % 2 ? 1.5 : 2.5 };
    });
    const s = summarisePoint(samples);
    expect(s.epochs).toBe(n);
    expect(s.durationS).toBe(599);
    expect(s.meanPdop).toBeCloseTo(2.0, 12);
    expect(s.sdEastM).toBeGreaterThan(0.2);
    expect(s.sdEastM).toBeLessThan(0.4);
    // AR(1) phi 0.8: n_eff ~ n / 9 = 67 (self-consistency, loose)
    expect(s.nEffEast).toBeGreaterThan(67 * 0.6);
    expect(s.nEffEast).toBeLessThan(67 * 1.5);
    const g = ecefToGeodetic(s.meanEcef);
    // the 50 m outlier in up is downweighted: mean within 4 sigma of the truth
    expect(Math.abs(g.heightM - 40)).toBeLessThan(4 * s.sigmaMeanUpM + 0.05);
    expect(Math.abs(s.sigmaMeanEastM / s.batchSigmaMeanEastM - 1)).toBeLessThan(0.5);
    expect(s.toleranceFlag).toBe('ok');
    expect(summarisePoint(samples.slice(0, 5)).toleranceFlag).toBe('too-few-epochs');
    expect(summarisePoint(samples, { horizontalToleranceM: 0.1 }).toleranceFlag).toBe('scatter-exceeds-tolerance');
  });
});

describe('summarisePoint: errors that persist over the occupation', () => {
  it('does not reduce the formal sigma by the number of correlation times when the epochs\' errors persist (float carrier epochs)', () => {
    const origin = geodeticToEcef({ latRad: degToRad(53.28), lonRad: degToRad(-9.06), heightM: 68 });
    // 1200 s of positions scattered by 1 mm with a formal sigma of 0.1 m: the formal sigma decides.
    const g = ecefToGeodetic(origin);
    const z = normals(7, 3 * 1200);
    const samples = Array.from({ length: 1200 }, (_, i) => {
      const d = enuToEcefDelta({ e: 0.001 * z[3 * i], n: 0.001 * z[3 * i + 1], u: 0.001 * z[3 * i + 2] }, g.latRad, g.lonRad);
      return { ecef: { x: origin.x + d.x, y: origin.y + d.y, z: origin.z + d.z }, tGpsS: i, sigmaEnuM: { e: 0.1, n: 0.1, u: 0.2 } };
    });
    const averaged = summarisePoint(samples);
    const persisting = summarisePoint(samples, { formalErrorsPersist: true });
    expect(averaged.sigmaMeanEastM).toBeCloseTo(0.1 / Math.sqrt(1199 / 300), 6);
    expect(persisting.sigmaMeanEastM).toBeCloseTo(0.1, 6);
    expect(persisting.sigmaMeanUpM).toBeCloseTo(0.2, 6);
  });
});
