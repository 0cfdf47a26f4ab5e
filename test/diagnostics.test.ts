// Diagnostics against analytic values of a large seeded Gaussian sample and exactly known inputs.
// Units: dt in s, dE in eV, emittances in eV·s.
import { describe, expect, it } from 'vitest';
import { computeBucket } from '../core/bucket.ts';
import { bunchFrom, loseParticle, makeBunch, type Bunch } from '../core/bunch.ts';
import { hamiltonian, phaseOfDt } from '../core/bucket.ts';
import {
  centroidSpectrum, computeDiagnostics, DiagnosticsLog, diagnosticsFromParts, fwhm, histogram2d, insideSeparatrix, lineDensity,
  fractionEmittances, lastSelectionPath, mergeMoments, partialMoments, partialShape, selectKth, type TurnDiagnostics,
} from '../core/diagnostics/index.ts';
import { machineAtStart } from '../core/machine.ts';
import { makeRng } from '../core/rng.ts';
import { parseSetup } from '../core/setup/validate.ts';

function setup() {
  const r = parseSetup({
    version: 1,
    particle: { kind: 'proton' },
    ring: { circumference: 180, gammaT: 4.8 },
    energy: { start: { quantity: 'kinetic', value: 200e6 } },
    rf: { systems: [{ harmonic: 8, voltage: 1e6 }] },
    beam: { distribution: { kind: 'unmatched', shape: 'gaussian', rmsLength: 1e-9 }, particles: 1 },
  });
  if (!r.ok) throw new Error(JSON.stringify(r.errors));
  return r.setup;
}

// Correlated 2-D Gaussian: dt = mt + σt·a, dE = mE + σE·(ρ·a + sqrt(1−ρ²)·b).
const N = 1_000_000, sT = 2e-9, sE = 1e6, rho = 0.5, mT = 0.3e-9, mE = -2e4;
function gaussianBunch(seed: number): Bunch {
  const b = makeBunch(N), rng = makeRng(seed);
  for (let i = 0; i < N; i++) {
    const a = rng.normal(), c = rng.normal();
    b.dt[i] = mT + sT * a;
    b.dE[i] = mE + sE * (rho * a + Math.sqrt(1 - rho * rho) * c);
  }
  return b;
}

describe('computeDiagnostics on a 2-D Gaussian of 1e6 particles', () => {
  const b = gaussianBunch(11);
  const m = machineAtStart(setup());
  const d = computeDiagnostics(b, m, null, 256);
  const epsRms = sT * sE * Math.sqrt(1 - rho * rho); // sqrt(det Σ) of the parent distribution

  it('centroid and rms (sampling error σ/√N and σ/√(2N); tolerances ≈ 5 standard errors)', () => {
    expect(Math.abs(d.meanDt - mT)).toBeLessThan(5e-3 * sT);
    expect(Math.abs(d.meanDE - mE)).toBeLessThan(5e-3 * sE);
    expect(Math.abs(d.rmsDt / sT - 1)).toBeLessThan(4e-3);
    expect(Math.abs(d.rmsDE / sE - 1)).toBeLessThan(4e-3);
    expect(d.length4Sigma).toBeCloseTo(4 * d.rmsDt, 20);
  });

  it('rms emittance sqrt(<dt²><dE²> − <dt dE>²) = σtσE·sqrt(1 − ρ²) (PHYSICS.md §9)', () => {
    expect(Math.abs(d.emittanceRms / epsRms - 1)).toBeLessThan(5e-3);
  });

  it('90 % and 95 % ellipse areas −2 ln(1−q)·π·ε_rms (PHYSICS.md §9; χ² with 2 degrees of freedom)', () => {
    // Quantile error: std(J_q) = 2·sqrt(q/((1−q)N)) ≈ 0.006–0.009, i.e. 0.15 % of J_q; plus ≈ 0.1 % from ε_rms.
    expect(Math.abs(d.emittance90 / (-2 * Math.log(0.1) * Math.PI * epsRms) - 1)).toBeLessThan(1e-2);
    expect(Math.abs(d.emittance95 / (-2 * Math.log(0.05) * Math.PI * epsRms) - 1)).toBeLessThan(1e-2);
  });

  it('FWHM = 2·sqrt(2 ln 2)·σ (Gaussian, common practice)', () => {
    // 256 bins over ±4.9σ: ≈ 7600 counts per bin at half maximum, 1.2 % noise, ≈ 0.6 % on the width.
    expect(Math.abs(d.lengthFwhm / (2 * Math.sqrt(2 * Math.LN2) * sT) - 1)).toBeLessThan(3e-2);
  });

  it('counts alive and lost particles, and insideFraction is NaN without a bucket', () => {
    const c = makeBunch(10);
    for (let i = 0; i < 10; i++) c.dt[i] = i;
    loseParticle(c, 0);
    loseParticle(c, 3);
    const e = computeDiagnostics(c, m, null, 16);
    expect(e.alive).toBe(8);
    expect(e.lost).toBe(2);
    expect(e.meanDt).toBeCloseTo((45 - 0 - 3) / 8, 12);
    expect(e.insideFraction).toBeNaN();
  });
});

describe('insideFraction', () => {
  it('uses the separatrix height δ0 = sqrt(2ZV/(πβ²E·h|η|)) of a stationary bucket (PHYSICS.md §7 [Lee ch. 3])', () => {
    const m = machineAtStart(setup()); // flat: φs = 0 below transition
    expect(m.phiS).toBeCloseTo(0, 12);
    const beta2E = m.beta * m.beta * m.Es;
    const delta0 = Math.sqrt((2 * m.particle.Z * m.rf[0].V) / (Math.PI * beta2E * m.h * Math.abs(m.eta0)));
    // H' at the top of the separatrix, (φ, δ) = (0, δ0), with U(0) = 0: Usep = π·h·|η|·δ0².
    const bucket = { phiLeft: -Math.PI, phiRight: Math.PI, Usep: Math.PI * m.h * Math.abs(m.eta0) * delta0 * delta0 };
    const c = makeBunch(6);
    const set = (i: number, phi: number, delta: number) => { c.dt[i] = phi / m.omegaRf; c.dE[i] = delta * beta2E; };
    set(0, 0, 0.99 * delta0); // inside
    set(1, 0, -1.01 * delta0); // outside
    set(2, 3.0, 0); // inside: U(3) < Usep
    set(3, 2 * Math.PI + 0.1, 0.5 * delta0); // inside the next bucket (integer harmonic ratios: U repeats every 2π)
    set(4, 2.0, 0.6 * delta0); // separatrix at φ = 2: δ = δ0·cos(1) = 0.54 δ0, so outside
    set(5, 0.1, 0);
    loseParticle(c, 5); // lost particles count as outside
    expect(insideSeparatrix(c, m, bucket)).toBe(3);
    // The same through computeDiagnostics with the bucket of core/bucket.ts, whose Usep must match §7.
    const br = computeBucket(m);
    if (!br.ok) throw new Error(br.reason);
    expect(Math.abs(br.bucket.Usep / bucket.Usep - 1)).toBeLessThan(1e-9);
    expect(computeDiagnostics(c, m, br.bucket, 16).insideFraction).toBeCloseTo(3 / 6, 15);
  });
});

describe('insideFraction of a coasting beam (every bucket counts)', () => {
  it('equals bucket area / phase-space area: 8δ0 per 2π of phase for a stationary bucket (PHYSICS.md §7 [Lee ch. 3])', () => {
    const m = machineAtStart(setup());
    const beta2E = m.beta * m.beta * m.Es;
    const delta0 = Math.sqrt((2 * m.particle.Z * m.rf[0].V) / (Math.PI * beta2E * m.h * Math.abs(m.eta0)));
    const br = computeBucket(m);
    if (!br.ok) throw new Error(br.reason);
    // Uniform over the whole ring in φ (h = 8 buckets) and over |δ| ≤ 2δ0: the separatrix δ0·cos(φ/2) encloses
    // 8δ0 of each 2π × 4δ0, so the fraction inside is 1/π. 2e5 particles: binomial σ ≈ 0.1 %; tolerance 1 %.
    const n = 200_000, c = makeBunch(n), rng = makeRng(11);
    for (let i = 0; i < n; i++) {
      c.dt[i] = ((rng.uniform() - 0.5) * 2 * Math.PI * m.h) / m.omegaRf;
      c.dE[i] = (rng.uniform() - 0.5) * 4 * delta0 * beta2E;
    }
    expect(Math.abs(insideSeparatrix(c, m, br.bucket) / n - 1 / Math.PI)).toBeLessThan(0.01 / Math.PI);
  });
});

describe('profiles', () => {
  const b = gaussianBunch(12);
  it('line density integrates to 1 over a window holding every particle and peaks at 1/(√(2π)σ)', () => {
    const out = new Float64Array(200);
    const lo = -8 * sT + mT, hi = 8 * sT + mT, w = (hi - lo) / 200;
    lineDensity(b, lo, hi, out);
    let s = 0, peak = 0;
    for (const v of out) { s += v * w; peak = Math.max(peak, v); }
    expect(Math.abs(s - 1)).toBeLessThan(1e-12);
    // bin 0.08σ wide: about 32000 counts at the peak, 0.6 % noise; bin averaging lowers it by ≈ 0.03 %.
    expect(Math.abs(peak * Math.sqrt(2 * Math.PI) * sT - 1)).toBeLessThan(3e-2);
  });

  it('line density over part of the bunch integrates to the fraction inside the window', () => {
    const out = new Float64Array(64);
    lineDensity(b, mT, mT + 10 * sT, out);
    let inside = 0;
    for (let i = 0; i < N; i++) if (b.dt[i] >= mT && b.dt[i] < mT + 10 * sT) inside++;
    const s = out.reduce((a, v) => a + v, 0) * ((10 * sT) / 64);
    expect(Math.abs(s - inside / N)).toBeLessThan(1e-12);
  });

  it('2-D histogram counts every particle inside the grid once, in its own cell', () => {
    const c = makeBunch(3);
    c.dt.set([0.5, 2.5, 9]); c.dE.set([0.5, 1.5, 0.5]);
    const out = new Float32Array(4 * 2);
    histogram2d(c, 0, 4, 0, 2, 4, 2, out); // cells 1 × 1
    expect(Array.from(out)).toEqual([1, 0, 0, 0, 0, 0, 1, 0]);
    const big = new Float32Array(50 * 40);
    histogram2d(b, mT - 3 * sT, mT + 3 * sT, mE - 3 * sE, mE + 3 * sE, 50, 40, big);
    let inside = 0;
    for (let i = 0; i < N; i++)
      if (Math.abs(b.dt[i] - mT) < 3 * sT && Math.abs(b.dE[i] - mE) < 3 * sE) inside++;
    expect(big.reduce((a, v) => a + v, 0)).toBeCloseTo(inside, 6);
    // The profile taken in the same pass is lineDensity's, bin for bin.
    const prof = new Float64Array(77), ref = new Float64Array(77);
    histogram2d(b, mT - 3 * sT, mT + 3 * sT, mE - 3 * sE, mE + 3 * sE, 50, 40, big, prof);
    lineDensity(b, mT - 3 * sT, mT + 3 * sT, ref);
    expect(prof).toEqual(ref);
    expect(prof.reduce((a, v) => a + v, 0)).toBeGreaterThan(0);
  });

  it('fwhm of a triangle of half-width 4 is 4 (exact: the crossings fall on bin centres)', () => {
    expect(fwhm(Float64Array.from([0, 1, 2, 3, 4, 3, 2, 1, 0]), 1)).toBe(4);
    expect(fwhm(Float64Array.from([0, 1, 2, 3, 4, 3, 2, 1, 0]), 0.5)).toBe(2);
  });
});

describe('selectKth', () => {
  it('agrees with sorting (independent computation)', () => {
    const rng = makeRng(5);
    const a = Float64Array.from({ length: 10001 }, () => rng.normal());
    const sorted = Float64Array.from(a).sort();
    for (const k of [0, 1, 5000, 9000, 9500, 10000]) expect(selectKth(Float64Array.from(a), a.length, k)).toBe(sorted[k]);
    const ties = Float64Array.from([3, 1, 3, 3, 2, 3, 1]);
    expect(selectKth(Float64Array.from(ties), 7, 3)).toBe(3);
    expect(selectKth(Float64Array.from(ties), 7, 1)).toBe(1);
  });
});

describe('centroidSpectrum', () => {
  it('finds a pure sine within one bin; Hann scalloping keeps the amplitude within 1.42 dB (F.J. Harris, Proc. IEEE 66 (1978) 51, Table I, from memory)', () => {
    const dt = 1e-3, f = 123.4, A = 2.5, M = 1000;
    const x = Float64Array.from({ length: M }, (_, i) => 7 + A * Math.sin(2 * Math.PI * f * i * dt + 0.3));
    const { freq, amplitude } = centroidSpectrum(x, dt);
    expect(freq.length).toBe(1024 / 2 + 1);
    const df = 1 / (1024 * dt);
    expect(freq[1]).toBeCloseTo(df, 12);
    let k = 0;
    for (let i = 1; i < amplitude.length; i++) if (amplitude[i] > amplitude[k]) k = i;
    expect(Math.abs(freq[k] - f)).toBeLessThanOrEqual(df);
    expect(amplitude[k]).toBeLessThan(1.01 * A);
    expect(amplitude[k]).toBeGreaterThan(10 ** (-1.42 / 20) * A * 0.99);
    expect(amplitude[0]).toBeLessThan(1e-2 * A); // the mean (7) is removed; what is left is window leakage
  });
});

describe('DiagnosticsLog', () => {
  it('stores columns and writes CSV with units in the header', () => {
    const log = new DiagnosticsLog();
    const rec = (t: number): TurnDiagnostics => ({
      turn: t, time: t * 1e-6, alive: 100 - t, lost: t, meanDt: 0, meanDE: 0, rmsDt: 1e-9, rmsDE: t,
      emittanceRms: 1, emittance90: 2, emittance95: 3, length4Sigma: 4e-9, lengthFwhm: 2e-9, insideFraction: NaN,
    });
    for (let t = 0; t < 100; t++) log.push(rec(t));
    expect(log.length).toBe(100);
    const turns = log.column('turn');
    expect(turns.length).toBe(100);
    expect(turns[99]).toBe(99);
    expect(log.column('rmsDE')[42]).toBe(42);
    const csv = log.toCsv().trim().split('\n');
    expect(csv.length).toBe(101);
    expect(csv[0].startsWith('turn,time_s,alive,lost,meanDt_s,meanDE_eV,rmsDt_s,rmsDE_eV')).toBe(true);
    expect(csv[1].split(',').length).toBe(csv[0].split(',').length);
  });
});

describe('tabulated inside test', () => {
  it('counts exactly as the per-particle Hamiltonian, also for particles on the separatrix', () => {
    // Accelerating bucket (φs ≠ 0): many particles within 1e-6 of H' = Usep, where interpolation alone could err.
    const doc = { ...setup(), energy: { ...setup().energy, ramp: { kind: 'gainPerTurn', value: 2e5 } } };
    const r = parseSetup(doc);
    if (!r.ok) throw new Error(JSON.stringify(r.errors));
    const m = machineAtStart(r.setup);
    const br = computeBucket(m);
    if (!br.ok) throw new Error(br.reason);
    const { phiLeft, phiRight, Usep } = br.bucket;
    const beta2E = m.beta * m.beta * m.Es, kin = Math.PI * m.h * Math.abs(m.eta0);
    const n = 200_000, c = makeBunch(n), rng = makeRng(5);
    for (let i = 0; i < n; i++) {
      const phi = phiLeft - 0.1 + (phiRight - phiLeft + 0.2) * rng.uniform();
      const U = hamiltonian(m, phi, 0);
      // Half on the separatrix to 1e-6 relative, half spread over the bucket height.
      const level = i % 2 ? Usep * (1 + 1e-6 * (2 * rng.uniform() - 1)) : Usep * 1.2 * rng.uniform();
      c.dt[i] = (phi - m.phiS) / m.omegaRf;
      c.dE[i] = (rng.uniform() < 0.5 ? -1 : 1) * Math.sqrt(Math.max(0, level - U) / kin) * beta2E;
    }
    let exact = 0;
    for (let i = 0; i < n; i++) {
      const phi = phaseOfDt(m, c.dt[i]);
      if (phi >= phiLeft && phi <= phiRight && hamiltonian(m, phi, c.dE[i] / beta2E) < Usep) exact++;
    }
    expect(exact).toBeGreaterThan(0.3 * n);
    expect(insideSeparatrix(c, m, br.bucket)).toBe(exact);
  });
});

describe('diagnostics of a bunch split in two parts', () => {
  it('merged moments equal the whole; 90/95 % areas within one action bin (0.1 %) of the exact selection', () => {
    const m = machineAtStart(setup());
    const whole = gaussianBunch(13);
    const d = computeDiagnostics(whole, m, null, 256);
    // Uneven halves (400k and 600k) with a shifted centroid in one, so the merge terms matter.
    const k = 400_000;
    const a = bunchFrom(whole.dt.slice(0, k), whole.dE.slice(0, k));
    const b = bunchFrom(whole.dt.slice(k), whole.dE.slice(k));
    const all = mergeMoments([partialMoments(a, m, null), partialMoments(b, m, null)]);
    const parts = diagnosticsFromParts(m, all, [partialShape(a, all, 256), partialShape(b, all, 256)], false);
    // Sums in a different order: agreement to rounding (1e-12 relative is far above double round-off of 1e6 terms).
    for (const key of ['meanDt', 'meanDE', 'rmsDt', 'rmsDE', 'emittanceRms'] as const)
      expect(Math.abs(parts[key] - d[key])).toBeLessThan(1e-12 * (Math.abs(d[key]) + (key === 'meanDt' ? sT : key === 'meanDE' ? sE : 0)));
    expect(parts.lengthFwhm).toBe(d.lengthFwhm); // the same integer counts in the same bins
    expect(parts.alive).toBe(N);
    expect(parts.insideFraction).toBeNaN();
    expect(Math.abs(parts.emittance90 / d.emittance90 - 1)).toBeLessThan(1e-3);
    expect(Math.abs(parts.emittance95 / d.emittance95 - 1)).toBeLessThan(1e-3);
  });
});

// Two-pass moments and the invariants J of all particles, sorted: the reference of the selection tests.
function sortedInvariants(b: Bunch) {
  const n = b.n;
  let mt = 0, me = 0;
  for (let i = 0; i < n; i++) { mt += b.dt[i]; me += b.dE[i]; }
  mt /= n; me /= n;
  let vt = 0, ve = 0, c = 0;
  for (let i = 0; i < n; i++) { const x = b.dt[i] - mt, y = b.dE[i] - me; vt += x * x; ve += y * y; c += x * y; }
  const mom = { meanDt: mt, meanDE: me, varDt: vt / n, varDE: ve / n, cov: c / n };
  const det = mom.varDt * mom.varDE - mom.cov * mom.cov;
  const J = Array.from({ length: n }, (_, i) => {
    const x = b.dt[i] - mt, y = b.dE[i] - me;
    return (mom.varDE / det) * x * x + 2 * (-mom.cov / det) * x * y + (mom.varDt / det) * y * y;
  }).sort((x, y) => x - y);
  return { mom, det, J, centred: { vt, ve, c } };
}

describe('fractionEmittances selection', () => {
  it('equals the order statistic of the sorted invariants, for several fractions, with a far outlier', () => {
    const n = 100_001, b = makeBunch(n), rng = makeRng(21);
    for (let i = 0; i < n; i++) { b.dt[i] = rng.normal() * 1e-9; b.dE[i] = (0.3 * b.dt[i] * 1e15 + rng.normal()) * 1e5; }
    b.dt[7] = 1e-3; // one particle 1e6 rms away: the counting bins become coarse, the result must stay exact
    const { mom, det, J } = sortedInvariants(b);
    const qs = [0.95, 0.9, 0.9];
    const got = fractionEmittances(b, mom, qs);
    expect(lastSelectionPath()).toBe('bracketed'); // two brackets from the sample
    qs.forEach((q, i) => expect(got[i]).toBe(Math.PI * J[Math.ceil(q * n) - 1] * Math.sqrt(det)));
    const three = [0.95, 0.5, 0.9, 0.9]; // three brackets: the exact path
    const got3 = fractionEmittances(b, mom, three);
    expect(lastSelectionPath()).toBe('exact');
    three.forEach((q, i) => expect(got3[i]).toBe(Math.PI * J[Math.ceil(q * n) - 1] * Math.sqrt(det)));
  });

  it('stays exact when the sample misrepresents the bunch (every sampled particle at the centre)', () => {
    const n = 40_960, b = makeBunch(n), rng = makeRng(8); // the sample takes every 10th particle
    for (let i = 0; i < n; i++) [b.dt[i], b.dE[i]] = i % 10 === 0 ? [0, 0] : [rng.normal() * 1e-9, rng.normal() * 1e5];
    const { mom, det, J } = sortedInvariants(b);
    const got = fractionEmittances(b, mom, [0.9, 0.95]);
    expect(lastSelectionPath()).toBe('exact'); // the ranks fell outside the sample's brackets
    [0.9, 0.95].forEach((q, i) => expect(got[i]).toBe(Math.PI * J[Math.ceil(q * n) - 1] * Math.sqrt(det)));
  });
});

describe('partialMoments', () => {
  // Centred sums by the plain two-pass formula (computed here) against the one-pass sums about a sample median;
  // the outlier sits first and far out (1e6 rms), where sums about the first particle would lose ~12 digits.
  // Tolerance: rounding of sums of 1e5 terms, ~1e5·2^−53 relative (common practice), with margin.
  it('gives the two-pass centroid and centred sums with a far outlier first', () => {
    const n = 100_001, b = makeBunch(n), rng = makeRng(31);
    for (let i = 0; i < n; i++) { b.dt[i] = 2e-9 + rng.normal() * 1e-9; b.dE[i] = (0.3 * rng.normal() + rng.normal()) * 1e5; }
    b.dt[0] = 1e-3;
    b.dE[0] = 1e11;
    const { mom, centred: { vt, ve, c } } = sortedInvariants(b);
    const p = partialMoments(b, machineAtStart(setup()), null);
    expect(Math.abs(p.meanDt / mom.meanDt - 1)).toBeLessThan(1e-12);
    expect(Math.abs(p.meanDE / mom.meanDE - 1)).toBeLessThan(1e-12);
    expect(Math.abs(p.m2t / vt - 1)).toBeLessThan(1e-10);
    expect(Math.abs(p.m2e / ve - 1)).toBeLessThan(1e-10);
    expect(Math.abs(p.m2c / c - 1)).toBeLessThan(1e-10);
  });
});
