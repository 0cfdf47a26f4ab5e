// RF kick at one gap: all RF systems that share a position kick together.
// Units: dt in s (dt > 0 = late), dE in eV, phases in rad. Sine convention (PHYSICS.md §0, §4 step 2):
//   dE += Σ_k Z·V_k·sin(φ_k + h_k·ω0·dt) − share,  share = Σ_k Z·V_k·sin φ_k (k at this gap),
// so the synchronous particle (dt = 0) gets exactly zero and stays at the origin; summed over all gaps the
// shares equal ΔE_s because F(φ_s) = 0. The kick depends on dt only, so it is a shear: determinant 1.
// No bucket (m.phiS NaN): the RF keeps the last valid phases (π/2 on the main system if there never was one,
// the crest where a bucket vanishes as ΔE_s → Z·V), and the gap subtracts its voltage-weighted part of
// ΔE_s, because the reference energy keeps following the program while the beam falls behind.
import type { Bunch } from '../bunch.ts';
import type { MachineState } from '../machine.ts';
import type { Element } from './types.ts';

/** Kick by the RF systems with indices `systems` in m.rf (one gap); reverse = true applies the inverse kick. */
export function rfKick(systems: readonly number[], reverse = false): Element {
  const nk = systems.length;
  if (nk === 0) throw new Error('rfKick needs at least one RF system');
  const idx = Int32Array.from(systems);
  const zv = new Float64Array(nk); // sign·Z·V_k [eV]
  const w = new Float64Array(nk); // h_k·ω0 [rad/s]
  const ph = new Float64Array(nk); // φ_k [rad]
  const last = new Float64Array(nk).fill(NaN); // last valid φ_k
  const sgn = reverse ? -1 : 1;
  return {
    name: `rf kick [${systems.join(',')}]`,
    apply(b: Bunch, m: MachineState): void {
      const valid = Number.isFinite(m.phiS);
      let vGap = 0;
      let vAll = 0;
      for (const r of m.rf) vAll += Math.abs(r.V);
      let share = 0;
      for (let j = 0; j < nk; j++) {
        const r = m.rf[idx[j]];
        if (valid) last[j] = r.phi;
        else if (Number.isNaN(last[j])) last[j] = (r.h / m.h) * (Math.PI / 2) + r.offset;
        zv[j] = sgn * Math.abs(m.particle.Z) * r.V; // phases as the particle sees them (core/machine.ts)
        w[j] = r.h * m.omega0;
        ph[j] = last[j];
        share += zv[j] * Math.sin(ph[j]);
        vGap += Math.abs(r.V);
      }
      if (!valid) share = sgn * m.dEs * (vAll > 0 ? vGap / vAll : idx.includes(0) ? 1 : 0);
      if (nk === 1) kickOne(b.dt, b.dE, b.n, zv[0], w[0], ph[0], share);
      else if (nk === 2) kickTwo(b.dt, b.dE, b.n, zv[0], w[0], ph[0], zv[1], w[1], ph[1], share);
      else kickMany(b.dt, b.dE, b.n, zv, w, ph, share);
    },
  };
}

// One RF system: the hot loop, parameters as arguments (PERF.md).
function kickOne(dt: Float64Array, dE: Float64Array, n: number, zv: number, w: number, phi: number, share: number): void {
  for (let i = 0; i < n; i++) dE[i] = dE[i] + zv * Math.sin(phi + w * dt[i]) - share;
}

// Two RF systems at one gap, unrolled (an inner loop over k runs at half the speed); same summation order
// as the share, so dt = 0 still gets exactly zero.
function kickTwo(
  dt: Float64Array, dE: Float64Array, n: number,
  zv0: number, w0: number, ph0: number, zv1: number, w1: number, ph1: number, share: number,
): void {
  for (let i = 0; i < n; i++) {
    const t = dt[i];
    dE[i] = dE[i] + zv0 * Math.sin(ph0 + w0 * t) + zv1 * Math.sin(ph1 + w1 * t) - share;
  }
}

// Three or more RF systems at one gap.
function kickMany(dt: Float64Array, dE: Float64Array, n: number, zv: Float64Array, w: Float64Array, ph: Float64Array, share: number): void {
  const nk = zv.length;
  for (let i = 0; i < n; i++) {
    const t = dt[i];
    let e = dE[i];
    for (let k = 0; k < nk; k++) e += zv[k] * Math.sin(ph[k] + w[k] * t);
    dE[i] = e - share;
  }
}
