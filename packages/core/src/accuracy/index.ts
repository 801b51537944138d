/** Accuracy against check points: NSSDA (FGDC-STD-007.3-1998) and circular error of a bivariate normal. */
export * from './circular-error.js';
export * from './nssda.js';
