// What the app and the CLI show of intensity effects: RF and induced voltage on a dt grid, the potential well and
// separatrix including the beam's own field, and the energy lost to the impedance.
// Units: dt in s, voltages in V, energies in eV, U and H' per turn (PHYSICS.md §5). Sine convention; dt > 0 late.
// Well: F_tot(dt) = F_rf(φ) + Z·V_ind(dt), U = −sgn(η)·(β²E)⁻¹·ω_rf·∫F_tot dt (trapezoid on the grid, U = 0 at the
// well bottom), separatrix δ = ±sqrt((U_sep − U)/(π·h·|η|)), U_sep the lower of the U maxima on either side.
// Loss: ΔE per turn of the bunch = ∫I·V_ind dt = −k_loss·Q² [J]; per particle Z·∫λ·V_ind dt [eV].
import { E_CHARGE } from '../constants.ts';
import type { MachineState } from '../machine.ts';
import { rfGain } from '../rf.ts';
import type { InducedVoltage } from './inducedVoltage.ts';

/** RF voltage Σ V_k sin(φ_k + h_k·ω0·dt), induced voltage and their sum [V] at each dt [s]. */
export function voltagesOnGrid(m: MachineState, calc: InducedVoltage | null, dt: ArrayLike<number>): { dt: Float64Array; rf: Float64Array; induced: Float64Array; total: Float64Array } {
  const n = dt.length;
  const out = { dt: Float64Array.from(dt), rf: new Float64Array(n), induced: new Float64Array(n), total: new Float64Array(n) };
  for (let i = 0; i < n; i++) {
    let v = 0;
    for (const r of m.rf) v += r.V * Math.sin(r.phi + r.h * m.omega0 * dt[i]);
    out.rf[i] = v;
    out.induced[i] = calc ? calc.voltageAt(dt[i]) : 0;
    out.total[i] = v + out.induced[i];
  }
  return out;
}

/** The potential well with the beam's field, and its separatrix (null if U has no maximum on one side). */
export interface DistortedWell {
  dt: Float64Array;
  /** U(dt) per turn, 0 at the well bottom. */
  U: Float64Array;
  /** Energy gain per turn relative to the synchronous particle, F_tot [eV]. */
  gain: Float64Array;
  /** dt of the well bottom [s] (the synchronous point shifted by the beam's field). */
  bottom: number;
  separatrix: { dt: Float64Array; dE: Float64Array; Usep: number } | null;
}

/** The beam's field as the well needs it: its binning window and V_ind [V] at any dt [s]. */
export type BeamField = Pick<InducedVoltage, 'grid' | 'voltageAt'>;

/** U and the separatrix over dt ∈ [dtMin, dtMax] on `points` samples; the bottom is the lowest U inside calc's window (or anywhere without calc). */
export function distortedWell(m: MachineState, calc: BeamField | null, dtMin: number, dtMax: number, points = 2001): DistortedWell {
  if (!(points >= 3 && dtMax > dtMin)) throw new RangeError(`distortedWell: needs dtMax > dtMin and ≥ 3 points, got [${dtMin}, ${dtMax}] with ${points}`);
  const h = (dtMax - dtMin) / (points - 1);
  const dt = new Float64Array(points), U = new Float64Array(points), gain = new Float64Array(points);
  const Z = m.particle.Z;
  for (let i = 0; i < points; i++) {
    dt[i] = dtMin + i * h;
    gain[i] = rfGain(m.wave, m.phiS + m.omegaRf * dt[i]) + (calc ? Z * calc.voltageAt(dt[i]) : 0);
  }
  const pre = (-Math.sign(m.eta0) * m.omegaRf) / (m.beta * m.beta * m.Es);
  for (let i = 1; i < points; i++) U[i] = U[i - 1] + pre * 0.5 * (gain[i - 1] + gain[i]) * h;
  const a = calc ? calc.grid.e0 : -Infinity, b = calc ? calc.grid.e0 + calc.grid.nb * calc.grid.delta : Infinity;
  let k = -1;
  for (let i = 1; i < points - 1; i++) if (dt[i] >= a && dt[i] <= b && (k < 0 || U[i] < U[k])) k = i;
  if (k < 0) k = 0;
  const Umin = U[k];
  for (let i = 0; i < points; i++) U[i] -= Umin;
  // Nearest local maxima of U on each side of the bottom.
  let l = k, r = k;
  while (l > 0 && !(U[l - 1] < U[l] && l < k)) l--;
  while (r < points - 1 && !(U[r + 1] < U[r] && r > k)) r++;
  const closed = l > 0 && r < points - 1;
  let separatrix: DistortedWell['separatrix'] = null;
  if (closed) {
    const Usep = Math.min(U[l], U[r]);
    const kappa = Math.PI * m.h * Math.abs(m.eta0), b2E = m.beta * m.beta * m.Es;
    let i0 = k, i1 = k;
    while (i0 > l && U[i0 - 1] <= Usep) i0--;
    while (i1 < r && U[i1 + 1] <= Usep) i1++;
    const n = i1 - i0 + 1;
    const sdt = new Float64Array(2 * n + 1), sdE = new Float64Array(2 * n + 1);
    for (let j = 0; j < n; j++) {
      const e = b2E * Math.sqrt(Math.max(0, Usep - U[i0 + j]) / kappa);
      sdt[j] = dt[i0 + j]; sdE[j] = e;
      sdt[2 * n - 1 - j] = dt[i0 + j]; sdE[2 * n - 1 - j] = -e;
    }
    sdt[2 * n] = sdt[0]; sdE[2 * n] = sdE[0];
    separatrix = { dt: sdt, dE: sdE, Usep };
  }
  // Bottom between grid points: vertex of the parabola through the three lowest samples.
  let bottom = dt[k];
  if (k > 0 && k < points - 1) {
    const c = U[k - 1] - 2 * U[k] + U[k + 1];
    if (c > 0) bottom += (0.5 * h * (U[k - 1] - U[k + 1])) / c;
  }
  return { dt, U, gain, bottom, separatrix };
}

/** Energy lost to the impedance per turn in the last compute of calc (positive = lost): loss factor k [V/C], per bunch [J], per particle [eV]. */
export function impedanceLoss(calc: InducedVoltage, bunchCharge: number, particlesPerBunch: number): { lossFactor: number; lossPerBunch: number; lossPerParticle: number } {
  const { current, voltage, grid } = calc;
  let e = 0; // ∫I·V dt [J]
  for (let i = 0; i < grid.nb; i++) e += current[i] * voltage[i] * grid.delta;
  return {
    lossFactor: bunchCharge !== 0 ? -e / (bunchCharge * bunchCharge) : 0,
    lossPerBunch: -e,
    lossPerParticle: particlesPerBunch > 0 ? -e / (particlesPerBunch * E_CHARGE) : 0,
  };
}
