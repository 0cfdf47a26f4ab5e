// Setup builders shared by the validation tests: a fictional proton ring with a few RF systems, validated by the
// real parser (so every test exercises the schema too). Units as in the setup file: eV, m, V, s.
import { machineAtStart, type MachineState } from '../../core/machine.ts';
import type { Setup } from '../../core/setup/schema.ts';
import { parseSetup } from '../../core/setup/validate.ts';

/** Parse a setup document or throw with the validation messages. */
export function setupOrThrow(doc: unknown): Setup {
  const r = parseSetup(doc);
  if (!r.ok) throw new Error(JSON.stringify(r.errors));
  return r.setup;
}

export interface RingOptions {
  circumference: number;
  gammaT: number;
  /** Kinetic energy of the synchronous proton [eV]. */
  kinetic: number;
  systems: { harmonic: number; voltage: number; phase?: number }[];
  /** Energy gain per turn [eV]; 0 = flat. */
  gain?: number;
  slope?: string;
  beam?: Record<string, unknown>;
  more?: Record<string, unknown>;
}

/** A proton ring; the beam defaults to a small matched gaussian (100 particles) where the test needs none. */
export function protonRing(o: RingOptions): Setup {
  return setupOrThrow({
    version: 1,
    particle: { kind: 'proton' },
    ring: { circumference: o.circumference, gammaT: o.gammaT },
    energy: { start: { quantity: 'kinetic', value: o.kinetic }, ramp: o.gain ? { kind: 'gainPerTurn', value: o.gain } : { kind: 'flat' } },
    rf: { systems: o.systems, ...(o.slope ? { slope: o.slope } : {}) },
    beam: o.beam ?? { distribution: { kind: 'matched', shape: 'gaussian', size: { by: 'rmsLength', value: 1e-8 } }, particles: 100 },
    ...o.more,
  });
}

/** Machine state at turn 0 of protonRing(o). */
export function protonMachine(o: RingOptions): MachineState {
  return machineAtStart(protonRing(o));
}
