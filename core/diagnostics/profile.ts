// Binned projections of the bunch. Units: dt in s, dE in eV; line density in 1/s.
// Binning is nearest-grid-point: bin i covers [min + i·w, min + (i+1)·w); particles outside the range are skipped.
import type { Bunch } from '../bunch.ts';

/**
 * Line density λ(dt) of the alive particles on out.length bins over [dtMin, dtMax), in 1/s: counts/(n_alive·w),
 * so Σ out·w = 1 when the window holds every alive particle (less if some fall outside; all zero if none alive).
 */
export function lineDensity(b: Bunch, dtMin: number, dtMax: number, out: Float64Array): void {
  const nx = out.length;
  out.fill(0);
  const n = b.n;
  if (n === 0 || !(dtMax > dtMin) || nx === 0) return;
  const dt = b.dt;
  const inv = nx / (dtMax - dtMin);
  for (let i = 0; i < n; i++) {
    const ix = Math.floor((dt[i] - dtMin) * inv);
    if (ix >= 0 && ix < nx) out[ix] += 1;
  }
  const scale = inv / n;
  for (let i = 0; i < nx; i++) out[i] *= scale;
}

/** Counts of alive particles on an nx × ny grid over [dtMin, dtMax) × [dEMin, dEMax), row-major out[iy·nx + ix]. */
export function histogram2d(
  b: Bunch, dtMin: number, dtMax: number, dEMin: number, dEMax: number, nx: number, ny: number, out: Float32Array,
): void {
  if (out.length < nx * ny) throw new Error(`histogram2d: out has ${out.length} cells, needs nx·ny = ${nx * ny}`);
  out.fill(0);
  if (!(dtMax > dtMin) || !(dEMax > dEMin)) return;
  const dt = b.dt, dE = b.dE, n = b.n;
  const ix0 = nx / (dtMax - dtMin), iy0 = ny / (dEMax - dEMin);
  for (let i = 0; i < n; i++) {
    const ix = Math.floor((dt[i] - dtMin) * ix0);
    const iy = Math.floor((dE[i] - dEMin) * iy0);
    if (ix >= 0 && ix < nx && iy >= 0 && iy < ny) out[iy * nx + ix] += 1;
  }
}

/**
 * Full width at half maximum of a binned profile with bin width w (result in the unit of w).
 * The outermost bins at or above half the peak are found from each end and the crossing is interpolated
 * linearly from the neighbouring bin outside (robust against noise dips near the peak).
 */
export function fwhm(p: Float64Array, w: number): number {
  const nb = p.length;
  let peak = 0;
  for (let i = 0; i < nb; i++) if (p[i] > peak) peak = p[i];
  if (!(peak > 0)) return NaN;
  const half = 0.5 * peak;
  let l = 0;
  while (p[l] < half) l++;
  let r = nb - 1;
  while (p[r] < half) r--;
  const xl = l === 0 ? 0 : l - 1 + (half - p[l - 1]) / (p[l] - p[l - 1]);
  const xr = r === nb - 1 ? nb - 1 : r + (p[r] - half) / (p[r] - p[r + 1]);
  return (xr - xl) * w;
}
