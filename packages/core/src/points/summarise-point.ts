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
import type { EcefM, EnuM, GeodeticRad } from '../gnss/index.js';
import { ecefDeltaToEnu, ecefToGeodetic, enuToEcefDelta, WGS84, type Ellipsoid } from '../geodesy/index.js';
import { median, robustMean } from './robust-mean.js';
import { circularErrorRadiusM } from '../accuracy/index.js';
import { batchMeansStandardError, effectiveSampleSize, standardDeviation } from '../solve/index.js';

export interface PointSample {
  readonly ecef: EcefM;
  readonly tGpsS?: number;
  readonly pdop?: number;
  /** Formal precision of this epoch's position (sigma E/N/U from the solution's covariance), if known. */
  readonly sigmaEnuM?: EnuM;
  /** That epoch's a-posteriori variance factor, scaling its formal sigma to the observed residuals. */
  readonly varianceFactor?: number;
}

export interface SummariseOptions {
  readonly ellipsoid?: Ellipsoid;
  readonly minEpochs?: number;
  readonly horizontalToleranceM?: number;
  /** Huber k (default 1.5). */
  readonly huberK?: number;
  /**
   * Time over which the errors of a static antenna stay correlated (s): code multipath on a still antenna
   * changes over minutes (satellite geometry; common practice: periods of 1-10 min), which no short series
   * can reveal. Default 300 s.
   */
  readonly correlationTimeS?: number;
  /** Standard uncertainty of the reference coordinate itself (m, per horizontal axis and vertical): it moves every point alike. */
  readonly referenceSigma?: ReferenceSigma;
  /** Smallest sigma of the mean (m, per horizontal axis and vertical), for errors the epochs cannot show. */
  readonly sigmaFloor?: ReferenceSigma;
  /**
   * The epochs' errors persist over the whole occupation, so their formal sigma is not reduced by the number
   * of correlation times it lasted: float carrier-phase epochs, whose errors come from the float
   * ambiguities shared by every epoch of their arcs (and the filter's sigma of a float epoch is already
   * that of an estimate from many epochs). Default false.
   */
  readonly formalErrorsPersist?: boolean;
}

/** How well the reference coordinate itself is known (1 sigma, m). */
export interface ReferenceSigma {
  readonly horizontalM: number;
  readonly verticalM: number;
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
  /** The reference coordinate's own uncertainty (1 sigma per horizontal axis, and vertical), 0 when not given. */
  readonly sigmaReferenceHorizontalM: number;
  readonly sigmaReferenceUpM: number;
  /** Radius holding the true point with 95 % probability, from the relative precision alone (sigma_mean E/N). */
  readonly radius95RelativeM: number;
  /** The same with the reference coordinate's uncertainty added: where the point is in the frame. */
  readonly radius95M: number;
  /** 95 % vertical half-interval, relative and with the reference's uncertainty (1.96 sigma). */
  readonly up95RelativeM: number;
  readonly up95M: number;
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
  const sig = samples.map((s) => s.sigmaEnuM).filter((x): x is EnuM => x !== undefined && Number.isFinite(x.e));
  // The a-priori sigmas rescaled by the median a-posteriori variance factor (the residuals' own scale).
  const vf = samples.map((s) => s.varianceFactor).filter((x): x is number => x !== undefined && Number.isFinite(x) && x > 0);
  const scale = vf.length > 0 ? Math.sqrt(median(vf)) : 1;
  const formal = sig.length > 0
    ? { e: scale * median(sig.map((x) => x.e)), n: scale * median(sig.map((x) => x.n)), u: scale * median(sig.map((x) => x.u)) }
    : { e: 0, n: 0, u: 0 };
  const nCorrelation = opts.formalErrorsPersist ? 1 : Math.max(1, (Number.isFinite(durationS) ? durationS : 0) / (opts.correlationTimeS ?? 300));
  const minEpochs = opts.minEpochs ?? 10;
  const tol = opts.horizontalToleranceM ?? 1.0;
  const floorH = opts.sigmaFloor?.horizontalM ?? 0, floorV = opts.sigmaFloor?.verticalM ?? 0;
  const sigmaE = Math.max(sdE / Math.sqrt(fe.nEff), formal.e / Math.sqrt(nCorrelation), floorH);
  const sigmaN = Math.max(sdN / Math.sqrt(fn.nEff), formal.n / Math.sqrt(nCorrelation), floorH);
  const sigmaU = Math.max(sdU / Math.sqrt(fu.nEff), formal.u / Math.sqrt(nCorrelation), floorV);
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
    // sigma of the mean: the larger of the scatter's sd / sqrt(n_eff) (time-correlation.ts) and the epochs'
    // formal sigma over the number of correlation times the occupation lasted: a constant multipath or
    // reference error makes the scatter small but is still in the epochs' own error budget.
    sigmaMeanEastM: sigmaE,
    sigmaMeanNorthM: sigmaN,
    sigmaMeanUpM: sigmaU,
    batchSigmaMeanEastM: batchMeansStandardError(e),
    batchSigmaMeanNorthM: batchMeansStandardError(nn),
    batchSigmaMeanUpM: batchMeansStandardError(u),
    meanPdop,
    toleranceFlag,
    ...precision95(sigmaE, sigmaN, sigmaU, opts.referenceSigma),
  };
}

/**
 * 95 % horizontal radius of an error with independent east/north sigmas (accuracy/circular-error.ts: the
 * exact integral, 2.4477 sigma for a circular error) and 95 % vertical half-interval (1.9600 sigma), from
 * the point's relative precision and with the reference coordinate's uncertainty added in quadrature.
 */
function precision95(sigmaE: number, sigmaN: number, sigmaU: number, ref?: ReferenceSigma) {
  const rh = ref?.horizontalM ?? 0, rv = ref?.verticalM ?? 0;
  const ok = Number.isFinite(sigmaE) && Number.isFinite(sigmaN);
  return {
    sigmaReferenceHorizontalM: rh,
    sigmaReferenceUpM: rv,
    radius95RelativeM: ok ? circularErrorRadiusM(0.95, sigmaE, sigmaN) : NaN,
    radius95M: ok ? circularErrorRadiusM(0.95, Math.hypot(sigmaE, rh), Math.hypot(sigmaN, rh)) : NaN,
    up95RelativeM: 1.96 * sigmaU,
    up95M: 1.96 * Math.hypot(sigmaU, rv),
  };
}
