// Tanh-sinh (double-exponential) quadrature for integrands with square-root behaviour at both ends.
// Units: whatever the caller integrates. Nodes are handed to the integrand as a distance d from the nearer end,
// computed without cancellation, so that a caller can evaluate e.g. H − U(end ± d) accurately near a turning
// point, where H − U(φ) written directly would lose all digits.
// Method: x = tanh((π/2)·sinh t), weights (π/2)·cosh t / cosh²((π/2)·sinh t), step halved until two levels agree
// (H. Takahasi and M. Mori, Publ. RIMS Kyoto Univ. 9 (1974) 721; common practice).

// Finest step 2^-LEVELS and half-range T_MAX: at t = 4, 1 − x ≈ 1e-37, far below any useful contribution.
const LEVELS = 7;
const T_MAX = 4;
const J = T_MAX << LEVELS;
const OFF = new Float64Array(J + 1); // 1 − tanh(u_j), from exp to avoid cancellation
const WT = new Float64Array(J + 1);
for (let j = 0; j <= J; j++) {
  const t = j / (1 << LEVELS);
  const u = (Math.PI / 2) * Math.sinh(t);
  const c = Math.cosh(u);
  OFF[j] = 2 / (Math.exp(2 * u) + 1);
  WT[j] = ((Math.PI / 2) * Math.cosh(t)) / (c * c);
}

// Stop when two successive levels agree to this relative tolerance; the error of the finer one is far smaller.
const REL_TOL = 1e-11;

/** Integrand as a function of the distance d ≥ 0 from the left end (fromRight false) or the right end. */
export type EndIntegrand = (d: number, fromRight: boolean) => number;

/** ∫_a^b f over a < b, with f given in end-distance form. Non-finite or negative-argument nodes count as 0. */
export function tanhSinh(f: EndIntegrand, a: number, b: number): number {
  const r = 0.5 * (b - a);
  if (!(r > 0)) return 0;
  const val = (d: number, right: boolean): number => {
    const v = f(d, right);
    return Number.isFinite(v) ? v : 0;
  };
  // Level 0: step 1, nodes j = 0, 2^LEVELS, 2·2^LEVELS, ...
  let stride = 1 << LEVELS;
  let sum = WT[0] * val(r, false);
  for (let j = stride; j <= J; j += stride) sum += WT[j] * (val(r * OFF[j], false) + val(r * OFF[j], true));
  let prev = r * sum;
  for (let level = 1; level <= LEVELS; level++) {
    const half = stride >> 1;
    for (let j = half; j <= J; j += stride) sum += WT[j] * (val(r * OFF[j], false) + val(r * OFF[j], true));
    stride = half;
    const I = (r * sum * stride) / (1 << LEVELS);
    if (level >= 3 && Math.abs(I - prev) <= REL_TOL * Math.abs(I)) return I;
    prev = I;
  }
  return prev;
}
