/** Map projections (proj4-based; no datum shifts), UTM zone choice, point scale and convergence. */
export * from './utm-zone.js';
export * from './projection-spec.js';
export * from './projection.js';
export * from './grid-factors.js';
export * from './wkt1.js';
export * from './projection-datum.js';
export * from './grid-area.js';
