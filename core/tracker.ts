// The symplectic one-turn map: RF kicks at each gap, then the drift over the arc to the next gap.
// Units: dt in s (dt > 0 = late), dE in eV (E − E_s). PHYSICS.md §4.
// Turn n: every gap kicks with the machine state of turn n (ω0(n), φ_k(n)); every arc drifts with the state
// of turn n+1 (E_s(n+1), T0(n+1), η(n+1)), as in PHYSICS.md §4 where the drift follows the energy update.
// Gaps: RF systems with equal `position` share one kick; gaps are visited in increasing position, the turn
// starting at the first one, so dt is the arrival time at that gap. With distributed gaps every arc uses the
// turn-(n+1) reference energy (the reference between gaps is not split: first order in ΔE_s/E_s per turn).
// Added elements (collective kicks, radiation) run after the RF kicks of the last gap, with state n.
// Kernels: with one gap (the usual case) and at most MAX_RF systems, the turn runs through a turn kernel
// (core/kernels: WebAssembly SIMD where it validates, else TypeScript; polynomial sine). The bunch's columns
// then move into the kernel's memory once. Option kernel: 'reference' keeps the plain elements with Math.sin.
// An induced voltage without other added elements rides in the same kernel pass (one pass over memory per turn).
import type { Bunch } from './bunch.ts';
import { KernelGap } from './elements/kernelGap.ts';
import { chooseKernel, createKernel, MAX_RF, type Columns, type InducedParams, type TurnKernel } from './kernels/index.ts';
import { drift } from './elements/drift.ts';
import { inducedKickFromSetup, type InducedKickElement } from './elements/inducedKick.ts';
import { radiationKickFromSetup } from './elements/radiationKick.ts';
import { rfKick } from './elements/rfKick.ts';
import type { Element } from './elements/types.ts';
import { MachineStepper, type MachineState } from './machine.ts';
import type { Setup } from './setup/schema.ts';

interface Gap {
  kick: Element;
  drift: Element;
}

/** Which implementation runs the RF kick and drift: a turn kernel ('auto' picks wasm where supported) or the reference elements. */
export type KernelChoice = 'auto' | 'wasm' | 'js' | 'reference';

/** Tracks a bunch turn by turn through the RF gaps and arcs of a setup. */
export class Tracker {
  readonly bunch: Bunch;
  /** The kernel implementation in use for the single-gap turn ('reference': plain elements). */
  readonly impl: 'wasm' | 'js' | 'reference';
  private readonly kernel: TurnKernel | null;
  private fast: KernelGap | null = null;
  private cols: Columns | null = null;
  private stepper: MachineStepper;
  private ahead: MachineStepper | null = null; // state n+1, needed only with distributed gaps
  private gaps: Gap[] = [];
  private readonly extras: Element[] = [];
  private physics: Element[] = []; // from the setup: induced voltage, then radiation (after the RF kicks)
  private stage: InducedParams | null = null; // the induced voltage's tables in the kernel, when it runs fused
  /** The induced-voltage element of the setup (null without intensity and impedances); rebuilt by updateSetup. */
  induced: InducedKickElement | null = null;

  constructor(setup: Setup, bunch: Bunch, opts: { kernel?: KernelChoice } = {}) {
    this.bunch = bunch;
    const choice = opts.kernel ?? 'auto';
    const impl = choice === 'auto' ? chooseKernel() : choice;
    this.kernel = impl === 'reference' ? null : createKernel(impl, { initialParticles: bunch.total });
    this.impl = impl;
    if (this.kernel) {
      // Move the columns into the kernel's memory once (WebAssembly kernels work only on their own memory).
      const cols = this.kernel.allocColumns(bunch.total);
      cols.dt.set(bunch.dt);
      cols.dE.set(bunch.dE);
      bunch.dt = cols.dt;
      bunch.dE = cols.dE;
      this.cols = cols;
    }
    this.stepper = new MachineStepper(setup);
    this.build(setup);
  }

  /** Machine state of the next turn to be tracked. */
  get machine(): MachineState {
    return this.stepper.state;
  }

  /** Index of the next turn to track (= turns tracked so far; kept across updateSetup). */
  get turn(): number {
    return this.stepper.state.turn;
  }

  /** Track n turns; calls onTurn after each turn if given (for diagnostics every K turns). */
  track(n: number, onTurn?: (t: Tracker) => void): void {
    for (let i = 0; i < n; i++) {
      this.step();
      if (onTurn) onTurn(this);
    }
  }

  /** Replace the setup keeping the beam, turn and the synchronous particle's momentum and time; applies from the next turn. */
  updateSetup(setup: Setup): void {
    const s = this.stepper.state;
    const next = new MachineStepper(setup);
    next.resumeAt(s.turn, s.time, s.pc);
    this.stepper = next;
    this.build(setup);
  }

  /** Add an element (e.g. a collective kick) to the per-turn sequence, after the RF kicks. */
  addElement(e: Element): void {
    this.extras.push(e);
  }

  private step(): void {
    const b = this.bunch;
    const cur = this.stepper.state;
    const gaps = this.gaps;
    const extras = this.extras;
    const fast = this.fast;
    if (fast !== null) {
      fast.setKick(cur);
      const stage = this.stage, induced = this.induced;
      if (stage !== null && induced !== null && extras.length === 0) {
        induced.prepare(b, cur, stage);
        this.stepper.advance();
        fast.setDrift(cur);
        fast.applyKickDriftInduced(b, stage);
        induced.settle(b, stage);
        return;
      }
      if (this.physics.length + extras.length === 0) {
        this.stepper.advance();
        fast.setDrift(cur);
        fast.applyKickDrift(b);
        return;
      }
      fast.applyKick(b);
      for (let j = 0; j < this.physics.length; j++) this.physics[j].apply(b, cur);
      for (let j = 0; j < extras.length; j++) extras[j].apply(b, cur);
      this.stepper.advance();
      fast.setDrift(cur);
      fast.applyDrift(b);
      return;
    }
    if (this.ahead === null) {
      gaps[0].kick.apply(b, cur);
      for (let j = 0; j < this.physics.length; j++) this.physics[j].apply(b, cur);
      for (let j = 0; j < extras.length; j++) extras[j].apply(b, cur);
      this.stepper.advance(); // cur is now the state of turn n+1
      gaps[0].drift.apply(b, cur);
      return;
    }
    const nxt = this.ahead.state;
    const last = gaps.length - 1;
    for (let g = 0; g <= last; g++) {
      gaps[g].kick.apply(b, cur);
      if (g === last) for (let j = 0; j < this.physics.length; j++) this.physics[j].apply(b, cur);
      if (g === last) for (let j = 0; j < extras.length; j++) extras[j].apply(b, cur);
      gaps[g].drift.apply(b, nxt);
    }
    this.stepper.advance();
    this.ahead.advance();
  }

  // Group RF systems by position into gaps, with the arc to the next gap after each.
  private build(setup: Setup): void {
    const byPos = new Map<number, number[]>();
    setup.rf.systems.forEach((r, k) => {
      const list = byPos.get(r.position) ?? [];
      list.push(k);
      byPos.set(r.position, list);
    });
    const pos = [...byPos.keys()].sort((a, b) => a - b);
    this.induced = inducedKickFromSetup(setup, this.stepper.state);
    const rad = radiationKickFromSetup(setup);
    this.physics = [this.induced, rad].filter((e): e is Element => e !== null);
    const { drift: mode, momentumAperture } = setup.run;
    this.gaps = pos.map((p, g) => {
      const frac = g + 1 < pos.length ? pos[g + 1] - p : 1 - p + pos[0];
      return { kick: rfKick(byPos.get(p)!), drift: drift(frac, mode, momentumAperture) };
    });
    const single = pos.length === 1 && setup.rf.systems.length <= MAX_RF;
    this.fast = single && this.kernel && this.cols ? new KernelGap(this.kernel, byPos.get(pos[0])!, mode, momentumAperture, this.cols) : null;
    // The induced voltage alone rides in the kernel's pass (its tables live in the kernel's memory).
    if (this.stage) this.kernel!.freeInduced(this.stage);
    this.stage = this.fast && this.induced && this.physics.length === 1 ? this.kernel!.allocInduced(this.induced.bins) : null;
    if (this.cols) {
      // an allocation may have grown the kernel's memory: the Columns object is re-pointed, the bunch's fields are not
      this.bunch.dt = this.cols.dt;
      this.bunch.dE = this.cols.dE;
    }
    if (pos.length > 1) {
      const s = this.stepper.state;
      this.ahead = new MachineStepper(setup);
      this.ahead.resumeAt(s.turn, s.time, s.pc);
      this.ahead.advance();
    } else this.ahead = null;
  }
}
