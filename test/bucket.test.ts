// Single-RF bucket geometry against closed forms and an independent quadrature of the separatrix, below and above
// transition. Machine states come from setup objects through parseSetup + machineAtStart (the whole chain).
// Kinematics for the expected values are recomputed here from the setup numbers, not taken from the machine.
import ellipe from '@stdlib/math-base-special-ellipe';
import ellipk from '@stdlib/math-base-special-ellipk';
import { describe, expect, it } from 'vitest';
import { computeBucket, contourAt, dtOfPhase, fixedPoints, hamiltonian, phaseOfDt, separatrix, type BucketInfo } from '../core/bucket.ts';
import type { MachineState } from '../core/machine.ts';
import { protonMachine } from './support/setups.ts';

const MP = 938.272_088_16e6; // proton rest energy [eV], CODATA 2018
const C = 299_792_458; // speed of light [m/s], exact
const DEG = Math.PI / 180;
const CIRC = 100;
const H = 8;
const V = 50e3;

// Two machines: below transition (γt = 6, T = 1 GeV, η < 0) and above (γt = 3, T = 5 GeV, η > 0).
const CASES = [
  { name: 'below transition', gammaT: 6, T: 1e9 },
  { name: 'above transition', gammaT: 3, T: 5e9 },
] as const;

function machine(gammaT: number, T: number, gain = 0, slope = 'auto'): MachineState {
  return protonMachine({ circumference: CIRC, gammaT, kinetic: T, systems: [{ harmonic: H, voltage: V }], gain, slope });
}

// Independent kinematics: γ = 1 + T/m, η = 1/γt² − 1/γ², ω_rf = h·2πβc/C (PHYSICS.md §2–3, Lee ch. 2).
function kin(gammaT: number, T: number) {
  const gamma = 1 + T / MP;
  const beta = Math.sqrt(1 - 1 / (gamma * gamma));
  const b2E = beta * beta * gamma * MP;
  const eta = 1 / (gammaT * gammaT) - 1 / (gamma * gamma);
  const omegaRf = (H * 2 * Math.PI * beta * C) / CIRC;
  const delta0 = Math.sqrt((2 * V) / (Math.PI * b2E * H * Math.abs(eta))); // PHYSICS.md §7, Lee ch. 3
  return { b2E, eta, omegaRf, delta0, A0: (8 * delta0 * b2E) / omegaRf };
}

function bucketOf(m: MachineState): BucketInfo {
  const r = computeBucket(m);
  if (!r.ok) throw new Error(r.reason);
  return r.bucket;
}

// Separatrix bracket for η < 0 (PHYSICS.md §7, Lee ch. 3 / Le Duff, from memory):
// δ² = (ZV/(πβ²Eh|η|))·[cos φ + cos φs − (π − φ − φs) sin φs].
const bracket = (phi: number, ps: number) => Math.cos(phi) + Math.cos(ps) - (Math.PI - phi - ps) * Math.sin(ps);

// Other root φ2 of the bracket on [−π, φs], by plain bisection (the bracket is < 0 left of φ2, > 0 right of it).
function phi2Of(ps: number): number {
  let a = -Math.PI;
  let b = ps;
  for (let i = 0; i < 200; i++) {
    const m = 0.5 * (a + b);
    if (bracket(m, ps) < 0) a = m;
    else b = m;
  }
  return 0.5 * (a + b);
}

// Independent area in (φ, δ): 2∫ sqrt(c·bracket) dφ over [φ2, π − φs], with φ = φ2 + s² (removes the sqrt at φ2),
// composite Simpson in s.
function separatrixArea(ps: number, c: number): number {
  const p2 = phi2Of(ps);
  const sMax = Math.sqrt(Math.PI - ps - p2);
  const n = 4000;
  const hs = sMax / n;
  let sum = 0;
  for (let i = 0; i <= n; i++) {
    const s = i * hs;
    const g = Math.max(0, bracket(p2 + s * s, ps));
    const f = Math.sqrt(c * g) * 2 * s;
    sum += (i === 0 || i === n ? 1 : i % 2 ? 4 : 2) * f;
  }
  return 2 * (sum * hs) / 3;
}

describe.each(CASES)('single-RF bucket, $name', ({ gammaT, T }) => {
  const k = kin(gammaT, T);
  const above = k.eta > 0;

  it('stationary bucket: half-height δ0 and area A0 = 8δ0β²E/ω_rf', () => {
    const m = machine(gammaT, T);
    expect(Math.sign(m.eta0)).toBe(Math.sign(k.eta));
    const b = bucketOf(m);
    // PHYSICS.md §7 (Lee ch. 3; Le Duff, from memory): δ_max = δ0 for φs = 0 (or π above), A0 = 8δ0β²E/ω_rf.
    expect(b.halfHeightDelta / k.delta0 - 1).toBeCloseTo(0, 3);
    expect(Math.abs(b.halfHeightDE / (k.delta0 * k.b2E) - 1)).toBeLessThan(1e-3);
    expect(Math.abs(b.area / k.A0 - 1)).toBeLessThan(1e-3);
    // The stationary bucket spans one full RF period between the unstable points φs ± π (common practice).
    expect(Math.abs((b.length * k.omegaRf) / (2 * Math.PI) - 1)).toBeLessThan(1e-6);
    expect(b.unstable.length).toBe(2);
    expect(b.subBuckets).toEqual([]);
    expect(Math.abs(Math.cos(b.phiS) - (above ? -1 : 1))).toBeLessThan(1e-12);
  });

  it.each([10, 30, 45, 60])('accelerating bucket, φs = %i° (below-transition value): height, area, length', (psDeg) => {
    const ps = psDeg * DEG; // the η < 0 phase; above transition the bucket sits at π − ps
    const m = machine(gammaT, T, V * Math.sin(ps));
    const b = bucketOf(m);
    expect(Math.abs(b.phiS - (above ? Math.PI - ps : ps))).toBeLessThan(1e-8);

    // Height: δ_max = δ0·Y(φs), Y = |cos φs − (π/2 − φs) sin φs|^½ (PHYSICS.md §7; Lee ch. 3, from memory).
    const Y = Math.sqrt(Math.abs(Math.cos(ps) - (Math.PI / 2 - ps) * Math.sin(ps)));
    expect(Math.abs(b.halfHeightDelta / (k.delta0 * Y) - 1)).toBeLessThan(1e-3);

    // Area vs an independent quadrature of the separatrix bracket (0.1 %).
    const c = V / (Math.PI * k.b2E * H * Math.abs(k.eta));
    const A = (separatrixArea(ps, c) * k.b2E) / k.omegaRf;
    expect(Math.abs(b.area / A - 1)).toBeLessThan(1e-3);

    // Length: φu − φ2 with φu = π − φs and φ2 the other root of the bracket (PHYSICS.md §7).
    const len = (Math.PI - ps - phi2Of(ps)) / k.omegaRf;
    expect(Math.abs(b.length / len - 1)).toBeLessThan(1e-6);
    // One end is the unstable fixed point π − φs (mirrored above transition): late side below, early side above.
    const phiU = above ? ps : Math.PI - ps;
    expect(b.unstable.length).toBe(1);
    expect(Math.abs(b.unstable[0] - phiU)).toBeLessThan(1e-8);
    expect(Math.abs((above ? b.phiLeft : b.phiRight) - phiU)).toBeLessThan(1e-8);
  });

  it('moving-bucket area against the approximation (1 − sin φs)/(1 + sin φs) within its stated accuracy', () => {
    // PHYSICS.md §7 (Lee): the approximation is high by about +1 % at 10°, 0 at 30°, +5 % at 45°, +21 % at 60°.
    const stated: [number, number][] = [[10, 0.01], [30, 0], [45, 0.05], [60, 0.21]];
    for (const [psDeg, excess] of stated) {
      const ps = psDeg * DEG;
      const b = bucketOf(machine(gammaT, T, V * Math.sin(ps)));
      const approx = ((1 - Math.sin(ps)) / (1 + Math.sin(ps))) * k.A0;
      // "About": the stated excesses are rounded to the nearest per cent.
      expect(Math.abs(approx / b.area - 1 - excess)).toBeLessThan(0.01);
    }
  });

  it('contour of amplitude φ̂ in the stationary bucket: area A0·[E(k) − (1 − k²)K(k)], height k·δ0', () => {
    const m = machine(gammaT, T);
    const b = bucketOf(m);
    for (const ampDeg of [20, 60, 90, 150, 175]) {
      const amp = ampDeg * DEG;
      // Level of the orbit through (φs + φ̂, 0); the expected values below come from the closed forms.
      const Hc = hamiltonian(m, b.phiS + amp, 0);
      const c = contourAt(m, b, Hc);
      const kk = Math.sin(amp / 2);
      // PHYSICS.md §7 (derived there); ellipk/ellipe take the parameter m = k².
      const area = k.A0 * (ellipe(kk * kk) - (1 - kk * kk) * ellipk(kk * kk));
      expect(Math.abs(c.area / area - 1)).toBeLessThan(1e-3);
      expect(Math.abs(c.halfHeightDE / (kk * k.delta0 * k.b2E) - 1)).toBeLessThan(1e-3);
      expect(Math.abs((c.length * k.omegaRf) / (2 * amp) - 1)).toBeLessThan(1e-6);
      expect(Math.abs(c.phiMax - b.phiS - amp)).toBeLessThan(1e-9);
    }
    // At the separatrix level the contour is the bucket itself.
    expect(contourAt(m, b, b.Usep).area).toBe(b.area);
  });

  it('contourAt rejects levels outside the bucket with a clear message', () => {
    const m = machine(gammaT, T);
    const b = bucketOf(m);
    expect(() => contourAt(m, b, 2 * b.Usep)).toThrow(/contour level H = .*must be in \(U\(φs\), U_sep\]/);
    expect(() => contourAt(m, b, -1)).toThrow(/contour level H = -1/);
    expect(() => contourAt(m, b, NaN)).toThrow(/H = NaN/);
  });

  it("hamiltonian matches the pendulum form, and the separatrix curve lies on H' = Usep and closes", () => {
    const m = machine(gammaT, T);
    const b = bucketOf(m);
    // H' − H'(φs, 0) = πh|η|δ² + (ZV/β²E)(1 − cos(φ − φs)) for a stationary single-RF bucket
    // (PHYSICS.md §5, Lee ch. 3); measured from the bucket centre, so the check does not depend on U's origin.
    const H0 = hamiltonian(m, b.phiS, 0);
    const d = 1e-3;
    const want = Math.PI * H * Math.abs(k.eta) * d * d + (V / k.b2E) * (1 - Math.cos(1.1));
    expect(Math.abs((hamiltonian(m, b.phiS + 1.1, d) - H0) / want - 1)).toBeLessThan(1e-9);
    expect(Math.abs((hamiltonian(m, b.phiS - 1.1, -d) - H0) / want - 1)).toBeLessThan(1e-9);
    // Usep − U(φs) = 2ZV/β²E at the unstable points (same form at φ − φs = π).
    expect(Math.abs((b.Usep - H0) / ((2 * V) / k.b2E) - 1)).toBeLessThan(1e-9);
    const s = separatrix(m, b, 101);
    const n = s.dt.length;
    expect(n).toBe(201);
    expect(s.dt[n - 1]).toBe(s.dt[0]);
    expect(s.dE[n - 1]).toBe(s.dE[0]);
    for (let i = 1; i < n - 1; i += 7) {
      const Hs = hamiltonian(m, phaseOfDt(m, s.dt[i]), s.dE[i] / k.b2E);
      expect(Math.abs(Hs / b.Usep - 1)).toBeLessThan(1e-9);
    }
    expect(s.dE[50]).toBeGreaterThan(0); // upper branch first
    expect(s.dE[150]).toBeLessThan(0);
    expect(() => separatrix(m, b, 2)).toThrow(/points = 2: must be an integer/);
  });
});

describe('fixed points, phase/time mapping and the no-bucket cases', () => {
  it('single RF accelerating: stable φs and unstable π − φs (PHYSICS.md §7, Lee ch. 3)', () => {
    const ps = 30 * DEG;
    const below = fixedPoints(machine(6, 1e9, V * Math.sin(ps)));
    expect(below.stable.length).toBe(1);
    expect(below.unstable.length).toBe(1);
    expect(below.stable[0]).toBeCloseTo(ps, 8);
    expect(below.unstable[0]).toBeCloseTo(Math.PI - ps, 8);
    // Above transition the roles swap: stable at π − φs, unstable at φs (PHYSICS.md §0).
    const above = fixedPoints(machine(3, 5e9, V * Math.sin(ps)));
    expect(above.stable[0]).toBeCloseTo(Math.PI - ps, 8);
    expect(above.unstable[0]).toBeCloseTo(ps, 8);
  });

  it('a late particle (dt > 0) has a larger phase, and the mapping inverts (PHYSICS.md §0)', () => {
    const m = machine(6, 1e9, 10e3);
    const k = kin(6, 1e9);
    const dt = 2.5e-9;
    expect(phaseOfDt(m, dt) - m.phiS).toBeCloseTo(k.omegaRf * dt, 9);
    expect(dtOfPhase(m, phaseOfDt(m, dt))).toBeCloseTo(dt, 20);
  });

  it('no bucket when the required gain exceeds the peak voltage: ok:false with the reason', () => {
    const r = computeBucket(machine(6, 1e9, 60e3));
    expect(r.ok).toBe(false);
    if (!r.ok) expect(r.reason).toMatch(/no bucket.*60000 eV per turn.*50000 eV/);
  });

  it('no bucket when the forced slope is unstable for the sign of η', () => {
    const r = computeBucket(machine(6, 1e9, 10e3, 'falling')); // falling slope below transition
    expect(r.ok).toBe(false);
    if (!r.ok) expect(r.reason).toMatch(/not a stable fixed point/);
  });
});
