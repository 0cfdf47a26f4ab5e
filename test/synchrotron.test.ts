// Synchrotron tune: small-amplitude formula, the one-turn-map tune, the pendulum amplitude dependence and, for
// moving buckets, a direct numerical integration of the equations of motion written here. Both signs of η.
// Machine states come from setup objects through parseSetup + machineAtStart.
import ellipk from '@stdlib/math-base-special-ellipk';
import { describe, expect, it } from 'vitest';
import { computeBucket, type BucketInfo } from '../core/bucket.ts';
import type { MachineState } from '../core/machine.ts';
import { protonMachine } from './support/setups.ts';
import { smallAmplitudeTune, tuneAtAmplitude, tuneVsAmplitude } from '../core/synchrotron.ts';

const MP = 938.272_088_16e6; // proton rest energy [eV], CODATA 2018
const C = 299_792_458; // speed of light [m/s], exact
const DEG = Math.PI / 180;
const CIRC = 100;
const H = 8;

const CASES = [
  { name: 'below transition', gammaT: 6, T: 1e9 },
  { name: 'above transition', gammaT: 3, T: 5e9 },
] as const;

function machine(gammaT: number, T: number, V: number, gain = 0): MachineState {
  return protonMachine({ circumference: CIRC, gammaT, kinetic: T, systems: [{ harmonic: H, voltage: V }], gain });
}

// Independent kinematics (PHYSICS.md §2–3, Lee ch. 2): γ = 1 + T/m, η = 1/γt² − 1/γ², f0 = βc/C.
function kin(gammaT: number, T: number) {
  const gamma = 1 + T / MP;
  const beta = Math.sqrt(1 - 1 / (gamma * gamma));
  return { b2E: beta * beta * gamma * MP, eta: 1 / (gammaT * gammaT) - 1 / (gamma * gamma), f0: (beta * C) / CIRC };
}

function bucketOf(m: MachineState): BucketInfo {
  const r = computeBucket(m);
  if (!r.ok) throw new Error(r.reason);
  return r.bucket;
}

// Period in turns of the orbit starting at (φ0, 0), by RK4 on dφ/dn = 2πhηδ, dδ/dn = (ZV sin φ − ΔE_s)/(β²E)
// (PHYSICS.md §4–5, continuous limit), timing the second return of δ through zero by linear interpolation.
function rk4Period(phi0: number, V: number, dEs: number, b2E: number, eta: number, dn: number): number {
  const a = 2 * Math.PI * H * eta;
  const f = (p: number) => (V * Math.sin(p) - dEs) / b2E;
  let p = phi0;
  let d = 0;
  let n = 0;
  let crossings = 0;
  for (let i = 0; i < 1e7; i++) {
    const k1p = a * d, k1d = f(p);
    const k2p = a * (d + 0.5 * dn * k1d), k2d = f(p + 0.5 * dn * k1p);
    const k3p = a * (d + 0.5 * dn * k2d), k3d = f(p + 0.5 * dn * k2p);
    const k4p = a * (d + dn * k3d), k4d = f(p + dn * k3p);
    const pn = p + (dn / 6) * (k1p + 2 * k2p + 2 * k3p + k4p);
    const dnext = d + (dn / 6) * (k1d + 2 * k2d + 2 * k3d + k4d);
    if (i > 0 && d !== 0 && d < 0 !== dnext < 0) {
      crossings++;
      if (crossings === 2) return n + (dn * d) / (d - dnext);
    }
    p = pn;
    d = dnext;
    n += dn;
  }
  throw new Error('orbit did not close');
}

describe.each(CASES)('synchrotron tune, $name', ({ gammaT, T }) => {
  const k = kin(gammaT, T);
  const V = 50e3;

  it.each([0, 20, 45])('small amplitude: Qs = sqrt(h|η|ZV|cos φs|/(2πβ²E)), fs = Qs·f0, φs = %i°', (psDeg) => {
    const ps = psDeg * DEG;
    const m = machine(gammaT, T, V, V * Math.sin(ps));
    const t = smallAmplitudeTune(m);
    // PHYSICS.md §6, Lee ch. 3.
    const Qs = Math.sqrt((H * Math.abs(k.eta) * V * Math.abs(Math.cos(ps))) / (2 * Math.PI * k.b2E));
    expect(Math.abs(t.Qs / Qs - 1)).toBeLessThan(1e-3);
    expect(Math.abs(t.fs / (Qs * k.f0) - 1)).toBeLessThan(1e-3);
  });

  it('one-turn map tune: trace of the kick-drift Jacobian, by finite differences (PHYSICS.md §4, §6)', () => {
    const Vbig = 10e6; // large Qs (~0.04 below transition), where the map and continuous tunes differ visibly
    const m = machine(gammaT, T, Vbig);
    const t = smallAmplitudeTune(m);
    const ps = k.eta < 0 ? 0 : Math.PI;
    // One turn: δ += ZV sin φ/(β²E), then φ += 2πhηδ; Jacobian by central differences at the fixed point.
    const map = (p: number, d: number): [number, number] => {
      const d1 = d + (Vbig * Math.sin(p)) / k.b2E;
      return [p + 2 * Math.PI * H * k.eta * d1, d1];
    };
    const e = 1e-6;
    const dpp = (map(ps + e, 0)[0] - map(ps - e, 0)[0]) / (2 * e);
    const ddd = (map(ps, e)[1] - map(ps, -e)[1]) / (2 * e);
    const Q = Math.acos((dpp + ddd) / 2) / (2 * Math.PI);
    expect(Math.abs(t.QsMap / Q - 1)).toBeLessThan(1e-6);
    expect(t.QsMap).toBeGreaterThan(t.Qs); // Q ≈ Qs(1 + (πQs)²/6), PHYSICS.md §6
    expect(Math.abs(t.QsMap / (t.Qs * (1 + (Math.PI * t.Qs) ** 2 / 6)) - 1)).toBeLessThan(1e-4);
  });

  it('stationary bucket: Qs(φ̂)/Qs0 = π/(2K(k)), k = sin(φ̂/2), at 30°, 90°, 150°, 170°', () => {
    const m = machine(gammaT, T, V);
    const b = bucketOf(m);
    const Q0 = smallAmplitudeTune(m).Qs;
    for (const ampDeg of [30, 90, 150, 170]) {
      const kk = Math.sin((ampDeg * DEG) / 2);
      // PHYSICS.md §6 (Lee ch. 3); @stdlib ellipk takes the parameter m = k².
      const want = Q0 * (Math.PI / (2 * ellipk(kk * kk)));
      expect(Math.abs(tuneAtAmplitude(m, b, ampDeg * DEG) / want - 1)).toBeLessThan(1e-3);
    }
    // Small φ̂: ≈ 1 − φ̂²/16 (PHYSICS.md §6).
    const a = 0.05;
    expect(Math.abs(tuneAtAmplitude(m, b, a) / (Q0 * (1 - (a * a) / 16)) - 1)).toBeLessThan(1e-6);
  });

  it('moving bucket (φs = 30° below-transition value): tune vs direct integration of the equations of motion', () => {
    const ps = 30 * DEG;
    const gain = V * Math.sin(ps);
    const m = machine(gammaT, T, V, gain);
    const b = bucketOf(m);
    const phiS = k.eta < 0 ? ps : Math.PI - ps;
    const reach = b.phiRight - b.phiS;
    for (const frac of [0.2, 0.6, 0.9]) {
      const amp = frac * reach;
      const Qs0 = smallAmplitudeTune(m).Qs;
      const dn = 1 / (Qs0 * 20000); // ~2e4 RK4 steps per small-amplitude period
      const period = rk4Period(phiS + amp, V, gain, k.b2E, k.eta, dn);
      expect(Math.abs(tuneAtAmplitude(m, b, amp) * period - 1)).toBeLessThan(1e-4);
    }
  });

  it('orbits outside the bucket give NaN; bad amplitudes throw; the vector form matches', () => {
    const m = machine(gammaT, T, V, V * Math.sin(30 * DEG));
    const b = bucketOf(m);
    expect(tuneAtAmplitude(m, b, b.phiRight - b.phiS + 0.01)).toBeNaN();
    expect(() => tuneAtAmplitude(m, b, 0)).toThrow(/amp = 0 rad: must be a finite number > 0/);
    expect(() => tuneAtAmplitude(m, b, NaN)).toThrow(/amp = NaN/);
    const amps = [0.1, 0.5, 5];
    const v = tuneVsAmplitude(m, b, amps);
    expect(v[0]).toBe(tuneAtAmplitude(m, b, 0.1));
    expect(v[1]).toBe(tuneAtAmplitude(m, b, 0.5));
    expect(v[2]).toBeNaN();
    expect(() => tuneVsAmplitude(m, b, [0.1, -1])).toThrow(/amps\[1\] = -1 rad/);
  });
});

describe('no bucket', () => {
  it('small-amplitude tune is NaN when the machine has no stable phase', () => {
    const t = smallAmplitudeTune(machine(6, 1e9, 50e3, 60e3));
    expect(t.Qs).toBeNaN();
    expect(t.fs).toBeNaN();
    expect(t.QsMap).toBeNaN();
  });
});
