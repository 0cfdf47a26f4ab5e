// The kernels' polynomial sine: range reduction by multiples of π, then an odd degree-9 polynomial on [−π/2, π/2].
// Pure numbers, no units. The JavaScript version here and the WebAssembly version (core/kernels/wasmModule.ts)
// perform the same IEEE-754 operations in the same order (no fused multiply-add), so they agree bit for bit.
//
// Accuracy (checked against Math.sin in test/kernels.test.ts):
//   |sinPoly(x) − sin x| ≤ SIN_POLY_REL_ERROR·|sin x| + SIN_POLY_ABS_ERROR   for |x| ≤ SIN_POLY_MAX_ARG.
// The polynomial is minimax in the relative error (Remez exchange, scripts/wasm-sine-remez.ts), levelled
// error 5.31e-9; small angles are therefore as accurate, relatively, as large ones. The reduction
// x = kπ + r uses a two-part π (Cody–Waite): P1 (32 significant bits, so k·P1 is exact for |k| < 2^21)
// and P2 = (Math.PI − P1) + (π − Math.PI), which keeps r within a few ulp of π/2 (SIN_POLY_ABS_ERROR).
// Beyond SIN_POLY_MAX_ARG the result degrades gradually (and stays finite up to |x| ~ 1e300).
//
// Why an approximate sine is acceptable in the map: a kick dE += f(dt) that depends on dt only is a shear with
// Jacobian determinant exactly 1 for ANY function f, so the map stays exactly area-preserving whatever the
// sine's accuracy; the error only perturbs the RF waveform by < 5.4e-9 of its amplitude.

/** Coefficients c1, c3, c5, c7, c9 of r·(c1 + c3 r² + c5 r⁴ + c7 r⁶ + c9 r⁸) (scripts/wasm-sine-remez.ts). */
export const SIN_COEFFS = [
  0.9999999946860073, -0.166666566840071, 0.008333025138968421, -0.00019807418727375059, 0.0000026019030675640895,
] as const;

/** Bound on the relative error of the polynomial on [−π/2, π/2] (levelled Remez error 5.31e-9, rounded up). */
export const SIN_POLY_REL_ERROR = 5.4e-9;
/** Bound on the absolute error added by the range reduction for |x| ≤ SIN_POLY_MAX_ARG (a few ulp of π/2). */
export const SIN_POLY_ABS_ERROR = 2e-15;
/** Largest |x| for which the reduction is exact in its first step (|k| < 2^21). */
export const SIN_POLY_MAX_ARG = 2 ** 21 * Math.PI;

/** 1/π rounded to double. */
export const INV_PI = 1 / Math.PI;
/** Leading 32 significant bits of π (exact products k·P1 for |k| < 2^21). */
export const PI_HI = Math.round(Math.PI * 2 ** 30) / 2 ** 30;
/** π − PI_HI: the rest of Math.PI plus π − Math.PI = 1.2246467991473532e-16 (the double nearest the tail of π). */
export const PI_LO = Math.PI - PI_HI + 1.2246467991473532e-16;
/** 1.5·2^52: adding and subtracting it rounds to the nearest integer, ties to even, for |y| < 2^51 (as f64.nearest). */
export const ROUND_MAGIC = 6755399441055744;

/** Polynomial sine; bit-identical to the WebAssembly kernels' sine for |x| < 2^51·π. */
export function sinPoly(x: number): number {
  const k = x * INV_PI + ROUND_MAGIC - ROUND_MAGIC; // nearest integer to x/π
  let r = x - k * PI_HI;
  r = r - k * PI_LO;
  const half = k * 0.5 + ROUND_MAGIC - ROUND_MAGIC;
  const parity = k - (half + half); // 0 for even k, ±1 for odd k
  r = r * (1 - 2 * Math.abs(parity)); // sin(kπ + r) = (−1)^k·sin r = sin((−1)^k·r)
  const r2 = r * r, r4 = r2 * r2;
  // Estrin's scheme (c1 + c3 r²) + r⁴·((c5 + c7 r²) + r⁴·c9): a shorter dependency chain than Horner's (+3–5 % in
  // the one-system SIMD kernel, paired runs)
  return r * ((0.9999999946860073 + -0.166666566840071 * r2) + r4 * ((0.008333025138968421 + -0.00019807418727375059 * r2) + r4 * 0.0000026019030675640895));
}
