/** Point occupations: splitting a series into points, robust mean, precision with time correlation, antenna heights. */
export * from './robust-mean.js';

export * from './antenna-height.js';
export * from './occupation-csv.js';
export * from './occupations.js';
export * from './summarise-point.js';
export * from './window-names.js';
