/** Velocity stage: receiver velocity and clock drift from Doppler measurements. */
export * from './doppler-velocity.js';
