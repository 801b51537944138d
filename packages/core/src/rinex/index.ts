/** RINEX readers and writers: public face of the rinex stage. */
export { LineCursor, textLines, decodeUtf8Chunks } from './text-lines.js';
export { readObsStream, collectEpochs, looksLikeR2Epoch } from './obs-reader.js';
export type { ReadObsOptions } from './obs-reader.js';
export { defaultTimeSystem, parseVersionLine } from './obs-header.js';
export { writeObsRinex3, calendarSecondsFromGpsS } from './obs-writer.js';
export type { WriteObsOptions } from './obs-writer.js';
export { readNav, mergeNav, parseNavLines } from './nav-reader.js';
export type { ReadNavOptions } from './nav-reader.js';
export { writeNavRinex3 } from './nav-writer.js';
export type { WriteNavOptions } from './nav-writer.js';
