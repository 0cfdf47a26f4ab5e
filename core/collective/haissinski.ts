// Stationary bunch in the potential well including its own induced voltage (Haïssinski equation), by damped
// self-consistent iteration on the bin grid. Units: dt in s, dE in eV, U and H' per turn (PHYSICS.md §5, §9, §12).
// With φ = φs + ω_rf·dt and F_tot(dt) = F_rf(φ) + Z·V_ind(dt) [eV per turn]:
//   U(dt) = −sgn(η)·(β²E)⁻¹·ω_rf·∫ F_tot dt',   H' = π·h·|η|·δ² + U,   ψ = G(H'),   λ(dt) ∝ ∫G dE.
// G is the matched shape of core/beam/shapes.ts with its scale (H0 or Hm) held fixed: for a gaussian this keeps
// the energy spread, σ_δ² = H0/(2π·h·|η|) (for leptons the natural spread); the length follows the intensity.
// Iteration: λ ← (1 − μ)·λ + μ·T[λ], with μ halved whenever the residual max|T[λ] − λ|/max λ grows.
import type { MachineState } from '../machine.ts';
import { energyIntegrals, type MatchedShape } from '../beam/shapes.ts';
import { makeWell, wellU, type BucketBounds } from '../beam/well.ts';
import type { InducedVoltage } from './inducedVoltage.ts';

/** Result of the self-consistent iteration. */
export interface HaissinskiResult {
  converged: boolean;
  iterations: number;
  /** Last max|T[λ] − λ|/max λ. */
  residual: number;
  /** Line density at the bin centres [1/s], Σλ·Δ = 1. */
  lambda: Float64Array;
  /** Potential U at the bin centres (H' units), minimum 0. */
  U: Float64Array;
  /** rms length [s] and centroid [s] of λ. */
  rmsLength: number;
  meanDt: number;
}

/** Options: shape and scale of G, bunch charge Q [C], iteration limits. */
export interface HaissinskiOptions {
  shape: MatchedShape;
  scale: number;
  bunchCharge: number;
  bunches: number;
  maxIterations: number;
  tolerance: number;
}

// First relaxation factor; halved on every rise of the residual, never below MIN_RELAX.
const START_RELAX = 0.5;
const MIN_RELAX = 1e-3;

/** Solve λ = T[λ] on calc's grid inside the bucket b (λ = 0 outside it). */
export function solveHaissinski(m: MachineState, b: BucketBounds, calc: InducedVoltage, o: HaissinskiOptions): HaissinskiResult {
  const g = calc.grid, nb = g.nb, d = g.delta, c = calc.centres;
  const w = makeWell(m, b);
  const Urf = new Float64Array(nb);
  const inside = new Uint8Array(nb);
  for (let i = 0; i < nb; i++) {
    const phi = m.phiS + m.omegaRf * c[i];
    inside[i] = phi > b.phiLeft && phi < b.phiRight ? 1 : 0;
    Urf[i] = wellU(w, phi);
  }
  const pre = (-Math.sign(m.eta0) * m.omegaRf * m.particle.Z) / (m.beta * m.beta * m.Es); // U per volt·second
  const Hcut = o.shape === 'gaussian' ? Infinity : o.scale;
  const lambda = new Float64Array(nb), next = new Float64Array(nb), U = new Float64Array(nb), q = new Float64Array(nb);
  const e = new Float64Array(2);
  const ctx = { omega0: m.omega0, beta: m.beta, gamma: m.gamma };
  const image = (src: Float64Array, out: Float64Array, withField: boolean): void => {
    if (withField) {
      for (let i = 0; i < nb; i++) q[i] = o.bunchCharge * src[i] * d;
      calc.compute(q, ctx, m.T0 / o.bunches, o.bunches, true);
    }
    // U_ind by the trapezoid rule from the first bin (the constant drops out with the normalisation).
    let acc = 0, Umin = Infinity;
    for (let i = 0; i < nb; i++) {
      if (i > 0 && withField) acc += 0.5 * (calc.voltage[i - 1] + calc.voltage[i]) * d;
      U[i] = Urf[i] + pre * acc;
      if (inside[i] && U[i] < Umin) Umin = U[i];
    }
    let sum = 0;
    for (let i = 0; i < nb; i++) {
      U[i] -= Umin;
      if (!inside[i]) out[i] = 0;
      else if (o.shape === 'gaussian') out[i] = Math.exp(-U[i] / o.scale);
      else {
        energyIntegrals(o.shape, o.scale, Hcut, U[i], w.a, e);
        out[i] = e[0];
      }
      sum += out[i] * d;
    }
    for (let i = 0; i < nb; i++) out[i] /= sum;
  };
  image(lambda, lambda, false); // start: the bunch in the RF well alone
  let mu = START_RELAX, residual = Infinity, it = 0, converged = false;
  for (; it < o.maxIterations; it++) {
    image(lambda, next, true);
    let diff = 0, peak = 0;
    for (let i = 0; i < nb; i++) {
      diff = Math.max(diff, Math.abs(next[i] - lambda[i]));
      peak = Math.max(peak, lambda[i]);
    }
    const r = diff / peak;
    if (r > residual) mu = Math.max(MIN_RELAX, 0.5 * mu);
    residual = r;
    if (r < o.tolerance) {
      converged = true;
      lambda.set(next);
      it++;
      break;
    }
    for (let i = 0; i < nb; i++) lambda[i] += mu * (next[i] - lambda[i]);
  }
  let m1 = 0, m2 = 0;
  for (let i = 0; i < nb; i++) m1 += lambda[i] * c[i] * d;
  for (let i = 0; i < nb; i++) m2 += lambda[i] * (c[i] - m1) ** 2 * d;
  // Leave calc holding the field of the final λ.
  for (let i = 0; i < nb; i++) q[i] = o.bunchCharge * lambda[i] * d;
  calc.compute(q, ctx, m.T0 / o.bunches, o.bunches, true);
  return { converged, iterations: it, residual, lambda, U, rmsLength: Math.sqrt(m2), meanDt: m1 };
}
