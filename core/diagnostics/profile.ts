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
    const x = (dt[i] - dtMin) * inv;
    if (x >= 0 && x < nx) out[x | 0] += 1; // x ≥ 0: truncation is the floor
  }
  const scale = inv / n;
  for (let i = 0; i < nx; i++) out[i] *= scale;
}

// Integer counts for histogram2d, reused (a Float32Array cell incremented per particle converts on every add).
let counts = new Int32Array(0);

/**
 * Counts of alive particles on an nx × ny grid over [dtMin, dtMax) × [dEMin, dEMax), row-major out[iy·nx + ix].
 * With `profile`, also the line density over [dtMin, dtMax) on profile.length bins, exactly as lineDensity gives
 * it, from the same pass over the particles (a picture and its profile cost one pass).
 */
export function histogram2d(
  b: Bunch, dtMin: number, dtMax: number, dEMin: number, dEMax: number, nx: number, ny: number, out: Float32Array,
  profile?: Float64Array,
): void {
  if (out.length < nx * ny) throw new Error(`histogram2d: out has ${out.length} cells, needs nx·ny = ${nx * ny}`);
  out.fill(0);
  const np = profile ? profile.length : 0;
  if (profile) profile.fill(0);
  if (!(dtMax > dtMin)) return;
  const cells = nx * ny;
  if (counts.length < cells + np) counts = new Int32Array(cells + np);
  const c = counts;
  c.fill(0, 0, cells + np);
  const dt = b.dt, dE = b.dE, n = b.n;
  const ix0 = nx / (dtMax - dtMin), iy0 = dEMax > dEMin ? ny / (dEMax - dEMin) : NaN, ip0 = np / (dtMax - dtMin);
  // x ≥ 0 is tested first, so truncation (x | 0) is the floor; NaN fails every test.
  for (let i = 0; i < n; i++) {
    const u = dt[i] - dtMin;
    const x = u * ix0, y = (dE[i] - dEMin) * iy0, p = u * ip0;
    if (p >= 0 && p < np) c[cells + (p | 0)]++;
    if (x >= 0 && x < nx && y >= 0 && y < ny) c[(y | 0) * nx + (x | 0)]++;
  }
  for (let k = 0; k < cells; k++) out[k] = c[k];
  if (profile && n > 0) {
    const scale = ip0 / n;
    for (let k = 0; k < np; k++) profile[k] = c[cells + k] * scale;
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
