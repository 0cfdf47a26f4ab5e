// Drift over an arc (a fraction of the turn) and the loss check.
// Units: dt in s (dt > 0 = late), dE in eV. PHYSICS.md §4 step 3, with the machine state of turn n+1:
//   linear: dt += frac·T0·η0·dE/(β²E_s)
//   exact:  dt += frac·T0·(T(E_s+dE)/T_s − 1)   (cancellation-free formula of PHYSICS.md §3, inlined)
// The change depends on dE only, so the drift is a shear: determinant 1.
// Loss, checked before the drift on dE and after it on dt (lost particles keep their coordinates):
// - |δ| > momentumAperture with δ = Δp/p exact: the bounds are turned once per call into exact energy bounds
//   dE ∈ [E(p(1−a)) − E_s, E(p(1+a)) − E_s], so the per-particle test costs two comparisons;
// - |dt| > T0/2 (half a revolution period).
// The tests are written as !(inside) so that a NaN would count as lost, never propagate.
import { loseParticle, type Bunch } from '../bunch.ts';
import type { MachineState } from '../machine.ts';
import { hypot } from '../kinematics.ts';
import type { Element } from './types.ts';

/** First-order slip (η0) or the exact time of flight. */
export type DriftMode = 'linear' | 'exact';

/** Energy offset [eV] at which Δp/p = x exactly (momentum pc, total energy Es, rest energy mass; no cancellation). */
export function dEAtDelta(x: number, pc: number, Es: number, mass: number): number {
  const E = hypot(pc * (1 + x), mass);
  return (pc * pc * x * (2 + x)) / (E + Es);
}

/** A momentum aperture a = |Δp/p| and its energy bounds [eV] for one machine state. */
export interface EnergyBounds {
  aperture: number;
  dEmin: number;
  dEmax: number;
}

/**
 * b.dEmax = dEAtDelta(a, …) and b.dEmin = dEAtDelta(−a, …) for the state m, the same operations written out: run
 * every turn, and numbers passed to or returned from a call V8 does not inline are boxed (core/machine.ts KINEMATICS).
 */
export function storeEnergyBounds(b: EnergyBounds, m: MachineState): void {
  const pc = m.pc, Es = m.Es, mass = m.particle.mass;
  for (let k = 0; k < 2; k++) {
    const x = k === 0 ? b.aperture : -b.aperture;
    const p = pc * (1 + x), ap = p < 0 ? -p : p, big = ap > mass ? ap : mass, r = (ap > mass ? mass : ap) / big;
    const dE = (pc * pc * x * (2 + x)) / (big * Math.sqrt(1 + r * r) + Es); // E(p) = hypot(p, mass)
    if (k === 0) b.dEmax = dE;
    else b.dEmin = dE;
  }
}

/**
 * Drift over `frac` of the turn; `m` passed to apply must be the state of the next turn (n+1).
 * reverse = true applies the inverse drift (dt −= ...), for reversibility checks.
 */
export function drift(frac: number, mode: DriftMode, momentumAperture: number, reverse = false): Element {
  if (!(frac > 0 && frac <= 1)) throw new Error(`drift fraction must be in (0, 1], got ${frac}`);
  if (!(momentumAperture > 0)) throw new Error(`momentumAperture must be > 0, got ${momentumAperture}`);
  const sgn = reverse ? -1 : 1;
  return {
    name: `${mode} drift ${frac}`,
    apply(b: Bunch, m: MachineState): void {
      const hi = dEAtDelta(momentumAperture, m.pc, m.Es, m.particle.mass);
      const lo = dEAtDelta(-momentumAperture, m.pc, m.Es, m.particle.mass);
      const kT = sgn * frac * m.T0;
      if (mode === 'linear') driftLinear(b, (kT * m.eta0) / (m.beta * m.beta * m.Es), lo, hi, 0.5 * m.T0);
      else driftExact(b, kT, m, lo, hi);
    },
  };
}

function driftLinear(b: Bunch, k: number, lo: number, hi: number, tMax: number): void {
  const dt = b.dt, dE = b.dE;
  let n = b.n;
  for (let i = 0; i < n; i++) {
    const e = dE[i];
    if (!(e <= hi && e >= lo)) {
      b.n = n; loseParticle(b, i); n = b.n; i--;
      continue;
    }
    const t = dt[i] + k * e;
    dt[i] = t;
    if (!(t <= tMax && t >= -tMax)) {
      b.n = n; loseParticle(b, i); n = b.n; i--;
    }
  }
  b.n = n;
}

function driftExact(b: Bunch, kT: number, m: MachineState, lo: number, hi: number): void {
  const dt = b.dt, dE = b.dE;
  const invEs = 1 / m.Es;
  const invB2 = 1 / (m.beta * m.beta);
  const invB2G2 = invB2 / (m.gamma * m.gamma);
  const a0 = m.compaction.alpha0, a1 = m.compaction.alpha1, a2 = m.compaction.alpha2;
  const tMax = 0.5 * m.T0;
  let n = b.n;
  for (let i = 0; i < n; i++) {
    const e = dE[i];
    if (!(e <= hi && e >= lo)) {
      b.n = n; loseParticle(b, i); n = b.n; i--;
      continue;
    }
    // ε, u, δ and the relative time of flight of core/kinematics.ts relativeTimeOfFlight, inlined.
    const eps = e * invEs;
    const w = 2 * eps + eps * eps;
    const u = w * invB2;
    const delta = u / (1 + Math.sqrt(1 + u));
    const path = delta * (a0 + delta * (a1 + delta * a2));
    const r = ((1 + eps) * path - (w * invB2G2) / (2 + eps + delta)) / (1 + delta);
    const t = dt[i] + kT * r;
    dt[i] = t;
    if (!(t <= tMax && t >= -tMax)) {
      b.n = n; loseParticle(b, i); n = b.n; i--;
    }
  }
  b.n = n;
}
