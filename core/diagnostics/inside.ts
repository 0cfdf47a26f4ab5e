// Particles inside the separatrix. Units: dt in s, dE in eV, phases in rad.
// Per-turn Hamiltonian (PHYSICS.md §5): H'(φ, δ) = π·h·|η|·δ² + U(φ), φ = φs + ω_rf·dt, δ = dE/(β²E)
// (first order, as in §5), U from core/rf.ts. Inside: phiLeft ≤ φ ≤ phiRight and H' < Usep.
import type { Bunch } from '../bunch.ts';
import type { MachineState } from '../machine.ts';
import { potential } from '../rf.ts';

/** The part of a bucket description this check needs (a full BucketInfo fits). */
export interface BucketLimits {
  phiLeft: number;
  phiRight: number;
  Usep: number;
}

/** Number of alive particles inside the separatrix of `bucket` (0 if the machine has no stable phase). */
export function insideSeparatrix(b: Bunch, m: MachineState, bucket: BucketLimits): number {
  const phiS = m.phiS;
  if (!Number.isFinite(phiS)) return 0;
  const beta2E = m.beta * m.beta * m.Es;
  const kd = Math.PI * m.h * Math.abs(m.eta0);
  const wRf = m.omegaRf, { phiLeft, phiRight, Usep } = bucket;
  const dt = b.dt, dE = b.dE, n = b.n;
  let count = 0;
  for (let i = 0; i < n; i++) {
    const phi = phiS + wRf * dt[i];
    if (phi < phiLeft || phi > phiRight) continue;
    const d = dE[i] / beta2E;
    if (kd * d * d + potential(m.wave, phiS, phi, m.eta0, beta2E) < Usep) count++;
  }
  return count;
}
