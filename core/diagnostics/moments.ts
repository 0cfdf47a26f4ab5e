// Per-turn reductions of the bunch. Units: dt in s, dE in eV, emittances in eV·s, lengths in s.
// Emittance conventions (PHYSICS.md §9): emittanceRms = sqrt(<dt²><dE²> − <dt dE>²) about the centroid, without
// a factor π; emittance90/95 are true areas (π included) of rms-shaped ellipses, see ellipse.ts.
// Statistics are over the alive particles (population moments, divisor n).
import type { BucketInfo } from '../bucket.ts';
import type { Bunch } from '../bunch.ts';
import type { MachineState } from '../machine.ts';
import { fractionEmittances } from './ellipse.ts';
import { partialMoments } from './partial.ts';
import { fwhm } from './profile.ts';

/** One turn's reductions of the bunch (alive particles unless stated). */
export interface TurnDiagnostics {
  turn: number;
  /** Time since turn 0 [s]. */
  time: number;
  alive: number;
  lost: number;
  /** Centroid [s], [eV]. */
  meanDt: number;
  meanDE: number;
  /** Rms about the centroid [s], [eV]. */
  rmsDt: number;
  rmsDE: number;
  /** sqrt(<dt²><dE²> − <dt dE>²) [eV·s], no π. */
  emittanceRms: number;
  /** Area [eV·s] (π included) of the rms-shaped ellipse holding 90 % / 95 % of the alive particles. */
  emittance90: number;
  emittance95: number;
  /** 4·rmsDt [s]. */
  length4Sigma: number;
  /** FWHM [s] of the binned line density (linear interpolation at half maximum). */
  lengthFwhm: number;
  /** Fraction of all particles (alive + lost) inside the separatrix; NaN if no bucket. */
  insideFraction: number;
}

let profile = new Float64Array(0); // reused FWHM profile (fwhmCounts' bins)

/** All per-turn diagnostics; `bins` sets the line-density resolution of the FWHM; bucket null if none. */
export function computeDiagnostics(b: Bunch, m: MachineState, bucket: BucketInfo | null, bins: number): TurnDiagnostics {
  const p = partialMoments(b, m, bucket); // one tracker = one part: the same first pass as a split bunch
  const n = p.n, tMin = p.tMin, tMax = p.tMax;
  const meanDt = n ? p.meanDt : NaN, meanDE = n ? p.meanDE : NaN;
  let vt = p.m2t, ve = p.m2e, c = p.m2c;
  vt /= n; ve /= n; c /= n;
  // the FWHM profile is counted in the selection's pass over the particles
  const bins1 = b.n === 0 || !(bins >= 3) ? 0 : bins;
  if (profile.length !== bins1) profile = new Float64Array(bins1);
  const [emittance90, emittance95] = fractionEmittances(b, { meanDt, meanDE, varDt: vt, varDE: ve, cov: c }, [0.9, 0.95], { tMin, tMax, out: profile });
  return {
    turn: m.turn, time: m.time, alive: n, lost: b.total - n,
    meanDt, meanDE, rmsDt: Math.sqrt(vt), rmsDE: Math.sqrt(ve),
    emittanceRms: Math.sqrt(Math.max(0, vt * ve - c * c)),
    emittance90, emittance95,
    length4Sigma: 4 * Math.sqrt(vt),
    lengthFwhm: bins1 === 0 ? NaN : tMax > tMin ? fwhm(profile, (tMax - tMin) / (bins - 2)) : 0,
    insideFraction: bucket === null ? NaN : p.inside / b.total,
  };
}
