// The machine at any time of the cycle without tracking: p·c(t) from the ramp, the turn count ∫dt/T0, and a
// MachineStepper resumed there (so φs, RF programs, slopes and buckets are exactly the tracker's).
// Units: time in s, p·c and energies in eV.
import { C_LIGHT } from '../constants.ts';
import { fromMomentum, fromTotal } from '../kinematics.ts';
import { MachineStepper, startKinematics, type MachineState } from '../machine.ts';
import { makeParticle } from '../particle.ts';
import { buildPrograms, programsEnd } from '../program/machinePrograms.ts';
import type { Setup } from '../setup/schema.ts';

// RK4 sub-steps per sample interval for the per-turn energy gain (gainPerTurn ramps); the rate dE/dt changes
// only through T0(β), so a few steps reach round-off.
const GAIN_SUBSTEPS = 8;

/** Walks forward in time through a setup's cycle; `at(t)` must be called with non-decreasing t. */
export class CycleTimeline {
  readonly stepper: MachineStepper;
  readonly duration: number;
  private readonly setup: Setup;
  private readonly pcProgram: ((t: number) => number) | null;
  private t = 0;
  private turn = 0;
  private E: number; // total energy for gainPerTurn ramps [eV]
  private readonly pc0: number;
  private pcLast: number; // p·c at the last time asked [eV]

  constructor(setup: Setup, duration?: number) {
    this.setup = setup;
    const p = makeParticle(setup.particle);
    const k = startKinematics(setup, p);
    this.pc0 = k.pc;
    this.pcLast = k.pc;
    this.E = k.E;
    const progs = buildPrograms(setup, p, k.pc);
    this.pcProgram = progs.pc ? (t) => progs.pc!.at(t) : null;
    this.stepper = new MachineStepper(setup);
    const end = programsEnd(progs);
    const runTime = setup.run.turns * this.stepper.state.T0;
    this.duration = duration ?? Math.max(end, runTime);
    if (!(this.duration > 0 && Number.isFinite(this.duration)))
      throw new RangeError(`cycle duration = ${this.duration} s: must be a finite number > 0`);
  }

  /** p·c [eV] of the synchronous particle at time t [s] (t non-decreasing between calls for gainPerTurn ramps). */
  pcAt(t: number): number {
    const s = this.setup, r = s.energy.ramp, m = this.stepper.state.particle;
    switch (r.kind) {
      case 'flat':
        return this.pc0;
      case 'bDot':
        return this.pc0 + Math.abs(m.Z) * C_LIGHT * s.ring.bendingRadius! * r.value * t;
      case 'momentumRate':
        return this.pc0 + r.value * t;
      case 'gainPerTurn':
        this.integrateGain(t, r.value);
        return fromTotal(this.E, m.mass).pc;
      default:
        return this.pcProgram!(t);
    }
  }

  /** Machine state at time t [s] (t non-decreasing); the turn index is ∫dt/T0 rounded down. */
  at(t: number): MachineState {
    const { turn, pc } = this.momentumAt(t);
    this.stepper.resumeAt(turn, t, pc);
    return this.stepper.state;
  }

  /** Turn index and p·c [eV] at time t [s] (t non-decreasing), without the machine state (no φs search). */
  momentumAt(t: number): { turn: number; pc: number } {
    if (t < this.t) throw new RangeError(`cycle time ${t} s is before the last one asked (${this.t} s)`);
    const pc = this.pcAt(t);
    const C = this.setup.ring.circumference, mass = this.stepper.state.particle.mass;
    const T0a = C / (fromMomentum(this.pcLast, mass).beta * C_LIGHT), T0b = C / (fromMomentum(pc, mass).beta * C_LIGHT);
    this.turn += (t - this.t) * 0.5 * (1 / T0a + 1 / T0b); // trapezoid
    this.t = t;
    this.pcLast = pc;
    return { turn: Math.floor(this.turn + 1e-9), pc };
  }

  // dE/dt = gain/T0(E): the energy advances by `gain` every revolution.
  private integrateGain(t: number, gain: number): void {
    const m = this.stepper.state.particle.mass, C = this.setup.ring.circumference;
    const rate = (E: number) => (gain * fromTotal(E, m).beta * C_LIGHT) / C;
    const h = (t - this.gainT) / GAIN_SUBSTEPS;
    for (let i = 0; i < GAIN_SUBSTEPS && h > 0; i++) {
      const k1 = rate(this.E), k2 = rate(this.E + 0.5 * h * k1), k3 = rate(this.E + 0.5 * h * k2), k4 = rate(this.E + h * k3);
      this.E += (h / 6) * (k1 + 2 * k2 + 2 * k3 + k4);
    }
    this.gainT = t;
  }
  private gainT = 0;
}
