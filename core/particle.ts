// Particle species. Units: rest energy in eV; charge state Z in units of e (so Z·V[volt] is in eV).
// Ion mass: m = A_u·(u c²) − Z·(m_e c²), electron binding energy (< 1 MeV) neglected (common practice).
import { AMU_EV, ELECTRON_MASS_EV, PROTON_MASS_EV } from './constants.ts';

export interface Particle {
  readonly name: string;
  /** Rest energy [eV]. */
  readonly mass: number;
  /** Charge state: charge in units of the elementary charge (signed; −1 for electrons). */
  readonly Z: number;
  /** Mass number (1 for protons, 0 for leptons); used for per-nucleon energies. */
  readonly A: number;
}

export type ParticleSpec =
  | { kind: 'proton' }
  | { kind: 'electron' }
  | { kind: 'positron' }
  | { kind: 'ion'; massNumber: number; chargeState: number; atomicMass?: number; restEnergy?: number };

/** Build a particle from its setup description. */
export function makeParticle(s: ParticleSpec): Particle {
  switch (s.kind) {
    case 'proton':
      return { name: 'proton', mass: PROTON_MASS_EV, Z: 1, A: 1 };
    case 'electron':
      return { name: 'electron', mass: ELECTRON_MASS_EV, Z: -1, A: 0 };
    case 'positron':
      return { name: 'positron', mass: ELECTRON_MASS_EV, Z: 1, A: 0 };
    case 'ion': {
      const massU = s.atomicMass ?? s.massNumber; // atomic mass in u; mass number if not given
      const mass = s.restEnergy ?? massU * AMU_EV - s.chargeState * ELECTRON_MASS_EV;
      return { name: `ion A=${s.massNumber} Q=${s.chargeState}`, mass, Z: s.chargeState, A: s.massNumber };
    }
  }
}
