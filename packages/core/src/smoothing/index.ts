export * from './hatch.js';
export * from './clock-jump.js';
