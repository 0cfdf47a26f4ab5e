// Cycle planner and design helpers on invented (fictional) rings: bucket numbers against the stationary-bucket
// formula, flagged intervals where closed forms say they start and end, the constant-bucket-area voltage
// program and the fastest ramp checked on the tracked (turn-by-turn) machine, and the `cycle` command.
// Units: time in s, energies in eV, areas in eV·s, voltages in V.
import { spawnSync } from 'node:child_process';
import { mkdtempSync, writeFileSync } from 'node:fs';
import { tmpdir } from 'node:os';
import { join } from 'node:path';
import { describe, expect, it } from 'vitest';
import { computeBucket } from '../core/bucket.ts';
import { areaWith, constantBucketVoltage, fastestRamp, largestGain } from '../core/cycle/design.ts';
import { planCycle } from '../core/cycle/planner.ts';
import { MachineStepper, machineAtStart, type MachineState } from '../core/machine.ts';
import { withMomentumProgram, withRfProgram } from '../core/program/apply.ts';
import type { SetupInput } from '../core/setup/schema.ts';
import { formatIssue, parseSetup } from '../core/setup/validate.ts';

const doc: SetupInput = {
  version: 1,
  title: 'Test booster (fictional)',
  particle: { kind: 'proton' },
  ring: { circumference: 180, gammaT: 4.8, bendingRadius: 9.5 },
  energy: { start: { quantity: 'kinetic', value: 200e6 } },
  rf: { systems: [{ harmonic: 4, voltage: 20e3 }] },
  beam: { distribution: { kind: 'matched', shape: 'parabolic', size: { by: 'emittance', convention: 'contour', value: 0.1 } }, particles: 1000 },
  run: { turns: 2000 },
};

function setupOf(patch: (d: any) => void) {
  const d = structuredClone(doc) as any;
  patch(d);
  const r = parseSetup(d);
  if (!r.ok) throw new Error(r.errors.map(formatIssue).join('; '));
  return r.setup;
}

// Stationary bucket area A0 = (8/ω_rf)·sqrt(2ZVβ²E/(πh|η|)) (PHYSICS.md §7) and its inverse in V.
const areaStationary = (m: MachineState, V: number) => (8 / m.omegaRf) * Math.sqrt((2 * V * m.beta ** 2 * m.Es) / (Math.PI * m.h * Math.abs(m.eta0)));
const voltageForArea = (m: MachineState, A: number) => ((A * m.omegaRf) / 8) ** 2 * (Math.PI * m.h * Math.abs(m.eta0)) / (2 * m.beta ** 2 * m.Es);

describe('cycle planner', () => {
  it('tabulates the stationary bucket area and filling factor as the formula gives', () => {
    const s = setupOf(() => {});
    const p = planCycle(s, { samples: 5, duration: 1e-3 });
    const A0 = areaStationary(machineAtStart(s), 20e3);
    for (let i = 0; i < 5; i++) {
      expect(p.bucketArea[i] / A0).toBeCloseTo(1, 6);
      expect(p.filling[i]).toBeCloseTo(0.1 / A0, 6); // contour emittance of the matched bunch = 0.1 eV·s
      expect(p.phiS[i]).toBeCloseTo(0, 9);
    }
    expect(p.intervals).toEqual([]);
  });

  it('flags the bucket as too small exactly where a voltage dip brings the filling factor above the limit', () => {
    // V falls linearly 20 kV → 2 kV over 1–2 ms and rises back over 3–4 ms; area ∝ sqrt(V), so with filling F0 at
    // 20 kV the limit Fl is crossed at V* = 20 kV·(F0/Fl)².
    const s = setupOf((d) => (d.rf.systems[0].program = { voltage: [[1e-3, 20e3], [2e-3, 2e3], [3e-3, 2e3], [4e-3, 20e3]] }));
    const p = planCycle(s, { samples: 801, duration: 5e-3, fillingLimit: 0.5, adiabaticLimit: 1e3 });
    const F0 = p.filling[0];
    const Vstar = 20e3 * (F0 / 0.5) ** 2;
    const tIn = 1e-3 + ((20e3 - Vstar) / 18e3) * 1e-3, tOut = 3e-3 + ((Vstar - 2e3) / 18e3) * 1e-3;
    const over = p.intervals.filter((i) => i.kind === 'overfilled');
    expect(over.length).toBe(1);
    const dt = p.time[1] - p.time[0];
    expect(Math.abs(over[0].tStart - tIn)).toBeLessThanOrEqual(dt);
    expect(Math.abs(over[0].tEnd - tOut)).toBeLessThanOrEqual(dt);
    expect(over[0].message).toMatch(/bucket too small for the beam: filling factor up to .* \(limit 0\.5\)/);
  });

  it('flags no bucket where the voltage cannot give the energy gain per turn (ZV < ΔE_s)', () => {
    const s = setupOf((d) => {
      d.energy.ramp = { kind: 'gainPerTurn', value: 5e3 };
      d.rf.systems[0].program = { voltage: [[1e-3, 20e3], [2e-3, 2e3], [3e-3, 20e3]] };
    });
    const p = planCycle(s, { samples: 601, duration: 4e-3, fillingLimit: 10, adiabaticLimit: 1e3 });
    const none = p.intervals.filter((i) => i.kind === 'noBucket');
    expect(none.length).toBe(1);
    // V = 5 kV at t = 1 ms + (15/18) ms and 2 ms + (3/18) ms.
    const dt = p.time[1] - p.time[0];
    expect(Math.abs(none[0].tStart - (1e-3 + (15 / 18) * 1e-3))).toBeLessThanOrEqual(1.01 * dt);
    expect(Math.abs(none[0].tEnd - (2e-3 + (3 / 18) * 1e-3))).toBeLessThanOrEqual(1.01 * dt);
  });

  it('flags a fast voltage change as not adiabatic: α = |V̇|/(2V·ω_s) for ω_s ∝ sqrt(V) (PHYSICS.md §10)', () => {
    // V doubles linearly over 0.1 ms; α peaks at the start of the rise, where V = 20 kV.
    const s = setupOf((d) => (d.rf.systems[0].program = { voltage: [[1e-3, 20e3], [1.1e-3, 40e3]] }));
    const p = planCycle(s, { samples: 2001, duration: 2e-3, fillingLimit: 10, adiabaticLimit: 0.1 });
    const fs0 = p.fs[0];
    const alphaRise = (20e3 / 1e-4) / (2 * 20e3 * 2 * Math.PI * fs0);
    const na = p.intervals.filter((i) => i.kind === 'nonAdiabatic');
    expect(alphaRise).toBeGreaterThan(0.15); // the setup is fast enough to be flagged at 0.1
    expect(na.length).toBe(1);
    expect(na[0].tStart).toBeGreaterThan(0.99e-3);
    expect(na[0].tEnd).toBeLessThan(1.11e-3);
    let peak = 0;
    for (let i = 0; i < p.time.length; i++) if (p.time[i] > 1.001e-3 && p.time[i] < 1.099e-3) peak = Math.max(peak, p.adiabaticity[i]);
    // Within the rise α falls from alphaRise to alphaRise/2^1.5; central differences across the corners blur the ends.
    expect(peak).toBeLessThan(alphaRise * 1.02);
    expect(peak).toBeGreaterThan(alphaRise * 0.95);
    console.log(`voltage rise: α formula ${alphaRise}, planner peak ${peak}`);
  });
});

describe('design helpers', () => {
  const ramp = (d: any) => (d.energy.ramp = { kind: 'smooth', quantity: 'kinetic', target: 600e6, start: 1e-3, duration: 8e-3, rounding: 2e-3 });

  it('the constant-bucket-area voltage program keeps the area of the tracked machine within 1 % along the ramp', () => {
    const s = setupOf(ramp);
    const target = 0.4;
    const res = constantBucketVoltage(s, { area: target });
    // At the flat bottom the bucket is stationary: V from the inverse of A0 (PHYSICS.md §7).
    expect(res.programs[0].start / voltageForArea(machineAtStart(s), target)).toBeCloseTo(1, 4);
    const tracked = parseSetup(withRfProgram(structuredClone(doc) as any, 0, 'voltage', res.programs[0]));
    if (!tracked.ok) throw new Error(tracked.errors.map(formatIssue).join('; '));
    const withRamp = setupOf((d) => { ramp(d); d.rf.systems[0] = tracked.setup.rf.systems[0]; });
    const st = new MachineStepper(withRamp);
    let worst = 0, n = 0;
    while (st.state.time < 10e-3) {
      for (let k = 0; k < 25; k++) st.advance();
      const b = computeBucket(st.state);
      if (!b.ok) throw new Error(b.reason);
      worst = Math.max(worst, Math.abs(b.bucket.area / target - 1));
      n++;
    }
    expect(n).toBeGreaterThan(300);
    expect(worst).toBeLessThan(0.01);
    console.log(`constant-area program: ${res.programs[0].points.length + 1} points, worst area deviation ${worst}`);
  });

  it('the largest gain per turn for a bucket area is the boundary: its bucket has the area, one 1e-6 more does not', () => {
    const m = machineAtStart(setupOf(() => {}));
    const A0 = areaWith(m, 1, 0);
    for (const q of [0.9, 0.5, 0.1, 0.01]) {
      const x = largestGain(m, q * A0);
      expect(x).toBeGreaterThan(0);
      expect(areaWith(m, 1, x)).toBeGreaterThanOrEqual(q * A0);
      expect(areaWith(m, 1, x * (1 + 1e-6))).toBeLessThan(q * A0);
    }
  });

  it('the fastest ramp at a filling factor holds the bucket at emittance/filling on the tracked machine (≥ and within 2 %)', () => {
    const s = setupOf(() => {});
    const res = fastestRamp(s, 700e6, { filling: 0.6 }, { steps: 60 });
    expect(res.area).toBeCloseTo(0.1 / 0.6, 12);
    const d = withMomentumProgram(structuredClone(doc), res.program);
    const r = parseSetup(d);
    if (!r.ok) throw new Error(r.errors.map(formatIssue).join('; '));
    const st = new MachineStepper(r.setup);
    const end = res.program.points[res.program.points.length - 1][0];
    let lo = Infinity, hi = 0;
    while (st.state.time < 0.98 * end) {
      for (let k = 0; k < 25; k++) st.advance();
      const b = computeBucket(st.state);
      if (!b.ok) throw new Error(b.reason);
      lo = Math.min(lo, b.bucket.area / res.area);
      hi = Math.max(hi, b.bucket.area / res.area);
    }
    // Piecewise-linear p(t) between the solved points: the rate is exact at midpoints only; allow 1 % below.
    expect(lo).toBeGreaterThan(0.99);
    expect(hi).toBeLessThan(1.02);
    console.log(`fastest ramp: bucket area / target in [${lo}, ${hi}], ramp time ${end} s`);
  });
});

describe('phasewell cycle', () => {
  const root = new URL('..', import.meta.url).pathname;
  const dir = mkdtempSync(join(tmpdir(), 'pw-cycle-'));
  const cli = (...args: string[]) => {
    const r = spawnSync(join(root, 'node_modules/.bin/tsx'), [join(root, 'cli/main.ts'), ...args], { encoding: 'utf8' });
    return { code: r.status, out: r.stdout, err: r.stderr };
  };
  const f = join(dir, 'dip.json');
  const d = structuredClone(doc) as any;
  d.rf.systems[0].program = { voltage: [[1e-3, 20e3], [2e-3, 1e3], [3e-3, 20e3]] };
  writeFileSync(f, JSON.stringify(d));

  it('prints JSON columns with units and the flagged intervals', () => {
    const r = cli('cycle', f);
    expect(r.code).toBe(0);
    const j = JSON.parse(r.out);
    expect(Object.keys(j.columns)).toEqual(expect.arrayContaining(['time_s', 'synchronousPhase_deg', 'bucketArea_eVs', 'bucketHalfHeight_eV', 'synchrotronFrequency_Hz', 'fillingFactor', 'adiabaticity', 'voltage0_V']));
    expect(j.intervals.some((i: { kind: string }) => i.kind === 'overfilled')).toBe(true);
  });

  it('prints CSV with a header row and flags per row; a bad --format exits 2 naming it', () => {
    const r = cli('cycle', f, '--format', 'csv');
    expect(r.code).toBe(0);
    const lines = r.out.trim().split('\n').filter((l) => !l.startsWith('#'));
    expect(lines[0]).toMatch(/^time_s,turn,energy_eV,.*,voltage0_V,flags$/);
    expect(lines.some((l) => l.endsWith('overfilled'))).toBe(true);
    const bad = cli('cycle', f, '--format', 'xml');
    expect(bad.code).toBe(2);
    expect(bad.err).toMatch(/--format = xml: must be json or csv/);
  });
});
