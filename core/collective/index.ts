// Intensity effects: impedance models, line density, induced voltage (FFT and wake recursion), self-consistent
// matching, reports. Re-exports only.
export { impedanceAt, impedancesOf, resonatorWake, spaceChargeG0, spaceChargeZOverN, type BeamContext, type Impedance, type Resonator, type ZOverN, type ZTable } from './impedance.ts';
export { binCentres, depositLinear, kickLinear, type BinGrid } from './lineDensity.ts';
export { InducedVoltage } from './inducedVoltage.ts';
export { SpectrumPath } from './spectrum.ts';
export { ResonatorWakes, resonatorPoles } from './resonatorWake.ts';
export { intensityModel, makeInducedVoltage, windowGrid, type IntensityModel } from './model.ts';
export { solveHaissinski, type HaissinskiOptions, type HaissinskiResult } from './haissinski.ts';
export { generateSelfConsistentBeam, sampleSelfConsistent, solveSelfConsistent, type SelfConsistentBunch } from './selfConsistent.ts';
export { distortedWell, impedanceLoss, voltagesOnGrid, type BeamField, type DistortedWell } from './report.ts';
export { intensitySummary } from './summary.ts';
export { importImpedanceCsv, type ImpedanceCsvIssue, type ImpedanceCsvResult, type ImpedanceTableSetup } from './impedanceCsv.ts';
