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

// Loops below work on arrays with one guard cell at each end (index j = bin + 1), so a particle in an outer half
// bin needs no branch: its share beyond the edge lands in the guard cell and is folded back (deposit) or reads
// the edge value (kick). x = dt/Δ − e0/Δ + ½ is ≥ ½ inside the window, so truncation (x | 0) is the floor.
let guard = new Float64Array(0);
let cells = new Float64Array(0);

/** Deposit weight w per particle of dt[0..n) into out (cleared first); returns how many fell outside the window. */
export function depositLinear(dt: Float64Array, n: number, g: BinGrid, w: number, out: Float64Array): number {
  const nb = g.nb;
  if (cells.length < 2 * (nb + 2)) cells = new Float64Array(2 * (nb + 2));
  const c = cells;
  c.fill(0, 0, 2 * (nb + 2));
  const inv = 1 / g.delta;
  const x0 = g.e0 * inv - 0.5; // x = dt/Δ − x0: centre of bin i at x = i + 1
  let outside = 0;
  // Per cell [k, k+1): the count and Σf. Linear weights follow afterwards, (count − Σf) to k and Σf to k+1;
  // one pair of adjacent stores per particle runs about twice as fast as two scattered weighted stores.
  for (let i = 0; i < n; i++) {
    const x = dt[i] * inv - x0;
    if (!(x >= 0.5 && x < nb + 0.5)) {
      outside++;
      continue;
    }
    const k = x | 0;
    const j = k + k;
    c[j] += 1;
    c[j + 1] += x - k;
  }
  foldCells(c, nb, w, out);
  return outside;
}

/**
 * Linear weights from per-cell sums (cells[2k] = count, cells[2k+1] = Σf for cell k = 0..nb between the centres
 * of bins k−1 and k): (count − Σf)·w to bin k−1 and Σf·w to bin k, the outer half cells to the edge bins.
 * out (nb entries) is overwritten; returns the count of deposited particles.
 */
function foldCells(cells: Float64Array, nb: number, w: number, out: Float64Array): number {
  out.fill(0);
  let count = 0;
  for (let k = 0; k <= nb; k++) {
    const cnt = cells[2 * k], sf = cells[2 * k + 1];
    const lo = k === 0 ? 0 : k - 1, hi = k === nb ? nb - 1 : k;
    out[lo] += w * (cnt - sf);
    out[hi] += w * sf;
    count += cnt;
  }
  return count;
}

/** Kick dE[i] += v(dt[i]) with v linear between the bin centres (constant in the outer half bins, 0 outside); returns Σ kicks [eV]. */
export function kickLinear(dt: Float64Array, dE: Float64Array, n: number, g: BinGrid, v: Float64Array): number {
  const nb = g.nb;
  if (guard.length < nb + 2) guard = new Float64Array(nb + 2);
  const v2 = guard;
  for (let i = 0; i < nb; i++) v2[i + 1] = v[i];
  v2[0] = v[0];
  v2[nb + 1] = v[nb - 1];
  const inv = 1 / g.delta;
  const x0 = g.e0 * inv - 0.5;
  let sum = 0;
  for (let i = 0; i < n; i++) {
    const x = dt[i] * inv - x0;
    if (!(x >= 0.5 && x < nb + 0.5)) continue;
    const k = x | 0;
    const a = v2[k];
    const kick = a + (x - k) * (v2[k + 1] - a);
    dE[i] += kick;
    sum += kick;
  }
  return sum;
}
