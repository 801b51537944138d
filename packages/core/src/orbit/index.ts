/** Orbit stage: satellite positions, velocities and clocks from broadcast ephemerides; issue selection; transmission time. */
export {
  SPEED_OF_LIGHT_MS, GPS_PI, GPS_CONSTANTS, QZSS_CONSTANTS, GALILEO_CONSTANTS, BEIDOU_CONSTANTS, NAVIC_CONSTANTS,
  PZ90, FREQ_L1_HZ, FREQ_L2_HZ, FREQ_L5_HZ, FREQ_E5B_HZ, keplerConstantsFor, earthRotationRadS,
  type KeplerConstants,
} from './constants.js';
export { keplerStateInto, solveKepler, eccentricAnomaly, isBeidouGeo, timeFromEphemerisEpochS } from './kepler.js';
export { glonassStateInto, GLONASS_STEP_S, GLONASS_MAX_INTEGRATION_S } from './glonass.js';
export { sbasStateInto } from './sbas.js';
export { satelliteState, satelliteStateInto, type SatelliteState } from './state.js';
export {
  satelliteClock, groupDelayS, defaultSignal, isGalileoFnav, GAMMA_L1_L2,
  type SatelliteClock, type SignalKind,
} from './clock.js';
export {
  EphemerisStore, issueKey, referenceTimeGpsS, validityS,
  type Selection, type SelectionFailure, type SelectOptions,
} from './ephemeris-store.js';
export { satelliteAtTransmission, earthRotationCorrection, type SatelliteAtTransmission } from './transmit.js';
