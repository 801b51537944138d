/** Geoid models and orthometric heights: EGM96 (on demand) and geoid grids in ISG and GeoTIFF form. */
export * from './geoid-model.js';
export * from './egm96.js';
export * from './regular-grid.js';
export * from './isg-grid.js';
export * from './geotiff-grid.js';
