// Kick by the bunch's own induced voltage, once per turn after the RF kicks. Units: dt in s, dE in eV, V in V.
// Each pass (PHYSICS.md §12): bin the alive particles (each macroparticle carries Q/total, Q = Z·e·N_b, so lost
// particles take their charge with them), compute V_ind on the grid, then dE += Z·V_ind(dt) interpolated with the
// deposit's weights. V_ind depends on dt only, so the kick is a shear (area-preserving) for a given line density.
// The grid is fixed at the first pass (centred on the bunch, see core/collective/model.ts); particles outside it
// carry no charge and get no kick (counted in `outside`).
// Two ways to run it: `apply` does all of it in its own passes over the bunch (the reference path, and whenever
// other elements act between the kicks and the drift); prepare/settle run it inside a turn kernel's pass
// (core/kernels/induced.ts: the kick with the RF kick, the deposit for the next turn after the drift).
import type { Bunch } from '../bunch.ts';
import type { InducedVoltage } from '../collective/inducedVoltage.ts';
import { depositLinear, kickLinear } from '../collective/lineDensity.ts';
import { intensityModel, makeInducedVoltage, windowGrid, type IntensityModel } from '../collective/model.ts';
import { foldInduced, setInducedStage, type InducedParams } from '../kernels/induced.ts';
import type { MachineState } from '../machine.ts';
import type { Setup } from '../setup/schema.ts';
import type { Element } from './types.ts';

/** The induced-voltage element, with what the app may read after each turn. */
export interface InducedKickElement extends Element {
  /** The calculator (grid, current, voltage of the last pass); null before the first pass. */
  readonly calc: InducedVoltage | null;
  /** Mean energy change per particle in the last pass [eV] (negative: energy lost to the impedance). */
  readonly meanKick: number;
  /** Alive particles outside the window at the last deposit. */
  readonly outside: number;
  /** Bins of the window (the size of a kernel's induced tables). */
  readonly bins: number;
  /** Fused path, before the kernel pass of turn n (state m): V_ind from the line density of dt now, into p. */
  prepare(b: Bunch, m: MachineState, p: InducedParams): void;
  /** Fused path, after the pass and the removal of lost particles (and of their deposits): the next turn's line density. */
  settle(b: Bunch, p: InducedParams): void;
}

/** Induced-voltage kick of an intensity model; `grid` fixes the window (else chosen from the bunch at the first pass). */
export function inducedKick(model: IntensityModel, grid?: { e0: number; delta: number; nb: number }): InducedKickElement {
  let calc: InducedVoltage | null = null;
  let q = new Float64Array(0);
  let meanKick = 0;
  let outside = 0;
  let current = false; // q is the line density of the bunch's dt as it is now (set by settle, cleared by apply)
  const ctx = { omega0: 0, beta: 0, gamma: 0 };

  // V_ind on the grid from q, for the state of this turn.
  function compute(b: Bunch, m: MachineState): InducedVoltage {
    if (calc === null) {
      calc = makeInducedVoltage(model, m, grid ?? windowGrid(model, m, ...extent(b)));
      q = new Float64Array(calc.grid.nb);
    }
    if (!current) outside = depositLinear(b.dt, b.n, calc.grid, model.bunchCharge / b.total, q);
    ctx.omega0 = m.omega0; ctx.beta = m.beta; ctx.gamma = m.gamma;
    calc.compute(q, ctx, m.T0 / model.bunches, model.bunches, false);
    return calc;
  }

  return {
    name: 'induced voltage',
    bins: grid?.nb ?? model.bins,
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
      const c = compute(b, m);
      current = false; // the drift that follows moves dt
      const v = c.voltage;
      const Z = m.particle.Z;
      if (Z !== 1) for (let i = 0; i < v.length; i++) v[i] *= Z; // energy kick [eV]; undone below so `voltage` stays in V
      const sum = kickLinear(b.dt, b.dE, b.n, c.grid, v);
      if (Z !== 1) for (let i = 0; i < v.length; i++) v[i] /= Z;
      meanKick = b.n > 0 ? sum / b.n : 0;
    },
    prepare(b: Bunch, m: MachineState, p: InducedParams): void {
      const c = compute(b, m);
      const g = c.grid, nb = g.nb, v = c.voltage, Z = m.particle.Z;
      if (p.nb !== nb) throw new Error(`induced stage: tables for ${p.nb} bins, window has ${nb}`);
      setInducedStage(p, g.e0, g.delta, v, Z);
      // The kick interpolates with the deposit's weights, so Σ kicks = Σ_bins (q/w)·Z·V.
      const w = model.bunchCharge / b.total;
      let sum = 0;
      for (let i = 0; i < nb; i++) sum += q[i] * v[i];
      meanKick = b.n > 0 && w !== 0 ? (Z * sum) / w / b.n : 0;
    },
    settle(b: Bunch, p: InducedParams): void {
      const inside = foldInduced(p, model.bunchCharge / b.total, q);
      outside = b.n - inside;
      current = true;
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
