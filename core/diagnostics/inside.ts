// Particles inside the separatrix. Units: dt in s, dE in eV, phases in rad.
// Per-turn Hamiltonian H'(φ, δ) of core/bucket.ts (PHYSICS.md §5): φ = φs + ω_rf·dt, δ = dE/(β²E) (first order,
// as in §5). Inside: phiLeft ≤ φ ≤ phiRight and H' < Usep, in any of the buckets: when every harmonic ratio is an
// integer the wave repeats every 2π of φ and U(φ + 2π) = U(φ) + const, so each bucket is the central one moved by
// 2π and φ is first taken back into [phiLeft, phiLeft + 2π). With a non-integer ratio only the central bucket counts.
// Speed: U(φ) is tabulated once per call on TABLE intervals over [phiLeft, phiRight] and interpolated linearly.
// The interpolation error is at most h²/8·max|U''| with |U''| = |F'(φ)|/(β²E) ≤ Σ|Z·V_k·n_k|/(β²E) (rf.ts), so
// a particle whose interpolated H' is farther than that bound from Usep is classified without the exact U; the
// few within the bound get the exact hamiltonian(). The count is therefore exactly that of the exact test.
import type { Bunch } from '../bunch.ts';
import { hamiltonian } from '../bucket.ts';
import type { MachineState } from '../machine.ts';

/** The part of a bucket description this check needs (a BucketInfo fits). */
export interface BucketLimits {
  phiLeft: number;
  phiRight: number;
  Usep: number;
}

// Intervals of the U table: error bound ∝ 1/TABLE², cost of the table ∝ TABLE (negligible beside 1e5 particles).
const TABLE = 2048;
let table = new Float64Array(TABLE + 1);

/** Number of alive particles inside the separatrix of `bucket` (0 if the machine has no stable phase). */
export function insideSeparatrix(b: Bunch, m: MachineState, bucket: BucketLimits): number {
  if (!Number.isFinite(m.phiS)) return 0;
  const beta2E = m.beta * m.beta * m.Es;
  const inv = 1 / beta2E;
  const { phiLeft, phiRight, Usep } = bucket;
  if (!(phiRight > phiLeft)) return 0;
  const h = (phiRight - phiLeft) / TABLE;
  if (table.length !== TABLE + 1) table = new Float64Array(TABLE + 1);
  const U = table;
  let maxAbs = Math.abs(Usep);
  for (let j = 0; j <= TABLE; j++) {
    U[j] = hamiltonian(m, phiLeft + j * h, 0);
    maxAbs = Math.max(maxAbs, Math.abs(U[j]));
  }
  let slope = 0;
  for (let k = 0; k < m.wave.ZV.length; k++) slope += Math.abs(m.wave.ZV[k] * m.wave.n[k]);
  // Interpolation bound plus round-off of the table and of the sums (relative 1e-12 of the largest |U|).
  const tol = (h * h * slope * inv) / 8 + 1e-12 * maxAbs;
  const kin = Math.PI * m.h * Math.abs(m.eta0) * inv * inv; // H' kinetic term per dE²
  const phiS = m.phiS, wRf = m.omegaRf, invH = 1 / h;
  const periodic = m.wave.n.every(Number.isInteger), TWO_PI = 2 * Math.PI;
  const dt = b.dt, dE = b.dE, n = b.n;
  let count = 0;
  for (let i = 0; i < n; i++) {
    let phi = phiS + wRf * dt[i];
    if (periodic && (phi < phiLeft || phi >= phiLeft + TWO_PI)) phi -= TWO_PI * Math.floor((phi - phiLeft) / TWO_PI);
    if (!(phi >= phiLeft && phi <= phiRight)) continue;
    const x = (phi - phiLeft) * invH;
    const j = Math.min(TABLE - 1, Math.floor(x));
    const f = x - j;
    const e = dE[i];
    const H = kin * e * e + U[j] + f * (U[j + 1] - U[j]);
    if (H < Usep - tol) count++;
    else if (H <= Usep + tol && hamiltonian(m, phi, e * inv) < Usep) count++;
  }
  return count;
}
