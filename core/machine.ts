// Machine state turn by turn: synchronous-particle kinematics, revolution period, slip factors, RF phases.
// Units: energies in eV (pc in eV), times in s, lengths in m, phases in rad, voltages in V.
// Turn n: the synchronous particle crosses the RF with energy Es(n) and gains dEs(n) = Es(n+1) − Es(n).
// Ramps (PHYSICS.md §4): gainPerTurn adds a fixed energy; bDot advances p·c by Z·c·ρ·Ḃ·T0 per turn;
// momentumRate advances p·c by (d(pc)/dt)·T0 per turn.
// Programs (core/program): table and smooth ramps give p·c(t), so turn n+1 has p·c(t_n + T0(n)); RF programs give
// V_k(t_n) and Φ_k(t_n) on turn n; rf.slope 'timed' puts the transition jump at rf.switchTime.
import { C_LIGHT, DEG, TWO_PI } from './constants.ts';
import { eta0, eta1, fromKinetic, fromMomentum, fromTotal, type Compaction, type Kinematics } from './kinematics.ts';
import { makeParticle, type Particle } from './particle.ts';
import { energyLossPerTurn, radiationLattice, type RadiationLattice } from './radiation.ts';
import type { RfWave } from './rf.ts';
import type { Setup } from './setup/schema.ts';
import { solveSyncPhase, storeSyncPhase, stableSlope, type Slope } from './synchronous.ts';
import { buildPrograms, fmtEvent, slopeSwitchMessage, type CyclePrograms, type MachineEvent } from './program/machinePrograms.ts';

// RF phases are quoted as the particle sees them (its energy gain), so the sign of the charge is absorbed in the
// phase: the RF gives |Z|·V·sin φ for either sign (an electron sees the field shifted by π). Common practice.
export interface RfSystemState {
  h: number;
  /** Peak voltage [V]. */
  V: number;
  /** Offset Φ_k from the main system [rad]. */
  offset: number;
  /** Fraction of the circumference where the gap sits. */
  position: number;
  /** Phase seen by the synchronous particle, φ_k = (h_k/h_1)·φ_s + Φ_k [rad]. */
  phi: number;
}

export interface MachineState {
  turn: number;
  /** Time since turn 0 [s]. */
  time: number;
  particle: Particle;
  circumference: number;
  compaction: Compaction;
  Es: number;
  gamma: number;
  beta: number;
  pc: number;
  T: number;
  T0: number;
  f0: number;
  omega0: number;
  eta0: number;
  eta1: number;
  /** Energy gained by the synchronous particle on this turn [eV]. */
  dEs: number;
  /** Energy radiated by the synchronous particle on this turn [eV] (0 without a radiation block); the RF supplies dEs + U0. */
  U0: number;
  /** Main harmonic number h_1. */
  h: number;
  omegaRf: number;
  rf: RfSystemState[];
  wave: RfWave;
  slope: Slope;
  /** Main-harmonic synchronous phase [rad] (NaN when no bucket). */
  phiS: number;
  /** Why there is no stable phase, or null. */
  noBucket: string | null;
  /** What happened so far (transition phase jump, bucket lost or regained), oldest first; grows only on such turns. */
  events: MachineEvent[];
}

/** Compaction factors from the ring block. */
export function compactionOf(s: Setup): Compaction {
  const a0 = s.ring.alpha0 ?? 1 / (s.ring.gammaT! * s.ring.gammaT!);
  return { alpha0: a0, alpha1: s.ring.alpha1, alpha2: s.ring.alpha2 };
}

/** Kinematics of the synchronous particle at turn 0. */
export function startKinematics(s: Setup, p: Particle): Kinematics {
  const { quantity, value } = s.energy.start;
  switch (quantity) {
    case 'kinetic':
      return fromKinetic(value, p.mass);
    case 'kineticPerNucleon':
      return fromKinetic(value * p.A, p.mass);
    case 'total':
      return fromTotal(value, p.mass);
    case 'momentum':
      return fromMomentum(value, p.mass);
  }
}

/** Steps the synchronous particle along the energy program, one turn at a time, updating in place. */
export class MachineStepper {
  readonly state: MachineState;
  private readonly setup: Setup;
  private readonly programs: CyclePrograms;
  private fresh = true; // no events on the first refresh
  private readonly radiation: RadiationLattice | null;
  private pcStep = 0; // change of p·c during the current turn [eV], set by refresh (once per turn)
  private readonly found = new Float64Array(1); // φs from storeSyncPhase (a returned number would be boxed)

  constructor(setup: Setup) {
    this.setup = setup;
    this.radiation = radiationLattice(setup);
    const p = makeParticle(setup.particle);
    const k = startKinematics(setup, p);
    const sys = setup.rf.systems;
    const h = sys[0].harmonic;
    const rf = sys.map((r) => ({ h: r.harmonic, V: r.voltage, offset: r.phase * DEG, position: r.position, phi: 0 }));
    this.state = {
      turn: 0, time: 0, particle: p, circumference: setup.ring.circumference, compaction: compactionOf(setup),
      Es: k.E, gamma: k.gamma, beta: k.beta, pc: k.pc, T: k.T, T0: 0, f0: 0, omega0: 0, eta0: 0, eta1: 0, dEs: 0, U0: 0,
      h, omegaRf: 0, rf,
      wave: { ZV: rf.map((r) => Math.abs(p.Z) * r.V), n: rf.map((r) => r.h / h), offset: rf.map((r) => r.offset), dEs: 0 },
      slope: 'rising', phiS: NaN, noBucket: null, events: [],
    };
    this.programs = buildPrograms(setup, p, k.pc);
    this.refresh();
  }

  /** Advance to the next turn. */
  advance(): void {
    const s = this.state;
    s.time += s.T0;
    s.turn += 1;
    s.pc += this.pcStep; // from refresh, before the clock moved: programs are looked up at time + T0
    setKinematics(s);
    this.refresh();
  }

  /** Continue at a given turn, time [s] and synchronous momentum p·c [eV] (e.g. after a setup change mid-run). */
  resumeAt(turn: number, time: number, pc: number): void {
    const s = this.state;
    const k = fromMomentum(pc, s.particle.mass);
    s.turn = turn; s.time = time;
    s.Es = k.E; s.gamma = k.gamma; s.beta = k.beta; s.pc = k.pc; s.T = k.T;
    this.refresh();
  }

  // Change of p·c [eV] during the current turn, into pcStep (so the programs are read once per turn). Each case
  // stores its own value: returned from a switch, the merged number was boxed (16 bytes a turn).
  private storeMomentumStep(): void {
    const s = this.state;
    const r = this.setup.energy.ramp;
    switch (r.kind) {
      case 'flat':
        this.pcStep = 0;
        break;
      case 'gainPerTurn': {
        const E = s.Es + r.value, m = s.particle.mass;
        this.pcStep = Math.sqrt((E - m) * (E + m)) - s.pc;
        break;
      }
      case 'bDot':
        this.pcStep = Math.abs(s.particle.Z) * C_LIGHT * this.setup.ring.bendingRadius! * r.value * s.T0;
        break;
      case 'momentumRate':
        this.pcStep = r.value * s.T0;
        break;
      case 'table':
      case 'smooth':
        this.pcStep = this.programs.pc!.at(s.time + s.T0) - s.pc;
        break;
    }
  }

  // Recompute the per-turn quantities from Es and the ramp.
  private refresh(): void {
    const s = this.state;
    s.T0 = s.circumference / (s.beta * C_LIGHT);
    s.f0 = 1 / s.T0;
    s.omega0 = TWO_PI * s.f0;
    s.omegaRf = s.h * s.omega0;
    s.eta0 = eta0(s.compaction, s.gamma);
    s.eta1 = eta1(s.compaction, s.gamma, s.beta);
    this.storeMomentumStep();
    const pc1 = s.pc + this.pcStep, m = s.particle.mass; // E at the end of the turn = hypot(pc1, m), written out (KINEMATICS)
    const a = pc1 < 0 ? -pc1 : pc1, big = a > m ? a : m, r = (a > m ? m : a) / big;
    s.dEs = big * Math.sqrt(1 + r * r) - s.Es;
    s.U0 = this.radiation ? energyLossPerTurn(s.particle, s.Es, this.radiation) : 0;
    (s.wave as { dEs: number }).dEs = s.dEs + s.U0; // synchronous condition ZΣV sin φ_k = ΔE_s + U0 (PHYSICS.md §4, §11)
    this.followRfPrograms();
    const slope0 = s.slope, phi0 = s.phiS, had = s.noBucket === null;
    const want = this.setup.rf.slope;
    s.slope = want === 'auto' ? stableSlope(s.eta0) : want === 'timed' ? (s.time < this.setup.rf.switchTime! ? 'rising' : 'falling') : want;
    storeSyncPhase(s.wave, s.slope, this.found);
    s.phiS = this.found[0];
    if (Number.isNaN(s.phiS)) {
      const sol = solveSyncPhase(s.wave, s.slope); // only to word the reason (rare)
      s.noBucket = sol.ok ? null : sol.reason;
    } else s.noBucket = null;
    if (!this.fresh && (slope0 !== s.slope || had !== (s.noBucket === null))) this.tell(slope0, phi0, had);
    this.fresh = false;
    for (let k = 0; k < s.rf.length; k++) {
      const r = s.rf[k];
      r.phi = (r.h / s.h) * s.phiS + r.offset;
    }
  }

  // Voltages and phase offsets from the RF programs at this turn's time, written in place.
  private followRfPrograms(): void {
    const s = this.state, { voltage, phase } = this.programs;
    const ZV = s.wave.ZV as number[], off = s.wave.offset as number[];
    for (let k = 0; k < s.rf.length; k++) {
      const v = voltage[k], f = phase[k];
      if (v) { s.rf[k].V = v.at(s.time); ZV[k] = Math.abs(s.particle.Z) * s.rf[k].V; }
      if (f) { s.rf[k].offset = f.at(s.time); off[k] = s.rf[k].offset; }
    }
  }

  // Record a slope switch or a bucket lost/regained on this turn (rare; allocates only then).
  private tell(slope0: Slope, phi0: number, had: boolean): void {
    const s = this.state;
    const gt = s.compaction.alpha0 > 0 ? 1 / Math.sqrt(s.compaction.alpha0) : NaN;
    const at = `turn ${s.turn}, t = ${fmtEvent(s.time)} s`;
    if (slope0 !== s.slope) {
      const rf = this.setup.rf;
      const msg = slopeSwitchMessage(s.turn, s.time, slope0, s.slope, phi0, s.phiS, s.gamma, gt, rf.slope === 'timed' ? rf.switchTime : undefined);
      s.events.push({ turn: s.turn, time: s.time, kind: 'slopeSwitch', message: msg });
    }
    if (had && s.noBucket !== null)
      s.events.push({ turn: s.turn, time: s.time, kind: 'bucketLost', message: `${at}: ${s.noBucket}` });
    else if (!had && s.noBucket === null)
      s.events.push({ turn: s.turn, time: s.time, kind: 'bucketRegained', message: `${at}: the bucket is back, φs = ${fmtEvent(s.phiS / DEG)}°` });
  }
}

// KINEMATICS: E = hypot(pc, m) (core/kinematics.ts) is written out where it runs every turn, for m > 0 (the same
// operations, without the special cases m > 0 makes moot): the tracker's turn is too big for V8 to inline every
// call in it, and a call it does not inline boxes its number arguments and result (16 bytes each, every turn).
// Synchronous kinematics from s.pc, written in place (no object per turn).
function setKinematics(s: MachineState): void {
  const m = s.particle.mass, pc = s.pc;
  const a = pc < 0 ? -pc : pc, big = a > m ? a : m, r = (a > m ? m : a) / big;
  s.Es = big * Math.sqrt(1 + r * r); // hypot(pc, m), written out (KINEMATICS)
  s.gamma = s.Es / m;
  s.beta = pc / s.Es;
  s.T = s.Es - m;
}

/** Machine state at turn 0 of a setup. */
export function machineAtStart(setup: Setup): MachineState {
  return new MachineStepper(setup).state;
}
