// Per-turn diagnostics: moments and emittances, profiles, centroid spectrum, and the columnar log.
export { computeDiagnostics, type TurnDiagnostics } from './moments.ts';
export { lineDensity, histogram2d, fwhm } from './profile.ts';
export { fractionEmittances, lastSelectionPath, selectKth, type SecondMoments } from './ellipse.ts';
export { insideSeparatrix, type BucketLimits } from './inside.ts';
export { centroidSpectrum } from './spectrum.ts';
export { DiagnosticsLog } from './log.ts';
export { partialMoments, mergeMoments, partialShape, diagnosticsFromParts, fwhmCounts, ACTION_BINS, ACTION_MAX, type PartialMoments, type PartialShape } from './partial.ts';
