// Particles inside the separatrix. Units: dt in s, dE in eV, phases in rad.
// Per-turn Hamiltonian H'(φ, δ) of core/bucket.ts (PHYSICS.md §5): φ = φs + ω_rf·dt, δ = dE/(β²E) (first order,
// as in §5). Inside: phiLeft ≤ φ ≤ phiRight and H' < Usep.
import type { Bunch } from '../bunch.ts';
import { hamiltonian, phaseOfDt } from '../bucket.ts';
import type { MachineState } from '../machine.ts';

/** The part of a bucket description this check needs (a BucketInfo fits). */
export interface BucketLimits {
  phiLeft: number;
  phiRight: number;
  Usep: number;
}

/** Number of alive particles inside the separatrix of `bucket` (0 if the machine has no stable phase). */
export function insideSeparatrix(b: Bunch, m: MachineState, bucket: BucketLimits): number {
  if (!Number.isFinite(m.phiS)) return 0;
  const inv = 1 / (m.beta * m.beta * m.Es);
  const { phiLeft, phiRight, Usep } = bucket;
  const dt = b.dt, dE = b.dE, n = b.n;
  let count = 0;
  for (let i = 0; i < n; i++) {
    const phi = phaseOfDt(m, dt[i]);
    if (phi >= phiLeft && phi <= phiRight && hamiltonian(m, phi, dE[i] * inv) < Usep) count++;
  }
  return count;
}
