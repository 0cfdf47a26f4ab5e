// Physics checks of a schema-valid setup. `rampErrors`: a start energy or an energy program that leaves the
// synchronous particle practically at rest (β < 1e-3), at turn 0 or within run.turns: parseSetup refuses them. `setupWarnings`: setups that
// run but may not mean what the user thinks (linear drift near transition, no bucket at turn 0, odd harmonics).
// Units: energies and p·c in eV, times in s, lengths in m, fields in T.
import { C_LIGHT } from '../constants.ts';
import { eta0, eta1, fromMomentum } from '../kinematics.ts';
import { CycleTimeline } from '../cycle/timeline.ts';
import { MachineStepper, startKinematics, type MachineState } from '../machine.ts';
import { makeParticle, type Particle } from '../particle.ts';
import { pcOf, QUANTITY_UNIT, valueOfPc } from '../program/quantity.ts';
import { linearlyMatchedSpread } from '../beam/unmatched.ts';
import { fmtNum } from './fields.ts';
import type { Setup } from './schema.ts';
import type { SetupIssue } from './validate.ts';

// Linear drift is trusted while the second-order term stays below this fraction of the first: common practice.
const NONLINEAR_FRACTION = 0.3;
// Beam half-extent in δ taken as this many rms (the tails that reach furthest): common practice.
const SIGMAS = 3;
// Rate ramps are followed in batches that change p·c by at most this fraction (timing error of the same order).
const BATCH_CHANGE = 0.01;
// Slowest synchronous particle accepted: closer to rest, E − m underflows against m in double precision for small
// energy steps (a proton at p·c = 1 eV has T = 5e-10 eV) and the revolution period grows without bound.
const MIN_BETA = 1e-3;

/** Impossible energies: the start, every program value and a falling ramp within run.turns must keep the particle moving (β ≥ 1e-3). */
export function rampErrors(s: Setup): SetupIssue[] {
  const p = makeParticle(s.particle);
  const r = s.energy.ramp;
  const k0 = startKinematics(s, p);
  const pcMin = (p.mass * MIN_BETA) / Math.sqrt(1 - MIN_BETA * MIN_BETA); // p·c at β = MIN_BETA
  if (!(k0.beta >= MIN_BETA))
    return [{ path: 'energy.start.value', value: s.energy.start.value, message: `leaves the ${p.name} practically at rest (β = ${fmtNum(k0.beta)}); the tracker needs β ≥ ${fmtNum(MIN_BETA)}, i.e. a kinetic energy of at least ${fmtNum(minKinetic(p.mass))} eV` }];
  if (r.kind === 'table' || r.kind === 'smooth') {
    const rho = s.ring.bendingRadius;
    const slow = (v: number) => !(pcOf(r.quantity, v, p, rho) >= pcMin);
    const least = `more than ${fmtNum(valueOfPc(r.quantity, pcMin, p, rho))} ${QUANTITY_UNIT[r.quantity]}`;
    const k = r.kind === 'table' ? r.points.findIndex(([, v]) => slow(v)) : slow(r.target) ? 0 : -1;
    if (k >= 0 && r.kind === 'table')
      return [{ path: `energy.ramp.points[${k}][1]`, value: r.points[k][1], message: `a ${r.quantity} program value that leaves the ${p.name} practically at rest (β < ${fmtNum(MIN_BETA)}); give ${least}` }];
    if (k >= 0) return [{ path: 'energy.ramp.target', value: r.kind === 'smooth' ? r.target : undefined, message: `a ${r.quantity} target that leaves the ${p.name} practically at rest (β < ${fmtNum(MIN_BETA)}); give ${least}` }];
  } else if (r.kind === 'gainPerTurn' && r.value < 0) {
    const turns = Math.floor((k0.E - Math.hypot(pcMin, p.mass)) / -r.value);
    if (turns < s.run.turns) return [stopIssue(r.value, 'eV', turns, s, p)];
  } else if ((r.kind === 'momentumRate' || r.kind === 'bDot') && r.value < 0) {
    const rate = r.kind === 'momentumRate' ? r.value : Math.abs(p.Z) * C_LIGHT * (s.ring.bendingRadius ?? 0) * r.value; // d(pc)/dt [eV/s]
    const turns = turnsToStop(k0.pc, pcMin, rate, s.ring.circumference, p.mass, s.run.turns);
    if (turns < s.run.turns) return [stopIssue(r.value, r.kind === 'bDot' ? 'T/s' : 'eV/s', turns, s, p)];
  }
  return [];
}

// Kinetic energy [eV] at β = MIN_BETA: T = m(γ − 1), written without cancellation.
function minKinetic(m: number): number {
  const b2 = MIN_BETA * MIN_BETA;
  return (m * b2) / (Math.sqrt(1 - b2) * (1 + Math.sqrt(1 - b2)));
}

function stopIssue(value: number, unit: string, turns: number, s: Setup, p: Particle): SetupIssue {
  return {
    path: 'energy.ramp.value', value,
    message: `this ${unit} ramp brings the ${p.name} practically to rest (β < ${fmtNum(MIN_BETA)}, energy near its rest energy ${fmtNum(p.mass)} eV) after about ${turns} turns, ` +
      `within run.turns = ${s.run.turns}; use a smaller rate or at most ${Math.max(1, turns - 1)} turns`,
  };
}

// Turns until p·c falls below pcMin under a constant negative rate (eV/s), or `limit` if not within `limit` turns.
function turnsToStop(pc0: number, pcMin: number, rate: number, C: number, mass: number, limit: number): number {
  let pc = pc0, n = 0;
  while (n < limit) {
    const T0 = C / (fromMomentum(pc, mass).beta * C_LIGHT);
    const step = rate * T0; // < 0
    const k = Math.min(limit - n, Math.max(1, Math.floor((BATCH_CHANGE * pc) / -step)));
    pc += k * step;
    n += k;
    if (!(pc >= pcMin)) return n;
  }
  return limit;
}

/** Warnings for a valid setup (it runs, but check these): each names the field, its value and why. */
export function setupWarnings(s: Setup): SetupIssue[] {
  const out: SetupIssue[] = [];
  const sys = s.rf.systems;
  const h1 = sys[0].harmonic;
  sys.forEach((r, k) => {
    if (k > 0 && r.harmonic % h1 !== 0)
      out.push({ path: `rf.systems[${k}].harmonic`, value: r.harmonic, message: `is not a multiple of the main harmonic ${h1}: neighbouring buckets differ, and only the one at the main system's phase is shown` });
    const j = sys.findIndex((q, i) => i < k && q.harmonic === r.harmonic && q.position === r.position);
    if (j >= 0)
      out.push({ path: `rf.systems[${k}].harmonic`, value: r.harmonic, message: `same harmonic and position as rf.systems[${j}]: the two act as one system (their voltages add as phasors)` });
  });
  let m;
  try {
    m = new MachineStepper(s).state;
  } catch (e) {
    return [...out, { path: '', value: undefined, message: `the machine cannot be set up: ${(e as Error).message}` }];
  }
  if (m.noBucket) out.push({ path: 'rf.systems[0].voltage', value: sys[0].voltage, message: `${m.noBucket} at turn 0 (only a coasting beam can be tracked)` });
  if (s.run.drift === 'linear') {
    const d = SIGMAS * deltaRms(s, m);
    const nearAt = linearDriftTrouble(s, m, d);
    if (nearAt !== null) {
      const q = nearAt.state, second = Math.abs(q.eta1) * d;
      out.push({
        path: 'run.drift', value: 'linear',
        message: nearAt.crossing
          ? `the ramp crosses transition (γt = ${fmtNum(1 / Math.sqrt(m.compaction.alpha0))}) near turn ${q.turn}, within run.turns = ${s.run.turns}: ` +
            `η0 goes through 0 there, so the linear drift misrepresents the motion; use "exact"`
          : `near transition${q.turn > 0 ? ` at turn ${q.turn}` : ''}: |η0| = ${fmtNum(Math.abs(q.eta0))} is not large against |η1|·δ = ${fmtNum(second)} ` +
            `(δ ≈ ${SIGMAS}σ of the beam = ${fmtNum(d)}), so the linear drift misrepresents the motion; use "exact"`,
      });
    }
  }
  return out;
}

// Where along the run the linear drift stops being trusted: at turn 0, else at one of RUN_SAMPLES times of the
// cycle within run.turns (CycleTimeline: the machine at any time without tracking), or where η0 changes sign
// between two of them (transition crossed; its turn by linear interpolation of η0); null if nowhere. δ is the
// beam's at turn 0 (it changes slowly).
const RUN_SAMPLES = 40;
interface SlipAt { turn: number; eta0: number; eta1: number }
function linearDriftTrouble(s: Setup, m0: MachineState, d: number): { state: SlipAt; crossing: boolean } | null {
  const bad = (q: SlipAt) => !(Math.abs(q.eta1) * d < NONLINEAR_FRACTION * Math.abs(q.eta0));
  if (bad(m0)) return { state: m0, crossing: false };
  if (s.energy.ramp.kind === 'flat') return null; // η does not change without an energy change
  let line: CycleTimeline;
  try {
    line = new CycleTimeline(s);
  } catch {
    return null; // no cycle to walk (the tracker reports what is wrong when it runs)
  }
  let turn = 0, eta = m0.eta0;
  for (let i = 1; i <= RUN_SAMPLES; i++) {
    const { turn: n, pc } = line.momentumAt((line.duration * i) / RUN_SAMPLES);
    const k = fromMomentum(pc, m0.particle.mass);
    const q = { turn: n, eta0: eta0(m0.compaction, k.gamma), eta1: eta1(m0.compaction, k.gamma, k.beta) };
    if (Math.sign(q.eta0) !== Math.sign(eta)) {
      const at = Math.round(turn + ((n - turn) * eta) / (eta - q.eta0)); // η0 = 0, linear between the samples
      return at <= s.run.turns ? { state: { ...q, turn: at }, crossing: true } : null;
    }
    if (n > s.run.turns) break;
    if (bad(q)) return { state: q, crossing: false };
    turn = n;
    eta = q.eta0;
  }
  return null;
}

// Rough rms δ of the requested beam from linear matching, PHYSICS.md §9 (capped by the momentum aperture).
function deltaRms(s: Setup, m: MachineStepper['state']): number {
  const d = s.beam.distribution, b2E = m.beta * m.beta * m.Es;
  let sigmaE: number;
  if (d.kind === 'coasting') sigmaE = d.rmsEnergySpread;
  else if (d.kind === 'unmatched') sigmaE = d.mismatch * linearlyMatchedSpread(m, d.rmsLength);
  else if (d.size.by === 'rmsLength') sigmaE = linearlyMatchedSpread(m, d.size.value);
  else {
    // σt·σE = ε_rms; σE/σt = β²E·ωs/|η| (linear matching); the contour of a parabolic bunch is about 6π ε_rms (common practice).
    const eRms = d.size.convention === 'rms' ? d.size.value : d.size.value / (d.size.convention === 'fourSigma' ? 4 * Math.PI : 6 * Math.PI);
    sigmaE = Math.sqrt(eRms * linearlyMatchedSpread(m, 1));
  }
  const delta = sigmaE / b2E;
  return Number.isFinite(delta) ? Math.min(delta, s.run.momentumAperture) : s.run.momentumAperture;
}
