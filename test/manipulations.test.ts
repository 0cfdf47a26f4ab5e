// RF manipulations on an invented (fictional) ring, checked against textbook formulas: adiabatic capture of a
// coasting beam, bunch rotation by a voltage jump, double-harmonic lengthening and shortening.
// Units: time in s, energies in eV, phases in rad. Stationary buckets below transition (φs = 0).
import { describe, expect, it } from 'vitest';
import { generateBeam } from '../core/beam/index.ts';
import type { Bunch } from '../core/bunch.ts';
import { machineAtStart } from '../core/machine.ts';
import { parseSetup } from '../core/setup/validate.ts';
import { Tracker } from '../core/tracker.ts';

const KINETIC = 1e9, GAMMA_T = 5, C = 100, H = 64;

function setupOf(rf: unknown, beam: unknown, turns: number) {
  const r = parseSetup({
    version: 1,
    title: 'Test ring (fictional)',
    particle: { kind: 'proton' },
    ring: { circumference: C, gammaT: GAMMA_T },
    energy: { start: { quantity: 'kinetic', value: KINETIC } },
    rf,
    beam,
    run: { turns, drift: 'exact', momentumAperture: 0.05 },
  });
  if (!r.ok) throw new Error(JSON.stringify(r.errors));
  return r.setup;
}

// Small-amplitude synchrotron tune, stationary single harmonic (PHYSICS.md §6): Qs = sqrt(h|η|ZV/(2πβ²E)).
function tune(V: number): number {
  const m = machineAtStart(setupOf({ systems: [{ harmonic: H, voltage: V }] }, { distribution: { kind: 'coasting', rmsEnergySpread: 1 }, particles: 1 }, 1));
  return Math.sqrt((H * Math.abs(m.eta0) * V) / (2 * Math.PI * m.beta ** 2 * m.Es));
}

function rmsDt(b: Bunch): number {
  let s = 0, s2 = 0;
  for (let i = 0; i < b.n; i++) { s += b.dt[i]; s2 += b.dt[i] ** 2; }
  return Math.sqrt(s2 / b.n - (s / b.n) ** 2);
}

describe('adiabatic capture of a coasting beam', () => {
  const V1 = 10e3, V0 = V1 / 25, N = 10000;
  const m0 = machineAtStart(setupOf({ systems: [{ harmonic: H, voltage: V1 }] }, { distribution: { kind: 'coasting', rmsEnergySpread: 1 }, particles: 1 }, 1));
  const b2E = m0.beta ** 2 * m0.Es;
  // Stationary bucket half-height δ0 = sqrt(2ZV/(πβ²E·h|η|)) (PHYSICS.md §7).
  const delta0 = Math.sqrt((2 * V1) / (Math.PI * b2E * H * Math.abs(m0.eta0)));
  const sigmaDelta = 0.25 * delta0;

  // Captured = inside the stationary separatrix δ² < δ0²·cos²(φ/2) (PHYSICS.md §7, φs = 0), φ wrapped per bucket.
  function captured(b: Bunch): number {
    let k = 0;
    for (let i = 0; i < b.n; i++) {
      const x = m0.omegaRf * b.dt[i];
      const phi = x - 2 * Math.PI * Math.round(x / (2 * Math.PI));
      const d = b.dE[i] / b2E;
      if (d * d < delta0 ** 2 * Math.cos(phi / 2) ** 2) k++;
    }
    return k / b.total;
  }

  // Voltage program with constant adiabaticity α = |dω_s/dt|/ω_s² (PHYSICS.md §10): V(t) = V0/(1 − t/τ)², so
  // ω_s = ω_s0/(1 − t/τ) and α = 1/(ω_s0·τ); it ends at V1 when 1 − t/τ = sqrt(V0/V1).
  function capture(alpha: number | null): number {
    const T0 = m0.T0;
    const rf = alpha === null
      ? { systems: [{ harmonic: H, voltage: V1 }] }
      : (() => {
          const ws0 = 2 * Math.PI * tune(V0) / T0;
          const tau = 1 / (ws0 * alpha);
          const tEnd = tau * (1 - Math.sqrt(V0 / V1));
          const pts = Array.from({ length: 40 }, (_, j) => {
            const t = (tEnd * (j + 1)) / 40;
            return [t, Math.min(V1, V0 / (1 - t / tau) ** 2)];
          });
          return { systems: [{ harmonic: H, voltage: V0, program: { voltage: pts } }] };
        })();
    const s = setupOf(rf, { distribution: { kind: 'coasting', rmsEnergySpread: sigmaDelta * b2E }, particles: N, seed: 5 }, 1);
    const prog = s.rf.systems[0].program?.voltage;
    const turns = Math.ceil((prog ? prog[prog.length - 1][0] : 0) / T0) + 300; // plus ~1 synchrotron period at V1
    const { bunch } = generateBeam(s, machineAtStart(s));
    new Tracker(s, bunch).track(turns);
    return captured(bunch);
  }

  it('a slow capture (α = 0.05) keeps nearly all of the beam inside the action limit, a sudden switch-on loses much more', () => {
    // Adiabatic limit: the action of a coasting particle, 4π|δ| (its band over one RF period, both signs),
    // is kept, and the bucket area is 8δ0, so particles with |δ| < (2/π)δ0 are captured.
    // Sudden switch-on: a particle at δ is inside for the fraction (2/π)·arccos(|δ|/δ0) of phases.
    // Both averaged over the Gaussian by Simpson quadrature (independent of the code under test).
    const gauss = (z: number) => Math.exp(-z * z / 2) / Math.sqrt(2 * Math.PI);
    const simpson = (f: (z: number) => number, a: number, b: number, n = 2000) => {
      const h = (b - a) / n;
      let s = f(a) + f(b);
      for (let i = 1; i < n; i++) s += (i % 2 ? 4 : 2) * f(a + i * h);
      return (s * h) / 3;
    };
    const zA = (2 / Math.PI) * delta0 / sigmaDelta;
    const adiabaticLimit = 2 * simpson(gauss, 0, zA);
    const sudden = 2 * simpson((z) => gauss(z) * (2 / Math.PI) * Math.acos(Math.min(1, (z * sigmaDelta) / delta0)), 0, 10);
    expect(adiabaticLimit).toBeCloseTo(0.989, 3); // erf(2.546/√2), a sanity check of the quadrature
    const slow = capture(0.05);
    const medium = capture(0.5);
    const fast = capture(null);
    // Statistics: 4·sqrt(p(1−p)/N) ≈ 0.013 for p ≈ 0.87; the map's separatrix differs from the continuous one by
    // O((πQs)²) ≈ 1e-4.
    expect(Math.abs(fast - sudden)).toBeLessThan(0.015);
    // Finite α: particles close to the separatrix are never adiabatic (ω_s → 0 there), so allow 2 % below the limit.
    expect(slow).toBeGreaterThan(adiabaticLimit - 0.02);
    expect(slow).toBeLessThan(adiabaticLimit + 0.01);
    expect(slow - fast).toBeGreaterThan(0.08);
    expect(medium).toBeGreaterThan(fast);
    expect(medium).toBeLessThan(slow);
    console.log(`capture: α = 0.05 → ${slow}, α = 0.5 → ${medium}, sudden → ${fast}; limits ${adiabaticLimit}, ${sudden}`);
  });
});

describe('bunch rotation by a voltage jump', () => {
  it('the bunch is shortest a quarter of the new small-amplitude synchrotron period after the jump, by √(V_low/V_high)', () => {
    const Vlo = 1e3, Vhi = 16e3;
    const m = machineAtStart(setupOf({ systems: [{ harmonic: H, voltage: Vlo }] }, { distribution: { kind: 'coasting', rmsEnergySpread: 1 }, particles: 1 }, 1));
    const t1 = 19.5 * m.T0; // the first high-voltage kick is on turn 20
    const s = setupOf(
      { systems: [{ harmonic: H, voltage: Vlo, program: { voltage: [[t1, Vlo], [t1, Vhi]] } }] },
      { distribution: { kind: 'matched', shape: 'gaussian', size: { by: 'rmsLength', value: 0.3 / m.omegaRf } }, particles: 5000, seed: 9 },
      1,
    );
    const { bunch } = generateBeam(s, machineAtStart(s));
    const tr = new Tracker(s, bunch);
    tr.track(20);
    const sigma0 = rmsDt(bunch);
    let best = Infinity, bestTurn = -1;
    for (let k = 0; k < 150; k++) {
      tr.track(1);
      const r = rmsDt(bunch);
      if (r < best) { best = r; bestTurn = tr.turn; }
    }
    const quarter = 1 / (4 * tune(Vhi)); // turns
    // Tolerance 3 turns (~5 %): 1-turn sampling, the half-turn between kick and drift, and the amplitude detuning
    // 1 − φ̂²/16 (PHYSICS.md §6), ≈ 1 % for this bunch (rms φ 0.3 rad).
    expect(Math.abs(bestTurn - 20 - quarter)).toBeLessThan(3);
    // Linear rotation: σt,min/σt,0 = ω_s,low/ω_s,high = sqrt(V_low/V_high) (PHYSICS.md §9 matching); 10 % for the
    // nonlinear well and filamentation over a quarter period.
    expect(best / sigma0).toBeGreaterThan(0.9 * Math.sqrt(Vlo / Vhi));
    expect(best / sigma0).toBeLessThan(1.1 * Math.sqrt(Vlo / Vhi));
    console.log(`rotation: shortest at ${bestTurn - 20} turns after the jump (quarter period ${quarter}), σ ratio ${best / sigma0} (linear ${Math.sqrt(Vlo / Vhi)})`);
  });
});

describe('double-harmonic RF', () => {
  // Second harmonic n = 2 raised slowly to r = V2/V1 = 1/4: ω_s ∝ sqrt(1 ∓ n·r) (PHYSICS.md §8), and with the
  // emittance kept (adiabatic) and σE ∝ ω_s·σt (linear matching, §9), σt ∝ (1 ∓ n·r)^(−1/4).
  function finalRatio(phase: number): number {
    const V1 = 10e3, r = 0.25;
    const m = machineAtStart(setupOf({ systems: [{ harmonic: H, voltage: V1 }] }, { distribution: { kind: 'coasting', rmsEnergySpread: 1 }, particles: 1 }, 1));
    const tRamp = 3000 * m.T0;
    const s = setupOf(
      { systems: [{ harmonic: H, voltage: V1 }, { harmonic: 2 * H, voltage: 0, phase, program: { voltage: [[tRamp, r * V1]] } }] },
      { distribution: { kind: 'matched', shape: 'gaussian', size: { by: 'rmsLength', value: 0.2 / m.omegaRf } }, particles: 5000, seed: 4 },
      1,
    );
    const { bunch } = generateBeam(s, machineAtStart(s));
    const tr = new Tracker(s, bunch);
    const sigma0 = rmsDt(bunch);
    tr.track(3050);
    let sum = 0;
    for (let k = 0; k < 550; k++) { tr.track(1); sum += rmsDt(bunch); } // two synchrotron periods
    return sum / 550 / sigma0;
  }

  it('lengthening (second harmonic in counter-phase) and shortening (in phase) follow (1 ∓ n·r)^(−1/4)', () => {
    // Tolerance 4 %: the cubic term of the RF force relative to the linear one is φ²/3 ≈ 1–2 % at this size, plus
    // residual oscillation after the averaging and sampling noise (1/sqrt(2N) ≈ 1 %).
    const longer = finalRatio(180);
    const shorter = finalRatio(0);
    expect(longer / 0.5 ** -0.25).toBeGreaterThan(0.96);
    expect(longer / 0.5 ** -0.25).toBeLessThan(1.04);
    expect(shorter / 1.5 ** -0.25).toBeGreaterThan(0.96);
    expect(shorter / 1.5 ** -0.25).toBeLessThan(1.04);
    console.log(`double RF: lengthening ${longer} (expected ${0.5 ** -0.25}), shortening ${shorter} (expected ${1.5 ** -0.25})`);
  });
});
