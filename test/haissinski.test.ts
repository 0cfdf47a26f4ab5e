// Potential-well equilibrium with a purely inductive impedance (Haïssinski equation).
// Independent solution written here: for Z = jωL (L = X/ω0, X = Im Z/n) the induced voltage is local,
// V_ind = −L·dI/dt (PHYSICS.md §12), so its potential is U_ind = sgn(η)·ω_rf·Z·L·I(dt)/(β²E) and the Haïssinski
// equation λ = A·exp(−(U_rf + U_ind[λ])/H0) is algebraic at each dt: solved by Newton pointwise, A by bisection
// on ∫λ = 1 (J. Haïssinski, Nuovo Cimento 18B (1973) 72 (mem.); form of U from PHYSICS.md §5). No FFT, no tracking.
// Checked against it: the core solver (FFT path) and a tracked lepton beam that settles under radiation damping,
// quantum excitation and the induced kick (fictional positron ring of test/radiation.test.ts).
// Direction (common practice, PHYSICS.md §12): an inductive impedance lengthens above transition, shortens below.
import { describe, expect, it } from 'vitest';
import { makeBunch } from '../core/bunch.ts';
import { E_CHARGE } from '../core/constants.ts';
import { solveSelfConsistent } from '../core/collective/selfConsistent.ts';
import { machineAtStart, type MachineState } from '../core/machine.ts';
import { naturalEnergySpread, radiationLattice } from '../core/radiation.ts';
import { makeRng } from '../core/rng.ts';
import type { Setup } from '../core/setup/schema.ts';
import { parseSetup } from '../core/setup/validate.ts';
import { Tracker } from '../core/tracker.ts';

const Nb = 1e11, X = 1.5;
function lepton(imZOverN: number, extra: Record<string, unknown> = {}): Setup {
  const r = parseSetup({
    version: 1, title: 'test lepton ring (fictional)', particle: { kind: 'positron' },
    ring: { circumference: 120, alpha0: 0.005, bendingRadius: 6 },
    energy: { start: { quantity: 'total', value: 6e9 } }, rf: { systems: [{ harmonic: 200, voltage: 30e6 }] },
    beam: { distribution: { kind: 'matched', shape: 'gaussian', size: { by: 'rmsLength', value: 27e-12 } }, particles: 10 },
    run: { momentumAperture: 0.2 }, radiation: { partitionE: 2 },
    intensity: { particlesPerBunch: Nb }, impedances: [{ kind: 'inductive', imZOverN }],
    collective: { bins: 512, smoothing: 0 }, ...extra,
  });
  if (!r.ok) throw new Error(JSON.stringify(r.errors));
  return r.setup;
}

// Pointwise Haïssinski solution for one RF system and a pure inductance, on a grid t[] (closed-form U_rf).
function pointwise(m: MachineState, V: number, X: number, Q: number, H0: number, t: Float64Array): Float64Array {
  const b2E = m.beta * m.beta * m.Es, sg = Math.sign(m.eta0), Z = m.particle.Z;
  const dEs = m.dEs + m.U0;
  // U_rf = −sgn(η)/(β²E)·∫_{φs}^{φ}(Z·V sin φ' − ΔE_s − U0)dφ'
  const Urf = (phi: number) => (-sg / b2E) * (Z * V * (Math.cos(m.phiS) - Math.cos(phi)) - dEs * (phi - m.phiS));
  const c = (sg * m.omegaRf * Z * (X / m.omega0) * Q) / (b2E * H0); // U_ind/H0 = c·λ
  const u = Float64Array.from(t, (x) => Urf(m.phiS + m.omegaRf * x) / H0);
  const solveAt = (lnA: number, ui: number) => {
    let y = Math.exp(lnA - ui); // Newton on ln y − ln A + u + c·y = 0
    for (let k = 0; k < 100; k++) {
      const f = Math.log(y) - lnA + ui + c * y, fp = 1 / y + c;
      const yn = y - f / fp;
      y = yn > 0 ? yn : 0.5 * y;
      if (Math.abs(f) < 1e-14) break;
    }
    return y;
  };
  const h = t[1] - t[0];
  const mass = (lnA: number) => u.reduce((s, ui) => s + solveAt(lnA, ui), 0) * h;
  let lo = -60, hi = 60; // ln A, bracketing ∫λ = 1 (λ in 1/s: ln A ≈ ln(1/(√(2π)σ)) ≈ 23 here)
  for (let k = 0; k < 200; k++) {
    const mid = 0.5 * (lo + hi);
    if (mass(mid) < 1) lo = mid;
    else hi = mid;
  }
  return Float64Array.from(u, (ui) => solveAt(0.5 * (lo + hi), ui));
}

function rms(t: Float64Array, l: Float64Array): number {
  let s0 = 0, s1 = 0, s2 = 0;
  for (let i = 0; i < t.length; i++) {
    s0 += l[i]; s1 += l[i] * t[i]; s2 += l[i] * t[i] * t[i];
  }
  return Math.sqrt(s2 / s0 - (s1 / s0) ** 2);
}

describe('Haïssinski equilibrium with an inductive impedance', () => {
  const setup = lepton(X);
  const m = machineAtStart(setup);
  const sd = naturalEnergySpread(m.particle, m.gamma, radiationLattice(setup)!);
  const H0 = 2 * Math.PI * m.h * Math.abs(m.eta0) * sd * sd; // σ_δ² = H0/(2πh|η|) (PHYSICS.md §5)
  const Q = m.particle.Z * E_CHARGE * Nb;
  const sc = solveSelfConsistent(setup, m)!;
  const t = sc.calc.centres;
  const ref = pointwise(m, 30e6, X, Q, H0, t);
  const ref0 = pointwise(m, 30e6, 0, Q, H0, t);

  it('the core solver (FFT path) converges and matches the pointwise solution in rms length and profile', () => {
    expect(sc.solution.converged).toBe(true);
    // Lengthening above transition (η > 0 here), by a clear margin (> 5 %) so the comparison means something.
    expect(rms(t, ref) / rms(t, ref0)).toBeGreaterThan(1.05);
    expect(Math.abs(sc.solution.rmsLength / rms(t, ref) - 1)).toBeLessThan(0.01);
    const peak = Math.max(...ref);
    let worst = 0;
    for (let i = 0; i < t.length; i++) worst = Math.max(worst, Math.abs(sc.solution.lambda[i] - ref[i]) / peak);
    expect(worst).toBeLessThan(0.02);
  });

  it('a tracked beam with damping, quantum excitation and the induced kick settles on the same profile (few %)', () => {
    const s = lepton(X, { collective: { bins: 256, smoothing: 2, window: 40 * 27e-12 } });
    const n = 40_000, b = makeBunch(n), rng = makeRng(3);
    const sT0 = rms(t, ref0), sE0 = sd * m.Es;
    for (let i = 0; i < n; i++) {
      b.dt[i] = sT0 * rng.normal();
      b.dE[i] = sE0 * rng.normal();
    }
    const tr = new Tracker(s, b);
    tr.track(1200); // ≈ 7.6 emittance damping times (τ_E/2 ≈ 157 turns)
    // Average the line density over 800 more turns on the reference grid.
    const hist = new Float64Array(t.length), h = t[1] - t[0], e0 = t[0] - 0.5 * h;
    let rmsSum = 0, samples = 0;
    tr.track(800, (x) => {
      if (x.turn % 5) return;
      const dt = x.bunch.dt;
      let s1 = 0, s2 = 0;
      for (let i = 0; i < x.bunch.n; i++) {
        const k = Math.floor((dt[i] - e0) / h);
        if (k >= 0 && k < hist.length) hist[k] += 1;
        s1 += dt[i]; s2 += dt[i] * dt[i];
      }
      rmsSum += Math.sqrt(s2 / x.bunch.n - (s1 / x.bunch.n) ** 2);
      samples++;
    });
    expect(b.n).toBe(n);
    const tracked = rmsSum / samples;
    expect(Math.abs(tracked / rms(t, ref) - 1)).toBeLessThan(0.03);
    // Profile: histogram normalised to ∫λ = 1, compared with the reference relative to its peak, centred on the
    // bunch centroid (the rms statistics above do not depend on it; 1/√(counts) noise ≈ 1 % at the peak).
    let tot = 0;
    for (const v of hist) tot += v;
    const lam = hist.map((v) => v / (tot * h));
    const peak = Math.max(...ref);
    const shift = centroid(t, lam) - centroid(t, ref);
    let worst = 0;
    for (let i = 0; i < t.length; i++) worst = Math.max(worst, Math.abs(lam[i] - interp(t, ref, t[i] - shift)) / peak);
    expect(worst).toBeLessThan(0.03);
  });
});

describe('direction of the potential-well effect of an inductive impedance (common practice)', () => {
  function proton(gammaT: number, imZOverN: number) {
    const r = parseSetup({
      version: 1, title: 'test proton ring (fictional)', particle: { kind: 'proton' }, ring: { circumference: 300, gammaT },
      energy: { start: { quantity: 'kinetic', value: 2e9 } }, rf: { systems: [{ harmonic: 8, voltage: 2e5 }] },
      beam: { distribution: { kind: 'matched', shape: 'gaussian', size: { by: 'rmsLength', value: 8e-9 } }, particles: 10 },
      intensity: { particlesPerBunch: 2e12 }, impedances: [{ kind: 'inductive', imZOverN }], collective: { bins: 512, smoothing: 0 },
    });
    if (!r.ok) throw new Error(JSON.stringify(r.errors));
    const sc = solveSelfConsistent(r.setup, machineAtStart(r.setup))!;
    expect(sc.solution.converged).toBe(true);
    return sc.solution.rmsLength / sc.zeroIntensity.rmsLength;
  }
  it('shortens below transition and lengthens above', () => {
    expect(proton(6, 20)).toBeLessThan(0.99); // γ ≈ 3.1 < γt = 6
    expect(proton(2, 20)).toBeGreaterThan(1.01); // γ > γt = 2
    // A capacitive Z/n (space charge) does the opposite.
    expect(proton(6, -20)).toBeGreaterThan(1.01);
  });
});

function centroid(t: Float64Array, l: Float64Array): number {
  let s0 = 0, s1 = 0;
  for (let i = 0; i < t.length; i++) {
    s0 += l[i]; s1 += l[i] * t[i];
  }
  return s1 / s0;
}

function interp(t: Float64Array, y: Float64Array, x: number): number {
  const h = t[1] - t[0], u = (x - t[0]) / h, k = Math.floor(u);
  if (k < 0 || k >= t.length - 1) return 0;
  return y[k] + (u - k) * (y[k + 1] - y[k]);
}
