// Impedance models: convention (Z is the Fourier transform of the wake, e^{+jωt}), space-charge Z/n, tables, and the
// incoherent synchrotron-frequency shift of an inductive impedance measured on a tracked bunch.
import { describe, expect, it } from 'vitest';
import { generateBeam } from '../core/beam/index.ts';
import { E_CHARGE, Z0_OHM } from '../core/constants.ts';
import { centroidSpectrum } from '../core/diagnostics/index.ts';
import { impedanceAt, impedancesOf, resonatorWake, type Resonator } from '../core/collective/impedance.ts';
import { importImpedanceCsv } from '../core/collective/impedanceCsv.ts';
import { solveSelfConsistent } from '../core/collective/selfConsistent.ts';
import { machineAtStart } from '../core/machine.ts';
import { parseSetup } from '../core/setup/validate.ts';
import { Tracker } from '../core/tracker.ts';

const ctx = { omega0: 2 * Math.PI * 1e6, beta: 0.9, gamma: 1 / Math.sqrt(1 - 0.81) };

describe('impedance models', () => {
  const r: Resonator = { kind: 'resonator', Rs: 2e3, Q: 3, omegaR: 2 * Math.PI * 1e9 };

  it('resonator Z(ω) is the Fourier transform ∫W(τ)e^{−jωτ}dτ of its wake (e^{+jωt} convention, PHYSICS.md §12)', () => {
    // Midpoint rule over 40 decay times 2Q/ω_r with 4e5 steps: error ≪ 1e-4 of R_s.
    const T = (40 * 2 * r.Q) / r.omegaR, n = 400_000, h = T / n;
    const z = new Float64Array(2);
    for (const f of [0.3e9, 0.9e9, 1e9, 1.4e9, 3e9]) {
      const w = 2 * Math.PI * f;
      let re = 0, im = 0;
      for (let i = 0; i < n; i++) {
        const t = (i + 0.5) * h, W = resonatorWake(r, t);
        re += W * Math.cos(w * t) * h;
        im -= W * Math.sin(w * t) * h;
      }
      impedanceAt(r, w, ctx, z);
      expect(Math.abs(z[0] - re) / r.Rs).toBeLessThan(1e-3);
      expect(Math.abs(z[1] - im) / r.Rs).toBeLessThan(1e-3);
    }
    // Below resonance a resonator is inductive (Im Z > 0 in e^{+jωt}); at resonance Z = R_s (common practice).
    impedanceAt(r, 0.5 * r.omegaR, ctx, z);
    expect(z[1]).toBeGreaterThan(0);
    impedanceAt(r, r.omegaR, ctx, z);
    expect(z[0]).toBeCloseTo(r.Rs, 9);
    // W(0) = half of W(0+) (beam-loading theorem, PHYSICS.md §12).
    expect(resonatorWake(r, 0) / resonatorWake(r, 1e-18)).toBeCloseTo(0.5, 6);
  });

  it('space charge: Im Z/n = −Z0·g0/(2βγ²), g0 = 1 + 2 ln(b/a) on axis, 0.5 + 2 ln(b/a) averaged', () => {
    // PHYSICS.md §12 (A.W. Chao et al., Handbook of Accelerator Physics and Engineering (2013), §3.2 (mem.)).
    const [onAxis, averaged] = impedancesOf([
      { kind: 'spaceCharge', beamRadius: 0.01, pipeRadius: 0.05, geometry: 'onAxis' },
      { kind: 'spaceCharge', beamRadius: 0.01, pipeRadius: 0.05, geometry: 'averaged' },
    ], ctx.beta, ctx.gamma);
    const z = new Float64Array(2);
    const n = 7;
    impedanceAt(onAxis, n * ctx.omega0, ctx, z);
    expect(z[1] / n).toBeCloseTo((-376.730313668 * (1 + 2 * Math.log(5))) / (2 * 0.9 * ctx.gamma ** 2), 9);
    expect(z[0]).toBe(0);
    impedanceAt(averaged, n * ctx.omega0, ctx, z);
    expect(z[1] / n).toBeCloseTo((-Z0_OHM * (0.5 + 2 * Math.log(5))) / (2 * 0.9 * ctx.gamma ** 2), 9);
  });

  it('a table is interpolated linearly, zero above its last row, conjugate-symmetric in use', () => {
    const [t] = impedancesOf([{ kind: 'table', label: '', frequency: [1e6, 2e6, 4e6], re: [10, 20, 0], im: [1, -3, 5] }], 1, 1);
    const z = new Float64Array(2);
    impedanceAt(t, 2 * Math.PI * 3e6, ctx, z);
    expect(z[0]).toBeCloseTo(10, 12);
    expect(z[1]).toBeCloseTo(1, 12);
    impedanceAt(t, 2 * Math.PI * 5e6, ctx, z);
    expect([z[0], z[1]]).toEqual([0, 0]);
  });
});

describe('impedance table from CSV', () => {
  it('converts units, flips Im Z for the physics convention and names bad lines', () => {
    const text = '# measured (invented numbers)\nfrequency_GHz,re_kOhm,im_Ohm\n0.5,1.5,20\n1,2,-30\n';
    const e = importImpedanceCsv(text, 'engineering');
    expect(e.ok && e.table.frequency).toEqual([0.5e9, 1e9]);
    expect(e.ok && e.table.re).toEqual([1500, 2000]);
    expect(e.ok && e.table.im).toEqual([20, -30]);
    // e^{−iωt} texts: Im Z changes sign (PHYSICS.md §12).
    const p = importImpedanceCsv(text, 'physics');
    expect(p.ok && p.table.im).toEqual([-20, 30]);
    const bad = importImpedanceCsv('frequency_GHz,re_Ohm,im_Ohm\n1,2,3\n0.5,x,1\n', 'engineering');
    expect(!bad.ok && bad.errors.map((i) => i.line)).toEqual([3]);
    const head = importImpedanceCsv('f,re,im\n1,2,3\n2,3,4\n', 'engineering');
    expect(!head.ok && head.errors[0].message).toMatch(/expected frequency_<Hz/);
  });
});

describe('incoherent synchrotron-frequency shift of an inductive impedance', () => {
  // Parabolic line density of half-length τ̂ and charge Q: I = I_pk(1 − t²/τ̂²), I_pk = 3Q/(4τ̂). With Z/n = jX, i.e.
  // V_ind = −(X/ω0)·dI/dt, the induced voltage is linear across the bunch and adds to the RF slope:
  //   (ω_s/ω_s0)² = 1 + 3π·h²·X·I_0/(Z·V·cos φs·φ̂³),  I_0 = Q·f0, φ̂ = h·ω0·τ̂
  // (K.Y. Ng, Physics of Intensity Dependent Beam Instabilities (2006), potential-well tune shift of a parabolic
  // bunch (mem.); re-derived here from V_ind = −L·dI/dt). Below transition with X > 0 the tune rises.
  // Fictional proton ring, stationary below transition: Q_s ≈ 0.012, so 1024 turns hold ≈ 12 periods; the bunch is
  // short (φ̂ ≈ 0.4 rad) so the RF well is nearly quadratic and the self-consistent parabolic bunch stays parabolic.
  const X = 200, Nb = 3e11, V = 2e6, h = 16;
  const r = parseSetup({
    version: 1, title: 'test proton ring (fictional)', particle: { kind: 'proton' }, ring: { circumference: 300, gammaT: 6 },
    energy: { start: { quantity: 'kinetic', value: 2e9 } }, rf: { systems: [{ harmonic: h, voltage: V }] },
    beam: { distribution: { kind: 'matched', shape: 'parabolic', size: { by: 'rmsLength', value: 2e-9 } }, particles: 20_000, seed: 4 },
    run: { drift: 'linear', momentumAperture: 0.1 },
    intensity: { particlesPerBunch: Nb }, impedances: [{ kind: 'inductive', imZOverN: X }],
    collective: { bins: 256, smoothing: 2 },
  });
  if (!r.ok) throw new Error(JSON.stringify(r.errors));
  const setup = r.setup;

  it('small-amplitude particles in the tracked self-consistent bunch oscillate at the shifted frequency (within 5 % of the shift)', () => {
    const m = machineAtStart(setup);
    const sc = solveSelfConsistent(setup, m)!;
    expect(sc.solution.converged).toBe(true);
    const { bunch } = generateBeam(setup, m);
    // 48 test particles near the centre (tiny amplitude, ≈ 1 % of the bunch length), taken from the last indices.
    const T = 48, sigE = sc.zeroIntensity.rmsEnergySpread;
    for (let k = 0; k < T; k++) {
      bunch.dt[bunch.total - 1 - k] = 0;
      bunch.dE[bunch.total - 1 - k] = 0.01 * sigE * (k % 2 ? 1 : -1) * (1 + k / T);
    }
    const tr = new Tracker(setup, bunch);
    const turns = 1024;
    const rec = Array.from({ length: T }, () => new Float64Array(turns));
    let rmsSum = 0;
    tr.track(turns, (t) => {
      const i = t.turn - 1;
      for (let k = 0; k < T; k++) rec[k][i] = t.bunch.dt[t.bunch.total - 1 - k];
      let s1 = 0, s2 = 0;
      for (let j = 0; j < t.bunch.n; j++) {
        s1 += t.bunch.dt[j]; s2 += t.bunch.dt[j] ** 2;
      }
      rmsSum += Math.sqrt(s2 / t.bunch.n - (s1 / t.bunch.n) ** 2);
    });
    expect(tr.bunch.n).toBe(tr.bunch.total);
    // Tune: peak of the summed amplitude spectra, refined by a parabola through log amplitudes (Hann window).
    let sum: Float64Array | null = null;
    for (const x of rec) {
      const s = centroidSpectrum(x, 1).amplitude;
      if (!sum) sum = new Float64Array(s.length);
      for (let i = 0; i < s.length; i++) sum[i] += s[i];
    }
    let k = 1;
    for (let i = 2; i < sum!.length - 1; i++) if (sum![i] > sum![k]) k = i;
    const [a, b, c] = [Math.log(sum![k - 1]), Math.log(sum![k]), Math.log(sum![k + 1])];
    const Q = (k + (0.5 * (a - c)) / (a - 2 * b + c)) / 1024;
    // Zero-intensity tune (PHYSICS.md §6), φs = 0 below transition.
    const Q0 = Math.sqrt((h * Math.abs(m.eta0) * V) / (2 * Math.PI * m.beta ** 2 * m.Es));
    const tauHat = Math.sqrt(5) * (rmsSum / turns); // parabolic: ⟨t²⟩ = τ̂²/5
    const I0 = E_CHARGE * Nb * m.f0;
    const shift = (3 * Math.PI * h * h * X * I0) / (V * Math.pow(h * m.omega0 * tauHat, 3));
    expect(shift).toBeGreaterThan(0.15); // a clear effect to measure
    const measured = (Q / Q0) ** 2 - 1;
    // 5 %: the RF nonlinearity at φ̂ ≈ 0.4 rad changes the bunch's central curvature by O(φ̂²/12) ≈ 1.5 % from the
    // parabola, and the interpolated spectral peak is good to ≈ 1 % of the tune.
    expect(Math.abs(measured / shift - 1)).toBeLessThan(0.05);
  });
});
