/**
 * The command-line options of a differential run (files, reference coordinate, antennas, processing),
 * shared by `solve` and `points` so both take the same inputs, and the mapping of yargs' parsed values to
 * SolveArgs.
 */
import type { Argv } from 'yargs';
import { DEFAULT_OPTIONS, DEFAULT_POINT_TOLERANCE_H_M, DEFAULT_POINT_TOLERANCE_V_M, defaultOutputKinds, outputKinds } from '@refdelta/core/defaults-and-errors';
import type { SolveArgs } from './commands/solve.js';
import type { PointsArgs } from './commands/points.js';
import { carrierArgsFrom } from './carrier-option-definitions.js';

/** The files of one session (solve, points) and every processing option. */
export function defineSolveOptions<T>(c: Argv<T>): Argv<T> {
  return defineProcessingOptions(
    c.option('rover', { type: 'string', demandOption: true, describe: 'rover observation file (RINEX 2/3/4, compact RINEX, .gz/.Z)', group: 'Files:' })
      .option('reference', { type: 'string', array: true, describe: 'reference observation file(s), one station, consecutive in time; without it: single-receiver (standalone) positions in the broadcast orbits\' frame', group: 'Files:' })
      .option('nav', { type: 'string', array: true, demandOption: true, describe: 'broadcast navigation file(s)', group: 'Files:' })
      .option('out', { type: 'string', demandOption: true, describe: 'output folder (created; files replaced atomically)', group: 'Files:' }),
  );
}

/** Everything but the input files and --out: outputs, reference coordinate, antennas, processing. */
export function defineProcessingOptions<T>(c: Argv<T>): Argv<T> {
  return c.option('outputs', { type: 'string', default: defaultOutputKinds().join(','), describe: `which outputs to write, from ${[...outputKinds(), 'report'].join(', ')} (report writes epochs and residuals too)`, group: 'Files:' })
    .option('ref-coord', { type: 'string', describe: "the reference mark: X,Y,Z (ECEF m), LAT,LON,H (deg, deg, ellipsoidal m), a mark name from --marks, or 'header' (the reference file's APPROX POSITION XYZ; approximate, warns)", group: 'Reference coordinate:' })
    .option('marks', { type: 'string', describe: 'control list CSV (or a points.csv) holding the mark named by --ref-coord', group: 'Reference coordinate:' })
    .option('ref-frame', { type: 'string', describe: "frame of the coordinate, e.g. ITRF2014, ETRF2000, WGS84 (required with coordinate values; header: unstated)", group: 'Reference coordinate:' })
    .option('ref-epoch', { type: 'number', describe: 'epoch of the coordinate, decimal year, e.g. 2024.37 (required with coordinate values; header: the observation epoch)', group: 'Reference coordinate:' })
    .option('tie-to', { type: 'string', array: true, describe: "CORS observation file(s): the reference (a base on an unknown point) is first tied to them; --ref-coord then gives the CORS's coordinate", group: 'Reference coordinate:' })
    .option('ref-sigma', { type: 'string', defaultDescription: '2,3 for a header coordinate, 0.02,0.03 for a given or published one', describe: "the reference coordinate's 1-sigma uncertainty H[,V] (m)", group: 'Reference coordinate:' })
    .option('allow-unknown-frame', { type: 'boolean', default: false, describe: 'accept a frame name outside the known list (its outputs carry no CRS)', group: 'Reference coordinate:' })
    .option('rover-antenna-height', { type: 'number', defaultDescription: 'the file header', describe: 'rover antenna height above the mark (m)', group: 'Antennas:' })
    .option('ref-antenna-height', { type: 'number', defaultDescription: 'the file header', describe: 'reference antenna height above the mark (m)', group: 'Antennas:' })
    .option('height-kind', { type: 'string', choices: ['vertical', 'slant'], default: 'vertical', describe: 'how the heights were measured', group: 'Antennas:' })
    .option('antenna-radius', { type: 'number', describe: 'antenna radius to the slant measuring point (m), for --height-kind slant', group: 'Antennas:' })
    .option('slant-offset', { type: 'number', default: 0, describe: 'vertical offset from the slant measuring point to the antenna reference point (m; negative when the ARP is below it)', group: 'Antennas:' })
    .option('at-antenna', { type: 'boolean', default: false, describe: 'report the antenna reference point instead of the ground mark', group: 'Antennas:' })
    .option('elevation-mask', { type: 'number', default: DEFAULT_OPTIONS.elevationMaskDeg, describe: 'elevation mask (deg)', group: 'Processing:' })
    .option('weights', { type: 'string', default: 'elevation+strength', describe: 'elevation | elevation+strength', group: 'Processing:' })
    .option('sigma-a', { type: 'number', default: DEFAULT_OPTIONS.weighting.aM, describe: 'weighting constant a (m) in sigma^2 = a^2 + b^2/sin^2(el)', group: 'Processing:' })
    .option('sigma-b', { type: 'number', default: DEFAULT_OPTIONS.weighting.bM, describe: 'weighting constant b (m)', group: 'Processing:' })
    .option('smooth', { type: 'number', default: 0, describe: 'carrier smoothing time constant (s); 0 = off', group: 'Processing:' })
    .option('smooth-reference', { type: 'string', choices: ['on', 'off'], default: 'on', describe: "carrier-smooth the reference's code (forwards and backwards over the session) also when the rover's is not", group: 'Processing:' })
    .option('systems', { type: 'string', default: 'G,R,E,C,J', describe: 'systems to use (letters)', group: 'Processing:' })
    .option('glonass', { type: 'string', default: 'auto', describe: 'auto | exclude | include | estimate', group: 'Processing:' })
    .option('max-age', { type: 'number', default: DEFAULT_OPTIONS.maxCorrectionAgeS, describe: 'largest correction age (s)', group: 'Processing:' })
    .option('fallback-standalone', { type: 'boolean', default: false, describe: 'give a standalone position when no differential one is possible', group: 'Processing:' }) as Argv<T>;
}

/** SolveArgs from yargs' parsed values (camel-cased keys). */
export function solveArgsFrom(a: Record<string, unknown>): SolveArgs {
  return {
    rover: String(a.rover), reference: (a.reference as string[]) ?? [], nav: (a.nav as string[]) ?? [], out: String(a.out),
    outputs: a.outputs, refCoord: a.refCoord, marks: a.marks, allowUnknownFrame: a.allowUnknownFrame,
    refFrame: a.refFrame, refEpoch: a.refEpoch, refSigma: a.refSigma, tieTo: a.tieTo as readonly unknown[] | undefined, roverAntennaHeight: a.roverAntennaHeight, refAntennaHeight: a.refAntennaHeight,
    heightKind: a.heightKind, antennaRadius: a.antennaRadius, slantOffset: a.slantOffset, atAntenna: a.atAntenna, elevationMask: a.elevationMask,
    weights: a.weights, sigmaA: a.sigmaA, sigmaB: a.sigmaB, smooth: a.smooth, smoothReference: a.smoothReference, systems: a.systems, glonass: a.glonass,
    maxAge: a.maxAge, fallbackStandalone: a.fallbackStandalone, quiet: a.quiet === true, jsonLines: a.jsonLines === true,
    ...carrierArgsFrom(a),
  };
}

/** The options `points` adds to a solve run (also taken by `batch`). */
export function definePointsOptions<T>(c: Argv<T>): Argv<T> {
  return c.option('windows', { type: 'string', describe: 'occupation CSV: name,start,end[,antenna_height_m,height_kind] (takes precedence over event flags and Doppler); times YYYY-MM-DDThh:mm:ss[.sss] (T or a space), ' +
      "in UTC unless followed by GPST (GPS time, no leap seconds); a UTC time may end in Z, UTC or an offset +hh:mm or -hh:mm (the colon optional)", group: 'Points:' })
    .option('tolerance-h', { type: 'number', default: DEFAULT_POINT_TOLERANCE_H_M, describe: 'flag points whose horizontal scatter exceeds this (m)', group: 'Points:' })
    .option('tolerance-v', { type: 'number', default: DEFAULT_POINT_TOLERANCE_V_M, describe: 'flag points whose vertical scatter exceeds this (m)', group: 'Points:' })
    .option('projection', { type: 'string', describe: "grid coordinates: EPSG:xxxx of a projected CRS, a '+proj=...' string, or utm (zone of the first point, in the points' frame); labelled by the points' frame", group: 'Points:' })
    .option('geoid', { type: 'string', describe: 'orthometric heights: egm96, or a geoid grid FILE in the ISG format or as a GeoTIFF (as PROJ distributes them)', group: 'Points:' }) as Argv<T>;
}

/** PointsArgs from yargs' parsed values. */
export function pointsArgsFrom(a: Record<string, unknown>): PointsArgs {
  return { ...solveArgsFrom(a), windows: a.windows, toleranceH: a.toleranceH, toleranceV: a.toleranceV, projection: a.projection, geoid: a.geoid };
}
