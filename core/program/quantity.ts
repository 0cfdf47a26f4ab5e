// Momentum programs: the quantity a table or shape gives, turned into p·c of the synchronous particle.
// Units: energies and p·c in eV (kineticPerNucleon in eV per nucleon), field in T, bending radius in m.
// Conversions (PHYSICS.md §2): p·c = sqrt(T·(T + 2m)) for kinetic energy T (no cancellation at low T),
// p·c = sqrt((E − m)(E + m)) for total energy E, p·c = Z·c·B·ρ for the dipole field B (Bρ = p/(Z·e)).
import { C_LIGHT } from '../constants.ts';
import type { Particle } from '../particle.ts';

/** What a momentum program gives. */
export type MomentumQuantity = 'momentum' | 'kinetic' | 'total' | 'kineticPerNucleon' | 'field';

/** Unit of each momentum-program quantity. */
export const QUANTITY_UNIT: Record<MomentumQuantity, string> = {
  momentum: 'eV', kinetic: 'eV', total: 'eV', kineticPerNucleon: 'eV', field: 'T',
};

/** p·c [eV] from a program value; rho is the bending radius [m] (needed for 'field'). */
export function pcOf(q: MomentumQuantity, value: number, p: Particle, rho: number | undefined): number {
  switch (q) {
    case 'momentum':
      return value;
    case 'kinetic':
      return Math.sqrt(value * (value + 2 * p.mass));
    case 'kineticPerNucleon': {
      const T = value * p.A;
      return Math.sqrt(T * (T + 2 * p.mass));
    }
    case 'total':
      return Math.sqrt(Math.max(0, (value - p.mass) * (value + p.mass)));
    case 'field':
      if (rho === undefined) throw new RangeError('a field program needs ring.bendingRadius');
      return Math.abs(p.Z) * C_LIGHT * value * rho;
  }
}

/** Program value of quantity q at momentum p·c [eV] (inverse of pcOf). */
export function valueOfPc(q: MomentumQuantity, pc: number, p: Particle, rho: number | undefined): number {
  const E = Math.hypot(pc, p.mass);
  const T = (pc * pc) / (E + p.mass); // E − m without cancellation
  switch (q) {
    case 'momentum':
      return pc;
    case 'kinetic':
      return T;
    case 'kineticPerNucleon':
      return T / p.A;
    case 'total':
      return E;
    case 'field':
      if (rho === undefined) throw new RangeError('a field program needs ring.bendingRadius');
      return pc / (Math.abs(p.Z) * C_LIGHT * rho);
  }
}
