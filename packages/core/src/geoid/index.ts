/** Geoid models and orthometric heights: EGM96 (on demand) and user grids in our own text format. */
export * from './geoid-model.js';
export * from './egm96.js';
export * from './geoid-grid.js';
