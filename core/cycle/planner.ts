// Cycle planner: the RF bucket along the whole cycle, against the beam, with the intervals that need attention.
// Units: time in s, energies in eV, areas in eV·s, frequencies in Hz, phases in degrees in the output.
// Filling factor = beam emittance / bucket area; the emittance in eV·s is the adiabatic invariant of the
// (dt, dE) map (PHYSICS.md §4), so one number holds along the cycle. Adiabaticity α = |dω_s/dt|/ω_s²
// (PHYSICS.md §10), ω_s = 2π·f_s (small amplitude), by central differences between samples.
import { matchBunch } from '../beam/index.ts';
import { computeBucket } from '../bucket.ts';
import { machineAtStart, type MachineState } from '../machine.ts';
import type { MachineEvent } from '../program/machinePrograms.ts';
import type { Setup } from '../setup/schema.ts';
import { smallAmplitudeTune } from '../synchrotron.ts';
import { CycleTimeline } from './timeline.ts';

/** Planner settings; every field optional. */
export interface CycleOptions {
  /** Sample times, evenly spaced over the cycle (default 400). */
  samples?: number;
  /** Cycle length [s] (default: run.turns turns or the end of the programs, whichever is later). */
  duration?: number;
  /** Filling factor above which the bucket counts as too small (default 0.8). */
  fillingLimit?: number;
  /** Adiabaticity above which changes count as too fast (default 0.1, PHYSICS.md §10 (mem.)). */
  adiabaticLimit?: number;
  /** Beam emittance [eV·s] (default: from the setup's beam at t = 0, see beamEmittance). */
  emittance?: number;
}

/** A stretch of the cycle that needs attention. */
export interface CycleInterval {
  kind: 'overfilled' | 'noBucket' | 'nonAdiabatic';
  tStart: number;
  tEnd: number;
  turnStart: number;
  turnEnd: number;
  message: string;
}

/** Columns along the cycle (one entry per sample) plus the flagged intervals. */
export interface CyclePlan {
  time: Float64Array; // [s]
  turn: Float64Array;
  energy: Float64Array; // total energy of the synchronous particle [eV]
  gamma: Float64Array;
  eta: Float64Array;
  phiS: Float64Array; // main-harmonic synchronous phase [deg], NaN without a bucket
  voltage: Float64Array[]; // per RF system [V]
  bucketArea: Float64Array; // [eV·s], NaN without a bucket
  bucketHalfHeight: Float64Array; // [eV]
  fs: Float64Array; // small-amplitude synchrotron frequency [Hz]
  filling: Float64Array; // emittance / bucket area
  adiabaticity: Float64Array; // |dω_s/dt|/ω_s²
  emittance: number; // [eV·s]
  emittanceNote: string;
  /** Time γ crosses γt [s], or NaN if it does not within the cycle. */
  transitionTime: number;
  intervals: CycleInterval[];
  events: MachineEvent[];
}

export const DEFAULT_FILLING_LIMIT = 0.8;
export const DEFAULT_ADIABATIC_LIMIT = 0.1;

/** Walk the cycle and tabulate the bucket against the beam. Throws RangeError naming a bad option. */
export function planCycle(setup: Setup, opts: CycleOptions = {}): CyclePlan {
  const n = check('samples', opts.samples ?? 400, 2, 1e6, true);
  const fLim = check('fillingLimit', opts.fillingLimit ?? DEFAULT_FILLING_LIMIT, 1e-6, 10, false);
  const aLim = check('adiabaticLimit', opts.adiabaticLimit ?? DEFAULT_ADIABATIC_LIMIT, 1e-9, 1e6, false);
  const em = opts.emittance === undefined ? beamEmittance(setup) : { value: check('emittance', opts.emittance, 0, 1e6, false), note: 'given' };
  const line = new CycleTimeline(setup, opts.duration === undefined ? undefined : check('duration', opts.duration, 1e-12, 1e4, false));
  const N = n;
  const col = () => new Float64Array(N).fill(NaN);
  const plan: CyclePlan = {
    time: col(), turn: col(), energy: col(), gamma: col(), eta: col(), phiS: col(),
    voltage: setup.rf.systems.map(col), bucketArea: col(), bucketHalfHeight: col(), fs: col(), filling: col(), adiabaticity: col(),
    emittance: em.value, emittanceNote: em.note, transitionTime: NaN, intervals: [], events: [],
  };
  for (let i = 0; i < N; i++) {
    const t = (line.duration * i) / (N - 1);
    const m = line.at(t);
    plan.time[i] = t; plan.turn[i] = m.turn; plan.energy[i] = m.Es; plan.gamma[i] = m.gamma; plan.eta[i] = m.eta0;
    for (let k = 0; k < m.rf.length; k++) plan.voltage[k][i] = m.rf[k].V;
    const b = computeBucket(m);
    if (!b.ok) continue;
    plan.phiS[i] = (m.phiS * 180) / Math.PI;
    plan.bucketArea[i] = b.bucket.area;
    plan.bucketHalfHeight[i] = b.bucket.halfHeightDE;
    plan.fs[i] = smallAmplitudeTune(m).fs;
    plan.filling[i] = em.value / b.bucket.area;
  }
  plan.events = line.stepper.state.events;
  adiabaticity(plan);
  plan.transitionTime = transitionTime(setup, plan, line.duration);
  plan.intervals = flag(plan, fLim, aLim);
  return plan;
}

/** Emittance [eV·s] of the setup's beam at t = 0: matched → area of its limiting contour; coasting → one RF period × 4σE (±2σ band, common practice); unmatched → 4π·σt·σE. */
export function beamEmittance(setup: Setup): { value: number; note: string } {
  const m = machineAtStart(setup);
  const d = setup.beam.distribution;
  if (d.kind === 'coasting') return { value: ((2 * Math.PI) / m.omegaRf) * 4 * d.rmsEnergySpread, note: 'coasting beam: one RF period × 4σE (±2σ band)' };
  if (d.kind === 'unmatched') {
    const sigmaE = d.mismatch * m.beta * m.beta * m.Es * (2 * Math.PI * smallAmplitudeTune(m).fs / Math.abs(m.eta0)) * d.rmsLength;
    return { value: 4 * Math.PI * d.rmsLength * sigmaE, note: 'unmatched beam: 4π·σt·σE' };
  }
  const b = computeBucket(m);
  if (!b.ok) throw new RangeError(`beam.distribution.kind = matched: ${b.reason} at t = 0`);
  return { value: matchBunch(m, b.bucket, d.shape, d.size).contourArea, note: 'matched beam: area of its limiting contour' };
}

function adiabaticity(p: CyclePlan): void {
  const N = p.time.length;
  for (let i = 0; i < N; i++) {
    const a = Math.max(0, i - 1), b = Math.min(N - 1, i + 1);
    const w = 2 * Math.PI * p.fs[i];
    const dw = (2 * Math.PI * (p.fs[b] - p.fs[a])) / (p.time[b] - p.time[a]);
    p.adiabaticity[i] = w > 0 ? Math.abs(dw) / (w * w) : NaN;
  }
}

// Where γ = γt: bisection on the momentum program between the samples that bracket the sign change of η.
function transitionTime(setup: Setup, p: CyclePlan, duration: number): number {
  for (let i = 1; i < p.time.length; i++) {
    if (p.eta[i - 1] < 0 === p.eta[i] < 0) continue;
    let lo = p.time[i - 1], hi = p.time[i];
    const below = p.eta[i - 1] < 0;
    for (let k = 0; k < 60; k++) {
      const mid = 0.5 * (lo + hi);
      const m: MachineState = new CycleTimeline(setup, duration).at(mid);
      if (m.eta0 < 0 === below) lo = mid;
      else hi = mid;
    }
    return 0.5 * (lo + hi);
  }
  return NaN;
}

function flag(p: CyclePlan, fLim: number, aLim: number): CycleInterval[] {
  const out: CycleInterval[] = [];
  const tests: [CycleInterval['kind'], (i: number) => boolean, (a: number, b: number) => string][] = [
    ['noBucket', (i) => Number.isNaN(p.bucketArea[i]), () => 'no RF bucket'],
    ['overfilled', (i) => p.filling[i] > fLim, (a, b) => `bucket too small for the beam: filling factor up to ${fmt(maxOf(p.filling, a, b))} (limit ${fmt(fLim)})`],
    ['nonAdiabatic', (i) => p.adiabaticity[i] > aLim, (a, b) => `changes too fast to be adiabatic: α = |dω_s/dt|/ω_s² up to ${fmt(maxOf(p.adiabaticity, a, b))} (limit ${fmt(aLim)})`],
  ];
  for (const [kind, bad, say] of tests) {
    let start = -1;
    for (let i = 0; i <= p.time.length; i++) {
      const on = i < p.time.length && bad(i);
      if (on && start < 0) start = i;
      if (!on && start >= 0) {
        const e = i - 1;
        out.push({ kind, tStart: p.time[start], tEnd: p.time[e], turnStart: p.turn[start], turnEnd: p.turn[e], message: `t = ${fmt(p.time[start])} … ${fmt(p.time[e])} s: ${say(start, e)}` });
        start = -1;
      }
    }
  }
  return out.sort((a, b) => a.tStart - b.tStart);
}

function maxOf(x: Float64Array, a: number, b: number): number {
  let m = -Infinity;
  for (let i = a; i <= b; i++) if (x[i] > m) m = x[i];
  return m;
}

function check(name: string, v: number, lo: number, hi: number, integer: boolean): number {
  if (!(Number.isFinite(v) && v >= lo && v <= hi) || (integer && !Number.isInteger(v)))
    throw new RangeError(`${name} = ${v}: must be ${integer ? 'an integer' : 'a number'} in [${lo}, ${hi}]`);
  return v;
}

function fmt(x: number): string {
  return Number(x.toPrecision(4)).toString();
}
