/**
 * The carrier-phase options of the command line (solve, points, batch) and their values as read by yargs.
 * Kept apart from carrier-run.ts, which runs the engine, so that the command line can be laid out
 * without loading the engine.
 */
import type { Argv } from 'yargs';

export interface CarrierArgs {
  readonly carrierPhase?: unknown;
  readonly ratioThreshold?: unknown;
  readonly ambiguityMask?: unknown;
  readonly dynamics?: unknown;
  readonly antennas?: unknown;
  readonly frequencies?: unknown;
}

export function defineCarrierOptions<T>(c: Argv<T>): Argv<T> {
  return c.option('carrier-phase', { type: 'string', describe: 'on | off: centimetre solutions from carrier phase with integer ambiguities (default: on when both receivers recorded phase)', group: 'Carrier phase:' })
    .option('ratio-threshold', { type: 'string', describe: 'ratio test threshold for integer ambiguities, default 3', group: 'Carrier phase:' })
    .option('ambiguity-mask', { type: 'string', describe: 'elevation mask for fixing ambiguities (deg), default 15', group: 'Carrier phase:' })
    .option('dynamics', { type: 'string', describe: 'auto | static | kinematic (auto: static between occupation events, moving otherwise)', group: 'Carrier phase:' })
    .option('antennas', { type: 'string', describe: 'antenna calibrations (ANTEX file) for the antenna types in the RINEX headers', group: 'Carrier phase:' })
    .option('frequencies', { type: 'string', describe: 'all | single: phase on every band both receivers recorded (L2, L5, E5a, E5b, B3I...; the differential ionosphere then estimated), or the first band alone; default all', group: 'Carrier phase:' }) as Argv<T>;
}

export function carrierArgsFrom(a: Record<string, unknown>): CarrierArgs {
  return { carrierPhase: a.carrierPhase, ratioThreshold: a.ratioThreshold, ambiguityMask: a.ambiguityMask, dynamics: a.dynamics, antennas: a.antennas, frequencies: a.frequencies };
}
