export * from './standalone-epoch.js';
export { GLONASS_CODE_BIAS_SIGMA_M, glonassCodeBiasVarianceM2 } from './fdma-code-bias.js';
export * from './standalone-session.js';
