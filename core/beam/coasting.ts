// Coasting beam: uniform in phase over one main RF period, Gaussian in energy.
// Units: dt in s (dt > 0 late), dE in eV. The period is T_rf = 2π/ω_rf; dt covers [−T_rf/2, T_rf/2).
import type { Bunch } from '../bunch.ts';
import type { MachineState } from '../machine.ts';
import type { Rng } from '../rng.ts';

/** Fill a bunch with a coasting beam of rms energy spread σE [eV] (no offsets). */
export function sampleCoasting(m: MachineState, sigmaE: number, rng: Rng, out: Bunch): void {
  const Trf = (2 * Math.PI) / m.omegaRf;
  const { dt, dE } = out;
  for (let i = 0; i < out.total; i++) {
    dt[i] = Trf * (rng.uniform() - 0.5);
    dE[i] = sigmaE * rng.normal();
  }
}
