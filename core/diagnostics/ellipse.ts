// Emittance of the rms-shaped ellipse that holds a given fraction of the particles.
// Units: dt in s, dE in eV, areas in eV·s (true areas: the factor π is included).
// Definition: with the sample covariance Σ of (dt, dE) of the alive particles, each particle has the
// Mahalanobis invariant J = xᵀΣ⁻¹x (x = offset from the centroid). J_q is the order statistic at rank
// ceil(q·n) (the smallest J such that at least q·n particles have J ≤ J_q). The ellipse {J ≤ J_q} has area
// π·J_q·sqrt(det Σ) = π·J_q·ε_rms. For a 2-D Gaussian J is χ² with 2 degrees of freedom, J_q = −2 ln(1 − q),
// giving the area −2 ln(1 − q)·π·σt·σE of PHYSICS.md §9.
// Selection: exact order statistics either way. Large bunches first try brackets from a sample (bracketed: one
// pass, ~5 % of the values kept); otherwise, or if a rank is not where the sample said, every J is stored and
// counted on bins (the exact path: rankValues).
import type { Bunch } from '../bunch.ts';
import { fwhmCounts } from './partial.ts';

let scratch = new Float64Array(0); // reused J buffer, grown on demand (no allocation per call once sized)

/** Moments needed by the ellipse: centroid, variances and covariance. */
export interface SecondMoments {
  meanDt: number; meanDE: number; varDt: number; varDE: number; cov: number;
}

/** dt bins to count in the same pass (the FWHM profile of partial.ts fwhmCounts, same bins). */
export interface ProfileCounts {
  tMin: number;
  tMax: number;
  out: Float64Array;
}

/**
 * Areas [eV·s] of the rms-shaped ellipses holding fractions qs of the alive particles (NaN if degenerate). With
 * `profile`, the same pass over the particles also counts fwhmCounts(b, tMin, tMax, out).
 */
export function fractionEmittances(b: Bunch, mom: SecondMoments, qs: readonly number[], profile?: ProfileCounts): number[] {
  const n = b.n;
  const det = mom.varDt * mom.varDE - mom.cov * mom.cov;
  if (n === 0 || !(det > 0)) {
    if (profile) fwhmCounts(b, profile.tMin, profile.tMax, profile.out);
    return qs.map(() => NaN);
  }
  const a = mom.varDE / det, c = -mom.cov / det, d = mom.varDt / det;
  const mt = mom.meanDt, me = mom.meanDE, dt = b.dt, dE = b.dE;
  const eps = Math.sqrt(det);
  const ranks = qs.map((q) => Math.min(n - 1, Math.max(0, Math.ceil(q * n) - 1)));
  const out = profile?.out ?? NO_BINS;
  out.fill(0);
  const prof = out.length >= 3 && profile!.tMax > profile!.tMin;
  const w = prof ? (profile!.tMax - profile!.tMin) / (out.length - 2) : 1, lo = prof ? profile!.tMin - w : 0;
  const fast = n >= 4 * SAMPLE ? bracketed(dt, dE, n, mt, me, a, c, d, ranks, prof ? out : NO_BINS, lo, 1 / w) : null;
  path = fast ? 'bracketed' : 'exact';
  if (fast) return fast.map((j) => Math.PI * j * eps);
  // Exact path: every J stored and counted; the rank bins gathered. Counting bins on [0, cap), then one overflow
  // bin. The mean of J over the particles is exactly 2 (the trace of Σ⁻¹Σ), so fewer than a fraction 2/x of them
  // have J ≥ x (Markov): the rank of q lies below 2/(1 − q), and cap = 2.5/(1 − q) keeps it in the counting bins
  // (any other bin would still give the exact value).
  if (scratch.length < n) scratch = new Float64Array(n);
  const J = scratch;
  const qMax = Math.max(...qs);
  const scale = BINS / (qMax < 0.999 ? 2.5 / (1 - qMax) : 2500);
  if (counts.length !== BINS + 1) counts = new Uint32Array(BINS + 1);
  const cnt = counts;
  cnt.fill(0);
  invariants(dt, dE, n, mt, me, a, c, d, J, cnt, scale);
  if (profile) fwhmCounts(b, profile.tMin, profile.tMax, profile.out); // its own pass: this path is the rare one
  return rankValues(J, n, scale, ranks).map((j) => Math.PI * j * eps);
}

let path: 'bracketed' | 'exact' = 'exact';
/** Which selection the last fractionEmittances call used (for tests of both paths). */
export const lastSelectionPath = (): 'bracketed' | 'exact' => path;

const NO_BINS = new Float64Array(0);
// Fast path: J of SAMPLE particles taken evenly over the bunch (in the beam's own, generation-random order) brackets
// each rank between sample quantiles at q ± (6 standard errors + 2/SAMPLE); one pass counts the particles below the
// brackets and gathers those inside (about 5 % of them), and the selection runs there. A rank outside its bracket
// (a sample that does not represent the bunch) or a bracket fuller than expected falls back to the exact path.
const SAMPLE = 4096;
const sampleJ = new Float64Array(SAMPLE);
const passOut = new Float64Array(5); // below first, inside first, between, inside second, overflow (0/1)
let gather1 = new Float64Array(0), gather2 = new Float64Array(0);

function bracketed(dt: Float64Array, dE: Float64Array, n: number, mt: number, me: number, a: number, c: number, d: number, ranks: number[], out: Float64Array, lo: number, inv: number): number[] | null {
  const m = SAMPLE, sJ = sampleJ;
  for (let j = 0; j < m; j++) {
    const i = Math.floor((j * n) / m), x = dt[i] - mt, y = dE[i] - me;
    sJ[j] = a * x * x + 2 * c * x * y + d * y * y;
  }
  sJ.sort();
  // brackets [lo, hi) of the distinct ranks in increasing order, overlapping ones merged; at most two
  const br: [number, number, number][] = []; // lo, hi, sample points inside
  for (const k of [...new Set(ranks)].sort((x, y) => x - y)) {
    const p = (k + 0.5) / n, wd = 6 * Math.sqrt((p * (1 - p)) / m) + 2 / m;
    const i0 = Math.floor((p - wd) * m), i1 = Math.ceil((p + wd) * m);
    const b0 = i0 < 0 ? -Infinity : sJ[i0], b1 = i1 >= m ? Infinity : sJ[i1];
    const last = br[br.length - 1];
    if (last && b0 <= last[1]) { last[1] = Math.max(last[1], b1); last[2] = Math.min(m, i1) - Math.max(0, i0) + last[2]; }
    else br.push([b0, b1, Math.min(m, i1) - Math.max(0, i0)]);
  }
  if (br.length > 2) return null;
  const cap = (k: number) => (k < br.length ? Math.ceil((2 * br[k][2] * n) / m) + 4096 : 0);
  if (gather1.length < cap(0)) gather1 = new Float64Array(cap(0));
  if (gather2.length < cap(1)) gather2 = new Float64Array(cap(1));
  const two = br.length === 2;
  bracketPass(dt, dE, n, mt, me, a, c, d, br[0][0], br[0][1], two ? br[1][0] : Infinity, two ? br[1][1] : Infinity,
    gather1, cap(0), gather2, cap(1), out, lo, inv, passOut);
  if (passOut[4] !== 0) return null;
  const below = [passOut[0], passOut[0] + passOut[1] + passOut[2]], inside = [passOut[1], passOut[3]], g = [gather1, gather2];
  const values: number[] = [];
  for (const k of ranks) {
    const j = k >= below[0] && k < below[0] + inside[0] ? 0 : two && k >= below[1] && k < below[1] + inside[1] ? 1 : -1;
    if (j < 0) return null;
    values.push(selectKth(g[j], inside[j], k - below[j]));
  }
  return values;
}

// The fast path's pass: J of every particle against the brackets [lo1, hi1), [lo2, hi2) (lo2 ≥ hi1), gathering
// the values inside (up to cap1, cap2), and, when `out` has bins, dt counted as fwhmCounts does. Results in res.
function bracketPass(dt: Float64Array, dE: Float64Array, n: number, mt: number, me: number, a: number, c: number, d: number,
  lo1: number, hi1: number, lo2: number, hi2: number, g1: Float64Array, cap1: number, g2: Float64Array, cap2: number,
  out: Float64Array, lo: number, inv: number, res: Float64Array): void {
  let below = 0, between = 0, o1 = 0, o2 = 0, over = 0;
  const prof = out.length >= 3, last = out.length - 2; // tMax lands in the last full bin
  for (let i = 0; i < n; i++) {
    const t = dt[i], x = t - mt, y = dE[i] - me;
    const v = a * x * x + 2 * c * x * y + d * y * y;
    if (prof) out[Math.min(last, Math.floor((t - lo) * inv))] += 1;
    if (v < lo1) below++;
    else if (v < hi1) { if (o1 < cap1) g1[o1] = v; o1++; }
    else if (v < lo2) between++;
    else if (v < hi2) { if (o2 < cap2) g2[o2] = v; o2++; }
  }
  if (o1 > cap1 || o2 > cap2) over = 1;
  res[0] = below; res[1] = o1; res[2] = between; res[3] = o2; res[4] = over;
}

// J = a·x² + 2c·x·y + d·y² of every particle into J[], counted in cnt (bin ⌊J·scale⌋, BINS beyond; J ≤ 0 and NaN
// in bin 0). Hot loops take everything as arguments (PERF.md).
function invariants(dt: Float64Array, dE: Float64Array, n: number, mt: number, me: number, a: number, c: number, d: number, J: Float64Array, cnt: Uint32Array, scale: number): void {
  for (let i = 0; i < n; i++) {
    const x = dt[i] - mt, y = dE[i] - me;
    const v = a * x * x + 2 * c * x * y + d * y * y;
    J[i] = v;
    cnt[v > 0 ? Math.min(BINS, Math.floor(v * scale)) : 0]++;
  }
}

// Counting bins of the selection (plus one overflow bin): the bin holding a rank has ~n/BINS values or fewer.
const BINS = 4096;
let counts = new Uint32Array(BINS + 1);
let gathered = new Float64Array(0);

// Exact values at ranks (0-based) of J[0..n), counted in `counts` with bin ⌊J·scale⌋ (BINS for the rest), without
// reordering J: one pass gathers the rank bins' values (the same bin formula, so membership is exact), and the
// selection runs among them only. J ≤ 0 (rounding near the centroid) and NaN count in bin 0.
function rankValues(J: Float64Array, n: number, scale: number, ranks: number[]): number[] {
  // Bin of each rank, the count below it, and where its values go in the gather buffer.
  const bins = ranks.map((k) => { let b = 0, below = 0; while (b < BINS && below + counts[b] <= k) below += counts[b++]; return { b, below }; });
  const distinct = [...new Set(bins.map((x) => x.b))];
  const start = new Map<number, number>();
  let size = 0;
  for (const b of distinct) { start.set(b, size); size += counts[b]; }
  if (gathered.length < size) gathered = new Float64Array(size);
  const b0 = distinct[0], b1 = distinct.length > 1 ? distinct[1] : -1;
  let o0 = start.get(b0)!, o1 = b1 >= 0 ? start.get(b1)! : 0;
  const rest = distinct.slice(2), ro = rest.map((b) => start.get(b)!);
  const g = gathered;
  for (let i = 0; i < n; i++) {
    const v = J[i];
    const bi = v > 0 ? Math.min(BINS, Math.floor(v * scale)) : 0; // binOf, written out for the hot loop
    if (bi === b0) g[o0++] = v;
    else if (bi === b1) g[o1++] = v;
    else if (rest.length) { const r = rest.indexOf(bi); if (r >= 0) g[ro[r]++] = v; }
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
