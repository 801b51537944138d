export * from './solution-types.js';
export * from './options.js';
export * from './solve-session.js';
export * from './join-references.js';
export { ReasonCounter, reasonKey } from './session-tally.js';
