// Unmatched bunches: an upright ellipse-shaped distribution in (dt, dE) sized independently of the bucket.
// Units: dt in s (dt > 0 late), dE in eV. The energy spread is `mismatch` times the linearly matched one,
// σ_E = mismatch·β²E·(ω_s/|η|)·σ_t (PHYSICS.md §9, linear matching), with ω_s from PHYSICS.md §6:
// Q_s = sqrt(h·|η|·|F'(φ_s)|/(2π·β²E)), ω_s = Q_s·ω0.
// Shapes in the normalised coordinates (x, y) = (dt/x̂, dE/ŷ): 'gaussian' is a 2-D normal with σ_t, σ_E;
// 'parabolic' is the 2-D binomial (1 − x² − y²)^½, whose projections are parabolic, ∝ (1 − x²);
// a projection ∝ (1 − x²)^ν has ⟨x²⟩ = x̂²/(2ν+3), so x̂ = √5·σ_t and ŷ = √5·σ_E.
import type { Bunch } from '../bunch.ts';
import type { MachineState } from '../machine.ts';
import { rfGainSlope } from '../rf.ts';
import type { Rng } from '../rng.ts';

// |F'(φs)| below this fraction of Σ|ZV_k·n_k| counts as a flat well (the same tolerance as core/synchronous.ts).
const FLAT_SLOPE = 1e-9;

/** Linear synchrotron angular frequency ω_s [rad/s] (PHYSICS.md §6); 0 for a flat (quartic) well. */
export function linearOmegaS(m: MachineState): number {
  const beta2E = m.beta * m.beta * m.Es;
  let scale = 0;
  for (let k = 0; k < m.wave.ZV.length; k++) scale += Math.abs(m.wave.ZV[k] * m.wave.n[k]);
  const slope = Math.abs(rfGainSlope(m.wave, m.phiS));
  if (slope <= FLAT_SLOPE * scale) return 0;
  const Qs = Math.sqrt((m.h * Math.abs(m.eta0) * slope) / (2 * Math.PI * beta2E));
  return Qs * m.omega0;
}

/** rms energy spread [eV] linearly matched to an rms length σt [s]: β²E·(ω_s/|η|)·σt (PHYSICS.md §9). */
export function linearlyMatchedSpread(m: MachineState, sigmaT: number): number {
  return m.beta * m.beta * m.Es * (linearOmegaS(m) / Math.abs(m.eta0)) * sigmaT;
}

// ⟨x²⟩ = x̂²/(2ν+3) for a projection (1 − x²)^ν with ν = 1 (parabolic).
const PARABOLIC_EDGE_OVER_RMS = Math.sqrt(5);

/** Fill a bunch with an unmatched distribution of rms length σt [s] and rms energy spread σE [eV] (no offsets). */
export function sampleUnmatched(shape: 'gaussian' | 'parabolic', sigmaT: number, sigmaE: number, rng: Rng, out: Bunch): void {
  const { dt, dE } = out;
  if (shape === 'gaussian') {
    for (let i = 0; i < out.total; i++) {
      dt[i] = sigmaT * rng.normal();
      dE[i] = sigmaE * rng.normal();
    }
    return;
  }
  const xt = PARABOLIC_EDGE_OVER_RMS * sigmaT, xe = PARABOLIC_EDGE_OVER_RMS * sigmaE;
  for (let i = 0; i < out.total; i++) {
    // 2-D binomial of exponent ½: P(r² < s) = 1 − (1 − s)^(3/2), so r² = 1 − (1 − u)^(2/3); angle uniform
    const r = Math.sqrt(1 - Math.pow(1 - rng.uniform(), 2 / 3));
    const th = 2 * Math.PI * rng.uniform();
    dt[i] = xt * r * Math.cos(th);
    dE[i] = xe * r * Math.sin(th);
  }
}
