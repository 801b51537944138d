/** Carrier-phase solutions: double differences with integer ambiguities, forwards and backwards. */
export { solveCarrierSession, type CarrierInputs, type CarrierInputFactory, type CarrierEpochSolution, type CarrierSolutionKind, type CarrierSummary, type CarrierRun, type PassShares } from './solve-carrier-session.js';
export { DEFAULT_CARRIER_OPTIONS, withCarrierDefaults, type CarrierOptions, type CarrierDynamics } from './options.js';
export { readAntex, findAntenna, antennaCorrectionM, phaseCentreVariationM, type AntexData, type AntennaCalibration, type FrequencyCalibration } from './antex.js';
export { ArcTracker } from './arc-tracker.js';
export type { FixedDoubleDifference } from './float-filter.js';
export { MemoryRecordStore, type RecordStore } from './epoch-records.js';
