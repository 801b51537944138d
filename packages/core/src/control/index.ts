/** Control marks: CSV reading, matching logged points to marks, and comparison under the frame rule. */
export * from './control-csv.js';
export * from './match-marks.js';
export * from './compare-to-mark.js';
export * from './match-every-point.js';
export * from './marks-file.js';
export * from './difference-test.js';
export * from './far-match.js';
