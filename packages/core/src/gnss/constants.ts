/** Physical constants used by every stage, each defined once here. */

/** Speed of light in vacuum (m/s): SI definition (check-values.md, "Constants"). */
export const SPEED_OF_LIGHT_MS = 299_792_458;
