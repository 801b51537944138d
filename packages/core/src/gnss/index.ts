/**
 * The shared vocabulary of every stage: satellite and coordinate types, the observation and broadcast-record
 * data model, signals and bands, and physical constants. Imports nothing but time/.
 */
export * from './types.js';
export * from './constants.js';
export * from './obs-types.js';
export * from './nav-types.js';
export {
  rinex2ToRinex3Code, rinex2CodeList, normaliseBeidouCode, PSEUDORANGE_PRIORITY, pseudorangePriority, chooseCode, companionCodes,
  carrierFrequencyHz, carrierWavelengthM, glonassG1FrequencyHz, glonassG2FrequencyHz,
} from './obs-codes.js';
export type { CompanionCodes } from './obs-codes.js';
