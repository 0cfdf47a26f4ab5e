// The potential well of the main bucket as seen by a matched bunch: U(φ), level contours and the φ-quadrature.
// Units: H' and U per turn (dimensionless, PHYSICS.md §5), φ in rad (main harmonic), dt in s, dE in eV.
// H'(φ, dE) = U(φ) + a·dE² with a = π·h·|η|/(β²E)²; φ = φ_s + ω_rf·dt, so areas in (dt, dE) are ∫2·D dφ/ω_rf.
// U is core/bucket/well.ts wellU (product form, relative precision ~1e-16/|φ − φs| near the well bottom), so
// bunches down to 1e-10 of the bucket keep accurate moments.
// Quadrature: φ = φmin + L·(1 − cos θ)/2 with the midpoint rule in θ. Near a turning point the energy
// integrals behave like (φ − φmin)^(μ+½); the substitution makes them smooth in θ, so the rule converges fast.
import { wellOf, wellU as bucketWellU, type Well as PotentialWell } from '../bucket/well.ts';
import type { MachineState } from '../machine.ts';

/** The bucket fields a matched bunch needs (structurally a subset of core/bucket.ts BucketInfo). */
export interface BucketBounds {
  phiS: number;
  phiLeft: number;
  phiRight: number;
  /** H' on the separatrix. */
  Usep: number;
  /** Bucket area [eV·s]. */
  area: number;
}

/** Precomputed description of the well: machine, bucket bounds and the potential. */
export interface Well {
  m: MachineState;
  b: BucketBounds;
  beta2E: number;
  /** H' = U + a·dE² [1/eV²]. */
  a: number;
  /** U(φ) in the per-turn units of H' = π·h·|η|·δ² + U (core/bucket/well.ts). */
  q: PotentialWell;
}

// Steps of the outward walk from φs that brackets a level crossing (then bisected to machine precision).
const WALK_STEPS = 4096;
// Levels this close to the separatrix are treated as the separatrix itself (relative).
const SEPARATRIX_SLACK = 1e-12;

/** Well description; throws if the slip factor vanishes. */
export function makeWell(m: MachineState, b: BucketBounds): Well {
  if (m.eta0 === 0) throw new Error('machine: the slip factor η0 is 0 (at transition): no matched bunch exists');
  const beta2E = m.beta * m.beta * m.Es;
  return { m, b, beta2E, a: (Math.PI * m.h * Math.abs(m.eta0)) / (beta2E * beta2E), q: wellOf(m) };
}

/** U(φ) of the well. */
export function wellU(w: Well, phi: number): number {
  return bucketWellU(w.q, phi);
}

/** Phases [φmin, φmax] of the level H around φs (the connected region holding φs). */
export function levelEnds(w: Well, H: number): [number, number] {
  if (H >= w.b.Usep * (1 - SEPARATRIX_SLACK)) return [w.b.phiLeft, w.b.phiRight];
  return [crossing(w, H, w.b.phiLeft), crossing(w, H, w.b.phiRight)];
}

// First phase from φs towards `limit` where U reaches H.
function crossing(w: Well, H: number, limit: number): number {
  const phiS = w.m.phiS;
  const step = (limit - phiS) / WALK_STEPS;
  let inside = phiS;
  let outside = limit;
  for (let i = 1; i <= WALK_STEPS; i++) {
    const p = phiS + i * step;
    if (wellU(w, p) >= H) {
      outside = p;
      break;
    }
    inside = p;
  }
  if (outside === limit && wellU(w, limit) < H) return limit;
  for (let i = 0; i < 200; i++) {
    const mid = 0.5 * (inside + outside);
    if (mid === inside || mid === outside) break;
    if (wellU(w, mid) >= H) outside = mid;
    else inside = mid;
  }
  return 0.5 * (inside + outside);
}

/** Quadrature nodes and weights on [φmin, φmax] (cosine substitution, midpoint rule in θ). */
export function phaseNodes(phiMin: number, phiMax: number, n: number): { phi: Float64Array; weight: Float64Array } {
  const phi = new Float64Array(n);
  const weight = new Float64Array(n);
  const half = 0.5 * (phiMax - phiMin);
  for (let j = 0; j < n; j++) {
    const th = (Math.PI * (j + 0.5)) / n;
    phi[j] = phiMin + half * (1 - Math.cos(th));
    weight[j] = half * Math.sin(th) * (Math.PI / n);
  }
  return { phi, weight };
}

/** Geometry of the level-H contour: phase ends, full length [s], area [eV·s], half-height [eV]. */
export function contourGeometry(w: Well, H: number, n: number) {
  const [phiMin, phiMax] = levelEnds(w, H);
  const { phi, weight } = phaseNodes(phiMin, phiMax, n);
  let area = 0;
  let Umin = 0; // U(φs) = 0
  for (let j = 0; j < n; j++) {
    const U = wellU(w, phi[j]);
    if (U < Umin) Umin = U;
    if (H > U) area += weight[j] * 2 * Math.sqrt((H - U) / w.a);
  }
  const wrf = w.m.omegaRf;
  return { phiMin, phiMax, length: (phiMax - phiMin) / wrf, area: area / wrf, halfHeightDE: Math.sqrt((H - Umin) / w.a) };
}
