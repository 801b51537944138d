/** From the command line's values to the engine's SessionOptions (everything but the reference coordinate). */
import { DEFAULT_OPTIONS, type AntennaOffset, type GlonassPolicy, type SessionOptions } from '@refdelta/core';
import { parseChoice, parseChoiceList, parseNumber, parseSystems } from './parse-values.js';
import { UsageError } from './usage-error.js';

export const OUTPUT_KINDS = ['epochs', 'residuals', 'geojson', 'summary'] as const;
export type OutputKind = (typeof OUTPUT_KINDS)[number];

/** File names inside the output folder. */
export const OUTPUT_FILE_NAMES: Readonly<Record<OutputKind, string>> = {
  epochs: 'epochs.csv',
  residuals: 'residuals.csv',
  geojson: 'positions.geojson',
  summary: 'summary.json',
};

export interface SolveOptionArgs {
  readonly roverAntennaHeight?: unknown;
  readonly refAntennaHeight?: unknown;
  readonly heightKind?: unknown;
  readonly antennaRadius?: unknown;
  readonly elevationMask?: unknown;
  readonly weights?: unknown;
  readonly sigmaA?: unknown;
  readonly sigmaB?: unknown;
  readonly smooth?: unknown;
  readonly systems?: unknown;
  readonly glonass?: unknown;
  readonly maxAge?: unknown;
  readonly fallbackStandalone?: unknown;
  readonly atAntenna?: unknown;
  readonly outputs?: unknown;
}

/**
 * Vertical antenna height from a measured one. Slant: measured from the mark to the antenna's edge at
 * radius r from the vertical axis, so h = sqrt(s^2 - r^2) (right triangle; common practice). The
 * measuring point is assumed at the height of the antenna reference point: when it is not, add the
 * manufacturer's vertical offset to the result yourself.
 */
export function verticalHeightM(measuredM: number, kind: 'vertical' | 'slant', radiusM: number | undefined, option: string): number {
  if (kind === 'vertical') return measuredM;
  if (radiusM === undefined) throw new UsageError(`--height-kind slant needs --antenna-radius M (the horizontal distance from the antenna axis to where ${option} was measured)`);
  if (!(measuredM > radiusM)) throw new UsageError(`--${option} ${measuredM} m is a slant height not longer than --antenna-radius ${radiusM} m`);
  return Math.sqrt(measuredM * measuredM - radiusM * radiusM);
}

export interface AntennaHeights {
  /** Vertical heights of the antenna reference point above the marks (m), when given. */
  readonly roverHeightM?: number;
  readonly referenceHeightM?: number;
}

export function parseAntennaHeights(a: SolveOptionArgs): AntennaHeights {
  const kind = parseChoice('height-kind', a.heightKind ?? 'vertical', ['vertical', 'slant'] as const);
  const radius = a.antennaRadius === undefined ? undefined : parseNumber('antenna-radius', a.antennaRadius, 0, 1);
  const rover = a.roverAntennaHeight === undefined ? undefined : parseNumber('rover-antenna-height', a.roverAntennaHeight, 0, 100);
  const ref = a.refAntennaHeight === undefined ? undefined : parseNumber('ref-antenna-height', a.refAntennaHeight, 0, 100);
  if (kind === 'slant' && rover === undefined && ref === undefined) throw new UsageError('--height-kind slant given without --rover-antenna-height or --ref-antenna-height');
  return {
    roverHeightM: rover === undefined ? undefined : verticalHeightM(rover, kind, radius, 'rover-antenna-height'),
    referenceHeightM: ref === undefined ? undefined : verticalHeightM(ref, kind, radius, 'ref-antenna-height'),
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
    smoothing: { ...d.smoothing, enabled: smoothS > 0, timeConstantS: smoothS > 0 ? smoothS : d.smoothing.timeConstantS },
    quality: d.quality,
    maxCorrectionAgeS: a.maxAge === undefined ? d.maxCorrectionAgeS : parseNumber('max-age', a.maxAge, 0, 86400),
    standaloneFallback: a.fallbackStandalone === true,
    reduceToMark: a.atAntenna !== true,
  };
}

export function parseOutputs(v: unknown): OutputKind[] {
  return v === undefined ? [...OUTPUT_KINDS] : parseChoiceList('outputs', v, OUTPUT_KINDS);
}
