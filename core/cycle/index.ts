// Cycle planner and design helpers. Re-exports only.
export { planCycle, beamEmittance, DEFAULT_FILLING_LIMIT, DEFAULT_ADIABATIC_LIMIT, type CycleOptions, type CyclePlan, type CycleInterval } from './planner.ts';
export { constantBucketVoltage, fastestRamp, areaWith, type BucketTarget } from './design.ts';
export { CycleTimeline } from './timeline.ts';
