// The programs a MachineStepper follows, built once from the setup, and the messages it emits.
// Units: time in s, p·c in eV, voltages in V, phase offsets in rad inside (degrees in the setup and in messages).
// Lookups move an index forward (TableProgram), so following the programs costs O(1) per turn and allocates nothing.
import { DEG } from '../constants.ts';
import type { Particle } from '../particle.ts';
import type { Setup } from '../setup/schema.ts';
import { pcOf, valueOfPc, type MomentumQuantity } from './quantity.ts';
import { smoothRamp } from './shapes.ts';
import { TableProgram, type Program } from './table.ts';

/** Something that happened on one turn, worth telling the user (rare: a transition jump, a bucket lost or regained). */
export interface MachineEvent {
  turn: number;
  /** Time since turn 0 [s]. */
  time: number;
  kind: 'slopeSwitch' | 'bucketLost' | 'bucketRegained';
  message: string;
}

/** Programs of one setup: p·c(t) [eV] (null for the rate-based ramps) and, per RF system, V(t) [V] and Φ(t) [rad]. */
export interface CyclePrograms {
  pc: Program | null;
  voltage: (Program | null)[];
  phase: (Program | null)[];
}

/** Build the programs of a setup; pc0 is the synchronous p·c at t = 0 [eV]. */
export function buildPrograms(setup: Setup, p: Particle, pc0: number): CyclePrograms {
  const r = setup.energy.ramp;
  const rho = setup.ring.bendingRadius;
  let pc: Program | null = null;
  if (r.kind === 'table' || r.kind === 'smooth') {
    const q: MomentumQuantity = r.quantity;
    const v0 = valueOfPc(q, pc0, p, rho);
    const inner: Program =
      r.kind === 'table'
        ? new TableProgram(v0, r.points)
        : smoothRamp({ v0, v1: r.target, start: r.start, duration: r.duration, rounding: r.rounding });
    pc = { end: inner.end, at: (t: number) => pcOf(q, inner.at(t), p, rho) };
  }
  const sys = setup.rf.systems;
  return {
    pc,
    voltage: sys.map((s) => (s.program?.voltage ? new TableProgram(s.voltage, s.program.voltage) : null)),
    phase: sys.map((s) => (s.program?.phase ? scaled(new TableProgram(s.phase, s.program.phase), DEG) : null)),
  };
}

/** True if any RF system has a program. */
export function hasRfPrograms(c: CyclePrograms): boolean {
  return c.voltage.some((v) => v !== null) || c.phase.some((v) => v !== null);
}

/** Time after which no program changes any more [s] (0 if there are none). */
export function programsEnd(c: CyclePrograms): number {
  let e = c.pc ? c.pc.end : 0;
  for (const v of c.voltage) if (v) e = Math.max(e, v.end);
  for (const v of c.phase) if (v) e = Math.max(e, v.end);
  return e;
}

function scaled(p: Program, k: number): Program {
  return { end: p.end, at: (t: number) => k * p.at(t) };
}

/** Message for a switch of the stable RF slope (the phase jump φs → π − φs at transition). */
export function slopeSwitchMessage(
  turn: number, time: number, from: string, to: string, phiBefore: number, phiAfter: number,
  gamma: number, gammaT: number, timed: number | undefined,
): string {
  const why = timed === undefined
    ? `automatically: the slip factor changed sign (γ = ${fmt(gamma)} crossed γt = ${fmt(gammaT)})`
    : `at the set time rf.switchTime = ${fmt(timed)} s (γ = ${fmt(gamma)}, γt = ${fmt(gammaT)})`;
  return `turn ${turn}, t = ${fmt(time)} s: stable phase switched from the ${from} to the ${to} RF slope, ` +
    `φs ${fmt(phiBefore / DEG)}° → ${fmt(phiAfter / DEG)}°, ${why}`;
}

function fmt(x: number): string {
  return Number.isFinite(x) ? Number(x.toPrecision(6)).toString() : String(x);
}

/** Formatting shared with the stepper's bucket messages. */
export const fmtEvent = fmt;
