// Parameter blocks and the interface shared by the turn kernels (core/kernels/js.ts, core/kernels/wasm.ts).
// Units: dt in s (dt > 0 = late), dE in eV, phases in rad, angular frequencies in rad/s (PHYSICS.md §0, §4).
// The blocks are plain mutable objects: the caller makes them once and overwrites their fields every turn,
// so a kernel call allocates nothing.

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

/**
 * Induced-voltage stage fused into a kick–drift pass (core/elements/inducedKick.ts fills it). Grid coordinate
 * x = dt·inv − x0 puts the centre of bin i at x = i + 1; the window is x ∈ [0.5, nb + 0.5) and cell k = ⌊x⌋ spans
 * the centres k and k+1 (cells 0 and nb are the outer half bins).
 *   kick, with dt before the drift:  dE += volts[k] + f·(volts[k+1] − volts[k]), f = x − k; 0 outside the window
 *   deposit, with dt after the drift, every particle inside the window (lost ones too: see depositLost):
 *                                    cells[2k] += 1, cells[2k+1] += f   (the caller folds them into bins)
 * The kick order per particle: RF kick, then this kick, then the drift, then the deposit. Since the RF kick leaves
 * dt alone, the deposit of pass n is the line density the kick of pass n+1 needs. The kernels run a chunk of
 * particles (in L1) through each step in turn: one pass over memory per turn.
 * The stage's total kick is Σ_bins (deposit weight)·volts, from the deposit of the kick's dt: the kernels skip it.
 */
export interface InducedParams {
  inv: number;
  x0: number;
  nb: number;
  /** Energy kick [eV] at the nb bin centres, at indices 1..nb; 0 and nb+1 repeat the edge values. Length nb + 2. */
  readonly volts: Float64Array;
  /** Out: [count, Σf] per cell k = 0..nb (the kernel adds to it: zero it before the pass); cell nb + 1 is scratch. Length 2(nb + 2). */
  readonly cells: Float64Array;
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

/** Throws if an induced stage cannot be used (its tables must hold nb + 2 and 2(nb + 2) entries). */
export function checkInduced(p: InducedParams): void {
  if (!(Number.isInteger(p.nb) && p.nb >= 1 && p.volts.length >= p.nb + 2 && p.cells.length >= 2 * (p.nb + 2)))
    throw new Error(`induced stage: nb must be an integer ≥ 1 with tables of nb + 2 and 2(nb + 2) entries, got nb = ${p.nb}`);
  if (!(Number.isFinite(p.inv) && Number.isFinite(p.x0))) throw new Error(`induced stage: grid inv = ${p.inv}, x0 = ${p.x0} must be finite`);
}

/** Zeroed tables of an induced stage for nb bins, in ordinary arrays. */
export function makeInducedParams(nb: number): InducedParams {
  return { inv: 0, x0: 0, nb, volts: new Float64Array(nb + 2), cells: new Float64Array(2 * (nb + 2)) };
}

/** Take the deposits of dt[from..to) (particles a pass deposited, then set aside as lost) out of the cells again. */
export function depositLost(dt: Float64Array, from: number, to: number, p: InducedParams): void {
  const inv = p.inv, x0 = p.x0, top = p.nb + 0.5, cells = p.cells;
  for (let i = from; i < to; i++) {
    const x = dt[i] * inv - x0;
    if (!(x >= 0.5 && x < top)) continue;
    const k = x | 0;
    cells[2 * k] -= 1;
    cells[2 * k + 1] -= x - k;
  }
}
