// Phase stability (common practice; PHYSICS.md §0 and §4 [Lee ch. 3]): below transition the bunch sits on
// the rising slope of the RF wave; above transition the same energy gain uses π − φs on the falling slope.
// Units: dt in s, dE in eV, phases in rad.
import { describe, expect, it } from 'vitest';
import { makeBunch, type Bunch } from '../core/bunch.ts';
import type { MachineState } from '../core/machine.ts';
import { makeRng } from '../core/rng.ts';
import { parseSetup } from '../core/setup/validate.ts';
import { Tracker } from '../core/tracker.ts';

// Fictional proton ring, one RF system, accelerating by `gain` per turn.
function setupOf(kinetic: number, gammaT: number, h: number, V: number, gain: number, slope: string) {
  const r = parseSetup({
    version: 1,
    particle: { kind: 'proton' },
    ring: { circumference: 180, gammaT },
    energy: { start: { quantity: 'kinetic', value: kinetic }, ramp: { kind: 'gainPerTurn', value: gain } },
    rf: { systems: [{ harmonic: h, voltage: V }], slope },
    beam: { distribution: { kind: 'unmatched', shape: 'gaussian', rmsLength: 1e-9 }, particles: 1 },
    run: { drift: 'exact', momentumAperture: 0.01 },
  });
  if (!r.ok) throw new Error(JSON.stringify(r.errors));
  return r.setup;
}

// Linearly matched rms energy spread [eV] for rms phase sigPhi (PHYSICS.md §9: σE/(β²E) = (ωs/|η|)·σt,
// with Qs from §6 using |cos φs|).
function matchedSigE(m: MachineState, sigPhi: number): number {
  const Qs = Math.sqrt((m.h * Math.abs(m.eta0) * m.rf[0].V * Math.abs(Math.cos(m.phiS))) / (2 * Math.PI * m.beta ** 2 * m.Es));
  return (m.beta ** 2 * m.Es * Qs * sigPhi) / (Math.abs(m.eta0) * m.h);
}

// Gaussian bunch: rms phase sigPhi [rad] about phase offset phi0 from φs, linearly matched energy spread.
function gaussian(m: MachineState, N: number, phi0: number, sigPhi: number, seed: number): Bunch {
  const sigE = matchedSigE(m, sigPhi);
  const b = makeBunch(N), rng = makeRng(seed);
  for (let i = 0; i < N; i++) {
    b.dt[i] = (phi0 + sigPhi * rng.normal()) / m.omegaRf;
    b.dE[i] = sigE * rng.normal();
  }
  return b;
}

const N = 4000;

describe('below transition (η < 0)', () => {
  const setup = setupOf(200e6, 4.8, 8, 1e6, Math.SQRT1_2 * 1e6, 'auto'); // φs = 45°
  it('the stable phase is arcsin(ΔEs/ZV) on the rising slope', () => {
    const m = new Tracker(setup, makeBunch(1)).machine;
    expect(m.eta0).toBeLessThan(0);
    expect(m.phiS).toBeCloseTo(Math.PI / 4, 9);
  });

  it('a bunch on the rising slope is stable and keeps all its particles', () => {
    const m0 = new Tracker(setup, makeBunch(1)).machine;
    const b = gaussian(m0, N, 0, 0.08, 1); // bucket spans about −0.05 … 2.36 rad, i.e. ±10σ of φs
    new Tracker(setup, b).track(3000);
    expect(b.n).toBe(N);
  });

  it('a bunch centred on the crest (φ = 90°) loses its late particles', () => {
    const m0 = new Tracker(setup, makeBunch(1)).machine;
    const b = gaussian(m0, N, Math.PI / 2 - m0.phiS, 0.5, 2);
    // Particles later than the unstable fixed point φu = π − φs are outside the bucket at any dE.
    const phiU = Math.PI - m0.phiS;
    let late = 0;
    for (let i = 0; i < N; i++) if (m0.phiS + m0.omegaRf * b.dt[i] > phiU) late++;
    expect(late).toBeGreaterThan(0.03 * N);
    new Tracker(setup, b).track(3000);
    const lost = b.total - b.n;
    expect(lost).toBeGreaterThanOrEqual(late);
    expect(lost).toBeLessThan(0.5 * N); // the part near the crest is still inside the bucket
  });
});

describe('above transition (η > 0)', () => {
  const gain = 1e6, V = 2e6; // sin φ = 0.5
  it('the stable phase is π − arcsin(ΔEs/ZV) and a bunch there keeps all its particles', () => {
    const setup = setupOf(5e9, 3, 20, V, gain, 'auto');
    const m0 = new Tracker(setup, makeBunch(1)).machine;
    expect(m0.eta0).toBeGreaterThan(0);
    expect(m0.phiS).toBeCloseTo(Math.PI - Math.asin(gain / V), 9);
    const b = gaussian(m0, N, 0, 0.1, 3);
    new Tracker(setup, b).track(2000);
    expect(b.n).toBe(N);
  });

  it('forcing the below-transition (rising) slope there loses the bunch from φs', () => {
    const setup = setupOf(5e9, 3, 20, V, gain, 'rising');
    const m0 = new Tracker(setup, makeBunch(1)).machine;
    expect(m0.phiS).toBeCloseTo(Math.asin(gain / V), 9);
    const b = gaussian(m0, N, 0, 0.1, 4);
    new Tracker(setup, b).track(2000);
    // φs is now a hyperbolic point: the bunch leaves it. Particles are lost at the aperture or end up in
    // the stable bucket around π − φs (2.1 rad later), which the reference ramp also accelerates.
    // A stable bunch keeps (0.683)² ≈ 47 % of its particles in the 1σ × 1σ box around the origin.
    const sigE = matchedSigE(m0, 0.1);
    let box = 0;
    for (let i = 0; i < b.n; i++) if (Math.abs(m0.omegaRf * b.dt[i]) < 0.1 && Math.abs(b.dE[i]) < sigE) box++;
    expect(box).toBeLessThan(0.01 * N);
    expect(b.total - b.n).toBeGreaterThan(0);
  });
});
