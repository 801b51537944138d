/**
 * What a session report shows, gathered from a run's outputs (epochs, residuals, points, summary,
 * control check). Every series is optional: a report of a folder without residuals simply has no
 * residual chart and says so. Coordinates are local east/north/up metres at the reference coordinate,
 * in the frame and epoch stated in `frameText`.
 */

/** Per-epoch series, one entry per rover epoch, in time order. NaN = no value. */
export interface EpochSeries {
  /** GPS seconds since 1980-01-06 (estimated GPS time of the epoch). */
  readonly timeGpsS: ArrayLike<number>;
  readonly eastM: ArrayLike<number>;
  readonly northM: ArrayLike<number>;
  readonly upM: ArrayLike<number>;
  readonly satellitesUsed: ArrayLike<number>;
  readonly pdop: ArrayLike<number>;
  /** Solution kind as a word (any word: code, differential, smoothed, standalone, float, fixed, none...). */
  readonly kind: readonly string[];
  /** Occupation (point) the epoch belongs to; '' when none. */
  readonly point: readonly string[];
}

/** Per-satellite residual rows (long form) with the words indexed to keep a day's rows small. */
export interface ResidualSeries {
  readonly timeGpsS: ArrayLike<number>;
  /** Index into `satellites`. */
  readonly satellite: ArrayLike<number>;
  readonly satellites: readonly string[];
  readonly elevationDeg: ArrayLike<number>;
  readonly azimuthDeg: ArrayLike<number>;
  readonly residualM: ArrayLike<number>;
  /**
   * 1 where the row is a carrier-phase residual (its signal a phase code, L..: millimetres), 0 for code
   * (metres); absent when the outputs do not say (then every row is taken as code).
   */
  readonly phase?: ArrayLike<number>;
  /** 0 = used; k > 0 = rejected for reasons[k - 1]. */
  readonly rejection: ArrayLike<number>;
  readonly reasons: readonly string[];
}

/** Satellite directions seen from a receiver (sky.csv: the reference's). */
export interface SkySeries {
  readonly timeGpsS: ArrayLike<number>;
  /** Index into `satellites`. */
  readonly satellite: ArrayLike<number>;
  readonly satellites: readonly string[];
  readonly azimuthDeg: ArrayLike<number>;
  readonly elevationDeg: ArrayLike<number>;
}

export interface ReportPoint {
  readonly name: string;
  readonly epochs: number;
  readonly durationS: number;
  readonly startUtc: string;
  /** First and last epoch of the occupation, GPS seconds (NaN when unknown). */
  readonly startGpsS: number;
  readonly endGpsS: number;
  /** Local east/north/up of the point at the reference (m); NaN when unknown. */
  readonly eastM: number;
  readonly northM: number;
  readonly upM: number;
  readonly latitudeDeg: number;
  readonly longitudeDeg: number;
  readonly heightM: number;
  readonly eastingM: number;
  readonly northingM: number;
  readonly orthometricHeightM: number;
  /** Per-epoch scatter (1 sigma). */
  readonly sdEastM: number;
  readonly sdNorthM: number;
  readonly sdUpM: number;
  /** Precision of the mean (1 sigma). */
  readonly sigmaMeanEastM: number;
  readonly sigmaMeanNorthM: number;
  readonly sigmaMeanUpM: number;
  /** Stated 95 % horizontal radius of the point relative to the reference, and in the frame (with the reference's own uncertainty); NaN when not given. */
  readonly radius95RelativeM?: number;
  readonly radius95M?: number;
  /** 'ok' or the reason the point exceeds its tolerance. */
  readonly tolerance: string;
  readonly solutionKinds: string;
}

export interface ReportCheckPair {
  readonly point: string;
  readonly mark: string;
  readonly matchedBy: string;
  readonly dEastM: number;
  readonly dNorthM: number;
  readonly dUpM: number;
  readonly horizontalM: number;
  readonly pass: boolean;
  /**
   * The chi-square test of the difference against the point's precision and the mark's accuracy:
   * 'accepted', 'rejected-horizontal', 'rejected-vertical', 'rejected-horizontal-and-vertical', '' when
   * not tested (absent in older files).
   */
  readonly differenceTest?: string;
  /** Its test statistics (NaN when not tested). */
  readonly chi2H?: number;
  readonly chi2V?: number;
}

export interface ReportControlCheck {
  readonly toleranceHM: number;
  readonly toleranceVM: number;
  /** Critical values of the difference test (chi-square at 95 %, 2 and 1 degrees of freedom); NaN when not stated. */
  readonly criticalHorizontal?: number;
  readonly criticalVertical?: number;
  /** Frame and epoch of the comparison (the marks'), e.g. 'WGS84 epoch 2018.76'; '' when not stated. */
  readonly frameText?: string;
  /** The files compared and when. */
  readonly pointsFile?: string;
  readonly marksFile?: string;
  readonly createdUtc?: string;
  /** Matching radius (m), NaN when not stated. */
  readonly radiusM?: number;
  readonly pairs: readonly ReportCheckPair[];
  readonly unmatchedPoints: readonly string[];
  readonly unmatchedMarks: readonly string[];
  /** NSSDA figures as label/value lines (whatever the check wrote). */
  readonly nssda: readonly (readonly [string, string])[];
  readonly warnings: readonly string[];
}

export interface ReportInput {
  readonly kind: string;
  readonly path: string;
  readonly sha256: string;
  readonly bytes: number | null;
}

export interface SessionReportData {
  /** What the folder holds: a run's outputs (the default), or a control check's alone. */
  readonly kind?: 'session' | 'control-check';
  /** Session name (file or folder name). */
  readonly title: string;
  readonly software: string;
  readonly createdUtc: string;
  /** e.g. "WGS84 epoch 2018.76". */
  readonly frameText: string;
  /** "ground mark" or "antenna reference point". */
  readonly pointReference: string;
  /** Where the reference coordinate came from, in words. */
  readonly referenceText: string;
  readonly firstUtc: string;
  readonly lastUtc: string;
  /** Epoch counts by solution kind (all epochs, before any decimation). */
  readonly epochsByKind: readonly (readonly [string, number])[];
  /** The frame and epoch of the points (points.csv rows) when not the run's, e.g. for a check's page. */
  readonly pointsFrameText?: string;
  /** The CRS of the points' easting/northing in words ('WGS 84 / UTM zone 32N (EPSG:32632)', 'custom: ...'); '' or absent when none. */
  readonly gridCrsText?: string;
  /** How that grid's datum relates to the points' frame (one sentence). */
  readonly gridDatumNote?: string;
  /** The points' heights in words (ellipsoidal; orthometric above which geoid model). */
  readonly heightsText?: string;
  /** The geoid model's caution (EGM96 is not a national height datum), when it gives one. */
  readonly heightsCaution?: string;
  /** What the plan view's east/north are about when the folder gives no reference coordinate (e.g. 'the point P1'). */
  readonly planOrigin?: string;
  /** Why the run's input was incomplete (observations lost while reading), '' or absent when complete. */
  readonly incompleteInput?: string;
  /** More summary lines (scatter of the positions, systems used, rejected epochs...), label and value. */
  readonly facts?: readonly (readonly [string, string])[];
  readonly epochs: EpochSeries | null;
  readonly residuals: ResidualSeries | null;
  /** The reference receiver's satellites (sky.csv); null when the folder has none. */
  readonly referenceSky?: SkySeries | null;
  readonly points: readonly ReportPoint[];
  readonly check: ReportControlCheck | null;
  readonly inputs: readonly ReportInput[];
  /** Options as flat label/value lines. */
  readonly options: readonly (readonly [string, string])[];
  readonly warningsTotal: number;
  readonly warnings: readonly string[];
  readonly notes: readonly string[];
  readonly cautions: readonly string[];
  /** What the folder did not hold, in words (shown where the chart would be). */
  readonly missing: readonly string[];
}

export interface BatchIndexEntry {
  readonly session: string;
  /** 'ok' or 'failed' (any word). */
  readonly status: string;
  readonly reason: string;
  readonly epochs: number;
  readonly solvedEpochs: number;
  readonly points: number;
  /** Relative link to the session's report; null when there is none. */
  readonly reportHref: string | null;
}

export interface BatchIndexData {
  readonly title: string;
  readonly software: string;
  readonly createdUtc: string;
  readonly sessions: readonly BatchIndexEntry[];
  readonly cautions: readonly string[];
}
