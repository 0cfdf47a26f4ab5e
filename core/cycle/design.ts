// Design helpers: the voltage program that keeps the bucket area constant along a momentum program, and the
// fastest momentum ramp the RF can carry at a given filling factor. Both solve on the same machine states the
// tracker uses and return programs ready for a setup (core/program/apply.ts).
// Units: time in s, p·c and energies in eV, voltages in V, areas in eV·s.
import { computeBucket } from '../bucket.ts';
import { MachineStepper, type MachineState } from '../machine.ts';
import type { ProgramData } from '../program/apply.ts';
import type { Setup } from '../setup/schema.ts';
import { solveSyncPhase } from '../synchronous.ts';
import { beamEmittance } from './planner.ts';
import { CycleTimeline } from './timeline.ts';

const VOLTAGE_MAX = 1e9; // V, the setup schema's limit
const SOLVE_TOL = 1e-6; // relative area accuracy of each solved sample
const MAX_DEPTH = 12; // interval halvings when refining a voltage program

/** Bucket area [eV·s] of state m with every voltage scaled by f and the energy gain per turn set to dEs [eV]; 0 if no bucket. */
export function areaWith(m: MachineState, f: number, dEs: number): number {
  const extra = m.wave.dEs - m.dEs; // radiation loss the RF also supplies, if any
  const wave = { ZV: m.wave.ZV.map((z) => z * f), n: m.wave.n, offset: m.wave.offset, dEs: dEs + extra };
  const sol = solveSyncPhase(wave, m.slope);
  if (!sol.ok) return 0;
  const rf = m.rf.map((r) => ({ ...r, V: r.V * f, phi: (r.h / m.h) * sol.phiS + r.offset }));
  const b = computeBucket({ ...m, wave, dEs, phiS: sol.phiS, noBucket: null, rf });
  return b.ok ? b.bucket.area : 0;
}

/** Target of a constant-bucket design: an area [eV·s], or a filling factor of the beam (emittance default: the setup's beam). */
export type BucketTarget = { area: number } | { filling: number; emittance?: number };

/** Voltage programs (one per RF system, ratios kept) that hold the bucket area at the target along the setup's momentum program. */
export function constantBucketVoltage(
  setup: Setup, target: BucketTarget, opts: { samples?: number; tolerance?: number; duration?: number } = {},
): { area: number; programs: (ProgramData<'voltage'> & { start: number })[] } {
  const area = 'area' in target ? target.area : (target.emittance ?? beamEmittance(setup).value) / target.filling;
  if (!(area > 0 && Number.isFinite(area))) throw new RangeError(`target bucket area = ${area} eV·s: must be a finite number > 0`);
  const tol = opts.tolerance ?? 0.005;
  const base = withoutVoltagePrograms(setup);
  const line = new CycleTimeline(base, opts.duration);
  const n = Math.max(2, opts.samples ?? 33);
  // States at solved times, in time order (the timeline only moves forward, so refine interval by interval).
  const t: number[] = [], f: number[] = [];
  const stateAt = (time: number) => new CycleTimeline(base, line.duration).at(time);
  let prevT = 0, prevF = solveScale(line.at(0), area, 1, 0);
  t.push(0); f.push(prevF);
  for (let i = 1; i < n; i++) {
    const ti = (line.duration * i) / (n - 1);
    const fi = solveScale(line.at(ti), area, prevF, ti);
    refine(prevT, prevF, ti, fi, 0);
    t.push(ti); f.push(fi);
    prevT = ti; prevF = fi;
  }
  // Insert midpoints where linear interpolation of the voltages misses the area by more than tol/2.
  function refine(ta: number, fa: number, tb: number, fb: number, depth: number): void {
    if (depth >= MAX_DEPTH) return;
    const tm = 0.5 * (ta + tb);
    const m = stateAt(tm);
    const err = areaWith(m, 0.5 * (fa + fb), m.dEs) / area - 1;
    if (Math.abs(err) <= tol / 2) return;
    const fm = solveScale(m, area, 0.5 * (fa + fb), tm);
    refine(ta, fa, tm, fm, depth + 1);
    t.push(tm); f.push(fm);
    refine(tm, fm, tb, fb, depth + 1);
  }
  const programs = setup.rf.systems.map((s) => ({
    quantity: 'voltage' as const,
    start: s.voltage * f[0],
    points: t.slice(1).map((ti, j) => [ti, s.voltage * f[j + 1]] as [number, number]),
  }));
  return { area, programs };
}

/** Fastest momentum program (p·c against time) from the setup's start to pcEnd [eV] keeping the bucket area ≥ emittance/filling with the setup's RF. */
export function fastestRamp(
  setup: Setup, pcEnd: number, target: { filling: number; emittance?: number }, opts: { steps?: number } = {},
): { area: number; program: ProgramData<'momentum'> & { start: number } } {
  const area = (target.emittance ?? beamEmittance(setup).value) / target.filling;
  if (!(area > 0 && Number.isFinite(area))) throw new RangeError(`target bucket area = ${area} eV·s: must be a finite number > 0`);
  const flat: Setup = { ...setup, energy: { ...setup.energy, ramp: { kind: 'flat' } } };
  const st = new MachineStepper(flat);
  const pc0 = st.state.pc;
  if (!(pcEnd > pc0)) throw new RangeError(`final p·c = ${pcEnd} eV: must exceed the start, ${pc0} eV`);
  const steps = opts.steps ?? 200;
  const dp = (pcEnd - pc0) / steps;
  // d(pc)/dt = ΔE_s/(β·T0): the largest gain per turn whose bucket still has the target area.
  const rate = (t: number, pc: number): number => {
    st.resumeAt(0, t, pc);
    const m = st.state;
    if (areaWith(m, 1, 0) < area) throw new RangeError(`at t = ${t} s, p·c = ${pc} eV even a stationary bucket is smaller than ${area} eV·s: lower the filling target or raise the voltage`);
    return largestGain(m, area) / (m.beta * m.T0);
  };
  const points: [number, number][] = [];
  let t = 0, pc = pc0;
  for (let i = 0; i < steps; i++) {
    const r1 = rate(t, pc);
    const rm = rate(t + (0.5 * dp) / r1, pc + 0.5 * dp); // midpoint in p·c
    t += dp / rm;
    pc += dp;
    points.push([t, pc]);
  }
  return { area, program: { quantity: 'momentum', start: pc0, points } };
}

/**
 * The largest energy gain per turn dEs [eV] whose bucket still has `area` (state m's RF as it is; the area at dEs = 0
 * is at least `area`): regula falsi (Illinois) on area(dEs) − area, which falls from ≥ 0 at 0 to −area at Σ|Z·V|,
 * to a bracket of 1e-10 of Σ|Z·V| or an area within GAIN_TOL; returns the bracket's side that keeps the area
 * (about 10 bucket areas instead of the 51 of bisection to the last bit: the helper runs 3× faster).
 */
export function largestGain(m: MachineState, area: number): number {
  let lo = 0, hi = m.wave.ZV.reduce((a, z) => a + Math.abs(z), 0);
  let glo = areaWith(m, 1, lo) - area, ghi = -area, side = 0;
  for (let k = 0; k < 100 && hi - lo > 1e-10 * hi; k++) {
    let x = (lo * ghi - hi * glo) / (ghi - glo);
    if (!(x > lo && x < hi)) x = 0.5 * (lo + hi);
    const gx = areaWith(m, 1, x) - area;
    if (gx >= 0) {
      lo = x; glo = gx;
      if (gx <= GAIN_TOL * area) break;
      if (side === 1) ghi /= 2;
      side = 1;
    } else {
      hi = x; ghi = gx;
      if (side === -1) glo /= 2;
      side = -1;
    }
  }
  return lo;
}
const GAIN_TOL = 1e-7; // relative area margin of the fastest ramp's solved gains

// Common voltage scale f with area(f) = target: regula falsi (Illinois) in (log f, log area) after bracketing.
function solveScale(m: MachineState, area: number, guess: number, t: number): number {
  const g = (x: number) => {
    const a = areaWith(m, Math.exp(x), m.dEs);
    return a > 0 ? Math.log(a / area) : -Infinity;
  };
  let a = Math.log(guess), ga = g(a);
  let b = a, gb = ga;
  const vMax = Math.max(...m.rf.map((r) => r.V));
  const xMax = Math.log(VOLTAGE_MAX / vMax);
  while (!(ga < 0)) { b = a; gb = ga; a -= Math.LN2; ga = g(a); }
  while (!(gb > 0)) {
    a = b; ga = gb; b += Math.LN2;
    if (b > xMax) throw new RangeError(`at t = ${t} s no voltage up to ${VOLTAGE_MAX} V gives a bucket of ${area} eV·s`);
    gb = g(b);
  }
  if (!Number.isFinite(ga)) { // no bucket at a: bisect until there is one
    while (!Number.isFinite(ga)) { const c = 0.5 * (a + b); const gc = g(c); if (gc > 0) { b = c; gb = gc; } else { a = c; ga = gc; } }
  }
  let side = 0;
  for (let k = 0; k < 100 && Math.abs(b - a) > 1e-12; k++) {
    const c = (a * gb - b * ga) / (gb - ga);
    const gc = g(c);
    if (Math.abs(gc) < SOLVE_TOL) return Math.exp(c);
    if (gc < 0) { a = c; ga = gc; if (side === -1) gb /= 2; side = -1; }
    else { b = c; gb = gc; if (side === 1) ga /= 2; side = 1; }
  }
  return Math.exp(0.5 * (a + b));
}

function withoutVoltagePrograms(s: Setup): Setup {
  return { ...s, rf: { ...s.rf, systems: s.rf.systems.map((r) => ({ ...r, program: r.program?.phase ? { phase: r.program.phase } : undefined })) } };
}
