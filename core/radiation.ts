// Synchrotron radiation in the longitudinal plane: energy loss per turn, damping time, natural energy spread and
// bunch length (PHYSICS.md §11). Units: energies in eV, lengths in m, times in s; I2 in 1/m, I3 in 1/m².
// Radiation constants for a particle of rest energy m and charge state Z, from CODATA 2018 (core/constants.ts):
//   C_γ = 4π·r/(3·m³) with the classical radius r = Z²·r_e·(m_e/m) [M. Sands, SLAC-121 (1970), eq. 4.6 (mem.)],
//   C_q = 55·ħc/(32√3·m)                     [Sands, eq. 5.22 (mem.); H. Wiedemann, Particle Accelerator Physics].
// U0 = C_γ·E⁴·I2/(2π); τ_E = 2·E·T0/(J_E·U0) is the AMPLITUDE damping time (σ_E² and the emittance damp with τ_E/2);
// σ_δ² = C_q·γ²·I3/(J_E·I2); natural bunch length σ_t = |η|·σ_δ/ω_s (β ≈ 1).
import { ELECTRON_MASS_EV, ELECTRON_RADIUS, HBAR_C_EV_M } from './constants.ts';
import type { MachineState } from './machine.ts';
import type { Particle } from './particle.ts';
import type { RadiationSetup } from './setup/collective.ts';
import type { Setup } from './setup/schema.ts';
import { smallAmplitudeTune } from './synchrotron.ts';

/** C_γ [m/eV³] for a particle: 4π·Z²·r_e·(m_e/m)/(3·m³). Electrons: 8.846e-5 m/GeV³ = 8.846e-32 m/eV³. */
export function radiationConstant(p: Particle): number {
  const r = p.Z * p.Z * ELECTRON_RADIUS * (ELECTRON_MASS_EV / p.mass);
  return (4 * Math.PI * r) / (3 * p.mass * p.mass * p.mass);
}

/** C_q [m] for a particle: 55·ħc/(32√3·m). Electrons: 3.832e-13 m. */
export function quantumConstant(p: Particle): number {
  return (55 * HBAR_C_EV_M) / (32 * Math.sqrt(3) * p.mass);
}

/** The lattice numbers radiation needs: J_E and the radiation integrals I2 [1/m], I3 [1/m²]. */
export interface RadiationLattice {
  JE: number;
  I2: number;
  I3: number;
}

/** Lattice numbers from the setup; throws naming the field when neither I2/I3 nor ring.bendingRadius is given. */
export function radiationLattice(setup: Setup): RadiationLattice | null {
  const r: RadiationSetup | undefined = setup.radiation;
  if (!r) return null;
  if (r.I2 !== undefined && r.I3 !== undefined) return { JE: r.partitionE, I2: r.I2, I3: r.I3 };
  const rho = setup.ring.bendingRadius;
  if (rho === undefined)
    throw new Error('radiation: needs ring.bendingRadius (isomagnetic ring) or the radiation integrals radiation.I2 and radiation.I3');
  return { JE: r.partitionE, I2: (2 * Math.PI) / rho, I3: (2 * Math.PI) / (rho * rho) };
}

/** Energy radiated per turn by the synchronous particle, U0 = C_γ·E⁴·I2/(2π) [eV]. */
export function energyLossPerTurn(p: Particle, E: number, lat: RadiationLattice): number {
  const E2 = E * E;
  return (radiationConstant(p) * E2 * E2 * lat.I2) / (2 * Math.PI);
}

/** Equilibrium relative energy spread σ_δ = sqrt(C_q·γ²·I3/(J_E·I2)). */
export function naturalEnergySpread(p: Particle, gamma: number, lat: RadiationLattice): number {
  return gamma * Math.sqrt((quantumConstant(p) * lat.I3) / (lat.JE * lat.I2));
}

/** Radiation numbers of a machine state: U0, damping times, natural spread and length. */
export interface RadiationInfo {
  /** Energy loss per turn [eV]. */
  U0: number;
  /** Amplitude damping time of synchrotron oscillations [s] and [turns]. */
  tauE: number;
  tauETurns: number;
  /** Damping time of σ_E² and of the longitudinal emittance, τ_E/2 [s]. */
  tauEmittance: number;
  /** Natural relative energy spread σ_δ and rms energy spread σ_E = σ_δ·E [eV] (β ≈ 1). */
  sigmaDelta: number;
  sigmaE: number;
  /** Natural rms bunch length σ_t = |η|·σ_δ/ω_s [s] (linear RF, no intensity). */
  sigmaT: number;
  JE: number;
  Cgamma: number;
  Cq: number;
}

/** Radiation numbers at a machine state (m.phiS must include U0, as MachineStepper does). */
export function radiationInfo(m: MachineState, lat: RadiationLattice): RadiationInfo {
  const p = m.particle;
  const U0 = energyLossPerTurn(p, m.Es, lat);
  const tauE = (2 * m.Es * m.T0) / (lat.JE * U0);
  const sigmaDelta = naturalEnergySpread(p, m.gamma, lat);
  const { Qs } = smallAmplitudeTune(m);
  const omegaS = Qs * m.omega0;
  return {
    U0, tauE, tauETurns: tauE / m.T0, tauEmittance: tauE / 2,
    sigmaDelta, sigmaE: sigmaDelta * m.Es,
    sigmaT: (Math.abs(m.eta0) * sigmaDelta) / omegaS,
    JE: lat.JE, Cgamma: radiationConstant(p), Cq: quantumConstant(p),
  };
}

/** Radiation numbers for the `bucket` report (units in the key names), or null without a radiation block. */
export function radiationSummary(setup: Setup, m: MachineState): Record<string, unknown> | null {
  const lat = radiationLattice(setup);
  if (!lat) return null;
  const r = radiationInfo(m, lat);
  return {
    energyLossPerTurn_eV: r.U0,
    partitionNumberE: r.JE,
    dampingTimeAmplitude_s: r.tauE,
    dampingTimeAmplitude_turns: r.tauETurns,
    dampingTimeEmittance_s: r.tauEmittance,
    naturalEnergySpread_relative: r.sigmaDelta,
    naturalEnergySpread_eV: r.sigmaE,
    naturalBunchLength_s: r.sigmaT,
    Cgamma_m_per_GeV3: r.Cgamma * 1e27,
    Cq_m: r.Cq,
    note: 'τ_E is the amplitude damping time of synchrotron oscillations; σ_E² and the emittance damp with τ_E/2. Natural length for linear RF, no intensity.',
  };
}
