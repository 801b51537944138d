export * from './records.js';
export * from './inert-cell.js';
