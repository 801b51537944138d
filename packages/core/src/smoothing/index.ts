export * from './hatch.js';
export * from './clock-jump.js';
export { ReceiverSmoother } from './receiver-smoother.js';
export { SmoothingArcs, type SmoothingMode } from './receiver-smoother.js';
export { SmoothingArc, CODE_ERROR_CORRELATION_S } from './two-sided-arcs.js';
