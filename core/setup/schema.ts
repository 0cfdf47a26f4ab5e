// The setup document, version 1: one JSON file for ring, particle, RF, energy program, beam and run settings.
// Units throughout: energies in eV (momenta as p·c in eV), times in s, lengths in m, voltages in V,
// phases in degrees, magnetic field rates in T/s. The same document travels in the URL and feeds the CLI.
import { z } from 'zod';
import { int, num } from './fields.ts';
import { programChecks, rfProgram, smoothRamp, switchTime, tableRamp } from './programs.ts';
import { collective, impedances, intensity, radiation } from './collective.ts';

export const SETUP_VERSION = 1;

const particle = z.discriminatedUnion('kind', [
  z.object({ kind: z.literal('proton') }).strict(),
  z.object({ kind: z.literal('electron') }).strict(),
  z.object({ kind: z.literal('positron') }).strict(),
  z
    .object({
      kind: z.literal('ion'),
      massNumber: int('', 1, 300, 'mass number A'),
      chargeState: int('e', 1, 120, 'charge state Z (charge in units of e)'),
      atomicMass: num('u', 0.5, 300, 'atomic mass of the neutral atom; default: the mass number').optional(),
      restEnergy: num('eV', 1e6, 3e11, 'rest energy of the ion; overrides atomicMass').optional(),
    })
    .strict(),
]);

const ring = z
  .object({
    circumference: num('m', 1, 1e5, 'circumference of the design orbit'),
    gammaT: num('', 1.0001, 1e4, 'transition gamma γt (α0 = 1/γt²); give this or alpha0').optional(),
    alpha0: num('', -1, 1, 'momentum compaction factor α0; give this or gammaT').optional(),
    alpha1: num('', -10, 10, 'second-order momentum compaction α1 (absolute form)').default(0),
    alpha2: num('', -100, 100, 'third-order momentum compaction α2').default(0),
    bendingRadius: num('m', 0.1, 1e5, 'bending radius of the dipoles (for B-field ramps and radiation)').optional(),
  })
  .strict()
  .refine((r) => (r.gammaT === undefined) !== (r.alpha0 === undefined), {
    error: 'give exactly one of gammaT or alpha0',
    path: ['gammaT'],
  });

const rfSystem = z
  .object({
    harmonic: int('', 1, 1e6, 'harmonic number h (RF frequency = h × revolution frequency)'),
    voltage: num('V', 0, 1e9, 'peak voltage'),
    phase: num('deg', -360, 360, 'phase offset from the main system, in this system\'s degrees (0 for the first system)').default(0),
    position: num('', 0, 0.999999, 'location around the ring as a fraction of the circumference').default(0),
    program: rfProgram.optional(),
  })
  .strict();

const rf = z
  .object({
    systems: z.array(rfSystem).min(1, { error: 'needs at least one RF system' }).max(8, { error: 'at most 8 RF systems' }),
    slope: z.enum(['auto', 'rising', 'falling', 'timed']).default('auto').meta({ description: 'RF slope carrying the bunch: auto picks by the slip factor (rising below transition, falling above); timed switches from rising to falling at rf.switchTime' }),
    switchTime: switchTime.optional(),
  })
  .strict()
  .refine((r) => (r.slope === 'timed') === (r.switchTime !== undefined), { error: "give rf.switchTime exactly when rf.slope is 'timed'", path: ['switchTime'] })
  // systems[0]?: these checks also run when the list is empty (its own length check reports that).
  .refine((r) => r.systems[0]?.program?.phase === undefined, { error: 'the main system defines the phase: it takes no phase program', path: ['systems', 0, 'program', 'phase'] })
  .refine((r) => (r.systems[0]?.phase ?? 0) === 0, { error: 'the first (main) system defines the phase: its phase must be 0', path: ['systems', 0, 'phase'] })
  .refine((r) => r.systems.every((s) => s.harmonic >= r.systems[0].harmonic), {
    error: 'the first system must have the lowest harmonic number (it defines the bucket spacing)',
    path: ['systems'],
  });

const energyStart = z
  .object({
    quantity: z.enum(['kinetic', 'total', 'momentum', 'kineticPerNucleon']).meta({ description: 'what value gives: kinetic or total energy of the whole particle, p·c, or kinetic energy per nucleon' }),
    value: num('eV', 1, 1e14, 'energy of the synchronous particle at turn 0 (eV; p·c in eV for momentum; eV per nucleon for kineticPerNucleon)'),
  })
  .strict();

const ramp = z.discriminatedUnion('kind', [
  z.object({ kind: z.literal('flat') }).strict(),
  z.object({ kind: z.literal('gainPerTurn'), value: num('eV', -1e9, 1e9, 'energy gain of the synchronous particle per turn') }).strict(),
  z.object({ kind: z.literal('bDot'), value: num('T/s', -1e3, 1e3, 'dipole field rate dB/dt (needs ring.bendingRadius)') }).strict(),
  z.object({ kind: z.literal('momentumRate'), value: num('eV/s', -1e16, 1e16, 'rate of change of p·c') }).strict(),
  tableRamp,
  smoothRamp,
]);

const size = z.discriminatedUnion('by', [
  z.object({ by: z.literal('rmsLength'), value: num('s', 1e-15, 1e-3, 'rms bunch length') }).strict(),
  z
    .object({
      by: z.literal('emittance'),
      convention: z.enum(['rms', 'fourSigma', 'contour']).meta({ description: 'rms: sqrt(<dt²><dE²>−<dt·dE>²), no π; fourSigma: 4π·σt·σE; contour: area of the Hamiltonian contour bounding the bunch' }),
      value: num('eV·s', 1e-12, 1e3, 'longitudinal emittance in the stated convention'),
    })
    .strict(),
]);

const distribution = z.discriminatedUnion('kind', [
  z.object({ kind: z.literal('matched'), shape: z.enum(['gaussian', 'parabolic', 'flat']).meta({ description: 'distribution as a function of the Hamiltonian' }), size }).strict(),
  z
    .object({
      kind: z.literal('unmatched'),
      shape: z.enum(['gaussian', 'parabolic']).meta({ description: 'shape in time and in energy' }),
      rmsLength: num('s', 1e-15, 1e-3, 'rms bunch length'),
      mismatch: num('', 0.05, 20, 'ratio of the rms energy spread to the linearly matched one (1 = matched)').default(1),
    })
    .strict(),
  z
    .object({
      kind: z.literal('coasting'),
      rmsEnergySpread: num('eV', 0, 1e12, 'rms energy spread of the coasting beam'),
    })
    .strict(),
]);

const beam = z
  .object({
    distribution,
    particles: int('', 1, 20_000_000, 'number of macroparticles'),
    seed: int('', 0, 2 ** 32 - 1, 'random seed (same seed, same beam)').default(1),
    timeOffset: num('s', -1, 1, 'centroid offset in time (positive = late)').default(0),
    energyOffset: num('eV', -1e12, 1e12, 'centroid offset in energy').default(0),
  })
  .strict();

const run = z
  .object({
    turns: int('', 1, 100_000_000, 'number of turns to track').default(1000),
    drift: z.enum(['linear', 'exact']).default('exact').meta({ description: 'linear: dt += T0·η0·δ; exact: time of flight from the momentum offset with α0, α1, α2' }),
    momentumAperture: num('', 1e-6, 0.5, 'particles with |Δp/p| beyond this are lost').default(0.02),
    diagnosticsEvery: int('turns', 1, 1_000_000, 'record diagnostics every this many turns').default(10),
    profileBins: int('', 16, 4096, 'bins of the line-density profile').default(256),
  })
  .strict();

export const setupSchema = z
  .object({
    version: z.literal(SETUP_VERSION, { error: `must be ${SETUP_VERSION} (older versions are migrated)` }).meta({ description: 'schema version of this file' }),
    title: z.string().max(200).default('').meta({ description: 'short name of the setup' }),
    note: z.string().max(2000).default('').meta({ description: 'free text, e.g. that the machine is fictional' }),
    particle,
    ring,
    energy: z.object({ start: energyStart, ramp: ramp.default({ kind: 'flat' }) }).strict(),
    rf,
    beam,
    run: run.default({ turns: 1000, drift: 'exact', momentumAperture: 0.02, diagnosticsEvery: 10, profileBins: 256 }),
    intensity: intensity.optional(),
    impedances: impedances.default([]),
    collective: collective.default({ bins: 512, smoothing: 1, window: 0, matchIterations: 300, matchTolerance: 1e-8 }),
    radiation: radiation.optional(),
  })
  .strict()
  .superRefine(programChecks);

/** A validated setup (defaults filled in). */
export type Setup = z.output<typeof setupSchema>;
/** What a user may write (defaults optional). */
export type SetupInput = z.input<typeof setupSchema>;
