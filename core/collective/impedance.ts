// Longitudinal impedance models and the resonator wake. Units: Z in Ω, ω in rad/s, τ in s, W in V/C.
// Convention: engineering, e^{+jωt} (PHYSICS.md §12). Z(ω) = ∫W(τ)e^{−jωτ}dτ, Im Z > 0 is inductive, and
// Z(−ω) = Z(ω)*. Texts using e^{−iωt} [Chao] have the opposite sign of Im Z: convert at input only.
// Models (PHYSICS.md §12; A.W. Chao, Physics of Collective Beam Instabilities (1993), ch. 2 (mem.)):
//   resonator   Z = R_s/(1 + jQ(ω/ω_r − ω_r/ω)),
//               W(τ > 0) = (ω_r R_s/Q)·e^{−ατ}[cos ω̄τ − (α/ω̄) sin ω̄τ], α = ω_r/2Q, ω̄ = sqrt(ω_r² − α²);
//   inductive   Z = j·X·ω/ω0 with X = Im Z/n (constant Z/n);
//   space charge Z/n = −j·Z0·g0/(2βγ²), g0 = 1 + 2 ln(b/a) (on axis) or 0.5 + 2 ln(b/a) (averaged);
//   table       Re Z and Im Z interpolated linearly in f, zero beyond the last row, Z(−ω) = Z(ω)*.
import { Z0_OHM } from '../constants.ts';
import type { ImpedanceSetup } from '../setup/collective.ts';

/** A resonator: shunt impedance R_s [Ω], quality factor Q, resonant angular frequency ω_r [rad/s]. */
export interface Resonator {
  kind: 'resonator';
  Rs: number;
  Q: number;
  omegaR: number;
}

/** Z = j·X·ω/ω0: constant Im Z/n = X [Ω] (X < 0 is capacitive); space charge has g0 and X follows β, γ. */
export interface ZOverN {
  kind: 'zOverN';
  X: number;
  /** Space-charge geometry factor g0, or 0 for a fixed X. */
  g0: number;
}

/** The beam state Z/n models need: revolution angular frequency [rad/s], β, γ. */
export interface BeamContext {
  omega0: number;
  beta: number;
  gamma: number;
}

/** Tabulated Z(f): frequencies [Hz] increasing, Re and Im [Ω]. */
export interface ZTable {
  kind: 'table';
  f: Float64Array;
  re: Float64Array;
  im: Float64Array;
}

/** Impedance models as the calculation uses them. */
export type Impedance = Resonator | ZOverN | ZTable;

/** Space-charge geometry factor g0 (PHYSICS.md §12). */
export function spaceChargeG0(beamRadius: number, pipeRadius: number, geometry: 'onAxis' | 'averaged'): number {
  return (geometry === 'onAxis' ? 1 : 0.5) + 2 * Math.log(pipeRadius / beamRadius);
}

/** Space-charge Im Z/n [Ω] = −Z0·g0/(2βγ²) (negative: capacitive). */
export function spaceChargeZOverN(beta: number, gamma: number, g0: number): number {
  return (-Z0_OHM * g0) / (2 * beta * gamma * gamma);
}

/** Models of a setup at a given β, γ (space charge depends on them). */
export function impedancesOf(list: readonly ImpedanceSetup[], beta: number, gamma: number): Impedance[] {
  return list.map((z): Impedance => {
    switch (z.kind) {
      case 'resonator':
        return { kind: 'resonator', Rs: z.shuntImpedance, Q: z.quality, omegaR: 2 * Math.PI * z.frequency };
      case 'inductive':
        return { kind: 'zOverN', X: z.imZOverN, g0: 0 };
      case 'spaceCharge': {
        const g0 = spaceChargeG0(z.beamRadius, z.pipeRadius, z.geometry);
        return { kind: 'zOverN', X: spaceChargeZOverN(beta, gamma, g0), g0 };
      }
      case 'table':
        return { kind: 'table', f: Float64Array.from(z.frequency), re: Float64Array.from(z.re), im: Float64Array.from(z.im) };
    }
  });
}

/** Z(ω) of one model at ω ≥ 0 [rad/s] for a beam state (Z/n models). Writes [Re, Im] into out. */
export function impedanceAt(z: Impedance, omega: number, ctx: BeamContext, out: Float64Array): void {
  switch (z.kind) {
    case 'resonator': {
      if (omega === 0) {
        out[0] = 0; out[1] = 0;
        return;
      }
      const y = z.Q * (omega / z.omegaR - z.omegaR / omega);
      const d = 1 + y * y;
      out[0] = z.Rs / d;
      out[1] = (-z.Rs * y) / d;
      return;
    }
    case 'zOverN':
      out[0] = 0;
      out[1] = ((z.g0 > 0 ? spaceChargeZOverN(ctx.beta, ctx.gamma, z.g0) : z.X) * omega) / ctx.omega0;
      return;
    case 'table':
      tableAt(z, omega / (2 * Math.PI), out);
      return;
  }
}

// Linear interpolation in f; below the first row the first row's values, beyond the last row zero.
function tableAt(t: ZTable, f: number, out: Float64Array): void {
  const n = t.f.length;
  if (f > t.f[n - 1]) {
    out[0] = 0; out[1] = 0;
    return;
  }
  if (f <= t.f[0]) {
    out[0] = t.re[0]; out[1] = f === 0 ? 0 : t.im[0];
    return;
  }
  let lo = 0, hi = n - 1;
  while (hi - lo > 1) {
    const mid = (lo + hi) >> 1;
    if (t.f[mid] <= f) lo = mid;
    else hi = mid;
  }
  const u = (f - t.f[lo]) / (t.f[hi] - t.f[lo]);
  out[0] = t.re[lo] + u * (t.re[hi] - t.re[lo]);
  out[1] = t.im[lo] + u * (t.im[hi] - t.im[lo]);
}

/** Resonator wake W(τ) [V/C]: 0 for τ < 0, half the τ → 0+ value at τ = 0 (beam-loading theorem). */
export function resonatorWake(r: Resonator, tau: number): number {
  if (tau < 0) return 0;
  const alpha = r.omegaR / (2 * r.Q);
  const amp = (r.omegaR * r.Rs) / r.Q;
  if (tau === 0) return 0.5 * amp;
  const wb2 = r.omegaR * r.omegaR - alpha * alpha;
  const e = Math.exp(-alpha * tau);
  if (wb2 > 0) {
    const wb = Math.sqrt(wb2);
    return amp * e * (Math.cos(wb * tau) - (alpha / wb) * Math.sin(wb * tau));
  }
  // Overdamped (Q < ½): cosh/sinh with κ = sqrt(α² − ω_r²); critically damped: the limit 1 − ατ.
  const k = Math.sqrt(-wb2);
  if (k === 0) return amp * e * (1 - alpha * tau);
  return amp * e * (Math.cosh(k * tau) - (alpha / k) * Math.sinh(k * tau));
}
