/**
 * Default tolerances of the point and control-mark comparisons. A leaf module
 * (no imports) so that the command line can show them without loading the engine (defaults-and-errors.ts).
 */

/** A point's spread between its epochs is flagged above these (m). */
export const DEFAULT_POINT_TOLERANCE_H_M = 1.0;
export const DEFAULT_POINT_TOLERANCE_V_M = 2.0;

/** A control-mark comparison passes within these (m). */
export const DEFAULT_CHECK_TOLERANCE_H_M = 1.0;
export const DEFAULT_CHECK_TOLERANCE_V_M = 2.0;
