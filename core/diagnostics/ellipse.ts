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
  for (let i = 0; i < n; i++) {
    const x = dt[i] - mt, y = dE[i] - me;
    J[i] = a * x * x + 2 * c * x * y + d * y * y;
  }
  const eps = Math.sqrt(det);
  // Ascending ranks: after selecting rank k, J[k..n) holds the larger values, so the next rank searches only there.
  const ranks = qs.map((q) => Math.min(n - 1, Math.max(0, Math.ceil(q * n) - 1)));
  const order = ranks.map((_, i) => i).sort((x, y) => ranks[x] - ranks[y]);
  const out = new Array<number>(qs.length);
  let from = 0;
  for (const i of order) {
    const k = ranks[i];
    out[i] = Math.PI * selectKth(from === 0 ? J : J.subarray(from), n - from, k - from) * eps;
    from = k;
  }
  return out;
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
