// Line density on a fixed grid of bins and interpolation back to the particles. Units: dt in s, charge in C.
// Grid: bin i has centre e0 + (i + ½)·Δ, i = 0..nb−1, and the window is [e0, e0 + nb·Δ).
// Deposit is linear (cloud-in-cell): a particle between centres i and i+1 gives (1 − f) to i and f to i+1,
// so the binned density moves smoothly with the particles (no jitter of a whole bin); in the outer half bins the
// whole weight goes to the edge bin, so the charge of every particle inside the window is kept. The kick uses
// the same weights (interpolation is the transpose of the deposit: no self-force from the grid).

/** A uniform grid of bins. */
export interface BinGrid {
  /** Left edge of the window [s]. */
  e0: number;
  /** Bin width [s]. */
  delta: number;
  /** Number of bins. */
  nb: number;
}

/** Bin centres [s] of a grid. */
export function binCentres(g: BinGrid): Float64Array {
  const c = new Float64Array(g.nb);
  for (let i = 0; i < g.nb; i++) c[i] = g.e0 + (i + 0.5) * g.delta;
  return c;
}

/** Deposit weight w per particle of dt[0..n) into out (cleared first); returns how many fell outside the window. */
export function depositLinear(dt: Float64Array, n: number, g: BinGrid, w: number, out: Float64Array): number {
  const nb = g.nb;
  const inv = 1 / g.delta;
  const x0 = g.e0 * inv + 0.5; // x = dt/Δ − x0 is the position in units of bins from centre 0
  const last = nb - 1;
  out.fill(0);
  let outside = 0;
  for (let i = 0; i < n; i++) {
    const x = dt[i] * inv - x0;
    if (!(x >= -0.5 && x < last + 0.5)) {
      outside++;
      continue;
    }
    if (x <= 0) out[0] += w;
    else if (x >= last) out[last] += w;
    else {
      const k = Math.floor(x);
      const f = x - k;
      out[k] += w * (1 - f);
      out[k + 1] += w * f;
    }
  }
  return outside;
}

/** Kick dE[i] += v(dt[i]) with v linear between the bin centres (constant in the outer half bins, 0 outside); returns Σ kicks [eV]. */
export function kickLinear(dt: Float64Array, dE: Float64Array, n: number, g: BinGrid, v: Float64Array): number {
  const nb = g.nb;
  const inv = 1 / g.delta;
  const x0 = g.e0 * inv + 0.5;
  const last = nb - 1;
  const vFirst = v[0], vLast = v[last];
  let sum = 0;
  for (let i = 0; i < n; i++) {
    const x = dt[i] * inv - x0;
    let k: number;
    if (!(x >= -0.5 && x < last + 0.5)) continue;
    if (x <= 0) k = vFirst;
    else if (x >= last) k = vLast;
    else {
      const j = Math.floor(x);
      const f = x - j;
      k = v[j] + f * (v[j + 1] - v[j]);
    }
    dE[i] += k;
    sum += k;
  }
  return sum;
}
