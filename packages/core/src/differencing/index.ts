/**
 * Between-receiver differencing: the reference corrections over a sliding window of reference epochs,
 * the single-difference epoch builder, and session-constant between-receiver code offsets.
 */
export * from './reference-corrections.js';
export * from './single-difference-epoch.js';
