// Radiation damping and quantum excitation, once per turn after the RF kicks. Not area-preserving, on purpose.
// Units: dE in eV, times in s. PHYSICS.md §11 map, in the frame where the RF kick already subtracts
// ZΣV sin φ_k = ΔE_s + U0 (the synchronous particle's loss U0 is in the synchronous phase, core/machine.ts):
//   dE ← dE − d·dE + 2σ_E·sqrt(T0/τ_E)·ξ,   d = J_E·U0/E_s = 2T0/τ_E,   ξ ~ N(0, 1) per particle per turn.
// Why the factor 2 on the noise: averaged over a synchrotron period, ⟨dE²⟩ = A/2 for the oscillation "energy"
// A = x² + y² (normalised), and one turn changes A by ((1−d)² − 1)·y² + n²ξ², i.e. ⟨ΔA⟩ = −d·A + n²; the
// equilibrium A = n²/d must give ⟨dE²⟩ = σ_E², so n² = 2d·σ_E² = 4σ_E²·T0/τ_E (first order in d).
// σ_E = σ_δ·E_s (β ≈ 1) from core/radiation.ts; U0, τ_E and σ_E follow E_s turn by turn.
// Normal deviates: polar method (G. Marsaglia and T.A. Bray, SIAM Review 6 (1964) 260) on xorshift128 uniforms
// (G. Marsaglia, J. Stat. Softw. 8 (2003) 14; period 2^128 − 1), seeded from the injected generator; inlined because
// a generator call per particle per turn tripled the turn time. Uniforms have 32-bit resolution, so the far tails
// (|ξ| beyond ≈ 6.5) are cut: irrelevant for the diffusion, which depends on the variance.
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
  const xs = new Uint32Array(4);
  for (let k = 0; k < 4; k++) xs[k] = Math.floor(rng.uniform() * 4294967296) || 1;
  return {
    name: 'radiation',
    apply(b: Bunch, m: MachineState): void {
      const U0 = energyLossPerTurn(m.particle, m.Es, lat);
      const d = (lat.JE * U0) / m.Es; // = 2T0/τ_E
      const damp = opts.damping ? 1 - d : 1;
      const sigmaE = naturalEnergySpread(m.particle, m.gamma, lat) * m.Es;
      const noise = opts.quantumExcitation ? sigmaE * Math.sqrt(2 * d) : 0; // 2σ_E·sqrt(T0/τ_E)
      if (noise === 0) scale(b.dE, b.n, damp);
      else dampAndKick(b.dE, b.n, damp, noise, xs);
    },
  };
}

function scale(dE: Float64Array, n: number, f: number): void {
  if (f === 1) return;
  for (let i = 0; i < n; i++) dE[i] *= f;
}

const U32 = 1 / 4294967296;

// dE ← f·dE + noise·ξ, two deviates per accepted pair of the polar method (Marsaglia–Bray: no sine or cosine,
// about 21 % of pairs rejected); xs is the xorshift128 state, updated in place.
function dampAndKick(dE: Float64Array, n: number, f: number, noise: number, xs: Uint32Array): void {
  let x = xs[0], y = xs[1], z = xs[2], w = xs[3];
  const S = 2 * U32;
  for (let i = 0; i < n; i += 2) {
    let a: number, b: number, r: number;
    do {
      let t = x ^ (x << 11);
      x = y; y = z; z = w;
      w = (w ^ (w >>> 19) ^ (t ^ (t >>> 8))) >>> 0;
      a = w * S - 1;
      t = x ^ (x << 11);
      x = y; y = z; z = w;
      w = (w ^ (w >>> 19) ^ (t ^ (t >>> 8))) >>> 0;
      b = w * S - 1;
      r = a * a + b * b;
    } while (r >= 1 || r === 0);
    const g = noise * Math.sqrt((-2 * Math.log(r)) / r);
    dE[i] = f * dE[i] + g * a;
    if (i + 1 < n) dE[i + 1] = f * dE[i + 1] + g * b;
  }
  xs[0] = x; xs[1] = y; xs[2] = z; xs[3] = w;
}

/** The radiation element of a setup, or null without a radiation block. */
export function radiationKickFromSetup(setup: Setup): Element | null {
  const lat = radiationLattice(setup);
  const r = setup.radiation;
  return lat && r ? radiationKick(lat, { damping: r.damping, quantumExcitation: r.quantumExcitation, seed: r.seed }) : null;
}
