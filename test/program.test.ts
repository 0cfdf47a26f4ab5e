// Programs: piecewise-linear tables, the parabolic–linear–parabolic shape, momentum quantities, the setup fields,
// and a MachineStepper that follows them turn by turn. Units: time in s, energies and p·c in eV, field in T, V in volts.
import { describe, expect, it } from 'vitest';
import { C_LIGHT, PROTON_MASS_EV } from '../core/constants.ts';
import { MachineStepper } from '../core/machine.ts';
import { makeParticle } from '../core/particle.ts';
import { pcOf, valueOfPc } from '../core/program/quantity.ts';
import { smoothRamp, smoothRampMaxRate } from '../core/program/shapes.ts';
import { sampleProgram, TableProgram } from '../core/program/table.ts';
import { formatIssue, parseSetup } from '../core/setup/validate.ts';

const base = {
  version: 1,
  title: 'Test ring (fictional)',
  particle: { kind: 'proton' },
  ring: { circumference: 200, gammaT: 6, bendingRadius: 12 },
  energy: { start: { quantity: 'kinetic', value: 400e6 } },
  rf: { systems: [{ harmonic: 5, voltage: 50e3 }, { harmonic: 10, voltage: 0 }] },
  beam: { distribution: { kind: 'coasting', rmsEnergySpread: 1e5 }, particles: 10 },
};

function parse(patch: (d: any) => void) {
  const d = structuredClone(base) as any;
  patch(d);
  return parseSetup(d);
}

describe('piecewise-linear table', () => {
  it('interpolates linearly from the t = 0 value, holds the last value, and makes a step at a repeated time', () => {
    const p = new TableProgram(10, [[1, 30], [2, 30], [2, 5], [4, 9]]);
    // Straight lines through the points (written out by hand, common practice).
    expect(p.at(0)).toBe(10);
    expect(p.at(-1)).toBe(10);
    expect(p.at(0.25)).toBeCloseTo(15, 12);
    expect(p.at(1.5)).toBe(30);
    expect(p.at(1.999999)).toBeCloseTo(30, 9);
    expect(p.at(2)).toBe(5);
    expect(p.at(3)).toBeCloseTo(7, 12);
    expect(p.at(100)).toBe(9);
    expect(p.end).toBe(4);
  });

  it('gives the same values walking forward, backward and at random (the moving index never goes stale)', () => {
    const pts: [number, number][] = Array.from({ length: 50 }, (_, k) => [k + 1, Math.sin(k)]);
    const p = new TableProgram(0, pts);
    const fresh = (t: number) => new TableProgram(0, pts).at(t);
    for (const t of [0.5, 3.2, 3.3, 49.9, 2.1, 0.1, 25.5, 25.4, 60, 1]) expect(p.at(t)).toBe(fresh(t));
  });

  it('rejects bad points with the index and the reason', () => {
    expect(() => new TableProgram(0, [[1, 1], [0.5, 2]])).toThrow(/point 1: time 0.5 s is earlier/);
    expect(() => new TableProgram(0, [[0, 1]])).toThrow(/point 0: time 0 s must be > 0/);
    expect(() => new TableProgram(0, [[1, 1], [1, 2], [1, 3]])).toThrow(/three points at t = 1 s/);
    expect(() => new TableProgram(0, [[1, NaN]])).toThrow(/finite/);
  });

  it('samples a program on an even grid', () => {
    const { t, v } = sampleProgram(new TableProgram(0, [[2, 4]]), 2, 4);
    expect(Array.from(t)).toEqual([0, 0.5, 1, 1.5, 2]);
    expect(Array.from(v)).toEqual([0, 1, 2, 3, 4]);
  });
});

describe('parabolic–linear–parabolic ramp', () => {
  const r = { v0: 1, v1: 3, start: 0.1, duration: 1, rounding: 0.2 };
  const p = smoothRamp(r);

  it('equals the double integral of its rate profile (constant acceleration, coast, constant deceleration)', () => {
    // Independent computation: integrate dv/dt, which rises linearly to the top rate over `rounding`, stays, and falls.
    const top = (r.v1 - r.v0) / (r.duration - r.rounding);
    const rate = (t: number) => {
      const x = t - r.start;
      if (x <= 0 || x >= r.duration) return 0;
      return top * Math.min(1, x / r.rounding, (r.duration - x) / r.rounding);
    };
    let v = r.v0;
    const n = 200000, dt = 1.3 / n;
    for (let i = 0; i < n; i++) {
      const t = i * dt;
      v += (dt / 6) * (rate(t) + 4 * rate(t + dt / 2) + rate(t + dt)); // Simpson per step
      if (i % 20000 === 19999) expect(p.at(t + dt)).toBeCloseTo(v, 9);
    }
    expect(smoothRampMaxRate(r)).toBeCloseTo(top, 12);
  });

  it('is continuous in value and slope at the joins, and flat before and after', () => {
    const d = (t: number) => (p.at(t + 1e-7) - p.at(t - 1e-7)) / 2e-7;
    for (const t of [0.1, 0.3, 0.9, 1.1]) {
      expect(Math.abs(p.at(t + 1e-12) - p.at(t - 1e-12))).toBeLessThan(1e-9);
      expect(Math.abs(d(t + 1e-5) - d(t - 1e-5))).toBeLessThan(1e-3);
    }
    expect(p.at(0.05)).toBe(1);
    expect(p.at(1.2)).toBe(3);
  });

  it('rejects a rounding longer than half the ramp', () => {
    expect(() => smoothRamp({ ...r, rounding: 0.6 })).toThrow(/rounding = 0.6 s: must be in \[0, 0.5\] s/);
  });
});

describe('momentum quantities', () => {
  const proton = makeParticle({ kind: 'proton' });
  it('field ↔ p·c: Bρ [T·m] = p·c [eV]/(Z·c) (PHYSICS.md §2)', () => {
    expect(pcOf('field', 1, proton, 10)).toBeCloseTo(10 * C_LIGHT, 3); // 1 T at 10 m: 2.998 GeV/c
    expect(valueOfPc('field', 10 * C_LIGHT, proton, 10)).toBeCloseTo(1, 12);
  });
  it('kinetic, total and per-nucleon energy round-trip through p·c', () => {
    const ion = makeParticle({ kind: 'ion', massNumber: 12, chargeState: 6 });
    for (const q of ['momentum', 'kinetic', 'total', 'kineticPerNucleon'] as const) {
      for (const pc of [1e6, 3e8, 2e10]) {
        // A total energy near the rest energy carries p·c only to ε·m²/(p·c)² relative (E − m cancels); ε = 2^−52.
        const tol = 1e-12 + (q === 'total' ? 2.3e-16 * (ion.mass / pc) ** 2 : 0);
        expect(Math.abs(pcOf(q, valueOfPc(q, pc, ion, undefined), ion, undefined) / pc - 1)).toBeLessThan(tol);
      }
    }
    // T = sqrt(pc² + m²) − m (PHYSICS.md §2).
    expect(valueOfPc('kinetic', 1e9, proton, undefined)).toBeCloseTo(Math.hypot(1e9, PROTON_MASS_EV) - PROTON_MASS_EV, 3);
  });
});

describe('program fields in the setup', () => {
  it('accept tables, smooth ramps, RF programs and a timed switch', () => {
    const r = parse((d) => {
      d.energy.ramp = { kind: 'smooth', quantity: 'field', target: 0.8, duration: 0.02, rounding: 0.005 };
      d.rf.systems[0].program = { voltage: [[0.01, 80e3]] };
      d.rf.systems[1].program = { voltage: [[0.01, 20e3]], phase: [[0.01, 180]] };
      d.rf.slope = 'timed';
      d.rf.switchTime = 0.015;
    });
    expect(r.ok, r.ok ? '' : r.errors.map(formatIssue).join('; ')).toBe(true);
  });

  it('name the field, the value and the problem', () => {
    const msg = (patch: (d: any) => void) => {
      const r = parse(patch);
      return r.ok ? 'ok' : r.errors.map(formatIssue).join('\n');
    };
    expect(msg((d) => (d.rf.systems[0].program = { voltage: [[0.2, 1e3], [0.1, 1e3]] })))
      .toMatch(/rf\.systems\[0\]\.program\.voltage = .*point 1: time 0.1 s is earlier/);
    expect(msg((d) => (d.rf.systems[0].program = { voltage: [[0.1, -5]] }))).toMatch(/rf\.systems\[0\]\.program\.voltage\[0\]\[1\] = -5: must be in \[0, 1e9\] V/);
    expect(msg((d) => (d.rf.slope = 'timed'))).toMatch(/rf\.switchTime = \(missing\): give rf\.switchTime exactly when rf\.slope is 'timed'/);
    expect(msg((d) => (d.rf.systems[0].program = { phase: [[0.1, 10]] }))).toMatch(/rf\.systems\[0\]\.program\.phase.*takes no phase program/);
    expect(msg((d) => { delete d.ring.bendingRadius; d.energy.ramp = { kind: 'table', quantity: 'field', points: [[0.1, 0.5]] }; }))
      .toMatch(/ring\.bendingRadius = \(missing\): a field program .* needs the bending radius/);
    expect(msg((d) => (d.energy.ramp = { kind: 'smooth', quantity: 'kinetic', target: 1e9, duration: 1, rounding: 0.7 })))
      .toMatch(/energy\.ramp\.rounding = 0\.7: must not exceed half the ramp duration/);
  });
});

describe('MachineStepper follows the programs', () => {
  it('p·c at every turn is the table value at that turn\'s time, and ΔE_s is the change over the next revolution', () => {
    const r = parse((d) => (d.energy.ramp = { kind: 'table', quantity: 'kinetic', points: [[0.001, 420e6], [0.002, 420e6], [0.004, 380e6]] }));
    if (!r.ok) throw new Error(r.errors.map(formatIssue).join('; '));
    const st = new MachineStepper(r.setup);
    const T = (t: number) => (t < 0.001 ? 400e6 + 20e6 * (t / 0.001) : t < 0.002 ? 420e6 : t < 0.004 ? 420e6 - 40e6 * ((t - 0.002) / 0.002) : 380e6);
    let worst = 0;
    while (st.state.time < 0.005) {
      const m = st.state;
      worst = Math.max(worst, Math.abs(m.T - T(m.time)) / 1e6);
      // Next turn's kinetic energy, from the table at t + T0 (independent evaluation of the same straight lines).
      expect(m.dEs).toBeCloseTo(T(m.time + m.T0) - T(m.time), 1);
      st.advance();
    }
    expect(worst).toBeLessThan(1e-6); // eV·1e-6: round-off of p·c ↔ T
  });

  it('voltages and phases follow their tables; φs is re-solved with both systems', () => {
    const r = parse((d) => {
      d.energy.ramp = { kind: 'gainPerTurn', value: 1e3 };
      d.rf.systems[1].program = { voltage: [[0.001, 25e3]], phase: [[0.001, 180]] };
    });
    if (!r.ok) throw new Error(r.errors.map(formatIssue).join('; '));
    const st = new MachineStepper(r.setup);
    while (st.state.time < 0.0005) st.advance();
    const m = st.state;
    const x = m.time / 0.001;
    expect(m.rf[1].V).toBeCloseTo(25e3 * x, 6);
    expect(m.rf[1].offset).toBeCloseTo(Math.PI * x, 12);
    // Synchronous condition ZΣV_k sin(n_k φs + Φ_k) = ΔE_s (PHYSICS.md §4).
    const gain = 50e3 * Math.sin(m.phiS) + m.rf[1].V * Math.sin(2 * m.phiS + m.rf[1].offset);
    expect(gain).toBeCloseTo(m.dEs, 6);
  });
});
