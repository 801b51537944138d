export * from './ellipsoid.js';
export * from './geodetic.js';
export * from './enu.js';
export * from './mark-reduction.js';
