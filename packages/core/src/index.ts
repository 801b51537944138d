/** Public face of the engine: every stage's index. Others append lines here; keep it append-only. */
export * from './gnss/index.js';
export * from './errors.js';
export * from './time/index.js';
export * from './geodesy/index.js';
export * from './orbit/index.js';
export * from './solve/index.js';
export * from './frames/index.js';
export * from './report/index.js';
export * from './inspect/index.js';
export * from './rinex/index.js';
export * from './atmosphere/index.js';
export * from './geoid/index.js';
export * from './observables/index.js';
export * from './projection/index.js';
export * from './standalone/index.js';
export * from './compress/index.js';
export * from './session/index.js';
export * from './control/index.js';
// points/: 'Occupation' is also a word of the simulator's; the points one is exported as PointOccupation.
export * from './points/robust-mean.js';

export * from './points/antenna-height.js';
export * from './points/occupation-csv.js';
export * from './points/summarise-point.js';
export {
  splitOccupations, DEFAULT_STATIC_DETECTION,
  type EpochMark, type SplitInput, type StaticDetection, type Occupation as PointOccupation,
} from './points/occupations.js';
export * from './accuracy/index.js';
export * from './velocity/index.js';
export * from './report/points-summary.js';
export * from './report/points-table.js';
export * from './report/points-csv.js';
export * from './report/control-check.js';
export * from './report/control-report.js';
export * from './ambiguity/index.js';
export * from './carrier/index.js';
export * from './report-html/index.js';
export * from './csv/inert-cell.js';
