// Emittance of the rms-shaped ellipse that holds a given fraction of the particles.
// Units: dt in s, dE in eV, areas in eV·s (true areas: the factor π is included).
// Definition: with the sample covariance Σ of (dt, dE) of the alive particles, each particle has the
// Mahalanobis invariant J = xᵀΣ⁻¹x (x = offset from the centroid). J_q is the order statistic at rank
// ceil(q·n) (the smallest J such that at least q·n particles have J ≤ J_q). The ellipse {J ≤ J_q} has area
// π·J_q·sqrt(det Σ) = π·J_q·ε_rms. For a 2-D Gaussian J is χ² with 2 degrees of freedom, J_q = −2 ln(1 − q),
// giving the area −2 ln(1 − q)·π·σt·σE of PHYSICS.md §9.
import type { Bunch } from '../bunch.ts';

let scratch = new Float64Array(0); // reused J buffer, grown on demand (no allocation per call once sized)

/** Moments needed by the ellipse: centroid, variances and covariance. */
export interface SecondMoments {
  meanDt: number; meanDE: number; varDt: number; varDE: number; cov: number;
}

/** Areas [eV·s] of the rms-shaped ellipses holding fractions qs of the alive particles (NaN if degenerate). */
export function fractionEmittances(b: Bunch, mom: SecondMoments, qs: readonly number[]): number[] {
  const n = b.n;
  const det = mom.varDt * mom.varDE - mom.cov * mom.cov;
  if (n === 0 || !(det > 0)) return qs.map(() => NaN);
  if (scratch.length < n) scratch = new Float64Array(n);
  const J = scratch;
  const a = mom.varDE / det, c = -mom.cov / det, d = mom.varDt / det;
  const mt = mom.meanDt, me = mom.meanDE, dt = b.dt, dE = b.dE;
  let jMax = 0;
  for (let i = 0; i < n; i++) {
    const x = dt[i] - mt, y = dE[i] - me;
    const v = a * x * x + 2 * c * x * y + d * y * y;
    J[i] = v;
    if (v > jMax) jMax = v;
  }
  const eps = Math.sqrt(det);
  const ranks = qs.map((q) => Math.min(n - 1, Math.max(0, Math.ceil(q * n) - 1)));
  return rankValues(J, n, jMax, ranks).map((j) => Math.PI * j * eps);
}

// Bins of the counting pass of rankValues: the bin holding a rank then has ~n/BINS values or fewer.
const BINS = 4096;
let counts = new Uint32Array(BINS);
let gathered = new Float64Array(0);

// Exact values at ranks (0-based) of J[0..n) (all in [0, jMax]) without reordering J: one counting pass finds the
// bin of each rank, one pass gathers those bins' values (the same bin formula, so membership is exact), and the
// selection runs among them only.
function rankValues(J: Float64Array, n: number, jMax: number, ranks: number[]): number[] {
  if (!(jMax > 0) || !Number.isFinite(jMax)) return ranks.map((k) => selectKth(J, n, k));
  const scale = BINS / jMax;
  if (counts.length !== BINS) counts = new Uint32Array(BINS);
  counts.fill(0);
  for (let i = 0; i < n; i++) counts[Math.min(BINS - 1, Math.floor(J[i] * scale))]++;
  // Bin of each rank, the count below it, and where its values go in the gather buffer.
  const bins = ranks.map((k) => { let b = 0, below = 0; while (below + counts[b] <= k) below += counts[b++]; return { b, below }; });
  const distinct = [...new Set(bins.map((x) => x.b))];
  const start = new Map<number, number>();
  let size = 0;
  for (const b of distinct) { start.set(b, size); size += counts[b]; }
  if (gathered.length < size) gathered = new Float64Array(size);
  const b0 = distinct[0], b1 = distinct.length > 1 ? distinct[1] : -1;
  let o0 = start.get(b0)!, o1 = b1 >= 0 ? start.get(b1)! : 0;
  const rest = distinct.slice(2), ro = rest.map((b) => start.get(b)!);
  for (let i = 0; i < n; i++) {
    const v = J[i];
    const bi = Math.min(BINS - 1, Math.floor(v * scale));
    if (bi === b0) gathered[o0++] = v;
    else if (bi === b1) gathered[o1++] = v;
    else if (rest.length) { const r = rest.indexOf(bi); if (r >= 0) gathered[ro[r]++] = v; }
  }
  // Select within each bin's slice (quickselect reorders only that slice; another rank in it is still exact).
  return bins.map(({ b, below }, i) => selectKth(gathered.subarray(start.get(b)!, start.get(b)! + counts[b]), counts[b], ranks[i] - below));
}

/** k-th smallest (0-based) of a[0..n), reordering a in place (Hoare quickselect, median-of-three pivot). */
export function selectKth(a: Float64Array, n: number, k: number): number {
  let lo = 0, hi = n - 1;
  while (hi > lo) {
    const mid = (lo + hi) >>> 1;
    // median of three as pivot value
    const x = a[lo], y = a[mid], z = a[hi];
    const pivot = x < y ? (y < z ? y : x < z ? z : x) : x < z ? x : y < z ? z : y;
    let i = lo, j = hi;
    while (i <= j) {
      while (a[i] < pivot) i++;
      while (a[j] > pivot) j--;
      if (i <= j) {
        const t = a[i]; a[i] = a[j]; a[j] = t;
        i++; j--;
      }
    }
    if (k <= j) hi = j;
    else if (k >= i) lo = i;
    else return a[k];
  }
  return a[k];
}
