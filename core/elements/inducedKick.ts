// Kick by the bunch's own induced voltage, once per turn after the RF kicks. Units: dt in s, dE in eV, V in V.
// Each pass (PHYSICS.md §12): bin the alive particles (each macroparticle carries Q/total, Q = Z·e·N_b, so lost
// particles take their charge with them), compute V_ind on the grid, then dE += Z·V_ind(dt) interpolated with the
// deposit's weights. V_ind depends on dt only, so the kick is a shear (area-preserving) for a given line density.
// The grid is fixed at the first pass (centred on the bunch, see core/collective/model.ts); particles outside it
// carry no charge and get no kick (counted in `outside`).
import type { Bunch } from '../bunch.ts';
import type { InducedVoltage } from '../collective/inducedVoltage.ts';
import { depositLinear, kickLinear } from '../collective/lineDensity.ts';
import { intensityModel, makeInducedVoltage, windowGrid, type IntensityModel } from '../collective/model.ts';
import type { MachineState } from '../machine.ts';
import type { Setup } from '../setup/schema.ts';
import type { Element } from './types.ts';

/** The induced-voltage element, with what the app may read after each turn. */
export interface InducedKickElement extends Element {
  /** The calculator (grid, current, voltage of the last pass); null before the first pass. */
  readonly calc: InducedVoltage | null;
  /** Mean energy change per particle in the last pass [eV] (negative: energy lost to the impedance). */
  readonly meanKick: number;
  /** Alive particles outside the window in the last pass. */
  readonly outside: number;
}

/** Induced-voltage kick of an intensity model; `grid` fixes the window (else chosen from the bunch at the first pass). */
export function inducedKick(model: IntensityModel, grid?: { e0: number; delta: number; nb: number }): InducedKickElement {
  let calc: InducedVoltage | null = null;
  let q = new Float64Array(0);
  let meanKick = 0;
  let outside = 0;
  const ctx = { omega0: 0, beta: 0, gamma: 0 };
  return {
    name: 'induced voltage',
    get calc() {
      return calc;
    },
    get meanKick() {
      return meanKick;
    },
    get outside() {
      return outside;
    },
    apply(b: Bunch, m: MachineState): void {
      if (calc === null) {
        calc = makeInducedVoltage(model, m, grid ?? windowGrid(model, m, ...extent(b)));
        q = new Float64Array(calc.grid.nb);
      }
      const w = model.bunchCharge / b.total;
      outside = depositLinear(b.dt, b.n, calc.grid, w, q);
      ctx.omega0 = m.omega0; ctx.beta = m.beta; ctx.gamma = m.gamma;
      calc.compute(q, ctx, m.T0 / model.bunches, model.bunches, false);
      const v = calc.voltage;
      const Z = m.particle.Z;
      if (Z !== 1) for (let i = 0; i < v.length; i++) v[i] *= Z; // energy kick [eV]; undone below so `voltage` stays in V
      const sum = kickLinear(b.dt, b.dE, b.n, calc.grid, v);
      if (Z !== 1) for (let i = 0; i < v.length; i++) v[i] /= Z;
      meanKick = b.n > 0 ? sum / b.n : 0;
    },
  };
}

function extent(b: Bunch): [number, number] {
  let lo = Infinity, hi = -Infinity;
  for (let i = 0; i < b.n; i++) {
    const t = b.dt[i];
    if (t < lo) lo = t;
    if (t > hi) hi = t;
  }
  return b.n > 0 ? [lo, hi] : [0, 0];
}

/** The induced-voltage element of a setup, or null without intensity or impedances. */
export function inducedKickFromSetup(setup: Setup, m: MachineState): InducedKickElement | null {
  const model = intensityModel(setup, m);
  return model ? inducedKick(model) : null;
}
