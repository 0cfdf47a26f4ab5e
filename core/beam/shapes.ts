// Matched-bunch shapes as functions G(H') of the Hamiltonian, and their energy integrals at fixed phase.
// Units: H' per turn (dimensionless, PHYSICS.md §5), dE in eV. At fixed φ, H' = U(φ) + a·dE² with
// a = π·h·|η|/(β²E)², so a level H bounds |dE| < D = sqrt((H − U)/a).
// Shapes (PHYSICS.md §9, "Nonlinear matching"):
// - 'flat':      G = 1 for H' < Hm (binomial exponent μ = 0).
// - 'parabolic': G = (1 − H'/Hm)^½ (binomial μ = ½). We call this one parabolic because its line density is
//                exactly parabolic, ∝ (1 − x²), in the small-amplitude (linear) limit: a binomial of exponent μ
//                projects to (1 − x²)^(μ+½).
// - 'gaussian':  G = exp(−H'/H0), cut at the separatrix.
// Energy integrals at fixed φ, with R = H − U, D = sqrt(R/a) and s = dE/D:
//   binomial: ∫G dE = (R/Hm)^μ·D·B(½, μ+1), ∫dE²G dE = that·D²/(2μ+3)  [∫s²(1−s²)^μ = B(3/2, μ+1) = B(½, μ+1)/(2μ+3)];
//   gaussian with σ² = H0/(2a), z = D/(σ√2): ∫G dE = e^{−U/H0}·√(2π)σ·erf(z),
//            ∫dE²G dE = e^{−U/H0}·σ²·[√(2π)σ·erf(z) − 2D·e^{−z²}]  (integration by parts).
// The common factor B(½, μ+1) is dropped: only ratios of integrals are used.
import { erf } from './erf.ts';

/** Name of a matched shape G(H'). */
export type MatchedShape = 'gaussian' | 'parabolic' | 'flat';

/** Binomial exponent μ of G = (1 − H'/Hm)^μ for the bounded shapes. */
export const BINOMIAL_EXPONENT = { parabolic: 0.5, flat: 0 } as const;

const SQRT_2PI = Math.sqrt(2 * Math.PI);

/** Line-density and energy-moment integrands at one phase: out[0] = ∫G dE, out[1] = ∫dE²·G dE. */
export function energyIntegrals(
  shape: MatchedShape, scale: number, Hcut: number, U: number, a: number, out: Float64Array,
): void {
  const R = Hcut - U;
  if (!(R > 0)) {
    out[0] = 0;
    out[1] = 0;
    return;
  }
  const D = Math.sqrt(R / a);
  if (shape === 'gaussian') {
    const sigma = Math.sqrt(scale / (2 * a));
    const z = D / (sigma * Math.SQRT2);
    const g = Math.exp(-U / scale);
    const core = SQRT_2PI * sigma * erf(z);
    out[0] = g * core;
    out[1] = g * sigma * sigma * (core - 2 * D * Math.exp(-z * z));
    return;
  }
  const mu = BINOMIAL_EXPONENT[shape];
  const w = mu === 0 ? D : Math.pow(R / scale, mu) * D;
  out[0] = w;
  out[1] = (w * D * D) / (2 * mu + 3);
}
