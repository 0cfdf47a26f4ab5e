// Setup pieces for cycle programs: momentum ramps as tables or smooth shapes, per-system RF voltage and phase
// tables. Units: times in s, energies and p·c in eV, field in T, voltages in V, phases in degrees.
// A table lists points [time, value] after t = 0; the value at t = 0 is the static field (energy.start,
// rf.systems[k].voltage, .phase), values in between are linear, and the last one is held. A repeated time is a step.
import { z } from 'zod';
import { tableProblem } from '../program/table.ts';
import { num } from './fields.ts';

const MAX_POINTS = 100_000;
const TIME_MAX = 1e4; // s: longer than any cycle this tool is meant for

const time = num('s', 0, TIME_MAX, 'time since turn 0');

function table(value: ReturnType<typeof num>, what: string) {
  return z
    .array(z.tuple([time, value]).meta({ description: `one point [time (s), ${what}]; times after 0, non-decreasing (a repeated time is a step), linear in between, last value held` }), {
      error: `must be a list of [time (s), ${what}] pairs`,
    })
    .min(1, { error: 'needs at least one point' })
    .max(MAX_POINTS, { error: `at most ${MAX_POINTS} points` })
    .superRefine((pts, ctx) => {
      const p = tableProblem(pts);
      if (p) ctx.addIssue({ code: 'custom', message: p });
    })
    .meta({ description: `piecewise-linear program: [time (s), ${what}] points after t = 0, times non-decreasing (a repeated time is a step), last value held` });
}

const momentumQuantity = z
  .enum(['momentum', 'kinetic', 'total', 'kineticPerNucleon', 'field'])
  .meta({ description: 'what the program gives: p·c, kinetic or total energy (eV), kinetic energy per nucleon (eV), or the dipole field (T, needs ring.bendingRadius)' });

/** energy.ramp variant: momentum (or energy, or field) against time from a table. */
export const tableRamp = z
  .object({
    kind: z.literal('table'),
    quantity: momentumQuantity,
    points: table(num('eV or T', 0, 1e14, 'program value in the unit of quantity'), 'value (eV, or T for field)'),
  })
  .strict();

/** energy.ramp variant: parabolic–linear–parabolic ramp from energy.start to a target value. */
export const smoothRamp = z
  .object({
    kind: z.literal('smooth'),
    quantity: momentumQuantity,
    target: num('eV or T', 0, 1e14, 'value at the end of the ramp, in the unit of quantity (eV, or T for field)'),
    start: num('s', 0, TIME_MAX, 'time the ramp leaves the flat bottom').default(0),
    duration: num('s', 1e-9, TIME_MAX, 'ramp duration, from leaving the start value to reaching the target'),
    rounding: num('s', 0, TIME_MAX, 'duration of each parabolic part (0 … duration/2; 0 = linear with corners)').default(0),
  })
  .strict()
  .refine((r) => r.rounding <= r.duration / 2, { error: 'must not exceed half the ramp duration', path: ['rounding'] });

/** rf.systems[k].program: voltage and phase of one RF system against time. */
export const rfProgram = z
  .object({
    voltage: table(num('V', 0, 1e9, 'peak voltage'), 'peak voltage (V)').optional(),
    phase: table(num('deg', -360, 360, 'phase offset from the main system'), 'phase offset (deg)').optional(),
  })
  .strict()
  .meta({ description: 'voltage and phase of this system against time; the static voltage and phase hold at t = 0' });

/** rf.switchTime: when the 'timed' slope moves the bunch from the rising to the falling RF slope. */
export const switchTime = num('s', 0, TIME_MAX, "time of the transition phase jump when rf.slope = 'timed' (rising slope before, falling after)");

/** Checks across blocks: a field program needs the bending radius; per-nucleon energies need nucleons. */
export function programChecks(
  s: { ring: { bendingRadius?: number }; particle: { kind: string }; energy: { ramp: { kind: string; quantity?: string } } },
  ctx: z.RefinementCtx,
): void {
  const r = s.energy.ramp;
  if ((r.kind === 'table' || r.kind === 'smooth') && r.quantity === 'field' && s.ring.bendingRadius === undefined)
    ctx.addIssue({ code: 'custom', path: ['ring', 'bendingRadius'], input: undefined, message: 'a field program (energy.ramp.quantity = "field") needs the bending radius' });
  if ((r.kind === 'table' || r.kind === 'smooth') && r.quantity === 'kineticPerNucleon' && (s.particle.kind === 'electron' || s.particle.kind === 'positron'))
    ctx.addIssue({ code: 'custom', path: ['energy', 'ramp', 'quantity'], input: r.quantity, message: 'energy per nucleon needs an ion or a proton' });
}
