// Error function for the Gaussian energy integrals of matched bunches. Dimensionless.
// Series erf(x) = (2/√π)·e^{−x²}·Σ_n 2ⁿx^{2n+1}/(1·3·…·(2n+1)) [A&S 7.1.6]: all terms positive, so no
// cancellation; it converges for every x and needs about x² + 30 terms. Beyond x = 6, 1 − erf(x) < 1e-16.

const TWO_OVER_SQRT_PI = 2 / Math.sqrt(Math.PI);
const SATURATION = 6;

/** erf(x) to about 1e-15 relative. */
export function erf(x: number): number {
  const ax = Math.abs(x);
  if (ax >= SATURATION) return Math.sign(x);
  const x2 = ax * ax;
  let term = ax;
  let sum = ax;
  for (let n = 1; n < 200 && term > 1e-17 * sum; n++) {
    term *= (2 * x2) / (2 * n + 1);
    sum += term;
  }
  return Math.sign(x) * TWO_OVER_SQRT_PI * Math.exp(-x2) * sum;
}
