// Matched bunches: distributions G(H') that are stationary under the synchrotron motion (PHYSICS.md §9),
// their predicted rms numbers (by φ-quadrature with the energy integral in closed form, no sampling) and
// exact sampling (inverse CDF of the line density in φ, then dE from the conditional law at that φ).
// Units: dt in s (dt > 0 late), dE in eV, emittances in eV·s, H' per turn (PHYSICS.md §5).
// Size parameter: H0 (gaussian) or Hm (parabolic, flat), found by bisection in log(scale); every predicted
// size grows monotonically with it.
// Limiting contour: H' = Hm for parabolic and flat. For the gaussian it is H' = ln(20)·H0, the level that holds
// 95 % of a linear Gaussian (PHYSICS.md §9, 95 % convention); the bunch itself is cut at the separatrix, so in a
// nonlinear bucket this level holds a little less than 95 %.
import type { Bunch } from '../bunch.ts';
import type { MachineState } from '../machine.ts';
import type { Rng } from '../rng.ts';
import { energyIntegrals, type MatchedShape } from './shapes.ts';
import { contourGeometry, levelEnds, makeWell, phaseNodes, wellU, type BucketBounds, type Well } from './well.ts';

/** Predicted numbers of a matched bunch (exact to quadrature accuracy). */
export interface MatchedInfo {
  shape: 'gaussian' | 'parabolic' | 'flat';
  /** Parameter of G: H0 (gaussian) or Hm (parabolic/flat), in H' units. */
  scale: number;
  rmsLength: number; // [s]
  rmsEnergySpread: number; // [eV]
  emittanceRms: number; // [eV·s], no π
  emittanceFourSigma: number; // 4π σt σE [eV·s]
  contourArea: number; // area of the limiting H'-contour [eV·s]
  contourLength: number; // its full length [s]
  contourHalfHeight: number; // its half-height [eV]
  fillingFactor: number; // contourArea / bucket area
}

/** Size request of a matched bunch (setup field beam.distribution.size). */
export type MatchSize =
  | { by: 'rmsLength'; value: number }
  | { by: 'emittance'; convention: 'rms' | 'fourSigma' | 'contour'; value: number };

/** Level of the gaussian's limiting contour in units of H0: ln(1/0.05), 95 % of a linear Gaussian. */
export const GAUSSIAN_CONTOUR_LEVEL = Math.log(20);
// The gaussian is evaluated only where H' < 40·H0 (e^−40 ≈ 4e-18 of the peak), so tiny bunches keep their nodes.
const GAUSSIAN_CUT_LEVEL = 40;
// φ-quadrature nodes (cosine substitution); also the cells of the sampling table.
const NODES = 2048;
// Bisection steps in log(scale) over SCALE_DECADES decades: 2^−80·ln(1e40) ≈ 8e-23, below double precision.
const BISECTION_STEPS = 80;
const SCALE_DECADES = 40;
// A solved size farther than this from the request means the request fell into a jump (inner humps).
const SIZE_TOLERANCE = 1e-6;

/** Largest admissible scale: the limiting contour on the separatrix. */
export function maxScale(shape: MatchedShape, b: BucketBounds): number {
  return shape === 'gaussian' ? b.Usep / GAUSSIAN_CONTOUR_LEVEL : b.Usep;
}

/** Level up to which G is non-zero. */
function cutLevel(shape: MatchedShape, scale: number, b: BucketBounds): number {
  return shape === 'gaussian' ? Math.min(b.Usep, GAUSSIAN_CUT_LEVEL * scale) : scale;
}

/** Predicted numbers of the matched bunch of a given scale. */
export function matchedNumbers(m: MachineState, b: BucketBounds, shape: MatchedShape, scale: number): MatchedInfo {
  const w = makeWell(m, b);
  const mo = phaseMoments(w, shape, scale);
  const sigmaT = mo.sigmaPhi / m.omegaRf;
  const sigmaE = mo.sigmaDE;
  const level = shape === 'gaussian' ? GAUSSIAN_CONTOUR_LEVEL * scale : scale;
  const c = contourGeometry(w, Math.min(level, b.Usep), NODES);
  return {
    shape, scale, rmsLength: sigmaT, rmsEnergySpread: sigmaE,
    emittanceRms: sigmaT * sigmaE, // ⟨dt·dE⟩ = 0: G is even in dE
    emittanceFourSigma: 4 * Math.PI * sigmaT * sigmaE,
    contourArea: c.area, contourLength: c.length, contourHalfHeight: c.halfHeightDE,
    fillingFactor: c.area / b.area,
  };
}

// rms phase width [rad] and rms energy spread [eV] by quadrature over the bunch.
function phaseMoments(w: Well, shape: MatchedShape, scale: number) {
  const Hcut = cutLevel(shape, scale, w.b);
  const [phiMin, phiMax] = levelEnds(w, Hcut);
  const { phi, weight } = phaseNodes(phiMin, phiMax, NODES);
  const e = new Float64Array(2);
  let m0 = 0, m1 = 0, m2 = 0, e2 = 0;
  for (let j = 0; j < NODES; j++) {
    energyIntegrals(shape, scale, Hcut, wellU(w, phi[j]), w.a, e);
    const x = phi[j] - w.m.phiS;
    const lw = weight[j] * e[0];
    m0 += lw; m1 += lw * x; m2 += lw * x * x; e2 += weight[j] * e[1];
  }
  const mean = m1 / m0;
  return { sigmaPhi: Math.sqrt(Math.max(0, m2 / m0 - mean * mean)), sigmaDE: Math.sqrt(e2 / m0) };
}

/** Solve the matched distribution for a size request, without generating particles. Throws Error with a clear message if impossible. */
export function matchBunch(m: MachineState, bucket: BucketBounds, shape: MatchedShape, size: MatchSize): MatchedInfo {
  const pick = (i: MatchedInfo): number =>
    size.by === 'rmsLength' ? i.rmsLength
      : size.convention === 'rms' ? i.emittanceRms
        : size.convention === 'fourSigma' ? i.emittanceFourSigma : i.contourArea;
  const what = size.by === 'rmsLength' ? 'rms length' : `${size.convention} emittance`;
  const unit = size.by === 'rmsLength' ? 's' : 'eV·s';
  if (!(size.value > 0)) throw new Error(`beam.distribution.size.value = ${size.value} ${unit}: must be positive`);
  const hi = maxScale(shape, bucket);
  const biggest = matchedNumbers(m, bucket, shape, hi);
  if (size.value > pick(biggest)) {
    const lim = shape === 'gaussian' ? 'the 95 % contour of a gaussian bunch' : `the ${shape} bunch's boundary`;
    throw new Error(
      `beam.distribution.size.value = ${fmt(size.value)} ${unit}: the ${what} exceeds ${fmt(pick(biggest))} ${unit}, ` +
      `reached when ${lim} fills the whole bucket (area ${fmt(bucket.area)} eV·s)`,
    );
  }
  let lo = Math.log(hi) - SCALE_DECADES * Math.LN10;
  let up = Math.log(hi);
  for (let i = 0; i < BISECTION_STEPS; i++) {
    const mid = 0.5 * (lo + up);
    if (pick(matchedNumbers(m, bucket, shape, Math.exp(mid))) < size.value) lo = mid;
    else up = mid;
  }
  const best = matchedNumbers(m, bucket, shape, Math.exp(0.5 * (lo + up)));
  // With inner humps the sizes jump where the contour rises over a hump and takes in the next sub-bucket.
  if (Math.abs(pick(best) / size.value - 1) > SIZE_TOLERANCE) {
    const below = pick(matchedNumbers(m, bucket, shape, Math.exp(lo)));
    const above = pick(matchedNumbers(m, bucket, shape, Math.exp(up)));
    throw new Error(
      `beam.distribution.size.value = ${fmt(size.value)} ${unit}: no matched ${shape} bunch has this ${what}; it jumps ` +
      `from ${fmt(below)} to ${fmt(above)} ${unit} where the bunch rises over an inner hump of the bucket into the next sub-bucket`,
    );
  }
  return best;
}

/** Fill all columns of `out` with a matched distribution of a given scale (offsets not added). */
export function sampleMatched(
  m: MachineState, b: BucketBounds, shape: MatchedShape, scale: number, rng: Rng, out: Bunch,
): void {
  const w = makeWell(m, b);
  const Hcut = cutLevel(shape, scale, b);
  const [phiMin, phiMax] = levelEnds(w, Hcut);
  const { phi, weight } = phaseNodes(phiMin, phiMax, NODES);
  // Cumulative line density over θ-cells: cell j spans θ ∈ [jπ/N, (j+1)π/N] around node j.
  const cdf = new Float64Array(NODES + 1);
  const e = new Float64Array(2);
  for (let j = 0; j < NODES; j++) {
    energyIntegrals(shape, scale, Hcut, wellU(w, phi[j]), w.a, e);
    cdf[j + 1] = cdf[j] + weight[j] * e[0];
  }
  const total = cdf[NODES];
  const half = 0.5 * (phiMax - phiMin);
  const phiS = m.phiS, wrf = m.omegaRf, a = w.a;
  const sigmaG = shape === 'gaussian' ? Math.sqrt(scale / (2 * a)) : 0;
  const { dt, dE } = out;
  for (let i = 0; i < out.total; i++) {
    // φ by inverse CDF (binary search, linear inside the θ-cell)
    const u = rng.uniform() * total;
    let lo = 0, hi = NODES;
    while (hi - lo > 1) {
      const mid = (lo + hi) >> 1;
      if (cdf[mid] <= u) lo = mid;
      else hi = mid;
    }
    const cell = cdf[lo + 1] - cdf[lo];
    const frac = cell > 0 ? (u - cdf[lo]) / cell : 0.5;
    const p = phiMin + half * (1 - Math.cos((Math.PI * (lo + frac)) / NODES));
    const D = Math.sqrt(Math.max(0, Hcut - wellU(w, p)) / a);
    dt[i] = (p - phiS) / wrf;
    dE[i] = energyAt(shape, D, sigmaG, rng);
  }
}

// dE from the conditional law at fixed φ: uniform (flat), semicircle (μ = ½), Gaussian cut at ±D.
function energyAt(shape: MatchedShape, D: number, sigma: number, rng: Rng): number {
  if (shape === 'flat') return D * (2 * rng.uniform() - 1);
  if (shape === 'parabolic') {
    // density ∝ (1 − s²)^½: the abscissa of a point uniform in the upper half disc
    let x: number, y: number;
    do {
      x = 2 * rng.uniform() - 1;
      y = rng.uniform();
    } while (x * x + y * y > 1);
    return D * x;
  }
  if (D === 0) return 0;
  let v: number;
  do v = sigma * rng.normal();
  while (Math.abs(v) > D);
  return v;
}

function fmt(x: number): string {
  return Number(x.toPrecision(4)).toString();
}
