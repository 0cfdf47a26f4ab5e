// Tracker checks: area preservation, time reversibility, the synchronous particle, the small-amplitude tune,
// losses. Units: dt in s, dE in eV.
import { describe, expect, it } from 'vitest';
import { bunchFrom, makeBunch, type Bunch } from '../core/bunch.ts';
import { drift } from '../core/elements/drift.ts';
import { rfKick } from '../core/elements/rfKick.ts';
import { fromMomentum } from '../core/kinematics.ts';
import type { MachineState } from '../core/machine.ts';
import { makeRng } from '../core/rng.ts';
import type { Setup } from '../core/setup/schema.ts';
import { parseSetup } from '../core/setup/validate.ts';
import { Tracker } from '../core/tracker.ts';
import { createJsKernel, makeDriftParams, makeKickParams } from '../core/kernels/index.ts';

type Sys = { harmonic: number; voltage: number; phase?: number; position?: number };
interface Opts { systems: Sys[]; kinetic?: number; ramp?: object; drift?: 'linear' | 'exact'; aperture?: number; gammaT?: number; slope?: string }

// A fictional proton ring (C = 180 m, γt = 4.8) at 200 MeV kinetic unless told otherwise.
export function ring(o: Opts): Setup {
  const r = parseSetup({
    version: 1,
    particle: { kind: 'proton' },
    ring: { circumference: 180, gammaT: o.gammaT ?? 4.8 },
    energy: { start: { quantity: 'kinetic', value: o.kinetic ?? 200e6 }, ramp: o.ramp ?? { kind: 'flat' } },
    rf: { systems: o.systems, slope: o.slope ?? 'auto' },
    beam: { distribution: { kind: 'unmatched', shape: 'gaussian', rmsLength: 1e-9 }, particles: 1 },
    run: { drift: o.drift ?? 'linear', momentumAperture: o.aperture ?? 0.05 },
  });
  if (!r.ok) throw new Error(JSON.stringify(r.errors));
  return r.setup;
}

// Small-amplitude tune from PHYSICS.md §6 [Lee ch. 3]: Qs² = h|η|·|F'(φs)|/(2πβ²E), F' = Z·Σ V_k n_k cos(φ_k).
function formulaQs(m: MachineState): number {
  let slope = 0;
  for (const r of m.rf) slope += m.particle.Z * r.V * (r.h / m.h) * Math.cos(r.phi);
  return Math.sqrt((m.h * Math.abs(m.eta0) * Math.abs(slope)) / (2 * Math.PI * m.beta * m.beta * m.Es));
}

// Energy per radian of main-harmonic phase for linear motion, PHYSICS.md §9: σE/(β²E) = (ωs/|η|)·σt.
function energyScale(m: MachineState): number {
  return (m.beta * m.beta * m.Es * formulaQs(m)) / (Math.abs(m.eta0) * m.h);
}

// One-turn map of the tracker applied to a list of points (dt, dE).
function oneTurn(setup: Setup, pts: number[][]): number[][] {
  const b = bunchFrom(Float64Array.from(pts.map((p) => p[0])), Float64Array.from(pts.map((p) => p[1])));
  const tr = new Tracker(setup, b);
  tr.track(1);
  expect(b.n).toBe(pts.length); // losses would reorder the columns
  return pts.map((_, i) => [b.dt[i], b.dE[i]]);
}

// Jacobian determinant by 4th-order central differences with one Richardson step (error O(s⁶)), in scaled
// coordinates x = ω_rf·dt, y = dE/E1 (E1 = energy per radian) so that every entry is O(1). Error budget:
// truncation ~ s⁶ ≈ 1e-14 at s = 5e-3; rounding ~ 2e-16·|x|·(18/12)/s·(17/15)·2 ≈ 2e-13. Both are below 1e-12,
// which is why that tolerance can be asked of a map whose exact determinant is 1 (PHYSICS.md §4).
function jacobianDet(setup: Setup, phi0: number, y0: number): number {
  const m = new Tracker(setup, makeBunch(1)).machine;
  const T1 = 1 / m.omegaRf, E1 = energyScale(m);
  const s = 5e-3;
  const steps = [s, 2 * s, -s, -2 * s, s / 2, s, -s / 2, -s];
  const pts: number[][] = [];
  for (const dir of [0, 1]) for (const st of steps) pts.push([(phi0 + (dir === 0 ? st : 0)) * T1, (y0 + (dir === 1 ? st : 0)) * E1]);
  const out = oneTurn(setup, pts).map((p) => [p[0] / T1, p[1] / E1]);
  const J = [[0, 0], [0, 0]];
  for (const dir of [0, 1]) {
    const o = out.slice(8 * dir, 8 * dir + 8);
    for (const c of [0, 1]) {
      const d4 = (a: number[], b: number[], c2: number[], d: number[], h: number) => (8 * a[c] - b[c] - 8 * c2[c] + d[c]) / (12 * h);
      const dh = d4(o[0], o[1], o[2], o[3], s);
      const dh2 = d4(o[4], o[5], o[6], o[7], s / 2);
      J[c][dir] = (16 * dh2 - dh) / 15; // Richardson: removes the s⁴ term
    }
  }
  return J[0][0] * J[1][1] - J[0][1] * J[1][0];
}

const accel = { kind: 'gainPerTurn', value: 250e3 }; // φs ≈ 14.5° at 1 MV
const oneRf = [{ harmonic: 8, voltage: 1e6 }];
const twoRfSameGap = [{ harmonic: 8, voltage: 1e6 }, { harmonic: 16, voltage: 0.3e6, phase: 180 }];
const twoRfTwoGaps = [{ harmonic: 8, voltage: 1e6 }, { harmonic: 16, voltage: 0.3e6, phase: 180, position: 0.4 }];

describe('one-turn map is area-preserving (PHYSICS.md §4: every step is a shear, det = 1)', () => {
  for (const mode of ['linear', 'exact'] as const)
    for (const [name, systems] of [['one RF', oneRf], ['two RF, one gap', twoRfSameGap], ['two RF, two gaps', twoRfTwoGaps]] as const)
      it(`${mode} drift, ${name}, accelerating`, () => {
        const setup = ring({ systems: [...systems], ramp: accel, drift: mode });
        for (const [phi0, y0] of [[0.8, 0.3], [-0.5, -0.6], [0.1, 0.9]]) {
          const d = jacobianDet(setup, phi0, y0);
          expect(Math.abs(d - 1)).toBeLessThan(1e-12);
        }
      });
});

// Record the machine state of every turn so the inverse map can be run backwards with the same elements.
function trackRecording(tr: Tracker, turns: number): MachineState[] {
  const states = [structuredClone(tr.machine)];
  tr.track(turns, (t) => states.push(structuredClone(t.machine)));
  return states;
}

describe('time reversibility (the inverse of a shear is the shear with the opposite sign)', () => {
  for (const mode of ['linear', 'exact'] as const)
    for (const [name, systems, gap] of [['one RF', oneRf, [0]], ['two RF', twoRfSameGap, [0, 1]]] as const)
      it(`${mode} drift, ${name}: 1000 turns forward and back recover the start (reference elements)`, () => {
        const setup = ring({ systems: [...systems], ramp: accel, drift: mode });
        const m0 = new Tracker(setup, makeBunch(1)).machine;
        const T1 = 1 / m0.omegaRf, E1 = energyScale(m0);
        const start = [[0.7, 0.2], [-0.4, 0.5], [0.05, -0.8], [1.2, 0]];
        const b = bunchFrom(Float64Array.from(start.map((p) => p[0] * T1)), Float64Array.from(start.map((p) => p[1] * E1)));
        const tr = new Tracker(setup, b, { kernel: 'reference' });
        const N = 1000;
        const S = trackRecording(tr, N);
        expect(b.n).toBe(start.length);
        const kickBack = rfKick([...gap], true);
        const driftBack = drift(1, mode, setup.run.momentumAperture, true);
        for (let n = N - 1; n >= 0; n--) {
          driftBack.apply(b, S[n + 1]);
          kickBack.apply(b, S[n]);
        }
        start.forEach((p, i) => {
          expect(Math.abs(b.dt[i] / T1 - p[0])).toBeLessThan(1e-12);
          expect(Math.abs(b.dE[i] / E1 - p[1])).toBeLessThan(1e-12);
        });
      });
});

describe('time reversibility of the default (kernel) path', () => {
  // The default tracker runs the turn kernel with its polynomial sine; running the same shears backwards with the
  // TypeScript kernel (bit-identical to the wasm one, core/kernels tests) and negated coefficients must undo it.
  for (const mode of ['linear', 'exact'] as const)
    it(`${mode} drift, two RF: 1000 turns forward and back recover the start`, () => {
      const setup = ring({ systems: [...twoRfSameGap], ramp: accel, drift: mode });
      const m0 = new Tracker(setup, makeBunch(1)).machine;
      const T1 = 1 / m0.omegaRf, E1 = energyScale(m0);
      const start = [[0.7, 0.2], [-0.4, 0.5], [0.05, -0.8], [1.2, 0]];
      const b = bunchFrom(Float64Array.from(start.map((p) => p[0] * T1)), Float64Array.from(start.map((p) => p[1] * E1)));
      const tr = new Tracker(setup, b);
      expect(tr.impl).not.toBe('reference');
      const S = trackRecording(tr, 1000);
      const k = createJsKernel();
      const cols = { dt: Float64Array.from(b.dt.subarray(0, 4)), dE: Float64Array.from(b.dE.subarray(0, 4)) };
      const kick = makeKickParams(), dr = makeDriftParams(mode);
      const wide = { dtMax: Infinity, dEmax: Infinity };
      for (let n = 999; n >= 0; n--) {
        const m1 = S[n + 1], m = S[n];
        if (mode === 'linear') dr.slip = -(m1.T0 * m1.eta0) / (m1.beta ** 2 * m1.Es);
        else Object.assign(dr, { period: -m1.T0, Es: m1.Es, beta2: m1.beta ** 2, gamma2: m1.gamma ** 2, ...m1.compaction });
        k.drift(cols, 4, dr, wide);
        kick.count = 2;
        m.rf.forEach((r, j) => { kick.amplitude[j] = r.V; kick.omega[j] = r.h * m.omega0; kick.phase[j] = r.phi; });
        kick.dEsync = k.syncGain(kick);
        for (let j = 0; j < 2; j++) kick.amplitude[j] = -kick.amplitude[j];
        kick.dEsync = -kick.dEsync;
        k.kick(cols, 4, kick);
      }
      start.forEach((p, i) => {
        expect(Math.abs(cols.dt[i] / T1 - p[0])).toBeLessThan(1e-12);
        expect(Math.abs(cols.dE[i] / E1 - p[1])).toBeLessThan(1e-12);
      });
    });
});

describe('the synchronous particle', () => {
  for (const [name, systems] of [['one gap', oneRf], ['two gaps', twoRfTwoGaps]] as const)
    it(`gains Z·V·sin φs = ΔEs every turn and stays at the origin (${name}, exact drift)`, () => {
      const setup = ring({ systems: [...systems], ramp: accel, drift: 'exact' });
      const b = makeBunch(1);
      const tr = new Tracker(setup, b);
      const E0 = tr.machine.Es;
      const N = 2000;
      tr.track(N, (t) => {
        const m = t.machine;
        // Synchronous condition, PHYSICS.md §4: Z·Σ V_k sin φ_k = ΔE_s; the program asks 250 keV per turn.
        let gain = 0;
        for (const r of m.rf) gain += m.particle.Z * r.V * Math.sin(r.phi);
        expect(Math.abs(gain - 250e3)).toBeLessThan(1e-9 * 250e3);
        expect(Math.abs(m.dEs - 250e3)).toBeLessThan(1e-9 * 250e3);
      });
      expect(Math.abs(tr.machine.Es - E0 - N * 250e3)).toBeLessThan(1e-9 * N * 250e3);
      expect(Math.abs(b.dE[0])).toBeLessThan(1e-9 * 250e3);
      expect(Math.abs(b.dt[0])).toBeLessThan(1e-9 / tr.machine.omegaRf);
    });

  it('stays at the origin on a B-field ramp (Ż·c·ρ·Ḃ per turn, PHYSICS.md §4 step 1)', () => {
    const r = parseSetup({ ...JSON.parse(JSON.stringify(ring({ systems: oneRf }))), ring: { circumference: 180, gammaT: 4.8, bendingRadius: 9.5 }, energy: { start: { quantity: 'kinetic', value: 200e6 }, ramp: { kind: 'bDot', value: 2 } } });
    if (!r.ok) throw new Error(JSON.stringify(r.errors));
    const b = makeBunch(1);
    const tr = new Tracker(r.setup, b);
    const pc0 = tr.machine.pc;
    tr.track(1000);
    // Independent: p·c grows by Z·c·ρ·Ḃ·T0 per turn; T0 varies, so compare with the summed periods.
    expect(Math.abs(tr.machine.pc - pc0 - 299792458 * 9.5 * 2 * tr.machine.time)).toBeLessThan(1e-9 * (tr.machine.pc - pc0));
    expect(b.dE[0]).toBe(0);
    expect(b.dt[0]).toBe(0);
  });
});

// Turns per oscillation from upward zero crossings of dt, linearly interpolated.
function measuredTune(dts: number[]): number {
  const x: number[] = [];
  for (let i = 1; i < dts.length; i++) if (dts[i - 1] < 0 && dts[i] >= 0) x.push(i - 1 + -dts[i - 1] / (dts[i] - dts[i - 1]));
  return (x.length - 1) / (x[x.length - 1] - x[0]);
}

describe('small-amplitude synchrotron tune (PHYSICS.md §6 [Lee ch. 3], discrete map cos 2πQ = 1 − 2(πQs)²)', () => {
  const cases = [
    { name: 'below transition', kinetic: 200e6, gammaT: 4.8, systems: [{ harmonic: 8, voltage: 1e6 }] },
    { name: 'above transition', kinetic: 5e9, gammaT: 3, systems: [{ harmonic: 20, voltage: 60e6 }] },
  ];
  for (const c of cases)
    for (const mode of ['linear', 'exact'] as const)
      it(`${c.name}, ${mode} drift`, () => {
        const setup = ring({ systems: c.systems, kinetic: c.kinetic, gammaT: c.gammaT, drift: mode });
        const b = makeBunch(1);
        const tr = new Tracker(setup, b);
        const m = tr.machine;
        const Qs = formulaQs(m);
        const Q = Math.acos(1 - 2 * (Math.PI * Qs) ** 2) / (2 * Math.PI);
        expect(Qs).toBeGreaterThan(0.03); // large enough that the discrete correction (≈ 0.4 %) matters
        b.dt[0] = 0.01 / m.omegaRf; // 0.01 rad: amplitude detuning φ̂²/16 ≈ 6e-6 (PHYSICS.md §6)
        const dts: number[] = [];
        tr.track(6000, () => dts.push(b.dt[0]));
        expect(Math.abs(measuredTune(dts) / Q - 1)).toBeLessThan(2e-3);
        expect(Math.abs(measuredTune(dts) / Qs - 1)).toBeGreaterThan(2e-3); // the correction is really seen
      });
});

describe('losses', () => {
  it('cuts at the exact momentum aperture |Δp/p| = a and at |dt| = T0/2', () => {
    const a = 0.01;
    const setup = ring({ systems: [{ harmonic: 8, voltage: 0 }], aperture: a, drift: 'exact' });
    const tr0 = new Tracker(setup, makeBunch(1));
    const m = tr0.machine;
    // Independent: E(p(1 ± x)) − E_s from the kinematics of core/kinematics.ts, direct difference.
    const at = (x: number) => fromMomentum(m.pc * (1 + x), m.particle.mass).E - m.Es;
    const T0 = m.T0;
    const pts = [
      [0, at(a * (1 - 1e-6))], [0, at(-a * (1 - 1e-6))], // inside: kept
      [0, at(a * (1 + 1e-6))], [0, at(-a * (1 + 1e-6))], // outside: lost
      [0.49 * T0, 0], [-0.51 * T0, 0], [0.6 * T0, 0], // one kept, two lost
      [0, -3 * m.Es], [0, 1e30], [1e30, 0], // absurd values: lost, no NaN
    ];
    const b = bunchFrom(Float64Array.from(pts.map((p) => p[0])), Float64Array.from(pts.map((p) => p[1])));
    const tr = new Tracker(setup, b);
    tr.track(1);
    expect(b.n).toBe(3);
    expect(b.total - b.n).toBe(7);
    const kept = Array.from(b.dE.subarray(0, b.n)).sort((x, y) => x - y);
    expect(kept[0]).toBeCloseTo(at(-a * (1 - 1e-6)), 6);
    for (let i = 0; i < b.total; i++) {
      expect(Number.isFinite(b.dt[i])).toBe(true);
      expect(Number.isFinite(b.dE[i])).toBe(true);
    }
  });

  it('a beam far larger than the bucket loses particles, counts them, and stays finite', () => {
    const setup = ring({ systems: oneRf, ramp: accel, drift: 'exact', aperture: 0.01 });
    const m = new Tracker(setup, makeBunch(1)).machine;
    const N = 20000, b = makeBunch(N), rng = makeRng(3);
    for (let i = 0; i < N; i++) {
      b.dt[i] = (2.5 / m.omegaRf) * rng.normal();
      b.dE[i] = 2 * energyScale(m) * rng.normal();
    }
    const tr = new Tracker(setup, b);
    tr.track(500);
    expect(b.total - b.n).toBeGreaterThan(0.2 * N);
    expect(b.n).toBeGreaterThan(0.05 * N);
    for (let i = 0; i < N; i++) expect(Number.isFinite(b.dt[i]) && Number.isFinite(b.dE[i])).toBe(true);
  });
});

describe('setup changes and added elements', () => {
  it('updateSetup keeps turn, time and momentum and continues like an uninterrupted run', () => {
    const s1 = ring({ systems: oneRf, ramp: accel, drift: 'exact' });
    const pts = (b: Bunch) => { b.dt[0] = 0.3 / 2e7; b.dE[0] = 1e5; };
    const a = makeBunch(1); pts(a);
    const ta = new Tracker(s1, a);
    ta.track(300);
    const b = makeBunch(1); pts(b);
    const tb = new Tracker(s1, b);
    tb.track(100);
    tb.updateSetup(s1); // same setup: must continue exactly
    tb.track(200);
    expect(tb.turn).toBe(300);
    expect(tb.machine.time).toBe(ta.machine.time);
    expect(tb.machine.pc).toBe(ta.machine.pc);
    expect(b.dt[0]).toBe(a.dt[0]);
    expect(b.dE[0]).toBe(a.dE[0]);
  });

  it('an added element runs once per turn after the RF kick, with the state of that turn', () => {
    const setup = ring({ systems: oneRf, ramp: accel });
    const b = makeBunch(1);
    const tr = new Tracker(setup, b);
    const seen: number[] = [];
    tr.addElement({ name: 'probe', apply: (_b, m) => seen.push(m.turn) });
    tr.track(3);
    expect(seen).toEqual([0, 1, 2]);
  });

  it('without a bucket tracking still runs and the beam falls behind the reference (common practice)', () => {
    const setup = ring({ systems: [{ harmonic: 8, voltage: 100e3 }], ramp: accel, drift: 'exact' });
    const b = makeBunch(1);
    const tr = new Tracker(setup, b);
    expect(tr.machine.noBucket).not.toBeNull();
    tr.track(5);
    expect(Number.isFinite(b.dE[0])).toBe(true);
    expect(b.dE[0]).toBeLessThan(-5 * (250e3 - 100e3) * 0.9); // at most Z·V gained per turn, 250 keV needed
  });
});
