/** From the command line's values to the engine's SessionOptions (everything but the reference coordinate). */
import {
  DEFAULT_OPTIONS, SUMMARY_FILE_NAME, defaultOutputKinds, outputKinds, type AntennaOffset, type GlonassPolicy, type SessionOptions,
} from '@refdelta/core';
import { parseChoice, parseChoiceList, parseNumber, parseSystems } from './parse-values.js';
import { UsageError } from './usage-error.js';

/** The kinds of --outputs: the core's output registry (report/output-registry.ts), 'summary' and 'report' (report.html, built from the others). */
export const OUTPUT_KINDS: readonly string[] = [...outputKinds(), 'report'];
export type OutputKind = string;

/** The run's index and its report inside the output folder. */
export const OUTPUT_FILE_NAMES = { summary: SUMMARY_FILE_NAME, report: 'report.html' } as const;

export interface SolveOptionArgs {
  readonly roverAntennaHeight?: unknown;
  readonly refAntennaHeight?: unknown;
  readonly heightKind?: unknown;
  readonly antennaRadius?: unknown;
  readonly slantOffset?: unknown;
  readonly elevationMask?: unknown;
  readonly weights?: unknown;
  readonly sigmaA?: unknown;
  readonly sigmaB?: unknown;
  readonly smooth?: unknown;
  readonly smoothReference?: unknown;
  readonly systems?: unknown;
  readonly glonass?: unknown;
  readonly maxAge?: unknown;
  readonly fallbackStandalone?: unknown;
  readonly atAntenna?: unknown;
  readonly outputs?: unknown;
}

/** Where a slant height was measured: the antenna's slant measuring point (manufacturer's sheet). */
export interface SlantGeometry {
  /** Horizontal distance from the antenna axis to the slant measuring point (m). */
  readonly radiusM: number;
  /**
   * --slant-offset: vertical offset from the slant measuring point to the antenna reference point (m),
   * i.e. the ARP's height above the measuring point; negative when the ARP is below it (the usual case:
   * the ARP is the bottom of the mount, the measuring point the edge of the ground plane).
   */
  readonly arpAboveSlantPointM: number;
}

/**
 * Vertical height mark -> antenna reference point (ARP) from a measured one. Slant: measured from the
 * mark to the slant measuring point at radius r from the vertical axis; that point is sqrt(s^2 - r^2)
 * above the mark (Pythagoras in the vertical plane through the axis; common practice, receiver
 * manuals) and the ARP d = --slant-offset above the point: h_ARP = sqrt(s^2 - r^2) + d (the rule of
 * core points/antenna-height.ts verticalHeightToArpM with its o = -d).
 */
export function verticalHeightM(measuredM: number, kind: 'vertical' | 'slant', slant: SlantGeometry | undefined, option: string): number {
  if (kind === 'vertical') return measuredM;
  if (slant === undefined) throw new UsageError(`--height-kind slant needs --antenna-radius M (the horizontal distance from the antenna axis to where ${option} was measured)`);
  if (!(measuredM > slant.radiusM)) throw new UsageError(`--${option} ${measuredM} m is a slant height not longer than --antenna-radius ${slant.radiusM} m`);
  const h = Math.sqrt(measuredM * measuredM - slant.radiusM * slant.radiusM) + slant.arpAboveSlantPointM;
  if (!(h >= 0)) throw new UsageError(`--${option} ${measuredM} m with --slant-offset ${slant.arpAboveSlantPointM} m puts the antenna reference point below the mark`);
  return h;
}

/** --antenna-radius and --slant-offset, when a radius is given. */
export function parseSlantGeometry(a: SolveOptionArgs): SlantGeometry | undefined {
  const radiusM = a.antennaRadius === undefined ? undefined : parseNumber('antenna-radius', a.antennaRadius, 0, 1);
  // Slant measuring points sit within a few decimetres of the ARP on survey antennas (common practice).
  const offsetM = a.slantOffset === undefined ? 0 : parseNumber('slant-offset', a.slantOffset, -1, 1);
  if (radiusM === undefined) {
    if (a.slantOffset !== undefined && a.slantOffset !== 0) throw new UsageError('--slant-offset needs --antenna-radius M (both describe the slant measuring point)');
    return undefined;
  }
  return { radiusM, arpAboveSlantPointM: offsetM };
}

export interface AntennaHeights {
  /** Vertical heights of the antenna reference point above the marks (m), when given. */
  readonly roverHeightM?: number;
  readonly referenceHeightM?: number;
}

export function parseAntennaHeights(a: SolveOptionArgs): AntennaHeights {
  const kind = parseChoice('height-kind', a.heightKind ?? 'vertical', ['vertical', 'slant'] as const);
  const slant = parseSlantGeometry(a);
  const rover = a.roverAntennaHeight === undefined ? undefined : parseNumber('rover-antenna-height', a.roverAntennaHeight, 0, 100);
  const ref = a.refAntennaHeight === undefined ? undefined : parseNumber('ref-antenna-height', a.refAntennaHeight, 0, 100);
  if (kind === 'slant' && rover === undefined && ref === undefined) throw new UsageError('--height-kind slant given without --rover-antenna-height or --ref-antenna-height');
  return {
    roverHeightM: rover === undefined ? undefined : verticalHeightM(rover, kind, slant, 'rover-antenna-height'),
    referenceHeightM: ref === undefined ? undefined : verticalHeightM(ref, kind, slant, 'ref-antenna-height'),
  };
}

/** An antenna offset with the given height and the header's eccentricities. */
export function withHeight(header: AntennaOffset, heightM: number | undefined): AntennaOffset | undefined {
  return heightM === undefined ? undefined : { heightM, eastM: header.eastM, northM: header.northM };
}

/** Options without the reference coordinate and antenna overrides (those need the files' headers). */
export function parseSessionOptions(a: SolveOptionArgs): Omit<SessionOptions, 'reference' | 'roverAntenna'> {
  const d = DEFAULT_OPTIONS;
  const weights = parseChoice('weights', a.weights ?? (d.weighting.useStrength ? 'elevation+strength' : 'elevation'), ['elevation', 'elevation+strength'] as const);
  const smoothS = a.smooth === undefined ? 0 : parseNumber('smooth', a.smooth, 0, 3600);
  const systems = a.systems === undefined ? [...d.systems] : parseSystems(a.systems);
  const glonass = parseChoice<GlonassPolicy>('glonass', a.glonass ?? d.glonass, ['auto', 'exclude', 'include', 'estimate']);
  return {
    elevationMaskDeg: a.elevationMask === undefined ? d.elevationMaskDeg : parseNumber('elevation-mask', a.elevationMask, 0, 90),
    systems: glonass === 'exclude' ? systems.filter((s) => s !== 'R') : systems,
    glonass,
    weighting: {
      aM: a.sigmaA === undefined ? d.weighting.aM : parseNumber('sigma-a', a.sigmaA, 0.001, 100),
      bM: a.sigmaB === undefined ? d.weighting.bM : parseNumber('sigma-b', a.sigmaB, 0, 100),
      useStrength: weights === 'elevation+strength',
    },
    smoothing: { ...d.smoothing, enabled: smoothS > 0, timeConstantS: smoothS > 0 ? smoothS : d.smoothing.timeConstantS, reference: onOff('smooth-reference', a.smoothReference, d.smoothing.reference) },
    quality: d.quality,
    maxCorrectionAgeS: a.maxAge === undefined ? d.maxCorrectionAgeS : parseNumber('max-age', a.maxAge, 0, 86400),
    standaloneFallback: a.fallbackStandalone === true,
    reduceToMark: a.atAntenna !== true,
  };
}

export function parseOutputs(v: unknown): OutputKind[] {
  // report.html is asked for by name; the default set is the data files. The report draws from
  // epochs.csv and residuals.csv, so asking for it writes them too.
  if (v === undefined) return defaultOutputKinds();
  const kinds = parseChoiceList('outputs', v, OUTPUT_KINDS);
  return kinds.includes('report') ? OUTPUT_KINDS.filter((k) => kinds.includes(k) || k === 'epochs' || k === 'residuals') : kinds;
}

/** An on|off option; the default when not given. */
function onOff(name: string, v: unknown, dflt: boolean): boolean {
  if (v === undefined || v === null) return dflt;
  const t = String(v).trim().toLowerCase();
  if (t === 'on' || t === 'true') return true;
  if (t === 'off' || t === 'false') return false;
  throw new UsageError(`--${name}: expected on or off, got '${String(v)}'`);
}
