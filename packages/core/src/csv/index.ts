export * from './records.js';
