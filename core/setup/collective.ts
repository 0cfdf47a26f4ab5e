// Setup blocks for intensity effects and synchrotron radiation: beam intensity, impedance models, the numerics
// of the induced-voltage calculation, and the radiation block. Units: Ω, Hz, s, m, A; impedances in the
// engineering convention e^{+jωt} (PHYSICS.md §12): Im Z > 0 is inductive.
import { z } from 'zod';
import { int, num } from './fields.ts';

/** Beam intensity: particles per bunch, or the average current of the bunch train. */
export const intensity = z
  .object({
    particlesPerBunch: num('', 0, 1e16, 'real particles in the tracked bunch (give this or averageCurrent)').optional(),
    averageCurrent: num('A', 0, 1e4, 'average circulating current of all bunches (give this or particlesPerBunch)').optional(),
    bunches: int('', 1, 100_000, 'identical, equally spaced bunches in the ring (must divide the main harmonic); long-lived resonator wakes add up over all of them').default(1),
  })
  .strict()
  .refine((r) => (r.particlesPerBunch === undefined) !== (r.averageCurrent === undefined), {
    error: 'give exactly one of particlesPerBunch or averageCurrent',
    path: ['particlesPerBunch'],
  });

const resonator = z
  .object({
    kind: z.literal('resonator'),
    shuntImpedance: num('Ω', 0, 1e12, 'shunt impedance R_s (Z at resonance)'),
    quality: num('', 0.01, 1e8, 'quality factor Q (about 1 for a broad-band model, large for a cavity mode)'),
    frequency: num('Hz', 1e3, 1e13, 'resonant frequency f_r'),
  })
  .strict();

const inductive = z
  .object({
    kind: z.literal('inductive'),
    imZOverN: num('Ω', -1e6, 1e6, 'Im Z/n, constant in frequency (positive = inductive, negative = capacitive)'),
  })
  .strict();

const spaceCharge = z
  .object({
    kind: z.literal('spaceCharge'),
    beamRadius: num('m', 1e-6, 1, 'beam radius a'),
    pipeRadius: num('m', 1e-5, 10, 'beam pipe radius b (must exceed a)'),
    geometry: z.enum(['onAxis', 'averaged']).default('onAxis').meta({ description: 'g0 = 1 + 2 ln(b/a) (field on axis) or 0.5 + 2 ln(b/a) (averaged over a uniform beam)' }),
  })
  .strict()
  .refine((s) => s.pipeRadius > s.beamRadius, { error: 'pipeRadius must exceed beamRadius', path: ['pipeRadius'] });

const table = z
  .object({
    kind: z.literal('table'),
    label: z.string().max(200).default('').meta({ description: 'where the table came from' }),
    frequency: z.array(num('Hz', 0, 1e14, 'frequency of a table row (increasing)')).min(2).max(100_000),
    re: z.array(num('Ω', -1e12, 1e12, 'Re Z at that frequency')).min(2).max(100_000),
    im: z.array(num('Ω', -1e12, 1e12, 'Im Z at that frequency (e^{+jωt}: positive = inductive)')).min(2).max(100_000),
  })
  .strict()
  .refine((t) => t.re.length === t.frequency.length && t.im.length === t.frequency.length, {
    error: 'frequency, re and im must have the same length',
    path: ['re'],
  })
  .refine((t) => t.frequency.every((f, i) => i === 0 || f > t.frequency[i - 1]), {
    error: 'frequencies must increase strictly',
    path: ['frequency'],
  });

/** Impedance models; any number act at once. */
export const impedances = z.array(z.discriminatedUnion('kind', [resonator, inductive, spaceCharge, table])).max(64);

/** Numerics of the line density and induced voltage. */
export const collective = z
  .object({
    bins: int('', 16, 65_536, 'bins of the line density over the window').default(512),
    smoothing: num('bins', 0, 100, 'rms width of the Gaussian filter applied to the line density (0 = none)').default(1),
    window: num('s', 0, 1, 'full length of the binning window, centred on the initial bunch; 0 = automatic (3 times the initial bunch extent, at most one RF period)').default(0),
    matchIterations: int('', 1, 10_000, 'at most this many self-consistent iterations for a matched beam with intensity').default(300),
    matchTolerance: num('', 1e-12, 0.1, 'self-consistent matching stops when the line density changes by less than this (max relative to the peak)').default(1e-8),
  })
  .strict();

/** Synchrotron radiation: energy loss, damping and quantum excitation. */
export const radiation = z
  .object({
    partitionE: num('', 0.01, 4, 'longitudinal damping partition number J_E = 2 + 𝒟'),
    I2: num('1/m', 1e-9, 1e6, 'radiation integral I2 = ∮ds/ρ²; default 2π/ρ from ring.bendingRadius').optional(),
    I3: num('1/m²', 1e-12, 1e9, 'radiation integral I3 = ∮ds/|ρ|³; default 2π/ρ² from ring.bendingRadius').optional(),
    damping: z.boolean().default(true).meta({ description: 'apply radiation damping' }),
    quantumExcitation: z.boolean().default(true).meta({ description: 'apply quantum excitation (random energy kicks)' }),
    seed: int('', 0, 2 ** 32 - 1, 'random seed of the quantum-excitation kicks').default(2),
  })
  .strict()
  .refine((r) => (r.I2 === undefined) === (r.I3 === undefined), { error: 'give both I2 and I3, or neither', path: ['I2'] });

/** Parsed blocks (defaults filled in). */
export type IntensitySetup = z.output<typeof intensity>;
export type ImpedanceSetup = z.output<typeof impedances>[number];
export type CollectiveSetup = z.output<typeof collective>;
export type RadiationSetup = z.output<typeof radiation>;
