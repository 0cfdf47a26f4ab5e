// The induced-voltage stage of the turn kernels: its tables and what the caller does with them.
// Units: dt in s, kick in eV, charge in C (PHYSICS.md §12). Grid as core/collective/lineDensity.ts: bin i has
// centre e0 + (i + ½)Δ, window [e0, e0 + nb·Δ); V_ind is linear between the centres and constant in the outer
// half bins; outside the window, no kick and no charge.
// Here the window is cut in half cells: y = dt·inv − y0 with inv = 2/Δ, y0 = 2e0/Δ − 1, so half cell m = 0..2nb−1
// of the window is table row j = ⌊y⌋ = m + 1, and rows 0 and 2nb + 1 stand for everything outside. On a half cell
// the voltage is one linear piece, so the kick is  a_j + f·d_j  (f = y − ⌊y⌋) with rows 0 and 2nb + 1 zero: no
// test of the window per particle. The deposit (after the drift) adds (1, f) to row j; rows 0 and 2nb + 1 collect
// the particles outside and are never read. foldInduced turns the rows into charge per bin with the weights of
// linear interpolation between centres (the same weights as the kick, so the kick has no self-force from the grid).
// The kernels clamp y to [0, 2nb + 1] (NaN to 0) before ⌊·⌋, so no value of dt reaches outside the tables.
// Per particle of a pass: RF kick, this kick, drift, deposit. The RF kick leaves dt alone, so the deposit of pass
// n is the line density the kick of pass n+1 needs: one pass over memory per turn.

/** Tables of an induced stage (made by a kernel's allocInduced: in wasm memory for the wasm kernel). */
export interface InducedParams {
  /** 2/Δ [1/s]. */
  inv: number;
  /** 2e0/Δ − 1. */
  y0: number;
  nb: number;
  /** Kick rows (a_j, d_j) [eV], j = 0..2nb+1. Length 2(2nb + 2). */
  readonly volts: Float64Array;
  /** Deposit rows (count, Σf), j = 0..2nb+1 (the kernel adds: zero them before the pass). Length 2(2nb + 2). */
  readonly cells: Float64Array;
}

/** Table length (f64 entries) of either table for nb bins. */
export const inducedTableLength = (nb: number): number => 4 * nb + 4;

/** Zeroed tables for nb bins, in ordinary arrays. */
export function makeInducedParams(nb: number): InducedParams {
  return { inv: 0, y0: 0, nb, volts: new Float64Array(inducedTableLength(nb)), cells: new Float64Array(inducedTableLength(nb)) };
}

/** Throws if the stage cannot be used. */
export function checkInduced(p: InducedParams): void {
  const len = inducedTableLength(p.nb);
  if (!(Number.isInteger(p.nb) && p.nb >= 1 && p.volts.length >= len && p.cells.length >= len))
    throw new Error(`induced stage: nb must be an integer ≥ 1 with tables of 4·nb + 4 entries, got nb = ${p.nb}`);
  if (!(Number.isFinite(p.inv) && Number.isFinite(p.y0))) throw new Error(`induced stage: grid inv = ${p.inv}, y0 = ${p.y0} must be finite`);
}

/** ⌊clamp(y, 0, 2nb + 1)⌋ with the kernels' operations (wasm pmax(0, y) then pmin: NaN gives row 0). */
export function inducedFloor(y: number, nb: number): number {
  const top = 2 * nb + 1, m = 0 < y ? y : 0;
  return Math.floor(top < m ? top : m);
}

/** The grid (window from e0, bins of width delta) and the kick rows from V at the nb centres times scale; zeroes the deposit rows. */
export function setInducedStage(p: InducedParams, e0: number, delta: number, v: Float64Array, scale: number): void {
  const nb = p.nb, t = p.volts;
  p.inv = 2 / delta;
  p.y0 = (2 * e0) / delta - 1;
  t[0] = 0; t[1] = 0;
  t[2] = scale * v[0]; t[3] = 0; // row 1: outer half bin
  for (let i = 0; i + 1 < nb; i++) {
    const a = scale * v[i], b = scale * v[i + 1], d = 0.5 * (b - a);
    t[4 * i + 4] = a; t[4 * i + 5] = d; // row 2i + 2: from centre i to the edge between the bins
    t[4 * i + 6] = 0.5 * (a + b); t[4 * i + 7] = d; // row 2i + 3: from that edge to centre i + 1
  }
  t[4 * nb] = scale * v[nb - 1]; t[4 * nb + 1] = 0; // row 2nb: outer half bin
  t[4 * nb + 2] = 0; t[4 * nb + 3] = 0;
  p.cells.fill(0);
}

/** Charge per bin (w per particle) from the deposit rows into out[0..nb); returns the number of particles in the window. */
export function foldInduced(p: InducedParams, w: number, out: Float64Array): number {
  const nb = p.nb, c = p.cells;
  out.fill(0, 0, nb);
  out[0] += w * c[2];
  out[nb - 1] += w * c[4 * nb];
  let count = c[2] + c[4 * nb];
  for (let i = 0; i + 1 < nb; i++) {
    const n1 = c[4 * i + 4], s1 = c[4 * i + 5]; // row 2i + 2: offset from centre i is f/2 bins
    const n2 = c[4 * i + 6], s2 = c[4 * i + 7]; // row 2i + 3: offset is (1 + f)/2 bins
    out[i] += w * (n1 - 0.5 * s1 + 0.5 * (n2 - s2));
    out[i + 1] += w * (0.5 * s1 + 0.5 * (n2 + s2));
    count += n1 + n2;
  }
  return count;
}

/** Take the deposits of dt[from..to) (deposited by a pass, then set aside as lost) out of the rows again. */
export function depositLost(dt: Float64Array, from: number, to: number, p: InducedParams): void {
  const inv = p.inv, y0 = p.y0, nb = p.nb, c = p.cells;
  for (let i = from; i < to; i++) {
    const y = dt[i] * inv - y0;
    const j = inducedFloor(y, nb);
    c[2 * j] -= 1;
    c[2 * j + 1] -= y - j;
  }
}
