// Put a program (imported from CSV or computed by a design helper) into a setup document in one step, returning
// a new document; the caller validates it with parseSetup. Units as in the setup: s, eV, T, V, deg.
import { C_LIGHT } from '../constants.ts';
import { makeParticle } from '../particle.ts';
import type { SetupInput } from '../setup/schema.ts';
import type { MomentumQuantity } from './quantity.ts';

/** A program ready for a setup: value at t = 0 (null keeps the setup's) and the points after it. */
export interface ProgramData<Q extends string = string> {
  quantity: Q;
  start: number | null;
  points: [number, number][];
}

/** New setup with energy.ramp = the momentum program; a t = 0 value also becomes energy.start. */
export function withMomentumProgram(doc: SetupInput, prog: ProgramData<MomentumQuantity>): SetupInput {
  const d = structuredClone(doc);
  d.energy.ramp = { kind: 'table', quantity: prog.quantity, points: prog.points.map(([t, v]) => [t, v] as [number, number]) };
  if (prog.start !== null) {
    if (prog.quantity === 'field') {
      const rho = d.ring.bendingRadius;
      if (rho === undefined) throw new RangeError('a field program needs ring.bendingRadius');
      d.energy.start = { quantity: 'momentum', value: Math.abs(makeParticle(d.particle).Z) * C_LIGHT * prog.start * rho };
    } else d.energy.start = { quantity: prog.quantity, value: prog.start };
  }
  return d;
}

/** New setup with RF system k following the voltage or phase program; a t = 0 value becomes the static field. */
export function withRfProgram(doc: SetupInput, k: number, what: 'voltage' | 'phase', prog: ProgramData): SetupInput {
  const d = structuredClone(doc);
  const sys = d.rf.systems[k];
  if (!sys) throw new RangeError(`rf.systems[${k}]: there are ${d.rf.systems.length} RF systems`);
  if (what === 'phase' && k === 0) throw new RangeError('rf.systems[0]: the main system defines the phase and takes no phase program');
  if (prog.start !== null) sys[what] = prog.start;
  sys.program = { ...(sys.program ?? {}), [what]: prog.points.map(([t, v]) => [t, v] as [number, number]) };
  return d;
}
