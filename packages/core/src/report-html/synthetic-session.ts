/**
 * Report data of a synthetic session of any length (default a day at 1 Hz), for measuring the page's
 * size and opening time. Not a GNSS simulation: smooth made-up series with a fixed pseudo-random noise,
 * shaped like a static occupation with a walk, so every chart has the amount of data a real day gives.
 */
import type { ReportPoint, SessionReportData } from './report-data.js';

/** Park-Miller minimal standard generator (Park and Miller 1988, CACM 31(10)): a fixed, portable sequence. */
function lcg(seed: number): () => number {
  let s = seed % 2147483647 || 1;
  return () => (s = (s * 16807) % 2147483647) / 2147483647;
}

export function syntheticSessionReportData(epochCount = 86_400, satellitesPerEpoch = 10, intervalS = 1): SessionReportData {
  const r = lcg(20240514);
  const n = epochCount;
  const t = new Float64Array(n), e = new Float64Array(n), no = new Float64Array(n), u = new Float64Array(n), sats = new Float64Array(n), pdop = new Float64Array(n);
  const kind: string[] = new Array(n), point: string[] = new Array(n);
  const t0 = 1_399_680_000; // 2024-05-14 00:00 GPS
  const kinds = ['code', 'smoothed', 'float', 'fixed'];
  let ae = 0, an = 0, au = 0;
  for (let i = 0; i < n; i++) {
    t[i] = t0 + i * intervalS;
    ae = 0.98 * ae + 0.1 * (r() - 0.5); an = 0.98 * an + 0.1 * (r() - 0.5); au = 0.98 * au + 0.2 * (r() - 0.5);
    const occ = Math.floor(i / (n / 4));
    e[i] = 120 + 30 * occ + ae; no[i] = -40 + 25 * occ + an; u[i] = 3 + au;
    sats[i] = 8 + Math.round(3 * Math.sin(i / 5000));
    pdop[i] = 1.4 + 0.4 * Math.sin(i / 3000);
    kind[i] = i % 7000 < 200 ? 'none' : kinds[Math.floor(i / 9000) % kinds.length];
    if (kind[i] === 'none') { e[i] = NaN; no[i] = NaN; u[i] = NaN; }
    point[i] = `P${occ + 1}`;
  }
  const m = n * satellitesPerEpoch;
  const rt = new Float64Array(m), sat = new Uint16Array(m), el = new Float32Array(m), az = new Float32Array(m), res = new Float32Array(m), rej = new Uint16Array(m);
  const names = Array.from({ length: 32 }, (_, k) => `${k < 24 ? 'G' : 'E'}${String((k % 24) + 1).padStart(2, '0')}`);
  for (let i = 0, j = 0; i < n; i++) {
    for (let k = 0; k < satellitesPerEpoch; k++, j++) {
      const s = (k * 3 + Math.floor(i / 3600)) % names.length;
      rt[j] = t[i]; sat[j] = s;
      el[j] = 5 + 80 * Math.abs(Math.sin(s + i / 20000));
      az[j] = (s * 37 + i / 240) % 360;
      rej[j] = el[j] < 10 ? 1 : r() < 0.001 ? 2 : 0;
      res[j] = rej[j] ? NaN : (r() - 0.5) * (1 + 10 / el[j]);
    }
  }
  const points: ReportPoint[] = [0, 1, 2, 3].map((k) => ({
    name: `P${k + 1}`, epochs: n / 4, durationS: (n / 4) * intervalS, startUtc: '', startGpsS: t0 + (k * n * intervalS) / 4, endGpsS: t0 + ((k + 1) * n * intervalS) / 4 - intervalS,
    eastM: 120 + 30 * k, northM: -40 + 25 * k, upM: 3, latitudeDeg: NaN, longitudeDeg: NaN, heightM: NaN, eastingM: NaN, northingM: NaN, orthometricHeightM: NaN,
    sdEastM: 0.3, sdNorthM: 0.35, sdUpM: 0.6, sigmaMeanEastM: 0.05, sigmaMeanNorthM: 0.06, sigmaMeanUpM: 0.1, tolerance: 'ok', solutionKinds: '',
  }));
  return {
    title: 'synthetic day', software: 'refdelta', createdUtc: '2024-05-15T00:00:00Z', frameText: 'WGS84 epoch 2024.37', pointReference: 'ground mark',
    referenceText: 'synthetic', firstUtc: '', lastUtc: '', epochsByKind: [],
    epochs: { timeGpsS: t, eastM: e, northM: no, upM: u, satellitesUsed: sats, pdop, kind, point },
    residuals: { timeGpsS: rt, satellite: sat, satellites: names, elevationDeg: el, azimuthDeg: az, residualM: res, rejection: rej, reasons: ['below elevation mask', 'rejected by data snooping'] },
    points, check: null, inputs: [], options: [], warningsTotal: 0, warnings: [], notes: [], cautions: [], missing: [],
  };
}
