/**
 * The measurement model, once: satellite state at transmission for a receiver's epoch tag, the atmosphere
 * at a receiver, signal strength, and which code of a satellite is used.
 */
export * from './satellite-for-tag.js';
export * from './atmosphere-model.js';
export * from './signal-strength.js';
export * from './signals.js';
export * from './code-selection.js';
export * from './modelled-range.js';
