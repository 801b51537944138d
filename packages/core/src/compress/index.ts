/** Compressed inputs: gzip, Unix compress (.Z), compact RINEX 1.0 / 3.0, and their stacks. */
export { openText, TEXT_CHUNK_CHARS } from './open-text.js';
export type { OpenTextOptions, OpenedText } from './open-text.js';
export type { Encoding } from './encoding.js';
export { encodingsFromName, sniffBinaryLayer, sniffCompactRinex } from './encoding.js';
export { CompactRinexDecoder } from './compact-rinex.js';
export { claimObservationRecords } from './observation-records.js';
export { claimTextBytes } from './byte-text.js';
export type { TextBytes } from './byte-text.js';
export type { ObservationRecords } from './observation-records.js';
export type { CompactRinexVersion, CrxProblemSink } from './compact-rinex.js';
export { UnixCompressDecoder, UnixCompressDamage, decompressUnix } from './unix-compress.js';
export { gunzip } from './gzip.js';
