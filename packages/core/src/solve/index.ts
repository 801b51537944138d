export * from './wls.js';
export * from './dop.js';
export * from './weights.js';
export * from './distributions.js';
export * from './tests.js';
export { choleskyInPlace, choleskySolveInPlace, choleskyInverse, CHOLESKY_RELATIVE_PIVOT_TOLERANCE } from './dense-cholesky.js';
export * from './position-fix.js';
export type { SatelliteResidual } from './satellite-residual.js';
