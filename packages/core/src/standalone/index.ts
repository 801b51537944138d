export * from './standalone-epoch.js';
