/** Reference frames: names, 14-parameter Helmert transformations, parameter sets and the comparison rule. */
export * from './frame-names.js';
export * from './helmert.js';
export * from './helmert-json.js';
export * from './parameter-sets.js';
export * from './frame-path.js';
export * from './frame-rule.js';
export * from './frame-crs.js';
export * from './shipped-transformations.js';
