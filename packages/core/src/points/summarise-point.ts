/**
 * Statistics of one occupation from the engine's per-epoch solutions: robust mean position (Huber,
 * componentwise in ENU about the componentwise median, robust-mean.ts), scatter, effective number of
 * independent epochs and the precision of the mean (time-correlation.ts), mean PDOP and a tolerance
 * flag.
 *
 * Tolerance flag (our choice, documented): 'too-few-epochs' under minEpochs (default 10);
 * 'scatter-exceeds-tolerance' when the horizontal scatter sqrt(sdE^2 + sdN^2) exceeds
 * horizontalToleranceM (default 1.0 m, about the code-differential level of check-values.md
 * "Accuracy facts"); otherwise 'ok'.
 */
import type { EcefM, GeodeticRad } from '../types.js';
import { ecefDeltaToEnu, ecefToGeodetic, enuToEcefDelta, WGS84, type Ellipsoid } from '../geodesy/index.js';
import { median, robustMean } from './robust-mean.js';
import { batchMeansStandardError, effectiveSampleSize, standardDeviation } from './time-correlation.js';

export interface PointSample {
  readonly ecef: EcefM;
  readonly tGpsS?: number;
  readonly pdop?: number;
}

export interface SummariseOptions {
  readonly ellipsoid?: Ellipsoid;
  readonly minEpochs?: number;
  readonly horizontalToleranceM?: number;
  /** Huber k (default 1.5). */
  readonly huberK?: number;
}

export type ToleranceFlag = 'ok' | 'too-few-epochs' | 'scatter-exceeds-tolerance';

export interface PointSummary {
  readonly epochs: number;
  /** Last minus first sample time; NaN when samples carry no times. */
  readonly durationS: number;
  readonly meanEcef: EcefM;
  readonly meanGeodetic: GeodeticRad;
  readonly sdEastM: number;
  readonly sdNorthM: number;
  readonly sdUpM: number;
  /** Smallest of the three components' effective numbers of independent epochs. */
  readonly nEff: number;
  readonly nEffEast: number;
  readonly nEffNorth: number;
  readonly nEffUp: number;
  readonly sigmaMeanEastM: number;
  readonly sigmaMeanNorthM: number;
  readonly sigmaMeanUpM: number;
  /** Batch-means standard errors (cross-check of the sigmaMean values). */
  readonly batchSigmaMeanEastM: number;
  readonly batchSigmaMeanNorthM: number;
  readonly batchSigmaMeanUpM: number;
  /** NaN when no sample carries a PDOP. */
  readonly meanPdop: number;
  readonly toleranceFlag: ToleranceFlag;
}

export function summarisePoint(samples: readonly PointSample[], opts: SummariseOptions = {}): PointSummary {
  const n = samples.length;
  if (n === 0) throw new RangeError('summarisePoint needs at least one sample');
  const ell = opts.ellipsoid ?? WGS84;
  // Provisional origin: componentwise ECEF median (robust against a wild first epoch).
  const origin: EcefM = {
    x: median(samples.map((s) => s.ecef.x)),
    y: median(samples.map((s) => s.ecef.y)),
    z: median(samples.map((s) => s.ecef.z)),
  };
  const g0 = ecefToGeodetic(origin, ell);
  const e = new Float64Array(n), nn = new Float64Array(n), u = new Float64Array(n);
  for (let i = 0; i < n; i++) {
    const p = samples[i]!.ecef;
    const v = ecefDeltaToEnu({ x: p.x - origin.x, y: p.y - origin.y, z: p.z - origin.z }, g0.latRad, g0.lonRad);
    e[i] = v.e;
    nn[i] = v.n;
    u[i] = v.u;
  }
  const k = opts.huberK ?? 1.5;
  const me = robustMean(e, { k }).mean, mn = robustMean(nn, { k }).mean, mu = robustMean(u, { k }).mean;
  const d = enuToEcefDelta({ e: me, n: mn, u: mu }, g0.latRad, g0.lonRad);
  const meanEcef = { x: origin.x + d.x, y: origin.y + d.y, z: origin.z + d.z };
  const sdE = standardDeviation(e), sdN = standardDeviation(nn), sdU = standardDeviation(u);
  const fe = effectiveSampleSize(e), fn = effectiveSampleSize(nn), fu = effectiveSampleSize(u);
  const times = samples.map((s) => s.tGpsS).filter((t): t is number => t !== undefined && Number.isFinite(t));
  const durationS = times.length > 0 ? Math.max(...times) - Math.min(...times) : NaN;
  const pdops = samples.map((s) => s.pdop).filter((p): p is number => p !== undefined && Number.isFinite(p));
  const meanPdop = pdops.length > 0 ? pdops.reduce((a, b) => a + b, 0) / pdops.length : NaN;
  const minEpochs = opts.minEpochs ?? 10;
  const tol = opts.horizontalToleranceM ?? 1.0;
  const toleranceFlag: ToleranceFlag = n < minEpochs ? 'too-few-epochs' : Math.hypot(sdE, sdN) > tol ? 'scatter-exceeds-tolerance' : 'ok';
  return {
    epochs: n,
    durationS,
    meanEcef,
    meanGeodetic: ecefToGeodetic(meanEcef, ell),
    sdEastM: sdE,
    sdNorthM: sdN,
    sdUpM: sdU,
    nEff: Math.min(fe.nEff, fn.nEff, fu.nEff),
    nEffEast: fe.nEff,
    nEffNorth: fn.nEff,
    nEffUp: fu.nEff,
    // sigma of the mean = sd / sqrt(n_eff) (time-correlation.ts)
    sigmaMeanEastM: sdE / Math.sqrt(fe.nEff),
    sigmaMeanNorthM: sdN / Math.sqrt(fn.nEff),
    sigmaMeanUpM: sdU / Math.sqrt(fu.nEff),
    batchSigmaMeanEastM: batchMeansStandardError(e),
    batchSigmaMeanNorthM: batchMeansStandardError(nn),
    batchSigmaMeanUpM: batchMeansStandardError(u),
    meanPdop,
    toleranceFlag,
  };
}
