/** File inspection: what an observation or navigation file holds (epochs, gaps, events, satellites, records), as objects and text. */
export {
  inspectObs, timeStamp, modalIntervalS, EPOCH_FLAG_WORDS,
  type ObsInspection, type InspectOptions, type TimeStamp, type GapRecord, type EventRecord,
} from './inspect-obs.js';
export { inspectNav, ephemerisTimeGpsS, type NavInspection } from './inspect-nav.js';
export { obsInspectionText, navInspectionText } from './inspect-text.js';
