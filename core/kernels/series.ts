// The exact drift as a power series in dE, for the particles close to the synchronous energy.
// Units: dE in eV; the series gives T(E_s+dE)/T_s − 1 (dimensionless), the quantity of exactRelative (js.ts).
//
// Why: the closed form needs a square root and a division per particle, which share one slow unit of the CPU;
// a degree-10 Horner polynomial needs neither. The kernels use the series where |dE| ≤ reach and the closed
// form elsewhere (per particle in js.ts, per lane in the wasm kernels, so both give the same bits).
//
// How: the closed form's own expressions (js.ts header) are evaluated as truncated power series in ε = dE/E_s
// up to degree TERMS (Cauchy products, the square-root and quotient recurrences): the Taylor coefficients
// c_k of T/T_s − 1, exact up to rounding. The series converges for |ε| < ρ = 1 − 1/γ (ε = −ρ is the particle
// at rest, where the drift is singular). The reach is the largest |ε| ≤ ρ/4 at which the neglected terms
// Σ_{k=DEGREE+1..TERMS} |c_k|·|ε|^k stay below 2^−54 of the scale S·|ε|, S = (|α0| + 1/γ²)/β² (the size of
// the two first-order terms whose difference is η/β², so the truncation error is below the closed form's own
// rounding); beyond TERMS, |ε| ≤ ρ/4 makes the terms fall at least 4× per order.
// No allocation: scratch arrays are module-scoped (the kernels call update() every turn on a ramp).

import type { DriftParams } from './types.ts';

/** Degree of the polynomial the kernels evaluate (their Estrin scheme is written for 10). */
export const DEGREE = 10;
/** Degree to which the series is computed (to bound the neglected terms). */
const TERMS = 16;
const N = TERMS + 1;

const eps = new Float64Array(N), w = new Float64Array(N), u = new Float64Array(N), s = new Float64Array(N);
const d = new Float64Array(N), d2 = new Float64Array(N), b = new Float64Array(N), q = new Float64Array(N);
const t1 = new Float64Array(N), t2 = new Float64Array(N), num = new Float64Array(N), den = new Float64Array(N);
const rel = new Float64Array(N);

/** out = x·y, truncated at TERMS (out must not alias x or y). */
function mul(out: Float64Array, x: Float64Array, y: Float64Array): void {
  for (let k = 0; k < N; k++) {
    let acc = 0;
    for (let j = 0; j <= k; j++) acc += x[j] * y[k - j];
    out[k] = acc;
  }
}

/**
 * Coefficients of the exact drift T/T_s − 1 in ε = dE/E_s: fills c[0..TERMS] (c[0] = 0). From the drift block:
 * beta2 = β_s², gamma2 = γ_s², alpha0..2 the momentum compaction orders (an object: numbers passed as arguments
 * to a call the compiler does not inline are boxed, one allocation each).
 */
export function driftCoefficients(c: Float64Array, drift: Pick<DriftParams, 'beta2' | 'gamma2' | 'alpha0' | 'alpha1' | 'alpha2'>): void {
  const beta2 = drift.beta2, gamma2 = drift.gamma2, alpha0 = drift.alpha0, alpha1 = drift.alpha1, alpha2 = drift.alpha2;
  eps.fill(0); eps[1] = 1;
  w.fill(0); w[1] = 2; w[2] = 1; // ε(2 + ε)
  for (let k = 0; k < N; k++) u[k] = w[k] / beta2;
  // s = √(1 + u): s_0 = 1, 2·s_0·s_k = u_k − Σ_{j=1..k−1} s_j·s_{k−j}
  s.fill(0); s[0] = 1;
  for (let k = 1; k < N; k++) {
    let acc = u[k];
    for (let j = 1; j < k; j++) acc -= s[j] * s[k - j];
    s[k] = acc / 2;
  }
  for (let k = 0; k < N; k++) d[k] = s[k] + (k === 0 ? 1 : 0); // D = 1 + s
  mul(d2, d, d);
  // B = (2 + ε)·D + u
  for (let k = 0; k < N; k++) b[k] = 2 * d[k] + (k > 0 ? d[k - 1] : 0) + u[k];
  // Q = α0·D² + u·(α1·D + α2·u)
  for (let k = 0; k < N; k++) t1[k] = alpha1 * d[k] + alpha2 * u[k];
  mul(t2, u, t1);
  for (let k = 0; k < N; k++) q[k] = alpha0 * d2[k] + t2[k];
  // numerator (1 + ε)·u·Q·B − (w/(β²γ²))·D⁴
  mul(t1, q, b);
  for (let k = 0; k < N; k++) t2[k] = u[k] + (k > 0 ? u[k - 1] : 0); // (1 + ε)·u
  mul(num, t2, t1);
  mul(t1, d2, d2);
  mul(t2, w, t1);
  for (let k = 0; k < N; k++) num[k] -= t2[k] / (beta2 * gamma2);
  // denominator s·B·D³
  mul(t1, s, b);
  mul(t2, d2, d);
  mul(den, t1, t2);
  // quotient: rel_k = (num_k − Σ_{j=1..k} den_j·rel_{k−j}) / den_0
  for (let k = 0; k < N; k++) {
    let acc = num[k];
    for (let j = 1; j <= k; j++) acc -= den[j] * rel[k - j];
    rel[k] = acc / den[0];
  }
  c.set(rel);
}

const coeffs = new Float64Array(N);

/** Σ_{k=DEGREE+1..TERMS} |c_k|·x^k of the last coefficients computed. */
function tail(x: number): number {
  let sum = 0;
  for (let k = N - 1; k > DEGREE; k--) sum = (sum + Math.abs(coeffs[k])) * x; // Horner: no powers
  return sum * x ** DEGREE;
}

/** The series the kernels evaluate for one drift block (a cache: recomputed only when an input changes). */
export class DriftSeries {
  /** b_k of dE^k, k = 1..DEGREE, at index k − 1: T/T_s − 1 = dE·(b_1 + dE·(b_2 + … + dE·b_DEGREE)). */
  readonly b = new Float64Array(DEGREE);
  /** Largest |dE| [eV] for which the kernels use the series; −1 when none (the closed form everywhere). */
  reach = -1;
  private key = new Float64Array(6).fill(NaN);

  /** Recompute for a drift block's Es, beta2, gamma2, alpha0..2 (passed as the block: see driftCoefficients). */
  update(drift: Pick<DriftParams, 'Es' | 'beta2' | 'gamma2' | 'alpha0' | 'alpha1' | 'alpha2'>): void {
    const Es = drift.Es, beta2 = drift.beta2, gamma2 = drift.gamma2, alpha0 = drift.alpha0, alpha1 = drift.alpha1, alpha2 = drift.alpha2;
    const key = this.key;
    if (key[0] === Es && key[1] === beta2 && key[2] === gamma2 && key[3] === alpha0 && key[4] === alpha1 && key[5] === alpha2) return;
    key[0] = Es; key[1] = beta2; key[2] = gamma2; key[3] = alpha0; key[4] = alpha1; key[5] = alpha2;
    this.reach = -1;
    driftCoefficients(coeffs, drift);
    const gamma = Math.sqrt(gamma2);
    const rho = (beta2 * gamma) / (gamma + 1); // 1 − 1/γ without cancellation
    const scale = (Math.abs(alpha0) + 1 / gamma2) / beta2;
    for (let k = 0; k < N; k++) if (!Number.isFinite(coeffs[k])) return;
    if (!(Es > 0 && rho > 0 && scale > 0 && Number.isFinite(scale))) return;
    // the tail over x is increasing in x: bisect on a log scale between ρ·1e-12 and ρ/4
    let lo = rho * 1e-12, hi = rho / 4;
    if (!(tail(lo) <= 2 ** -54 * scale * lo)) return;
    if (tail(hi) <= 2 ** -54 * scale * hi) lo = hi;
    else for (let i = 0; i < 32; i++) {
      const mid = Math.sqrt(lo * hi);
      if (tail(mid) <= 2 ** -54 * scale * mid) lo = mid;
      else hi = mid;
    }
    let p = 1;
    for (let k = 1; k <= DEGREE; k++) {
      p /= Es;
      this.b[k - 1] = coeffs[k] * p;
    }
    this.reach = lo * Es;
  }
}
