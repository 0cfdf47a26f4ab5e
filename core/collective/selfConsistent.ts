// Matched beam with intensity: the setup's matched shape, solved self-consistently in the RF well plus the
// induced voltage (haissinski.ts), then sampled. Units: dt in s, dE in eV.
// Scale of G: for a gaussian in a ring with radiation, H0 = 2π·h·|η|·σ_δ² from the natural spread (the lepton
// equilibrium; the size request is then ignored and `zeroIntensity` is the natural bunch); otherwise the scale of the zero-intensity bunch of the requested size (same energy spread for a
// gaussian, same limiting H' for parabolic/flat), so the size request describes the bunch before intensity.
import type { Bunch } from '../bunch.ts';
import { makeBunch } from '../bunch.ts';
import { computeBucket, type BucketInfo } from '../bucket.ts';
import { matchBunch, matchedNumbers, type MatchedInfo } from '../beam/matched.ts';
import { makeWell } from '../beam/well.ts';
import type { MatchedShape } from '../beam/shapes.ts';
import type { MachineState } from '../machine.ts';
import { naturalEnergySpread, radiationLattice } from '../radiation.ts';
import { makeRng, type Rng } from '../rng.ts';
import type { Setup } from '../setup/schema.ts';
import { solveHaissinski, type HaissinskiResult } from './haissinski.ts';
import type { InducedVoltage } from './inducedVoltage.ts';
import { intensityModel, makeInducedVoltage, windowGrid } from './model.ts';

/** A solved self-consistent bunch: the zero-intensity reference, the solution and the calculator holding its field. */
export interface SelfConsistentBunch {
  shape: MatchedShape;
  scale: number;
  bucket: BucketInfo;
  zeroIntensity: MatchedInfo;
  solution: HaissinskiResult;
  calc: InducedVoltage;
}

// Extent of the zero-intensity bunch used to place the window: ±EXTENT_SIGMAS rms for a gaussian.
const EXTENT_SIGMAS = 5;

/** Solve the matched bunch of a setup with its intensity; null if the setup has no matched beam or no intensity model. Throws with the field on impossible requests. */
export function solveSelfConsistent(setup: Setup, m: MachineState): SelfConsistentBunch | null {
  const d = setup.beam.distribution;
  const model = intensityModel(setup, m);
  if (d.kind !== 'matched' || !model) return null;
  const br = computeBucket(m);
  if (!br.ok) throw new Error(`beam.distribution.kind = matched: ${br.reason}`);
  const bucket = br.bucket;
  let zero = matchBunch(m, bucket, d.shape, d.size);
  const lat = radiationLattice(setup);
  if (lat && d.shape === 'gaussian') {
    const sd = naturalEnergySpread(m.particle, m.gamma, lat);
    zero = matchedNumbers(m, bucket, d.shape, 2 * Math.PI * m.h * Math.abs(m.eta0) * sd * sd); // the natural bunch
  }
  const scale = zero.scale;
  const half = d.shape === 'gaussian' ? EXTENT_SIGMAS * zero.rmsLength : 0.5 * zero.contourLength;
  const calc = makeInducedVoltage(model, m, windowGrid(model, m, -half, half));
  const solution = solveHaissinski(m, bucket, calc, {
    shape: d.shape, scale, bunchCharge: model.bunchCharge, bunches: model.bunches,
    maxIterations: setup.collective.matchIterations, tolerance: setup.collective.matchTolerance,
  });
  return { shape: d.shape, scale, bucket, zeroIntensity: zero, solution, calc };
}

/** Sample n particles from a solved bunch: dt by inverse CDF of λ (uniform inside a bin), dE from G at that dt. */
export function sampleSelfConsistent(m: MachineState, s: SelfConsistentBunch, rng: Rng, out: Bunch): void {
  const { lambda, U } = s.solution;
  const g = s.calc.grid, nb = g.nb;
  const cdf = new Float64Array(nb + 1);
  for (let i = 0; i < nb; i++) cdf[i + 1] = cdf[i] + lambda[i];
  const total = cdf[nb];
  const a = makeWell(m, s.bucket).a;
  const sigmaG = Math.sqrt(s.scale / (2 * a));
  for (let k = 0; k < out.total; k++) {
    const u = rng.uniform() * total;
    let lo = 0, hi = nb;
    while (hi - lo > 1) {
      const mid = (lo + hi) >> 1;
      if (cdf[mid] <= u) lo = mid;
      else hi = mid;
    }
    const cell = cdf[lo + 1] - cdf[lo];
    const f = cell > 0 ? (u - cdf[lo]) / cell : 0.5;
    out.dt[k] = g.e0 + (lo + f) * g.delta;
    if (s.shape === 'gaussian') out.dE[k] = sigmaG * rng.normal();
    else {
      const D = Math.sqrt(Math.max(0, s.scale - U[lo]) / a);
      out.dE[k] = s.shape === 'flat' ? D * (2 * rng.uniform() - 1) : D * semicircle(rng);
    }
  }
}

// Abscissa of a point uniform in the upper half disc: density ∝ (1 − x²)^½ (the parabolic shape's energy law).
function semicircle(rng: Rng): number {
  let x: number, y: number;
  do {
    x = 2 * rng.uniform() - 1;
    y = rng.uniform();
  } while (x * x + y * y > 1);
  return x;
}

/** The setup's beam with intensity sampled from the self-consistent solution into `out` (default: a new bunch), or null when it does not apply. Throws if the iteration does not converge. */
export function generateSelfConsistentBeam(setup: Setup, m: MachineState, out?: Bunch): { bunch: Bunch; solved: SelfConsistentBunch } | null {
  const s = solveSelfConsistent(setup, m);
  if (!s) return null;
  if (!s.solution.converged)
    throw new Error(
      `beam.distribution: the matched bunch with intensity did not converge in collective.matchIterations = ${setup.collective.matchIterations} ` +
      `(residual ${s.solution.residual.toPrecision(3)} > collective.matchTolerance = ${setup.collective.matchTolerance}); ` +
      'the intensity may be above the threshold of a stationary solution',
    );
  const bunch = out ?? makeBunch(setup.beam.particles);
  sampleSelfConsistent(m, s, makeRng(setup.beam.seed), bunch);
  return { bunch, solved: s };
}
