// Parameter blocks and the interface shared by the turn kernels (core/kernels/js.ts, core/kernels/wasm.ts).
// Units: dt in s (dt > 0 = late), dE in eV, phases in rad, angular frequencies in rad/s (PHYSICS.md §0, §4).
// The blocks are plain mutable objects: the caller makes them once and overwrites their fields every turn,
// so a kernel call allocates nothing.
import type { InducedParams } from './induced.ts';

/** Most RF systems one kick can apply. */
export const MAX_RF = 4;

/** Columns of particle coordinates; with the wasm kernel they are views into its memory. */
export interface Columns {
  dt: Float64Array;
  dE: Float64Array;
}

/**
 * RF kick at one gap: dE += Σ_{k<count} A_k·sin(φ_k + w_k·dt) − dEsync.
 * dEsync is used as given. To keep the synchronous particle exactly at dt = dE = 0, pass
 * kernel.syncGain(kick) (Σ A_k·sin φ_k evaluated by the kernel's own sine, in the kernel's order).
 */
export interface KickParams {
  /** Number of RF systems in use, 1..MAX_RF. */
  count: number;
  /** A_k = Z·V_k [eV]. */
  readonly amplitude: Float64Array;
  /** w_k = h_k·ω0 [rad/s]. */
  readonly omega: Float64Array;
  /** φ_k [rad], the phase the synchronous particle sees. */
  readonly phase: Float64Array;
  /** Energy subtracted once per pass [eV]. */
  dEsync: number;
}

/**
 * Drift over an arc. linear: dt += slip·dE with slip = frac·T0·η0/(β_s²E_s) [s/eV].
 * exact: dt += period·g(dE), period = frac·T0 [s], g = T(E_s+dE)/T_s − 1 of PHYSICS.md §3 (as
 * core/kinematics.ts relativeTimeOfFlight), defined for dE > −(E_s − m).
 */
export interface DriftParams {
  kind: 'linear' | 'exact';
  slip: number;
  period: number;
  /** Reference total energy E_s [eV]. */
  Es: number;
  /** β_s². */
  beta2: number;
  /** γ_s². */
  gamma2: number;
  alpha0: number;
  alpha1: number;
  alpha2: number;
}

/** Acceptance: a particle is inside when |dt| ≤ dtMax and dEmin ≤ dE ≤ dEmax (dEmin defaults to −dEmax). */
export interface Limits {
  dtMax: number;
  dEmax: number;
  dEmin?: number;
}

/** The one-turn map kernels; both implementations give the same interface. */
export interface TurnKernel {
  readonly impl: 'wasm' | 'js';
  /** Columns of n particles (zeroed). wasm: views into its memory, valid until the next allocColumns (see wasm.ts). */
  allocColumns(n: number): Columns;
  /** Return columns from allocColumns to the kernel (no-op for js). */
  freeColumns(cols: Columns): void;
  /** Fused kick + drift over [0, n); returns how many particles are now outside `limits` (NaN counts as outside). */
  kickDrift(cols: Columns, n: number, kick: KickParams, drift: DriftParams, limits: Limits): number;
  /** Tables of an induced-voltage stage for nb bins (zeroed; wasm: views into its memory, re-pointed on a grow). */
  allocInduced(nb: number): InducedParams;
  /** Return tables from allocInduced to the kernel (no-op for js). */
  freeInduced(p: InducedParams): void;
  /** As kickDrift with the induced-voltage stage between kick and drift and the deposit after it (see InducedParams). */
  kickDriftInduced(cols: Columns, n: number, kick: KickParams, induced: InducedParams, drift: DriftParams, limits: Limits): number;
  /** Kick only, over [0, n). */
  kick(cols: Columns, n: number, kick: KickParams): void;
  /** Drift only, over [0, n); returns how many particles are now outside `limits`. */
  drift(cols: Columns, n: number, drift: DriftParams, limits: Limits): number;
  /** Σ_k A_k·sin φ_k as this kernel computes it (its sine, its summation order): the dEsync that fixes dt = dE = 0. */
  syncGain(kick: KickParams): number;
}

/** A zeroed kick block with room for MAX_RF systems (count = 1). */
export function makeKickParams(): KickParams {
  return { count: 1, amplitude: new Float64Array(MAX_RF), omega: new Float64Array(MAX_RF), phase: new Float64Array(MAX_RF), dEsync: 0 };
}

/** A drift block (linear, zero slip); fill the fields of the kind you use. */
export function makeDriftParams(kind: 'linear' | 'exact' = 'linear'): DriftParams {
  return { kind, slip: 0, period: 0, Es: 0, beta2: 0, gamma2: 0, alpha0: 0, alpha1: 0, alpha2: 0 };
}

/** Throws at the call with the bad value if a kick block cannot be used. */
export function checkKick(kick: KickParams): void {
  const c = kick.count;
  if (!(Number.isInteger(c) && c >= 1 && c <= MAX_RF)) throw new Error(`kick.count must be an integer in [1, ${MAX_RF}], got ${c}`);
  if (kick.amplitude.length < c || kick.omega.length < c || kick.phase.length < c)
    throw new Error(`kick arrays must hold count = ${c} entries`);
}

/** Throws if the columns cannot hold n particles. */
export function checkColumns(cols: Columns, n: number): void {
  if (!(Number.isInteger(n) && n >= 0 && n <= cols.dt.length && n <= cols.dE.length))
    throw new Error(`particle count must be an integer in [0, ${Math.min(cols.dt.length, cols.dE.length)}], got ${n} (detached view after a memory grow?)`);
}

/**
 * Moves the particles of [0, n) that are outside `limits` behind the alive block (swap with the last alive one,
 * as core/bunch.ts loseParticle) and returns the new alive count. Call it only when a kernel returned a nonzero count.
 */
export function compactLost(cols: Columns, n: number, limits: Limits): number {
  const dt = cols.dt, dE = cols.dE;
  const dtMax = limits.dtMax, dEmax = limits.dEmax, dEmin = limits.dEmin ?? -limits.dEmax;
  for (let i = 0; i < n; i++) {
    const t = dt[i], e = dE[i];
    if (t <= dtMax && t >= -dtMax && e <= dEmax && e >= dEmin) continue;
    n--;
    dt[i] = dt[n]; dE[i] = dE[n];
    dt[n] = t; dE[n] = e;
    i--; // re-visit the particle swapped in
  }
  return n;
}
