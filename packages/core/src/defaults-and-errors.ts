/**
 * The core's light entry (`@refdelta/core/defaults-and-errors`): the option defaults, output kinds and
 * error classes a command line needs to lay out its options and report failures, from modules that import
 * nothing heavy, so that `--version`, `--help` or a wrong command line do not load the engine. The same
 * names are exported by the main entry (index.ts); they are the same objects.
 */
export { RefdeltaError, InputError, FormatError, ProcessingError, formatWarning, type Warning, type WarningSink } from './errors.js';
export { DEFAULT_OPTIONS } from './session/options.js';
export { DEFAULT_CHECK_TOLERANCE_H_M, DEFAULT_CHECK_TOLERANCE_V_M, DEFAULT_POINT_TOLERANCE_H_M, DEFAULT_POINT_TOLERANCE_V_M } from './report/tolerances.js';
export { DEFAULT_MATCH_RADIUS_M } from './control/match-radius.js';
export { defaultOutputKinds, outputKinds } from './report/output-kinds.js';
