// The fictional proton ring of the kernel tests (common practice: the kick/drift map of PHYSICS.md §4): 1 GeV
// kinetic, C = 300 m, γt = 6 (α0 = 1/36, with α1 = 2e-3, α2 = −1e-3), main harmonic h = 8.
import { PROTON_MASS_EV } from '../../core/constants.ts';
import { makeDriftParams, type DriftParams } from '../../core/kernels/index.ts';

export const Es = 1e9 + PROTON_MASS_EV;
export const gamma = Es / PROTON_MASS_EV;
export const beta = Math.sqrt(1 - 1 / gamma ** 2);
export const T0 = 300 / (beta * 299_792_458);
/** ω_rf of h = 8 [rad/s]. */
export const w1 = (8 * 2 * Math.PI) / T0;
export const compaction = { alpha0: 1 / 36, alpha1: 2e-3, alpha2: -1e-3 };
export const eta0 = compaction.alpha0 - 1 / gamma ** 2;

/** Drift parameters of one turn of this ring, either kind. */
export function driftOf(kind: 'linear' | 'exact'): DriftParams {
  const d = makeDriftParams(kind);
  d.slip = (T0 * eta0) / (beta ** 2 * Es);
  d.period = T0;
  d.Es = Es;
  d.beta2 = beta ** 2;
  d.gamma2 = gamma ** 2;
  d.alpha0 = compaction.alpha0;
  d.alpha1 = compaction.alpha1;
  d.alpha2 = compaction.alpha2;
  return d;
}
