// Synchrotron radiation: constants, U0 and σ_δ against the textbook formulas, the synchronous phase with U0, and a
// tracked lepton beam that relaxes to the natural energy spread and bunch length with the formula's damping time.
// Sources: M. Sands, The Physics of Electron Storage Rings, SLAC-121 (1970): C_γ = 8.846e-5 m/GeV³ (eq. 4.6, mem.),
// C_q = 3.832e-13 m (eq. 5.22, mem.); H. Wiedemann, Particle Accelerator Physics (2007): U0[keV] = 88.46·E⁴[GeV]/ρ[m]
// (mem.), τ_E = 2E·T0/(J_E·U0) (amplitude), σ_δ² = C_q·γ²/(J_E·ρ); PHYSICS.md §11.
// Test ring (fictional): positrons at 6 GeV, ρ = 6 m, C = 120 m, α0 = 0.005, h = 200, V = 30 MV, J_E = 2 (isomagnetic,
// no gradient: 𝒟 ≈ 0, common practice). U0 ≈ 19 MeV gives τ_E ≈ 314 turns: short enough to track a few damping times.
import { describe, expect, it } from 'vitest';
import { makeBunch } from '../core/bunch.ts';
import { ELECTRON_MASS_EV, PROTON_MASS_EV } from '../core/constants.ts';
import { computeDiagnostics } from '../core/diagnostics/index.ts';
import { machineAtStart } from '../core/machine.ts';
import { makeParticle } from '../core/particle.ts';
import { quantumConstant, radiationConstant, radiationInfo, radiationLattice } from '../core/radiation.ts';
import { makeRng } from '../core/rng.ts';
import { parseSetup } from '../core/setup/validate.ts';
import { Tracker } from '../core/tracker.ts';

const E = 6e9, rho = 6, JE = 2, V = 30e6;
function ring(radiation: Record<string, unknown>, extra: Record<string, unknown> = {}) {
  const r = parseSetup({
    version: 1, title: 'test lepton ring (fictional)', particle: { kind: 'positron' },
    ring: { circumference: 120, alpha0: 0.005, bendingRadius: rho },
    energy: { start: { quantity: 'total', value: E } }, rf: { systems: [{ harmonic: 200, voltage: V }] },
    beam: { distribution: { kind: 'coasting', rmsEnergySpread: 0 }, particles: 10 },
    run: { momentumAperture: 0.2 }, radiation: { partitionE: JE, ...radiation }, ...extra,
  });
  if (!r.ok) throw new Error(JSON.stringify(r.errors));
  return r.setup;
}

describe('radiation constants and formulas', () => {
  const e = makeParticle({ kind: 'electron' });
  it('C_γ and C_q derived from CODATA match the quoted 8.846e-5 m/GeV³ and 3.832e-13 m (4 digits)', () => {
    expect(radiationConstant(e) * 1e27 / 8.846e-5).toBeCloseTo(1, 3); // m/eV³ → m/GeV³: × 1e27
    expect(quantumConstant(e) / 3.832e-13).toBeCloseTo(1, 3);
    // Protons: C_γ·(m_e/m_p)⁴ = 7.783e-18 m/GeV³ (PHYSICS.md §11).
    expect(radiationConstant(makeParticle({ kind: 'proton' })) * 1e27 / 7.783e-18).toBeCloseTo(1, 3);
    expect((ELECTRON_MASS_EV / PROTON_MASS_EV) ** 4 * 8.846e-5 / 7.783e-18).toBeCloseTo(1, 3);
  });

  it('U0, σ_δ, τ_E and σ_t of the test ring against the formulas with the quoted constants', () => {
    const s = ring({});
    const m = machineAtStart(s);
    const info = radiationInfo(m, radiationLattice(s)!);
    const U0 = 88.46e3 * (E / 1e9) ** 4 / rho; // eV
    expect(info.U0 / U0).toBeCloseTo(1, 3);
    const gamma = E / ELECTRON_MASS_EV;
    expect(info.sigmaDelta / Math.sqrt((3.832e-13 * gamma * gamma) / (JE * rho))).toBeCloseTo(1, 3);
    expect(info.tauE / ((2 * E * m.T0) / (JE * U0))).toBeCloseTo(1, 3);
    // Natural length σ_t = |η|σ_δ/ω_s with ω_s from PHYSICS.md §6 (V cos φs, sin φs = U0/V).
    const cosPhi = Math.sqrt(1 - (U0 / V) ** 2);
    const omegaS = m.omega0 * Math.sqrt((200 * Math.abs(m.eta0) * V * cosPhi) / (2 * Math.PI * E));
    expect(info.sigmaT / ((Math.abs(m.eta0) * info.sigmaDelta) / omegaS)).toBeCloseTo(1, 3);
  });

  it('the synchronous phase supplies U0: Z·V·sin φs = U0 on the falling slope above transition', () => {
    const m = machineAtStart(ring({}));
    expect(m.eta0).toBeGreaterThan(0);
    expect(m.U0).toBeGreaterThan(0);
    expect(V * Math.sin(m.phiS) / m.U0).toBeCloseTo(1, 9);
    expect(m.phiS).toBeGreaterThan(Math.PI / 2); // π − arcsin(U0/V) (PHYSICS.md §4)
  });

  it('radiation without a bending radius or integrals names the missing fields', () => {
    const s = ring({});
    delete (s.ring as { bendingRadius?: number }).bendingRadius;
    expect(() => machineAtStart(s)).toThrow(/ring\.bendingRadius.*radiation\.I2/);
  });
});

describe('tracked positron beam', () => {
  function track(radiation: Record<string, unknown>, sigmaT0: number, turns: number, every: number, n: number) {
    const s = ring(radiation);
    const m0 = machineAtStart(s);
    const info = radiationInfo(m0, radiationLattice(s)!);
    const b = makeBunch(n), rng = makeRng(9);
    const sigmaE0 = (sigmaT0 / info.sigmaT) * info.sigmaE; // linearly matched (same ratio as the natural bunch)
    for (let i = 0; i < n; i++) {
      b.dt[i] = sigmaT0 * rng.normal();
      b.dE[i] = sigmaE0 * rng.normal();
    }
    const t = new Tracker(s, b);
    const rec: { turn: number; emit: number; sE: number; sT: number }[] = [];
    t.track(turns, (tr) => {
      if (tr.turn % every === 0) {
        const d = computeDiagnostics(tr.bunch, tr.machine, null, 64);
        rec.push({ turn: tr.turn, emit: d.emittanceRms, sE: d.rmsDE, sT: d.rmsDt });
      }
    });
    return { rec, info, lost: b.total - b.n };
  }

  it('without quantum excitation the rms emittance decays as exp(−2t/τ_E) (emittance time τ_E/2), within 3 %', () => {
    const { rec, info, lost } = track({ quantumExcitation: false }, 40e-12, 600, 10, 4000);
    expect(lost).toBe(0);
    // Least-squares slope of ln ε against turn.
    let sx = 0, sy = 0, sxx = 0, sxy = 0;
    for (const r of rec) {
      const y = Math.log(r.emit);
      sx += r.turn; sy += y; sxx += r.turn * r.turn; sxy += r.turn * y;
    }
    const k = rec.length;
    const slope = (k * sxy - sx * sy) / (k * sxx - sx * sx);
    const tauFit = -2 / slope; // turns
    expect(Math.abs(tauFit / info.tauETurns - 1)).toBeLessThan(0.03);
  });

  it('with quantum excitation a small beam grows to the natural σ_E and σ_t within 3 %', () => {
    // ~9 emittance damping times to relax, then 1000 turns of averaging (20 000 particles: ±0.5 % per sample).
    const { rec, info } = track({}, 5e-12, 2500, 10, 20_000);
    const late = rec.filter((r) => r.turn > 1500);
    const mean = (f: (r: (typeof rec)[number]) => number) => late.reduce((a, r) => a + f(r), 0) / late.length;
    expect(Math.abs(mean((r) => r.sE) / info.sigmaE - 1)).toBeLessThan(0.03);
    expect(Math.abs(mean((r) => r.sT) / info.sigmaT - 1)).toBeLessThan(0.03);
  });
});
