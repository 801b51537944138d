/**
 * Exit codes of the refdelta command (documented in README.md). Later commands may add codes from 3 up
 * (e.g. a control check that fails).
 */
export const EXIT_OK = 0;
/** Reading or processing failed (missing or unreadable file, wrong format, no overlap, no navigation data...). */
export const EXIT_PROCESSING = 1;
/** The command line is wrong (unknown option, missing option, bad option value). */
export const EXIT_USAGE = 2;
/** `refdelta check`: at least one control mark failed its tolerance (outputs are still written). */
export const EXIT_CHECK_FAILED = 3;
/** `refdelta batch`: some sessions failed (each named with its reason); the others' outputs are written. */
export const EXIT_BATCH_PARTIAL = 4;
