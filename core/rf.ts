// The RF voltage function, its derivative and the potential well, for any set of RF systems.
// Units: energies in eV, phases in rad. Sine convention: system k kicks by Z·V_k·sin(φ_k + h_k·ω0·dt).
// The main system (index 0) defines the phase variable φ = φ_s + h_1·ω0·dt; system k has n_k = h_k/h_1 and a
// fixed offset Φ_k, so φ_k = n_k·φ_s + Φ_k (PHYSICS.md §5 "General RF").
// F(φ) = Z·Σ V_k sin(n_k φ + Φ_k) − ΔE_s is the energy gain per turn relative to the synchronous particle.
// Potential per turn (PHYSICS.md §5): U(φ) = −sgn(η)·(β²E)⁻¹·∫_{φs}^{φ} F dφ', closed form for sums of sines.
// Hamiltonian per turn: H'(φ, δ) = π·h·|η|·δ² + U(φ); wells are minima of U (for either sign of η).

export interface RfWave {
  /** Charge state Z times peak voltage [eV] per system. */
  readonly ZV: readonly number[];
  /** Harmonic ratio n_k = h_k/h_1 per system (n_0 = 1). */
  readonly n: readonly number[];
  /** Phase offset Φ_k [rad] per system (Φ_0 = 0). */
  readonly offset: readonly number[];
  /** Energy the synchronous particle must gain per turn [eV] (ΔE_s, plus radiation loss for leptons). */
  readonly dEs: number;
}

/** F(φ): energy gain per turn relative to the synchronous particle [eV]. */
export function rfGain(w: RfWave, phi: number): number {
  let s = -w.dEs;
  for (let k = 0; k < w.ZV.length; k++) s += w.ZV[k] * Math.sin(w.n[k] * phi + w.offset[k]);
  return s;
}

/** dF/dφ [eV/rad]. */
export function rfGainSlope(w: RfWave, phi: number): number {
  let s = 0;
  for (let k = 0; k < w.ZV.length; k++) s += w.ZV[k] * w.n[k] * Math.cos(w.n[k] * phi + w.offset[k]);
  return s;
}

/** ∫_{φs}^{φ} F dφ' [eV·rad], closed form. */
export function rfGainIntegral(w: RfWave, phiS: number, phi: number): number {
  let s = -w.dEs * (phi - phiS);
  for (let k = 0; k < w.ZV.length; k++) {
    const n = w.n[k];
    s += (w.ZV[k] / n) * (Math.cos(n * phiS + w.offset[k]) - Math.cos(n * phi + w.offset[k]));
  }
  return s;
}

/** Potential U(φ) per turn (dimensionless, same units as π·h·|η|·δ²); U(φs) = 0. */
export function potential(w: RfWave, phiS: number, phi: number, etaSign: number, beta2E: number): number {
  return (-Math.sign(etaSign) * rfGainIntegral(w, phiS, phi)) / beta2E;
}

/** Highest harmonic ratio present (sets the sampling density for root searches). */
export function maxHarmonicRatio(w: RfWave): number {
  let m = 1;
  for (let k = 0; k < w.n.length; k++) m = Math.max(m, Math.abs(w.n[k])); // index loop: no iterator per call
  return m;
}
