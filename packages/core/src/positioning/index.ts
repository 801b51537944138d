export * from './position-fix.js';
