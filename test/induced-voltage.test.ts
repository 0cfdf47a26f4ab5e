// Induced voltage of a Gaussian bunch in a resonator, three ways: the FFT path (Ṽ = −Z·Ĩ), the time-domain wake
// recursion, and a direct time-domain convolution with the closed-form wake written out here (PHYSICS.md §12;
// A.W. Chao, Physics of Collective Beam Instabilities (1993), ch. 2, resonator wake (mem.)). Sign: a resistive
// impedance decelerates the bunch by k_loss·Q² with k_loss = π⁻¹∫_0^∞ Re Z·|λ̃|² dω computed here by quadrature.
import { describe, expect, it } from 'vitest';
import { makeBunch } from '../core/bunch.ts';
import { E_CHARGE } from '../core/constants.ts';
import { erf } from '../core/beam/erf.ts';
import { InducedVoltage } from '../core/collective/inducedVoltage.ts';
import type { Resonator } from '../core/collective/impedance.ts';
import { distortedWell, impedanceLoss, voltagesOnGrid } from '../core/collective/report.ts';
import { solveSelfConsistent } from '../core/collective/selfConsistent.ts';
import { SpectrumPath } from '../core/collective/spectrum.ts';
import { inducedKick } from '../core/elements/inducedKick.ts';
import { machineAtStart } from '../core/machine.ts';
import { makeRng } from '../core/rng.ts';
import { parseSetup } from '../core/setup/validate.ts';

const sigma = 1e-9; // rms bunch length [s]
const Q = 1e-9; // bunch charge [C]
const res: Resonator = { kind: 'resonator', Rs: 1e3, Q: 1.5, omegaR: 2 * Math.PI * 0.8e9 };
const ctx = { omega0: 2 * Math.PI * 1e6, beta: 1, gamma: 1e3 };

// Resonator wake W(τ > 0) written out independently of core/collective/impedance.ts (PHYSICS.md §12).
function wake(tau: number): number {
  const a = res.omegaR / (2 * res.Q), wb = Math.sqrt(res.omegaR ** 2 - a * a);
  return ((res.omegaR * res.Rs) / res.Q) * Math.exp(-a * tau) * (Math.cos(wb * tau) - (a / wb) * Math.sin(wb * tau));
}
const current = (t: number) => (Q / (Math.sqrt(2 * Math.PI) * sigma)) * Math.exp((-0.5 * t * t) / (sigma * sigma));

// V(t) = −∫_0^∞ W(τ)·I(t − τ)dτ by composite Simpson on [0, t + 10σ] with 20000 intervals.
function directVoltage(t: number): number {
  const b = Math.max(0, t + 10 * sigma), n = 20000, h = b / n;
  if (b === 0) return 0;
  let s = wake(0) * current(t) + wake(b) * current(t - b);
  for (let i = 1; i < n; i++) s += (i % 2 ? 4 : 2) * wake(i * h) * current(t - i * h);
  return (-s * h) / 3;
}

// Exact charge per bin of the Gaussian: Q·[Φ(right) − Φ(left)].
function binCharges(e0: number, delta: number, nb: number): Float64Array {
  const q = new Float64Array(nb);
  const cdf = (t: number) => 0.5 * (1 + erf(t / (Math.SQRT2 * sigma)));
  for (let i = 0; i < nb; i++) q[i] = Q * (cdf(e0 + (i + 1) * delta) - cdf(e0 + i * delta));
  return q;
}

const nb = 1024, e0 = -8 * sigma, delta = (16 * sigma) / nb;
const grid = { e0, delta, nb };
const q = binCharges(e0, delta, nb);
const probes = [-2, -1, -0.5, 0, 0.5, 1, 2, 3].map((k) => k * sigma);

describe('resonator induced voltage of a Gaussian bunch', () => {
  const direct = probes.map(directVoltage);
  const scale = Math.max(...direct.map(Math.abs));

  it('FFT path (Ṽ = −Z·Ĩ) matches the direct time-domain convolution with the wake', () => {
    const sp = new SpectrumPath([res], nb, delta, 0);
    sp.setBeam(ctx.omega0, ctx.beta, ctx.gamma);
    const I = q.map((x) => x / delta);
    sp.transform(I);
    const v = new Float64Array(nb);
    sp.addVoltage(v);
    const calc = new InducedVoltage([], grid, 0); // only for interpolation at the probes
    calc.voltage.set(v);
    // Bin width σ/64: interpolation and sampling errors O((Δ/σ)²) ≈ 2e-4 of the peak; 2e-3 allows the resonator's
    // fast wake front (the current jumps within a bin).
    probes.forEach((t, i) => expect(Math.abs(calc.voltageAt(t) - direct[i]) / scale).toBeLessThan(2e-3));
  });

  it('time-domain wake recursion matches the same convolution', () => {
    const calc = new InducedVoltage([res], grid, 0);
    // Bunch spacing 1 ms: the wake (decay time 2Q/ω_r ≈ 0.6 ns) is long gone, so only this pass counts.
    calc.compute(q, ctx, 1e-3, 1, true);
    probes.forEach((t, i) => expect(Math.abs(calc.voltageAt(t) - direct[i]) / scale).toBeLessThan(2e-3));
  });

  it('the bunch loses k_loss·Q² with k_loss = π⁻¹∫Re Z·|λ̃|²dω (resistive part decelerates)', () => {
    // k_loss by quadrature over ω with λ̃ = exp(−ω²σ²/2) (Gaussian), Re Z of the resonator written out here.
    const reZ = (w: number) => res.Rs / (1 + (res.Q * (w / res.omegaR - res.omegaR / w)) ** 2);
    const wMax = 12 / sigma, n = 200000, h = wMax / n;
    let k = 0;
    for (let i = 1; i <= n; i++) {
      const w = (i - 0.5) * h;
      k += reZ(w) * Math.exp(-w * w * sigma * sigma) * h;
    }
    k /= Math.PI;
    for (const calc of [new InducedVoltage([res], grid, 0), new InducedVoltage([{ kind: 'table', ...tableOf(res) }], grid, 0)]) {
      calc.compute(q, ctx, 1e-3, 1, true);
      let energy = 0; // ∫I·V dt [J]
      for (let i = 0; i < nb; i++) energy += q[i] * calc.voltage[i];
      expect(energy).toBeLessThan(0);
      expect(-energy / (k * Q * Q)).toBeCloseTo(1, 2);
    }
  });

  it('the tracker element kicks each particle by Z·V_ind: mean loss −k_loss·Z²·e·N_b per particle', () => {
    const r = parseSetup({
      version: 1, title: 'test (fictional)', particle: { kind: 'proton' }, ring: { circumference: 300, gammaT: 5 },
      energy: { start: { quantity: 'kinetic', value: 1e9 } }, rf: { systems: [{ harmonic: 1, voltage: 1e5 }] },
      beam: { distribution: { kind: 'coasting', rmsEnergySpread: 0 }, particles: 10 },
    });
    if (!r.ok) throw new Error('setup');
    const m = machineAtStart(r.setup);
    const Nb = Q / E_CHARGE;
    const el = inducedKick({ particlesPerBunch: Nb, bunchCharge: Q, bunches: 1, impedances: [], bins: nb, smoothing: 0, window: 0 }, grid);
    // The element builds its models from the setup form: a resonator of the same numbers.
    const el2 = inducedKick({ particlesPerBunch: Nb, bunchCharge: Q, bunches: 1, bins: nb, smoothing: 0, window: 0,
      impedances: [{ kind: 'resonator', shuntImpedance: res.Rs, quality: res.Q, frequency: res.omegaR / (2 * Math.PI) }] }, grid);
    const n = 200_000, b = makeBunch(n), rng = makeRng(5);
    for (let i = 0; i < n; i++) b.dt[i] = sigma * rng.normal();
    el.apply(b, m);
    expect(el.meanKick).toBe(0); // no impedance, no kick
    el2.apply(b, m);
    const calc = new InducedVoltage([res], grid, 0);
    calc.compute(q, ctx, 1e-3, 1, true);
    let kQ2 = 0;
    for (let i = 0; i < nb; i++) kQ2 -= q[i] * calc.voltage[i];
    // Per particle: −k·Q²/(N_b·e) eV. Sampling noise of 2e5 particles ≈ 0.3 %: tolerance 2 %.
    expect(el2.meanKick / (-kQ2 / (Nb * E_CHARGE))).toBeGreaterThan(0.98);
    expect(el2.meanKick / (-kQ2 / (Nb * E_CHARGE))).toBeLessThan(1.02);
  });
});

describe('long-lived resonator: memory over bunches and turns', () => {
  // A narrow-band mode at 20 × the bunch frequency, Q = 300: the wake lives for many bunch spacings.
  const Tb = 100e-9, M = 4;
  const mode: Resonator = { kind: 'resonator', Rs: 5e5, Q: 300, omegaR: (2 * Math.PI * 20) / Tb };
  const sig = 0.2e-9;
  const nb2 = 256, g2 = { e0: -6 * sig, delta: (12 * sig) / nb2, nb: nb2 };
  const q2 = new Float64Array(nb2);
  const cdf = (t: number) => 0.5 * (1 + erf(t / (Math.SQRT2 * sig)));
  for (let i = 0; i < nb2; i++) q2[i] = Q * (cdf(g2.e0 + (i + 1) * g2.delta) - cdf(g2.e0 + i * g2.delta));

  // Direct sum over this bunch and all earlier ones (k·Tb earlier), wake written out here, midpoint rule.
  function trainVoltage(t: number): number {
    const a = mode.omegaR / (2 * mode.Q), wb = Math.sqrt(mode.omegaR ** 2 - a * a);
    const W = (x: number) => (x <= 0 ? 0 : ((mode.omegaR * mode.Rs) / mode.Q) * Math.exp(-a * x) * (Math.cos(wb * x) - (a / wb) * Math.sin(wb * x)));
    const I = (x: number) => (Q / (Math.sqrt(2 * Math.PI) * sig)) * Math.exp((-0.5 * x * x) / (sig * sig));
    let v = 0;
    const n = 4000, h = (12 * sig) / n;
    // The wake decays by e^{−ω_r·Tb/2Q} ≈ e^{−0.21} per spacing: 150 earlier bunches leave < 1e-13.
    for (let k = 0; k < 150; k++)
      for (let i = 0; i < n; i++) {
        const tp = -6 * sig + (i + 0.5) * h;
        v -= W(t - tp + k * Tb) * I(tp) * h;
      }
    return v;
  }

  it('the steady state of M bunches equals the direct sum over earlier bunches; turn-by-turn memory keeps it', () => {
    const calc = new InducedVoltage([mode], g2, 0);
    calc.compute(q2, ctx, Tb, M, true);
    const ref = [0, sig].map(trainVoltage);
    const scale = Math.abs(ref[0]);
    expect(Math.abs(calc.voltageAt(0) - ref[0]) / scale).toBeLessThan(3e-3);
    expect(Math.abs(calc.voltageAt(sig) - ref[1]) / scale).toBeLessThan(3e-3);
    // High-Q limit (beam loading, common practice): a short bunch train at resonance sees ≈ −2·I_DC·R_s·e^{−ω_r²σ²/2}.
    const IDC = Q / Tb;
    expect(calc.voltageAt(0) / (-2 * IDC * mode.Rs * Math.exp(-0.5 * (mode.omegaR * sig) ** 2))).toBeCloseTo(1, 1);
    // Turn by turn: the stored state reproduces the steady state for an unchanged bunch.
    const turn = new InducedVoltage([mode], g2, 0);
    for (let k = 0; k < 5; k++) turn.compute(q2, ctx, Tb, M, false);
    expect(Math.abs(turn.voltageAt(0) - calc.voltageAt(0)) / scale).toBeLessThan(1e-9);
  });
});

// The resonator as a Z(f) table (linear interpolation, fine rows up to 40 GHz), to check the FFT path of tables.
function tableOf(r: Resonator) {
  const n = 40000, fMax = 40e9;
  const f = new Float64Array(n), re = new Float64Array(n), im = new Float64Array(n);
  for (let i = 0; i < n; i++) {
    const w = (2 * Math.PI * (i + 1) * fMax) / n;
    const y = r.Q * (w / r.omegaR - r.omegaR / w);
    f[i] = (i + 1) * (fMax / n);
    re[i] = r.Rs / (1 + y * y);
    im[i] = (-r.Rs * y) / (1 + y * y);
  }
  return { f, re, im };
}

describe('reports: voltages, distorted well and energy balance', () => {
  // Fictional proton ring, stationary below transition, one RF system.
  const make = (extra: Record<string, unknown>) => {
    const r = parseSetup({
      version: 1, title: 'test (fictional)', particle: { kind: 'proton' }, ring: { circumference: 300, gammaT: 6 },
      energy: { start: { quantity: 'kinetic', value: 2e9 } }, rf: { systems: [{ harmonic: 8, voltage: 2e5 }] },
      beam: { distribution: { kind: 'matched', shape: 'gaussian', size: { by: 'rmsLength', value: 8e-9 } }, particles: 10 },
      ...extra,
    });
    if (!r.ok) throw new Error(JSON.stringify(r.errors));
    return r.setup;
  };

  it('without a beam field: RF voltage V·sin(φs + ω_rf·dt) and the separatrix height of PHYSICS.md §7', () => {
    const m = machineAtStart(make({}));
    const Trf = (2 * Math.PI) / m.omegaRf;
    const v = voltagesOnGrid(m, null, [0, Trf / 4, -Trf / 8]);
    expect(v.rf[1]).toBeCloseTo(2e5 * Math.sin(m.phiS + Math.PI / 2), 6);
    expect(v.induced[2]).toBe(0);
    const w = distortedWell(m, null, -0.75 * Trf, 0.75 * Trf, 20001);
    // Stationary bucket: ΔE_max = β²E·sqrt(2ZV/(πβ²E·h|η|)) (PHYSICS.md §7, Y = 1); grid step 1e-4 of the period.
    const b2E = m.beta ** 2 * m.Es;
    const dEmax = b2E * Math.sqrt((2 * 2e5) / (Math.PI * b2E * m.h * Math.abs(m.eta0)));
    expect(Math.max(...w.separatrix!.dE) / dEmax).toBeCloseTo(1, 3);
    expect(Math.abs(w.bottom)).toBeLessThan(1e-4 * Trf);
  });

  it('a stationary bunch in a lossy impedance: mean RF gain equals the energy lost to the impedance (energy balance, common practice)', () => {
    const s = make({
      intensity: { particlesPerBunch: 3e12 },
      impedances: [{ kind: 'resonator', shuntImpedance: 2e4, quality: 1, frequency: 2e8 }],
      collective: { bins: 1024, smoothing: 0 },
    });
    const m = machineAtStart(s);
    const sc = solveSelfConsistent(s, m)!;
    expect(sc.solution.converged).toBe(true);
    const { lambda } = sc.solution, c = sc.calc.centres, d = sc.calc.grid.delta;
    let gain = 0; // ∫λ·F_rf dt: mean energy given by the RF per turn [eV]
    for (let i = 0; i < c.length; i++) gain += lambda[i] * (2e5 * Math.sin(m.phiS + m.omegaRf * c[i]) - m.dEs) * d;
    const loss = impedanceLoss(sc.calc, 3e12 * E_CHARGE, 3e12).lossPerParticle;
    expect(loss).toBeGreaterThan(0);
    expect(gain / loss).toBeCloseTo(1, 2);
    // The well bottom moves to where the RF makes up the loss: F_rf(bottom) + Z·V_ind(bottom) = 0, with F_rf > 0 there.
    const w = distortedWell(m, sc.calc, sc.calc.grid.e0, sc.calc.grid.e0 + sc.calc.grid.nb * d, 4001);
    expect(2e5 * Math.sin(m.phiS + m.omegaRf * w.bottom) + sc.calc.voltageAt(w.bottom)).toBeCloseTo(0, 0);
  });
});

describe('smoothed current and voltage from one inverse FFT', () => {
  // Independent computation: the two inverse transforms done apart (smoothed, addVoltage). Packing two Hermitian
  // spectra as A + iB is exact in exact arithmetic; the tolerance is rounding of a 2048-point FFT (common practice).
  it('equals the two separate inverse transforms within 1e-12 of their largest value', () => {
    const nb = 1000, delta = 1e-10;
    const res: Resonator = { kind: 'resonator', Rs: 1e4, Q: 1, omegaR: 2 * Math.PI * 1e9 };
    const sp = new SpectrumPath([{ kind: 'zOverN', X: 5, g0: 0 }, res], nb, delta, 1.5);
    const I = new Float64Array(nb);
    for (let i = 0; i < nb; i++) I[i] = Math.exp(-0.5 * ((i - 480) / 60) ** 2) * (1 + 0.1 * Math.sin(i / 7));
    sp.setBeam(2 * Math.PI * 1e6, 0.8, 1.7);
    sp.transform(I);
    const c1 = new Float64Array(nb), v1 = new Float64Array(sp.N), c2 = new Float64Array(nb), v2 = new Float64Array(sp.N);
    sp.smoothed(c1);
    sp.addVoltage(v1, sp.N);
    sp.smoothedAndVoltage(c2, v2, sp.N);
    const maxAbs = (a: Float64Array) => a.reduce((m, x) => Math.max(m, Math.abs(x)), 0);
    const maxDiff = (a: Float64Array, b: Float64Array) => a.reduce((m, x, i) => Math.max(m, Math.abs(x - b[i])), 0);
    expect(maxAbs(v1)).toBeGreaterThan(1); // a voltage to compare
    expect(maxDiff(c1, c2)).toBeLessThan(1e-12 * maxAbs(c1));
    expect(maxDiff(v1, v2)).toBeLessThan(1e-12 * maxAbs(v1));
  });
});
