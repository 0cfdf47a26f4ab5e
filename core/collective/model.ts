// The intensity model of a setup: bunch charge, number of bunches, impedances and the binning window.
// Units: charge in C, dt in s, current in A. Bunch charge Q = Z·e·N_b (signed, so V_ind = −W∗I and the kick
// Z·V_ind make every species lose energy to a resistive impedance). From an average current I_avg of M bunches:
// N_b = I_avg·T0/(|Z|·e·M) at turn 0.
import { E_CHARGE } from '../constants.ts';
import type { MachineState } from '../machine.ts';
import type { ImpedanceSetup } from '../setup/collective.ts';
import type { Setup } from '../setup/schema.ts';
import { impedancesOf } from './impedance.ts';
import { InducedVoltage } from './inducedVoltage.ts';
import type { BinGrid } from './lineDensity.ts';

/** Everything the induced-voltage calculation takes from a setup. */
export interface IntensityModel {
  particlesPerBunch: number;
  /** Z·e·N_b [C]. */
  bunchCharge: number;
  bunches: number;
  impedances: readonly ImpedanceSetup[];
  bins: number;
  smoothing: number;
  /** Requested window length [s]; 0 = automatic. */
  window: number;
}

// Automatic window: this many times the bunch's full extent (room to lengthen), at most one RF period.
const AUTO_WINDOW_FACTOR = 3;

/** The intensity model, or null when the setup has no intensity or no impedance. Throws naming the field on bad combinations. */
export function intensityModel(setup: Setup, m: MachineState): IntensityModel | null {
  const it = setup.intensity;
  if (!it || setup.impedances.length === 0) return null;
  const M = it.bunches;
  if (m.h % M !== 0)
    throw new Error(`intensity.bunches = ${M}: must divide the main harmonic number h = ${m.h} (equally spaced bunches)`);
  const Z = m.particle.Z;
  const Nb = it.particlesPerBunch ?? ((it.averageCurrent ?? 0) * m.T0) / (Math.abs(Z) * E_CHARGE * M);
  const c = setup.collective;
  return { particlesPerBunch: Nb, bunchCharge: Z * E_CHARGE * Nb, bunches: M, impedances: setup.impedances, bins: c.bins, smoothing: c.smoothing, window: c.window };
}

/** Bin grid centred on the bunch extent [dtMin, dtMax]: the requested length, or AUTO_WINDOW_FACTOR × extent (≤ one RF period). */
export function windowGrid(model: IntensityModel, m: MachineState, dtMin: number, dtMax: number): BinGrid {
  const Trf = (2 * Math.PI) / m.omegaRf;
  const span = dtMax - dtMin;
  let L = model.window > 0 ? model.window : Math.min(Trf, AUTO_WINDOW_FACTOR * span);
  if (!(L > 0)) L = Trf / 10; // a bunch of zero length: any small window
  const c = 0.5 * (dtMin + dtMax);
  return { e0: c - 0.5 * L, delta: L / model.bins, nb: model.bins };
}

/** Induced-voltage calculator for a model on a grid at the machine state's energy. */
export function makeInducedVoltage(model: IntensityModel, m: MachineState, grid: BinGrid): InducedVoltage {
  return new InducedVoltage(impedancesOf(model.impedances, m.beta, m.gamma), grid, model.smoothing);
}
