/** Scenario simulator: synthetic broadcast ephemerides, reference and rover observations, and their truth. */
export { Rng, fnv1a32 } from './rng.js';
export { simulateConstellation, TYPICAL_KLOBUCHAR, TYPICAL_NEQUICK, issuePeriodS, glonassTruthOf, glonassChannelsOf } from './constellation.js';
export { simulateGlonass, GlonassOrbitTruth, GLONASS_NOMINAL_CHANNELS, GLONASS_ISSUE_PERIOD_S } from './glonass-constellation.js';
export type { SimulatedGlonass } from './glonass-constellation.js';
export type { SimSystem } from './signals.js';
export type { ConstellationSpec } from './constellation.js';
export * from './errors.js';
export { TrueSky, C_MS } from './true-sky.js';
export type { LightTimeSolution } from './true-sky.js';
export { ReceiverSimulation, RECORDING_MASK_RAD } from './observations.js';
export { RoverTrajectory, antennaPosition, DEFAULT_WALK_SPEED_MS } from './trajectory.js';
export type { PlanStep, Occupation } from './trajectory.js';
export { simulateScenario } from './scenario.js';
export type { ScenarioSpec, SimulatedScenario, ScenarioTruth, PointOccupationTruth, PointSpec, GeodeticDeg } from './scenario.js';
export { demoScenarioSpec, renderDemoFiles, DEMO_FILE_NAMES } from './demo.js';
export type { DemoFile } from './demo.js';
export { exampleScenarioSpec } from './example.js';
