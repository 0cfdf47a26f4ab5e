// Matched, unmatched and coasting beams checked against closed forms and independent quadrature.
// Test machine (fictional): protons at 1 GeV kinetic, C = 100 m, γt = 5 (below transition), one RF system
// h = 4, V = 50 kV, no ramp: a stationary bucket with φs = 0. Its bounds are written here in closed form
// (PHYSICS.md §7): separatrix ends ±π, U_sep = U(π) = 2ZV/(β²E), area A0 = (8/ω_rf)·sqrt(2ZVβ²E/(π·h·|η|)).
import ellipe from '@stdlib/math-base-special-ellipe';
import ellipk from '@stdlib/math-base-special-ellipk';
import { describe, expect, it } from 'vitest';
import { generateBeam, GAUSSIAN_CONTOUR_LEVEL, matchBunch, sampleMatched, type BucketBounds, type MatchedShape } from '../core/beam/index.ts';
import { computeBucket, contourAt } from '../core/bucket.ts';
import { makeBunch, type Bunch } from '../core/bunch.ts';
import { machineAtStart, type MachineState } from '../core/machine.ts';
import { makeRng } from '../core/rng.ts';
import { protonRing } from './support/setups.ts';

const V = 50e3;

function setupOf(distribution: unknown, beam: Record<string, unknown> = {}, more: Record<string, unknown> = {}) {
  return protonRing({ circumference: 100, gammaT: 5, kinetic: 1e9, systems: [{ harmonic: 4, voltage: V }], beam: { distribution, particles: 1000, ...beam }, more });
}

const m: MachineState = machineAtStart(setupOf({ kind: 'coasting', rmsEnergySpread: 1 }));
const beta2E = m.beta * m.beta * m.Es;
const u0 = V / beta2E; // U(φ) = u0·(1 − cos φ) for the stationary bucket below transition (PHYSICS.md §5)
const aE = (Math.PI * m.h * Math.abs(m.eta0)) / (beta2E * beta2E); // H' = U + aE·dE²
const A0 = (8 / m.omegaRf) * Math.sqrt((2 * V * beta2E) / (Math.PI * m.h * Math.abs(m.eta0)));
const bucket: BucketBounds = { phiS: 0, phiLeft: -Math.PI, phiRight: Math.PI, Usep: 2 * u0, area: A0 };
// ω_s from PHYSICS.md §6: Q_s = sqrt(h·|η|·ZV·|cos φs|/(2π·β²E)).
const omegaS = Math.sqrt((m.h * Math.abs(m.eta0) * V) / (2 * Math.PI * beta2E)) * m.omega0;

function moments(b: Bunch) {
  let st = 0, se = 0, stt = 0, see = 0, ste = 0;
  for (let i = 0; i < b.n; i++) {
    const t = b.dt[i], e = b.dE[i];
    st += t; se += e; stt += t * t; see += e * e; ste += t * e;
  }
  const n = b.n;
  const mt = st / n, me = se / n;
  const vt = stt / n - mt * mt, ve = see / n - me * me, c = ste / n - mt * me;
  return { meanT: mt, meanE: me, sigmaT: Math.sqrt(vt), sigmaE: Math.sqrt(ve), emitRms: Math.sqrt(vt * ve - c * c) };
}

function sample(shape: MatchedShape, scale: number, n: number, seed = 1): Bunch {
  const b = makeBunch(n);
  sampleMatched(m, bucket, shape, scale, makeRng(seed), b);
  return b;
}

describe('test machine', () => {
  it('is a stationary bucket below transition', () => {
    expect(m.phiS).toBeCloseTo(0, 12);
    expect(m.eta0).toBeLessThan(0);
  });
});

describe('small gaussian bunch: linear matching', () => {
  // σφ = 0.1 rad: its 95 % contour fills ≈ 1.2 % of the bucket.
  const sigmaT = 0.1 / m.omegaRf;
  const info = matchBunch(m, bucket, 'gaussian', { by: 'rmsLength', value: sigmaT });

  it('meets the rms-length request', () => {
    expect(Math.abs(info.rmsLength / sigmaT - 1)).toBeLessThan(1e-10);
    expect(info.fillingFactor).toBeLessThan(0.02);
  });

  it('obeys σE/(β²E) = (ω_s/|η|)·σt up to the pendulum correction', () => {
    // PHYSICS.md §9 (Lee ch. 3, from memory). Nonlinearity, derived here: for G = exp(−U/H0) with
    // U = u0(1 − cos φ) ≈ u0(φ²/2 − φ⁴/24), first-order perturbation of the Gaussian weight gives
    // ⟨φ²⟩ = s²(1 + s²/2), s² = H0/u0; the energy spread is exactly Gaussian, σδ² = H0/(2πh|η|).
    // So σt·(ω_s/|η|)·β²E/σE − 1 = s²/4 + O(s⁴) ≈ 2.5e-3 here; the O(s⁴) rest is < 1e-4 (< 5 % of it).
    const linear = (info.rmsLength * (omegaS / Math.abs(m.eta0)) * beta2E) / info.rmsEnergySpread - 1;
    const s2 = (2 * Math.PI * m.h * Math.abs(m.eta0) * (info.rmsEnergySpread / beta2E) ** 2) / u0;
    console.log(`linear matching: deviation ${linear.toExponential(3)}, predicted s²/4 = ${(s2 / 4).toExponential(3)}`);
    expect(Math.abs(linear)).toBeLessThan(5e-3);
    expect(Math.abs(linear / (s2 / 4) - 1)).toBeLessThan(0.05);
  });

  it('is reproduced by the generated sample within statistics', () => {
    // Relative standard error of a sample rms of a near-Gaussian: 1/sqrt(2N); allow 4 of them.
    const N = 200_000;
    const s = moments(sample('gaussian', info.scale, N));
    const tol = 4 / Math.sqrt(2 * N);
    expect(Math.abs(s.sigmaT / info.rmsLength - 1)).toBeLessThan(tol);
    expect(Math.abs(s.sigmaE / info.rmsEnergySpread - 1)).toBeLessThan(tol);
    expect(Math.abs(s.meanT) / info.rmsLength).toBeLessThan(4 / Math.sqrt(N));
    expect(Math.abs(s.emitRms / info.emittanceRms - 1)).toBeLessThan(2 * tol);
  });

  it('holds 1 − e⁻² = 86.5 % inside the 2σ ellipse (4πσtσE)', () => {
    // PHYSICS.md §9; for a 2-D Gaussian P(r < 2σ) = 1 − e^{−2}. Binomial standard error sqrt(p(1−p)/N);
    // allow 4 of them plus the pendulum correction (≈ s²/4 on σt, below 1e-3 in the fraction).
    const N = 200_000;
    const b = sample('gaussian', info.scale, N, 5);
    let inside = 0;
    for (let i = 0; i < N; i++) {
      const x = b.dt[i] / info.rmsLength, y = b.dE[i] / info.rmsEnergySpread;
      if (x * x + y * y < 4) inside++;
    }
    const p = 1 - Math.exp(-2);
    expect(Math.abs(inside / N - p)).toBeLessThan(4 * Math.sqrt((p * (1 - p)) / N) + 1e-3);
  });
});

describe('linear-limit projections of the contour', () => {
  // Closed forms derived here. A 2-D density ∝ (1 − r²)^μ on the unit disc projects to (1 − x²)^(μ+½); a
  // line density ∝ (1 − x²)^ν has ⟨x²⟩ = B(3/2, ν+1)/B(½, ν+1) = x̂²/(2ν+3). Hence
  // flat (μ = 0): σ = x̂/2; parabolic (μ = ½, ν = 1): σ = x̂/√5; the energy axis alike.
  // Gaussian exp(−H'/H0) with its contour at H' = ln20·H0: x̂ = σ·sqrt(2 ln 20).
  // Small bunch σφ ≈ 0.01 rad: the pendulum correction (≈ φ̂²/16) is below 1e-4; tolerance 1e-3.
  const cases: [MatchedShape, number][] = [
    ['flat', 1 / 2],
    ['parabolic', 1 / Math.sqrt(5)],
    ['gaussian', 1 / Math.sqrt(2 * Math.log(20))],
  ];
  for (const [shape, ratio] of cases) {
    it(`${shape}: σt/(L/2) = σE/ΔE = ${ratio.toFixed(4)}`, () => {
      const info = matchBunch(m, bucket, shape, { by: 'rmsLength', value: 0.01 / m.omegaRf });
      expect(Math.abs(info.rmsLength / (info.contourLength / 2) / ratio - 1)).toBeLessThan(1e-3);
      expect(Math.abs(info.rmsEnergySpread / info.contourHalfHeight / ratio - 1)).toBeLessThan(1e-3);
      // the contour is an ellipse of area π·(L/2)·ΔE
      expect(Math.abs(info.contourArea / (Math.PI * (info.contourLength / 2) * info.contourHalfHeight) - 1)).toBeLessThan(1e-3);
    });
  }
});

describe('large bunches (half the bucket): contour against 4σt and 2σE', () => {
  // Independent of the program's quadrature: the contour of amplitude φ̂ = 2·asin k in the stationary bucket has
  // area A0·[E(k) − (1 − k²)K(k)] and half-height k·δ0 (PHYSICS.md §7, elliptic integrals with parameter k²),
  // δ0 = sqrt(2ZV/(π·β²E·h·|η|)). Inside it, R(φ) = Hm − U = u0·(cos φ − cos φ̂) and, at fixed φ, |dE| < sqrt(R/aE).
  const filling = 0.5;
  const fill = (k: number) => ellipe(k * k) - (1 - k * k) * ellipk(k * k);
  let lo = 0, hi = 1;
  for (let i = 0; i < 60; i++) {
    const mid = 0.5 * (lo + hi);
    if (fill(mid) < filling) lo = mid;
    else hi = mid;
  }
  const k = 0.5 * (lo + hi);
  const phiHat = 2 * Math.asin(k);
  const delta0 = Math.sqrt((2 * V) / (Math.PI * beta2E * m.h * Math.abs(m.eta0)));
  const length = (2 * phiHat) / m.omegaRf;
  const halfHeight = beta2E * k * delta0;
  const R = (phi: number) => u0 * (Math.cos(phi) - Math.cos(phiHat));

  it('flat: contour geometry from elliptic integrals; σt, σE by direct quadrature', () => {
    // Flat: λ(φ) ∝ sqrt(R), ⟨dE²⟩ = ∫R^{3/2}/(3aE·∫R^{1/2}). Uniform midpoint rule, 2e5 nodes: the sqrt end
    // points leave an error ~ (step)^{3/2} ≈ 1e-7 relative; tolerance 1e-5.
    const n = 200_000;
    let w0 = 0, w2 = 0, r3 = 0;
    for (let j = 0; j < n; j++) {
      const phi = -phiHat + ((j + 0.5) * 2 * phiHat) / n;
      const r = R(phi);
      w0 += Math.sqrt(r); w2 += phi * phi * Math.sqrt(r); r3 += r * Math.sqrt(r);
    }
    const sigmaT = Math.sqrt(w2 / w0) / m.omegaRf;
    const sigmaE = Math.sqrt(r3 / (3 * aE * w0));
    const info = matchBunch(m, bucket, 'flat', { by: 'emittance', convention: 'contour', value: filling * A0 });
    expect(Math.abs(info.fillingFactor - filling)).toBeLessThan(1e-9);
    expect(Math.abs(info.contourLength / length - 1)).toBeLessThan(1e-9);
    expect(Math.abs(info.contourHalfHeight / halfHeight - 1)).toBeLessThan(1e-9);
    expect(Math.abs(info.rmsLength / sigmaT - 1)).toBeLessThan(1e-5);
    expect(Math.abs(info.rmsEnergySpread / sigmaE - 1)).toBeLessThan(1e-5);
    // A uniform ellipse has L = 4σt and ΔE = 2σE exactly. In the pendulum well R = 2u0·sin((φ̂+φ)/2)·sin((φ̂−φ)/2)
    // falls below its parabolic approximation more at the ends than at the centre, so the bunch is more
    // peaked: the quadrature above gives L/(4σt) ≈ 1.019 and ΔE/(2σE) ≈ 1.017. Check the program on both sides.
    const rL = length / (4 * sigmaT), rH = halfHeight / (2 * sigmaE);
    console.log(`flat, 50 % filling: L/(4σt) = ${rL.toFixed(4)}, ΔE/(2σE) = ${rH.toFixed(4)}`);
    expect(rL).toBeGreaterThan(1.01);
    expect(rH).toBeGreaterThan(1.01);
    expect(Math.abs(info.contourLength / (4 * info.rmsLength) - rL)).toBeLessThan(1e-4);
    expect(Math.abs(info.contourHalfHeight / (2 * info.rmsEnergySpread) - rH)).toBeLessThan(1e-4);
  });

  it('parabolic: σt, σE in closed form', () => {
    // Parabolic (μ = ½): λ(φ) ∝ R^{1/2}·R^{1/2} = R, ⟨dE²⟩ = ∫R²/(4aE·∫R) (shapes.ts integrals with μ = ½).
    // With c = cos φ̂, a = φ̂: ∫R/u0 = 2 sin a − 2a c; ∫φ²R/u0 = 2(a² sin a + 2a cos a − 2 sin a) − (2a³/3)c;
    // ∫R²/u0² = a + sin a·cos a − 4c·sin a + 2a c².
    const a = phiHat, c = Math.cos(a), s = Math.sin(a);
    const i0 = 2 * s - 2 * a * c;
    const i2 = 2 * (a * a * s + 2 * a * c - 2 * s) - ((2 * a ** 3) / 3) * c;
    const q = a + s * c - 4 * c * s + 2 * a * c * c;
    const sigmaT = Math.sqrt(i2 / i0) / m.omegaRf;
    const sigmaE = Math.sqrt((u0 * q) / (4 * aE * i0));
    const info = matchBunch(m, bucket, 'parabolic', { by: 'emittance', convention: 'contour', value: filling * A0 });
    expect(Math.abs(info.contourLength / length - 1)).toBeLessThan(1e-9);
    expect(Math.abs(info.rmsLength / sigmaT - 1)).toBeLessThan(1e-9);
    expect(Math.abs(info.rmsEnergySpread / sigmaE - 1)).toBeLessThan(1e-9);
    // Linear limit: L/(4σt) = ΔE/(2σE) = √5/2 ≈ 1.118; at half filling the closed forms give ≈ 1.157 and
    // ≈ 1.131 (the same peaking as for the flat bunch).
    const rL = length / (4 * sigmaT), rH = halfHeight / (2 * sigmaE);
    console.log(`parabolic, 50 % filling: L/(4σt) = ${rL.toFixed(4)}, ΔE/(2σE) = ${rH.toFixed(4)} (linear ${(Math.sqrt(5) / 2).toFixed(4)})`);
    expect(rL).toBeGreaterThan(Math.sqrt(5) / 2 + 0.02);
    expect(rH).toBeGreaterThan(Math.sqrt(5) / 2 + 0.005);
    expect(Math.abs(info.contourLength / (4 * info.rmsLength) - rL)).toBeLessThan(1e-4);
    expect(Math.abs(info.contourHalfHeight / (2 * info.rmsEnergySpread) - rH)).toBeLessThan(1e-4);
  });

  it('gaussian filling half the bucket: σt, σE by brute-force 2-D quadrature', () => {
    // G = exp(−H'/H0) cut at the separatrix, integrated over a uniform (φ, dE) midpoint grid of 1500 × 1500
    // cells (no closed-form energy integral, no substitution). The cut edge has G ≈ e^{−Usep/H0}, small, so
    // the grid error is ~1e-4; tolerance 1e-3. Pendulum form of U written independently: u0·(1 − cos φ).
    const info = matchBunch(m, bucket, 'gaussian', { by: 'emittance', convention: 'contour', value: filling * A0 });
    const H0 = info.scale;
    const dEmax = Math.sqrt((2 * u0) / aE);
    const n = 1500;
    let w0 = 0, wt = 0, wtt = 0, wee = 0;
    for (let i = 0; i < n; i++) {
      const phi = -Math.PI + ((i + 0.5) * 2 * Math.PI) / n;
      const U = u0 * (1 - Math.cos(phi));
      for (let j = 0; j < n; j++) {
        const e = -dEmax + ((j + 0.5) * 2 * dEmax) / n;
        const H = U + aE * e * e;
        if (H >= 2 * u0) continue;
        const g = Math.exp(-H / H0);
        w0 += g; wt += g * phi; wtt += g * phi * phi; wee += g * e * e;
      }
    }
    const sigmaT = Math.sqrt(wtt / w0 - (wt / w0) ** 2) / m.omegaRf;
    expect(Math.abs(info.rmsLength / sigmaT - 1)).toBeLessThan(1e-3);
    expect(Math.abs(info.rmsEnergySpread / Math.sqrt(wee / w0) - 1)).toBeLessThan(1e-3);
    // and it is markedly longer than linear matching predicts from its energy spread (σφ ≈ 0.6 rad)
    const linear = (info.rmsLength * (omegaS / Math.abs(m.eta0)) * beta2E) / info.rmsEnergySpread - 1;
    console.log(`gaussian, 95 % contour on half the bucket: σφ = ${(info.rmsLength * m.omegaRf).toFixed(3)} rad, σt/σt,linear − 1 = ${linear.toFixed(4)}`);
    expect(linear).toBeGreaterThan(0.05);
  });

  it('rejects a bunch larger than the bucket, naming the field and the bucket area', () => {
    expect(() => matchBunch(m, bucket, 'flat', { by: 'emittance', convention: 'contour', value: 1.1 * A0 })).toThrow(
      /beam\.distribution\.size\.value = .* eV·s: the contour emittance exceeds .* bucket \(area/,
    );
    expect(() => matchBunch(m, bucket, 'gaussian', { by: 'rmsLength', value: 1 / m.omegaRf })).toThrow(/rms length exceeds/);
  });
});

describe('unmatched beams', () => {
  // Requested σt; σE = mismatch·β²E·(ω_s/|η|)·σt with ω_s from PHYSICS.md §6 (computed above from V directly).
  // Relative standard error of a sample rms: sqrt((κ − 1)/(4N)) for kurtosis κ (3 Gaussian, 75/35 for a
  // parabolic projection); 4/sqrt(2N) covers both at four standard errors.
  const N = 200_000;
  const sigmaT = 0.3 / m.omegaRf;
  for (const shape of ['gaussian', 'parabolic'] as const) {
    it(`${shape}: rms length and energy spread as requested (mismatch 1.7)`, () => {
      const g = generateBeam(setupOf({ kind: 'unmatched', shape, rmsLength: sigmaT, mismatch: 1.7 }, { particles: N }), m);
      expect(g.matched).toBeNull();
      const s = moments(g.bunch);
      const sigmaE = 1.7 * beta2E * (omegaS / Math.abs(m.eta0)) * sigmaT;
      expect(Math.abs(s.sigmaT / sigmaT - 1)).toBeLessThan(4 / Math.sqrt(2 * N));
      expect(Math.abs(s.sigmaE / sigmaE - 1)).toBeLessThan(4 / Math.sqrt(2 * N));
      expect(Math.abs(s.meanT / sigmaT)).toBeLessThan(4 / Math.sqrt(N));
    });
  }
  it('parabolic: bounded by the ellipse of semi-axes √5·σ (line density ∝ 1 − x², ⟨x²⟩ = x̂²/5)', () => {
    const g = generateBeam(setupOf({ kind: 'unmatched', shape: 'parabolic', rmsLength: sigmaT, mismatch: 1 }, { particles: 10_000 }), m);
    const sigmaE = beta2E * (omegaS / Math.abs(m.eta0)) * sigmaT;
    let out = 0;
    for (let i = 0; i < g.bunch.n; i++) if ((g.bunch.dt[i] / sigmaT) ** 2 + (g.bunch.dE[i] / sigmaE) ** 2 > 5 * (1 + 1e-12)) out++;
    expect(out).toBe(0);
  });
  it('needs a linear synchrotron frequency', () => {
    // Double RF in bunch-lengthening mode, V2 = V1/2 at h2 = 2h1 in antiphase: F'(φs) = 0 (PHYSICS.md §8).
    const s = setupOf({ kind: 'unmatched', shape: 'gaussian', rmsLength: sigmaT, mismatch: 1 }, {}, {
      rf: { systems: [{ harmonic: 4, voltage: V }, { harmonic: 8, voltage: V / 2, phase: 180 }] },
    });
    expect(() => generateBeam(s, machineAtStart(s))).toThrow(/beam\.distribution\.kind = unmatched: the RF slope at φs is 0/);
  });
});

describe('coasting beam', () => {
  it('is uniform over one RF period and Gaussian in energy', () => {
    // Uniform on [−T/2, T/2): mean 0 with standard error T/sqrt(12N); rms T/√12 with relative standard error
    // sqrt((κ − 1)/(4N)), κ = 9/5 for a uniform law. Four standard errors.
    const N = 200_000;
    const g = generateBeam(setupOf({ kind: 'coasting', rmsEnergySpread: 2e5 }, { particles: N }), m);
    const T = (2 * Math.PI) / m.omegaRf;
    const s = moments(g.bunch);
    expect(Math.abs(s.meanT) / (T / Math.sqrt(12 * N))).toBeLessThan(4);
    expect(Math.abs(s.sigmaT / (T / Math.sqrt(12)) - 1)).toBeLessThan(4 * Math.sqrt(0.2 / N));
    expect(Math.abs(s.sigmaE / 2e5 - 1)).toBeLessThan(4 / Math.sqrt(2 * N));
    let lo = Infinity, hi = -Infinity;
    for (let i = 0; i < N; i++) {
      lo = Math.min(lo, g.bunch.dt[i]);
      hi = Math.max(hi, g.bunch.dt[i]);
    }
    expect(lo).toBeGreaterThanOrEqual(-T / 2);
    expect(hi).toBeLessThan(T / 2);
    expect(hi - lo).toBeGreaterThan(T * (1 - 1e-3)); // the gaps at the ends are ~T/N
  });
});

describe('seeds and offsets', () => {
  const dist = { kind: 'matched', shape: 'parabolic', size: { by: 'rmsLength', value: 1e-8 } };
  it('same seed → identical arrays; another seed → different', () => {
    const a = generateBeam(setupOf(dist, { seed: 3 }), m).bunch;
    const b = generateBeam(setupOf(dist, { seed: 3 }), m).bunch;
    const c = generateBeam(setupOf(dist, { seed: 4 }), m).bunch;
    expect(a.dt).toEqual(b.dt);
    expect(a.dE).toEqual(b.dE);
    expect(a.dt).not.toEqual(c.dt);
    expect(a.dE).not.toEqual(c.dE);
  });
  it('adds the time and energy offsets to every particle', () => {
    for (const d of [dist, { kind: 'coasting', rmsEnergySpread: 1e5 }, { kind: 'unmatched', shape: 'gaussian', rmsLength: 1e-8 }]) {
      const a = generateBeam(setupOf(d, { seed: 3 }), m).bunch;
      const b = generateBeam(setupOf(d, { seed: 3, timeOffset: 2e-9, energyOffset: -3e5 }), m).bunch;
      for (let i = 0; i < a.n; i += 97) {
        expect(b.dt[i] - a.dt[i]).toBeCloseTo(2e-9, 20);
        expect(b.dE[i] - a.dE[i]).toBeCloseTo(-3e5, 6);
      }
    }
  });
});

describe('matched bunches in other buckets (bucket from core/bucket.ts)', () => {
  // An accelerating bucket (φs = 30°) and a stationary one above transition (γt = 1.5 < γ ≈ 2.07, φs = π).
  const moving = setupOf({ kind: 'matched', shape: 'gaussian', size: { by: 'emittance', convention: 'rms', value: 0.01 } },
    { particles: 200_000 }, { energy: { start: { quantity: 'kinetic', value: 1e9 }, ramp: { kind: 'gainPerTurn', value: V / 2 } } });
  const above = setupOf({ kind: 'matched', shape: 'flat', size: { by: 'emittance', convention: 'fourSigma', value: 0.2 } },
    { particles: 200_000 }, { ring: { circumference: 100, gammaT: 1.5 } });
  for (const [name, s] of [['accelerating, φs = 30°', moving], ['above transition', above]] as const) {
    it(`${name}: request met, sample moments as predicted, contour as core/bucket.ts contourAt`, () => {
      const mm = machineAtStart(s);
      const g = generateBeam(s, mm);
      const info = g.matched!;
      const d = s.beam.distribution as { size: { convention: string; value: number } };
      const got = d.size.convention === 'rms' ? info.emittanceRms : info.emittanceFourSigma;
      expect(Math.abs(got / d.size.value - 1)).toBeLessThan(1e-9);
      // Statistics as above (4/sqrt(2N)). The half-drift shear of generate.ts changes σt by ≈ (πQs)²/2 < 1e-4.
      const st = moments(g.bunch);
      const N = g.bunch.n;
      expect(Math.abs(st.sigmaT / info.rmsLength - 1)).toBeLessThan(4 / Math.sqrt(2 * N) + 1e-4);
      expect(Math.abs(st.sigmaE / info.rmsEnergySpread - 1)).toBeLessThan(4 / Math.sqrt(2 * N));
      expect(Math.abs(st.emitRms / info.emittanceRms - 1)).toBeLessThan(8 / Math.sqrt(2 * N));
      // Two quadratures written differently (cosine substitution here, tanh-sinh in bucket.ts): 1e-6.
      const r = computeBucket(mm);
      if (!r.ok) throw new Error(r.reason);
      const level = info.shape === 'gaussian' ? GAUSSIAN_CONTOUR_LEVEL * info.scale : info.scale;
      const c = contourAt(mm, r.bucket, level);
      expect(Math.abs(info.contourArea / c.area - 1)).toBeLessThan(1e-6);
      expect(Math.abs(info.contourLength / c.length - 1)).toBeLessThan(1e-6);
      expect(Math.abs(info.contourHalfHeight / c.halfHeightDE - 1)).toBeLessThan(1e-6);
      expect(Math.abs(info.fillingFactor - c.area / r.bucket.area)).toBeLessThan(1e-6);
    });
  }
  it('a tiny bunch (σt = 1e-15 s) in the accelerating bucket obeys linear matching', () => {
    // PHYSICS.md §9 (Lee ch. 3, from memory) with ω_s from §6, ZV·|cos φs| = ZV·cos 30°. At σφ ≈ 1e-7 rad the
    // nonlinearity is ~σφ ≈ 1e-7; the tolerance 1e-6 tests that U stays accurate this close to φs.
    const mm = machineAtStart(moving);
    const r = computeBucket(mm);
    if (!r.ok) throw new Error(r.reason);
    const info = matchBunch(mm, r.bucket, 'parabolic', { by: 'rmsLength', value: 1e-15 });
    const b2E = mm.beta * mm.beta * mm.Es;
    const ws = Math.sqrt((mm.h * Math.abs(mm.eta0) * V * Math.cos(Math.PI / 6)) / (2 * Math.PI * b2E)) * mm.omega0;
    expect(Math.abs(info.rmsLength / 1e-15 - 1)).toBeLessThan(1e-9);
    expect(Math.abs((b2E * ws * 1e-15) / Math.abs(mm.eta0) / info.rmsEnergySpread - 1)).toBeLessThan(1e-6);
  });
  it('a matched beam needs a bucket: the error names the field and the reason', () => {
    const s = setupOf({ kind: 'matched', shape: 'flat', size: { by: 'rmsLength', value: 1e-8 } }, {},
      { energy: { start: { quantity: 'kinetic', value: 1e9 }, ramp: { kind: 'gainPerTurn', value: 2 * V } } });
    expect(() => generateBeam(s, machineAtStart(s))).toThrow(/^beam\.distribution\.kind = matched: no bucket/);
  });
});

describe('double RF (h = 4 and 8 in antiphase, V2 = r·V1)', () => {
  // PHYSICS.md §8: r = 1/2 gives a flat (quartic) well at φs; r = 0.8 > 1/2 raises an inner hump between two
  // sub-buckets. Sub-bucket geometry from core/bucket.ts (tanh-sinh quadrature, written independently).
  const dual = (r2: number, distribution: unknown) =>
    setupOf(distribution, { particles: 200_000 }, { rf: { systems: [{ harmonic: 4, voltage: V }, { harmonic: 8, voltage: r2 * V, phase: 180 }] } });
  const check = (s: ReturnType<typeof setupOf>) => {
    const mm = machineAtStart(s);
    const r = computeBucket(mm);
    if (!r.ok) throw new Error(r.reason);
    const g = generateBeam(s, mm);
    const info = g.matched!;
    const st = moments(g.bunch);
    const tol = 4 / Math.sqrt(2 * g.bunch.n); // statistics, as above
    expect(Math.abs(st.sigmaT / info.rmsLength - 1)).toBeLessThan(tol);
    expect(Math.abs(st.sigmaE / info.rmsEnergySpread - 1)).toBeLessThan(tol);
    const level = info.shape === 'gaussian' ? GAUSSIAN_CONTOUR_LEVEL * info.scale : info.scale;
    const c = contourAt(mm, r.bucket, level);
    expect(Math.abs(info.contourArea / c.area - 1)).toBeLessThan(1e-4); // 1e-4: a kink at the hump top
    expect(Math.abs(info.contourLength / c.length - 1)).toBeLessThan(1e-6);
    return { info, bucket: r.bucket };
  };
  it('flat well (r = 1/2): parabolic bunch on 30 % of the bucket', () => {
    const { info } = check(dual(0.5, { kind: 'matched', shape: 'parabolic', size: { by: 'emittance', convention: 'contour', value: 0.3 } }));
    expect(info.fillingFactor).toBeGreaterThan(0.2);
  });
  it('inner hump (r = 0.8): bunches inside one sub-bucket and over both; sizes in the jump are refused', () => {
    const s0 = dual(0.8, { kind: 'coasting', rmsEnergySpread: 0 });
    const r = computeBucket(machineAtStart(s0));
    if (!r.ok) throw new Error(r.reason);
    const own = r.bucket.subBuckets.find((b) => b.phiLeft < r.bucket.phiS && r.bucket.phiS < b.phiRight)!;
    expect(r.bucket.subBuckets.length).toBe(2);
    const small = check(dual(0.8, { kind: 'matched', shape: 'flat', size: { by: 'emittance', convention: 'contour', value: 0.5 * own.area } }));
    expect(Math.abs(small.info.contourArea / (0.5 * own.area) - 1)).toBeLessThan(1e-6);
    const big = check(dual(0.8, { kind: 'matched', shape: 'gaussian', size: { by: 'emittance', convention: 'contour', value: 0.6 * r.bucket.area } }));
    expect(big.info.contourLength * machineAtStart(s0).omegaRf).toBeGreaterThan(own.phiRight - own.phiLeft);
    // Just above the sub-bucket's own area the flat contour must already hold the other sub-bucket too.
    const gap = dual(0.8, { kind: 'matched', shape: 'flat', size: { by: 'emittance', convention: 'contour', value: 1.05 * own.area } });
    expect(() => generateBeam(gap, machineAtStart(gap))).toThrow(/no matched flat bunch has this contour emittance; it jumps/);
  });
});
