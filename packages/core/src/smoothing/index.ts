export * from './hatch.js';
export * from './clock-jump.js';
export { ReceiverSmoother } from './receiver-smoother.js';
