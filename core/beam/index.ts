// Beam generation: matched (functions of H'), unmatched and coasting distributions. Re-exports only.
export { matchBunch, matchedNumbers, sampleMatched, maxScale, GAUSSIAN_CONTOUR_LEVEL, type MatchedInfo, type MatchSize } from './matched.ts';
export { BINOMIAL_EXPONENT, type MatchedShape } from './shapes.ts';
export { linearOmegaS, linearlyMatchedSpread, sampleUnmatched } from './unmatched.ts';
export { sampleCoasting } from './coasting.ts';
export { generateBeam } from './generate.ts';
export type { BucketBounds } from './well.ts';
