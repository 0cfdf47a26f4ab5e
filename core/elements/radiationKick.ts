// Radiation damping and quantum excitation, once per turn after the RF kicks. Not area-preserving, on purpose.
// Units: dE in eV, times in s. PHYSICS.md §11 map, in the frame where the RF kick already subtracts
// ZΣV sin φ_k = ΔE_s + U0 (the synchronous particle's loss U0 is in the synchronous phase, core/machine.ts):
//   dE ← dE − d·dE + 2σ_E·sqrt(T0/τ_E)·ξ,   d = J_E·U0/E_s = 2T0/τ_E,   ξ ~ N(0, 1) per particle per turn.
// Why the factor 2 on the noise: averaged over a synchrotron period, ⟨dE²⟩ = A/2 for the oscillation "energy"
// A = x² + y² (normalised), and one turn changes A by ((1−d)² − 1)·y² + n²ξ², i.e. ⟨ΔA⟩ = −d·A + n²; the
// equilibrium A = n²/d must give ⟨dE²⟩ = σ_E², so n² = 2d·σ_E² = 4σ_E²·T0/τ_E (first order in d).
// σ_E = σ_δ·E_s (β ≈ 1) from core/radiation.ts; U0, τ_E and σ_E follow E_s turn by turn.
import type { Bunch } from '../bunch.ts';
import type { MachineState } from '../machine.ts';
import { energyLossPerTurn, naturalEnergySpread, radiationLattice, type RadiationLattice } from '../radiation.ts';
import type { Setup } from '../setup/schema.ts';
import { makeRng, type Rng } from '../rng.ts';
import type { Element } from './types.ts';

/** Options of the radiation element. */
export interface RadiationKickOptions {
  damping: boolean;
  quantumExcitation: boolean;
  seed: number;
}

/** Radiation damping (−J_E·U0/E_s·dE) and quantum excitation (2σ_E·sqrt(T0/τ_E)·ξ) per turn. */
export function radiationKick(lat: RadiationLattice, opts: RadiationKickOptions, rng: Rng = makeRng(opts.seed)): Element {
  return {
    name: 'radiation',
    apply(b: Bunch, m: MachineState): void {
      const U0 = energyLossPerTurn(m.particle, m.Es, lat);
      const d = (lat.JE * U0) / m.Es; // = 2T0/τ_E
      const damp = opts.damping ? 1 - d : 1;
      const sigmaE = naturalEnergySpread(m.particle, m.gamma, lat) * m.Es;
      const noise = opts.quantumExcitation ? sigmaE * Math.sqrt(2 * d) : 0; // 2σ_E·sqrt(T0/τ_E)
      if (noise === 0) scale(b.dE, b.n, damp);
      else dampAndKick(b.dE, b.n, damp, noise, rng);
    },
  };
}

function scale(dE: Float64Array, n: number, f: number): void {
  if (f === 1) return;
  for (let i = 0; i < n; i++) dE[i] *= f;
}

function dampAndKick(dE: Float64Array, n: number, f: number, noise: number, rng: Rng): void {
  for (let i = 0; i < n; i++) dE[i] = f * dE[i] + noise * rng.normal();
}

/** The radiation element of a setup, or null without a radiation block. */
export function radiationKickFromSetup(setup: Setup): Element | null {
  const lat = radiationLattice(setup);
  const r = setup.radiation;
  return lat && r ? radiationKick(lat, { damping: r.damping, quantumExcitation: r.quantumExcitation, seed: r.seed }) : null;
}
