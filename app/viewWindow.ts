// The window the phase-space histogram and profile are binned in: the bucket with a margin, widened to hold
// the beam. It changes only when the wanted window differs clearly, so the picture does not jitter.
import type { DiagRow, ViewWindow } from '../workers/protocol.ts';
import type { BucketView } from './derived.ts';

/** Histogram bins (dt × dE): enough detail for a ~500 px panel, small enough to bin 1e6 particles quickly. */
export const HIST_NX = 160;
/** Histogram bins along dE. */
export const HIST_NY = 120;
// Margin around the bucket, and how many rms sizes of the beam must fit.
const BUCKET_MARGIN = 1.15;
const BEAM_SIGMAS = 5;
// When the bucket is far larger than the beam (near transition), cap the window at this many beam extents.
const MAX_OVER_BEAM = 3;
// Refit when the wanted range grows past GROW × or shrinks below SHRINK × the current one. GROW stays inside the
// bucket margin, so a separatrix that grows by less than that is still in the window; small edits and ramps then
// redraw no axes (a refit lays out all three layers, ~20 ms).
const GROW = 1.1;
const SHRINK = 0.45;

/** Window for a bucket and (if known) the current beam. */
export function chooseWindow(v: BucketView, d: DiagRow | null): ViewWindow {
  const m = v.m;
  const rfHalf = Math.PI / m.omegaRf;
  let c = 0, halfDt = rfHalf, halfDE = 1e-4 * m.beta * m.beta * m.Es;
  if (v.bucket && v.sep) {
    let lo = Infinity, hi = -Infinity, eMax = 0;
    for (let i = 0; i < v.sep.dt.length; i++) {
      lo = Math.min(lo, v.sep.dt[i]);
      hi = Math.max(hi, v.sep.dt[i]);
      eMax = Math.max(eMax, Math.abs(v.sep.dE[i]));
    }
    c = 0.5 * (lo + hi);
    halfDt = 0.5 * (hi - lo) * BUCKET_MARGIN;
    halfDE = eMax * BUCKET_MARGIN;
  }
  if (d && d.alive > 0) {
    const beamDt = Math.abs(d.meanDt - c) + BEAM_SIGMAS * d.rmsDt;
    const beamDE = Math.abs(d.meanDE) + BEAM_SIGMAS * d.rmsDE;
    if (beamDE > 0) halfDE = Math.max(beamDE, Math.min(halfDE, MAX_OVER_BEAM * beamDE));
    if (!v.bucket) halfDt = Math.max(Math.min(beamDt, rfHalf), 1e-15);
  }
  if (!(halfDE > 0)) halfDE = 1;
  return { dtMin: c - halfDt, dtMax: c + halfDt, dEMin: -halfDE, dEMax: halfDE, nx: HIST_NX, ny: HIST_NY };
}

/** True when the wanted window is clearly different from the current one. */
export function needsRefit(cur: ViewWindow, want: ViewWindow): boolean {
  const r = (a: number, b: number) => a / b;
  const dtR = r(want.dtMax - want.dtMin, cur.dtMax - cur.dtMin);
  const dER = r(want.dEMax - want.dEMin, cur.dEMax - cur.dEMin);
  const shift = Math.abs(want.dtMin + want.dtMax - cur.dtMin - cur.dtMax) / (cur.dtMax - cur.dtMin);
  return dtR > GROW || dtR < SHRINK || dER > GROW || dER < SHRINK || shift > 0.1;
}
