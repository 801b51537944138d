export * from './gps-time.js';
