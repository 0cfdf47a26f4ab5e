// Induced voltage of resonators by convolution with their wake in time, with memory over turns and bunches.
// Units: t in s, current in A, voltage in V. V_ind(t) = −∫W(t − t')·I(t')dt' (PHYSICS.md §12), W(τ < 0) = 0.
// The wake is a sum of damped exponentials, W(τ) = Re Σ_p c_p·e^{s_p τ}: underdamped, one pole
// s = −α + jω̄ with c = (ω_r R_s/Q)(1 + jα/ω̄) (Re of the sum of the conjugate pair = 2·Re of one, folded into c);
// overdamped (Q < ½), two real poles −α ± κ. So S_p(t) = ∫_{−∞}^{t} e^{s_p(t−t')}I(t')dt' obeys the exact
// recursion over a bin of width Δ with constant current I_i:  S ← e^{sΔ}·S + I_i·(e^{sΔ} − 1)/s.
// The state at the window's end is carried to the next bunch (spacing T_b = T0/M) and the next turn: the M
// identical bunches and all earlier turns add up, which is the beam loading of a long-lived mode.
import type { Resonator } from './impedance.ts';

// The critically damped resonator (Q = ½) has a double pole; it is moved to Q = ½·(1 + 1e-9), a change far below
// any tolerance on a measured Q (common practice for a degenerate pole).
const CRITICAL_SPLIT = 1e-9;

/** One pole of a wake: W += Re(c·e^{sτ}). */
interface Pole { cr: number; ci: number; sr: number; si: number }

/** Poles of a resonator wake. */
export function resonatorPoles(r: Resonator): Pole[] {
  const Q = r.Q === 0.5 ? 0.5 * (1 + CRITICAL_SPLIT) : r.Q;
  const alpha = r.omegaR / (2 * Q);
  const amp = (r.omegaR * r.Rs) / Q;
  const wb2 = r.omegaR * r.omegaR - alpha * alpha;
  if (wb2 > 0) {
    const wb = Math.sqrt(wb2);
    return [{ cr: amp, ci: (amp * alpha) / wb, sr: -alpha, si: wb }];
  }
  const k = Math.sqrt(-wb2);
  return [
    { cr: 0.5 * amp * (1 - alpha / k), ci: 0, sr: -alpha + k, si: 0 },
    { cr: 0.5 * amp * (1 + alpha / k), ci: 0, sr: -alpha - k, si: 0 },
  ];
}

// Complex helpers on (re, im) pairs written into a 2-slot array.
function cexp(re: number, im: number, out: Float64Array, o: number): void {
  const e = Math.exp(re);
  out[o] = e * Math.cos(im);
  out[o + 1] = e * Math.sin(im);
}

/** Time-domain resonator voltages on a bin grid, with the multi-turn state (one slot per pole). */
export class ResonatorWakes {
  private readonly poles: Pole[];
  /** Wake state S_p at the left edge of the window, for the coming pass (re, im per pole). */
  private readonly state: Float64Array;
  private started = false;
  // Per-pole constants for the current grid: e^{sΔ}, (e^{sΔ}−1)/s, e^{sΔ/2}, (e^{sΔ/2}−1)/s.
  private readonly k: Float64Array;
  // Scratch for the propagators (no allocation per turn).
  private readonly gap = new Float64Array(2);
  private readonly P = new Float64Array(2);
  private readonly PM = new Float64Array(2);
  /** S_p at the window's left and right edges in the last pass (re, im per pole), for voltages outside it. */
  private readonly edges: Float64Array;
  private readonly delta: number;

  constructor(resonators: readonly Resonator[], delta: number) {
    this.delta = delta;
    this.poles = resonators.flatMap(resonatorPoles);
    this.state = new Float64Array(2 * this.poles.length);
    this.edges = new Float64Array(4 * this.poles.length);
    this.k = new Float64Array(8 * this.poles.length);
    const t = new Float64Array(2);
    this.poles.forEach((p, j) => {
      const o = 8 * j;
      cexp(p.sr * delta, p.si * delta, this.k, o);
      cexp(0.5 * p.sr * delta, 0.5 * p.si * delta, this.k, o + 4);
      for (const h of [0, 4]) {
        // (E − 1)/s
        const er = this.k[o + h] - 1, ei = this.k[o + h + 1];
        const d = p.sr * p.sr + p.si * p.si;
        t[0] = (er * p.sr + ei * p.si) / d;
        t[1] = (ei * p.sr - er * p.si) / d;
        this.k[o + h + 2] = t[0];
        this.k[o + h + 3] = t[1];
      }
    });
  }

  /** True if there is at least one resonator. */
  get active(): boolean {
    return this.poles.length > 0;
  }

  /**
   * Add −(W∗I) at the bin centres to v, for bin currents I [A]. steady = true: as if this bunch had always circulated
   * (periodic steady state of M bunches every Tb = T0/M), state untouched; false: use and advance the stored state
   * (started at the steady state of the first bunch seen). Tb is the bunch spacing [s].
   */
  addVoltage(I: Float64Array, Tb: number, M: number, steady: boolean, v: Float64Array): void {
    const nb = I.length;
    const L = nb * this.delta;
    const st = this.state;
    for (let j = 0; j < this.poles.length; j++) {
      const p = this.poles[j], o = 8 * j, k = this.k;
      const Er = k[o], Ei = k[o + 1], Gr = k[o + 2], Gi = k[o + 3];
      // Pass 1: the window's own contribution C = S(end) from a zero start.
      let cr = 0, ci = 0;
      for (let i = 0; i < nb; i++) {
        const x = I[i];
        const nr = Er * cr - Ei * ci + x * Gr;
        ci = Er * ci + Ei * cr + x * Gi;
        cr = nr;
      }
      // Propagators: P = e^{sTb}, the gap e^{s(Tb−L)}, and P^M.
      const gap = this.gap, P = this.P, PM = this.PM;
      cexp(p.sr * (Tb - L), p.si * (Tb - L), gap, 0);
      cexp(p.sr * Tb, p.si * Tb, P, 0);
      cexp(p.sr * Tb * M, p.si * Tb * M, PM, 0);
      // Carried C to the next bunch's window start: g = gap·C.
      const gr = gap[0] * cr - gap[1] * ci, gi = gap[0] * ci + gap[1] * cr;
      let sr: number, si: number;
      if (steady || !this.started) {
        // S = g/(1 − P): the sum over all earlier bunches of the periodic train.
        const dr = 1 - P[0], di = -P[1], dd = dr * dr + di * di;
        sr = (gr * dr + gi * di) / dd;
        si = (gi * dr - gr * di) / dd;
      } else {
        sr = st[2 * j];
        si = st[2 * j + 1];
      }
      // Pass 2: voltages at the centres from the start state.
      const Hr = k[o + 4], Hi = k[o + 5], Ghr = k[o + 6], Ghi = k[o + 7];
      const c0 = p.cr, c1 = p.ci;
      this.edges[4 * j] = sr;
      this.edges[4 * j + 1] = si;
      let ar = sr, ai = si;
      for (let i = 0; i < nb; i++) {
        const x = I[i];
        const mr = Hr * ar - Hi * ai + x * Ghr, mi = Hr * ai + Hi * ar + x * Ghi;
        v[i] -= c0 * mr - c1 * mi;
        const nr = Er * ar - Ei * ai + x * Gr;
        ai = Er * ai + Ei * ar + x * Gi;
        ar = nr;
      }
      this.edges[4 * j + 2] = ar;
      this.edges[4 * j + 3] = ai;
      if (!steady) {
        // Next turn's start: P^M·S + g·(1 + P + … + P^{M−1}) = P^M·S + g·(1 − P^M)/(1 − P).
        const dr = 1 - P[0], di = -P[1], dd = dr * dr + di * di;
        const nr = 1 - PM[0], ni = -PM[1];
        const fr = (nr * dr + ni * di) / dd, fi = (ni * dr - nr * di) / dd;
        const pr = M === 1 ? 1 : fr, pi = M === 1 ? 0 : fi;
        st[2 * j] = PM[0] * sr - PM[1] * si + gr * pr - gi * pi;
        st[2 * j + 1] = PM[0] * si + PM[1] * sr + gr * pi + gi * pr;
      }
    }
    if (!steady) this.started = true;
  }

  /** −(W∗I) [V] at a time t outside the last pass's window [a, b] (no current there: the state just decays and turns). */
  voltageOutside(t: number, a: number, b: number): number {
    let v = 0;
    const ed = this.edges;
    for (let j = 0; j < this.poles.length; j++) {
      const p = this.poles[j];
      const ref = t >= b ? b : a;
      const o = 4 * j + (t >= b ? 2 : 0);
      const e = Math.exp(p.sr * (t - ref)), c = Math.cos(p.si * (t - ref)), s = Math.sin(p.si * (t - ref));
      const Sr = e * (c * ed[o] - s * ed[o + 1]), Si = e * (c * ed[o + 1] + s * ed[o]);
      v -= p.cr * Sr - p.ci * Si;
    }
    return v;
  }

  /** Forget the memory (the next non-steady pass restarts from the steady state). */
  reset(): void {
    this.state.fill(0);
    this.started = false;
  }
}
