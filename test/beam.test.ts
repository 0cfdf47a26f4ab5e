// Matched, unmatched and coasting beams checked against closed forms and independent quadrature.
// Test machine (fictional): protons at 1 GeV kinetic, C = 100 m, γt = 5 (below transition), one RF system
// h = 4, V = 50 kV, no ramp: a stationary bucket with φs = 0. Its bounds are written here in closed form
// (PHYSICS.md §7): separatrix ends ±π, U_sep = U(π) = 2ZV/(β²E), area A0 = (8/ω_rf)·sqrt(2ZVβ²E/(π·h·|η|)).
import ellipe from '@stdlib/math-base-special-ellipe';
import ellipk from '@stdlib/math-base-special-ellipk';
import { describe, expect, it } from 'vitest';
import { matchBunch, sampleMatched, type BucketBounds, type MatchedShape } from '../core/beam/index.ts';
import { makeBunch, type Bunch } from '../core/bunch.ts';
import { machineAtStart, type MachineState } from '../core/machine.ts';
import { makeRng } from '../core/rng.ts';
import { parseSetup } from '../core/setup/validate.ts';

const V = 50e3;

function setupOf(distribution: unknown, extra: Record<string, unknown> = {}) {
  const r = parseSetup({
    version: 1,
    particle: { kind: 'proton' },
    ring: { circumference: 100, gammaT: 5 },
    energy: { start: { quantity: 'kinetic', value: 1e9 } },
    rf: { systems: [{ harmonic: 4, voltage: V }] },
    beam: { distribution, particles: 1000, ...extra },
  });
  if (!r.ok) throw new Error(JSON.stringify(r.errors));
  return r.setup;
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
