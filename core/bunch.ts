// Macroparticle storage as columns. Units: dt in s (dt > 0 = late), dE in eV (E − E_s).
// Alive particles occupy indices [0, n); a lost particle is swapped to the end, so loops run over [0, n)
// with no branch, and the lost keep the coordinates they had when they were lost.

export interface Bunch {
  /** Columns; a Tracker may move them into its kernel's memory, so keep the Bunch, not the arrays. */
  dt: Float64Array;
  dE: Float64Array;
  /** Number of alive particles (they are the first n). */
  n: number;
  /** Number of particles generated (alive + lost). */
  readonly total: number;
}

/** Allocate a bunch of `count` particles, all alive at the origin. */
export function makeBunch(count: number): Bunch {
  return { dt: new Float64Array(count), dE: new Float64Array(count), n: count, total: count };
}

/** Wrap existing columns (e.g. transferred from a worker). */
export function bunchFrom(dt: Float64Array, dE: Float64Array, n = dt.length): Bunch {
  if (dt.length !== dE.length) throw new Error(`bunch columns differ in length: dt ${dt.length}, dE ${dE.length}`);
  return { dt, dE, n, total: dt.length };
}

/** Mark particle i lost: swap it behind the alive block. Callers iterating upward must re-visit index i. */
export function loseParticle(b: Bunch, i: number): void {
  const j = b.n - 1;
  const t = b.dt[i], e = b.dE[i];
  b.dt[i] = b.dt[j]; b.dE[i] = b.dE[j];
  b.dt[j] = t; b.dE[j] = e;
  b.n = j;
}

/** Number of lost particles. */
export function lostCount(b: Bunch): number {
  return b.total - b.n;
}
