/**
 * Points and marks of different names are matched within this horizontal distance (m). A leaf module so
 * that the command line can show it without loading the engine (defaults-and-errors.ts).
 */
export const DEFAULT_MATCH_RADIUS_M = 5;
