/**
 * The run summary (JSON): inputs with their hashes, options, frame and epoch, counts, rejections with
 * reasons, scatter statistics, outputs and the cautions.
 */
import type { Warning } from '../errors.js';
import type { EcefM } from '../gnss/index.js';
import { gpsToUtcS, isoFromSeconds } from '../time/index.js';
import type { SessionSummary } from '../session/index.js';
import type { SessionOptions } from '../session/index.js';
import { frameEpochText, jsonNumber } from './format.js';
import type { ScatterStats } from './statistics.js';

export type InputKind = 'rover' | 'reference' | 'navigation' | 'control' | 'tie-station';

export interface InputFileRecord {
  readonly path: string;
  /** Hex SHA-256 of the file's bytes as stored (before decompression). */
  readonly sha256: string;
  readonly kind: InputKind;
  readonly bytes?: number;
  /** Encoding layers found (e.g. ['gzip', 'compact-rinex-3']). */
  readonly layers?: readonly string[];
}

export interface OutputFileRecord {
  readonly path: string;
  /** 'epochs' | 'residuals' | 'geojson' | 'summary' ... */
  readonly kind: string;
  readonly bytes?: number;
  readonly sha256?: string;
}

/** What the statistics were computed on and the figures. */
export interface LabelledScatter {
  /**
   * What the scatter is about, for programs: 'each-point-mean' (a points run: each epoch about its own
   * point's mean); absent for a scatter about one overall mean (mean_ecef).
   */
  readonly kind?: string;
  /** e.g. 'differential and smoothed epochs' */
  readonly over: string;
  /** What the scatter is about, in words; SOLVE_SCATTER_ABOUT when not given. */
  readonly about?: string;
  readonly stats: ScatterStats;
}

/**
 * The scatter of a solve run: every epoch about the session's one mean. Only a still antenna makes it a
 * precision; for an antenna that moved it measures the movement.
 */
export const SOLVE_SCATTER_ABOUT = 'scatter of the epoch positions about their overall mean: the precision (not accuracy) when the antenna stayed still; when it moved, the extent of its movement, not an error';

export interface SummaryExtras {
  readonly scatter?: LabelledScatter;
  readonly software?: { readonly name: string; readonly version: string };
  /** ISO time the run was made (the caller's clock; the core has none). */
  readonly createdUtc?: string;
  /** Warnings met while reading and processing (counted by code; the first few kept in full). */
  readonly warnings?: readonly Warning[];
  /** Words describing how the reference coordinate was given (for the user). */
  readonly referenceNote?: string;
  /** Where the reference coordinate came from, as the caller knows it (e.g. 'mark KFRD of marks.csv'); else the engine's words. */
  readonly referenceSource?: string;
}

export const CAUTIONS: readonly string[] = [
  'Results are for mapping-grade work, not for boundary, engineering or geodetic control surveys: code-differential positions are at the decimetre to metre level; carrier-phase fixed positions can reach centimetres, but a wrong integer fix moves them by decimetres or more without a sign in the data.',
  'Verify results by occupying known control points and comparing; report accuracy against them.',
  'A wrong reference coordinate, frame or antenna height moves every result by the same amount and cannot be detected from the data alone.',
  'Defer to local codes, regulations and licensed surveyors for any work with legal or safety consequences.',
];

function ecefJson(p: EcefM | null): { x_m: number | null; y_m: number | null; z_m: number | null } | null {
  return p ? { x_m: jsonNumber(p.x, 4), y_m: jsonNumber(p.y, 4), z_m: jsonNumber(p.z, 4) } : null;
}

export function scatterJson(s: LabelledScatter): Record<string, unknown> {
  const t = s.stats;
  return {
    ...(s.kind ? { kind: s.kind } : {}),
    over: s.over,
    about: s.about ?? SOLVE_SCATTER_ABOUT,
    epochs: t.count,
    mean_ecef: ecefJson(t.meanEcef),
    horizontal_median_m: jsonNumber(t.horizontalMedianM, 4),
    horizontal_95_m: jsonNumber(t.horizontal95M, 4),
    horizontal_max_m: jsonNumber(t.horizontalMaxM, 4),
    vertical_median_m: jsonNumber(t.verticalMedianM, 4),
    vertical_95_m: jsonNumber(t.vertical95M, 4),
    vertical_max_m: jsonNumber(t.verticalMaxM, 4),
    rms_east_m: jsonNumber(t.rmsEastM, 4),
    rms_north_m: jsonNumber(t.rmsNorthM, 4),
    rms_up_m: jsonNumber(t.rmsUpM, 4),
    percentile_method: 'linear interpolation between closest ranks (sample quantile definition 7)',
  };
}

function warningsJson(ws: readonly Warning[]): Record<string, unknown> {
  const byCode = new Map<string, number>();
  for (const w of ws) byCode.set(w.code, (byCode.get(w.code) ?? 0) + 1);
  return {
    total: ws.length,
    by_code: Object.fromEntries([...byCode.entries()].sort((a, b) => b[1] - a[1])),
    first: ws.slice(0, 50).map((w) => ({ file: w.file ?? null, line: w.line ?? null, code: w.code, message: w.message })),
  };
}

function optionsJson(o: SessionOptions): Record<string, unknown> {
  return {
    reference_position: o.reference.position
      ? { ...ecefJson(o.reference.position.ecef), frame: o.reference.position.frame.name, epoch: jsonNumber(o.reference.position.frame.epochYear, 4) }
      : 'from the reference file header',
    reference_antenna: o.reference.antenna ?? 'from the reference file header',
    rover_antenna: o.roverAntenna ?? 'from the rover file header',
    elevation_mask_deg: o.elevationMaskDeg,
    systems: [...o.systems],
    glonass: o.glonass,
    weighting: { a_m: o.weighting.aM, b_m: o.weighting.bM, use_strength: o.weighting.useStrength },
    smoothing: { enabled: o.smoothing.enabled, time_constant_s: o.smoothing.timeConstantS, reference: o.smoothing.reference },
    quality: {
      alpha_global: o.quality.testLevels === 'b-method' ? 'from alpha_local per epoch (B-method, power 0.80)' : o.quality.alphaGlobal, alpha_local: o.quality.alphaLocal, test_levels: o.quality.testLevels, min_satellites: o.quality.minSatellites,
      max_pdop: o.quality.maxPdop, max_rejections: o.quality.maxRejections,
    },
    max_correction_age_s: o.maxCorrectionAgeS,
    standalone_fallback: o.standaloneFallback,
    position_refers_to: o.reduceToMark ? 'ground mark' : 'antenna reference point',
  };
}

/** The run summary as a JSON-ready object. */
export function summaryJson(
  summary: SessionSummary,
  inputs: readonly InputFileRecord[],
  options: SessionOptions,
  outputs: readonly OutputFileRecord[],
  extras: SummaryExtras = {},
): Record<string, unknown> {
  const span = Number.isFinite(summary.firstGpsS) && Number.isFinite(summary.lastGpsS);
  return {
    refdelta_summary: 1,
    software: extras.software ?? null,
    created_utc: extras.createdUtc ?? null,
    inputs: inputs.map((i) => ({ kind: i.kind, path: i.path, sha256: i.sha256, bytes: i.bytes ?? null, layers: i.layers ?? null })),
    options: optionsJson(options),
    frame: { name: summary.frame.name, epoch: jsonNumber(summary.frame.epochYear, 4), epoch_text: frameEpochText(summary.frame.epochYear) },
    reference: {
      position: ecefJson(summary.referencePosition.ecef),
      frame: summary.referencePosition.frame.name,
      epoch: jsonNumber(summary.referencePosition.frame.epochYear, 4),
      source: extras.referenceSource ?? summary.referencePositionSource,
      engine_source: summary.referencePositionSource,
      note: extras.referenceNote ?? null,
    },
    time_span: span
      ? {
          first_gps_s: summary.firstGpsS, last_gps_s: summary.lastGpsS,
          first_utc: isoFromSeconds(gpsToUtcS(summary.firstGpsS), 'Z'), last_utc: isoFromSeconds(gpsToUtcS(summary.lastGpsS), 'Z'),
        }
      : null,
    counts: {
      rover_epochs: summary.epochsRover,
      by_kind: { ...summary.epochsByKind },
      without_corrections: summary.epochsWithoutCorrections,
    },
    systems_used: [...summary.systemsUsed],
    rejected_satellites: summary.satelliteRejections.map((r) => ({ reason: r.reason, count: r.count })),
    rejected_epochs: summary.epochRejections.map((r) => ({ reason: r.reason, count: r.count })),
    statistics: extras.scatter ? scatterJson(extras.scatter) : null,
    passes: summary.passes,
    code_offsets: summary.codeOffsets.map((r) => ({
      key: r.key, offset_m: jsonNumber(r.offsetM, 3), sigma_m: jsonNumber(r.sigmaM, 3),
      ...(r.relativeToChannelMeanM !== undefined ? { relative_to_channel_mean_m: jsonNumber(r.relativeToChannelMeanM, 3) } : {}),
      scatter_m: jsonNumber(r.scatterM, 3), samples: r.samples, effective_samples: jsonNumber(r.nEff, 1),
      significant: r.significant, stable: r.stable, applied: r.applied,
    })),
    notes: [...summary.notes],
    warnings: warningsJson(extras.warnings ?? []),
    outputs: outputs.map((o) => ({ kind: o.kind, path: o.path, bytes: o.bytes ?? null, sha256: o.sha256 ?? null })),
    cautions: [...CAUTIONS],
  };
}
