export * from './klobuchar.js';
export * from './troposphere.js';
