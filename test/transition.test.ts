// Transition crossing: the stable-phase switch (automatic or at a set time) keeps a matched bunch; without the
// jump it is lost; ω_s near transition follows ω_s² = |t|/T_c³ (PHYSICS.md §10, [Sørenssen] (mem.), [Lee ch. 3]).
// Units: time in s, energies and p·c in eV. The ring is invented (fictional) for the test.
import { describe, expect, it } from 'vitest';
import { generateBeam } from '../core/beam/index.ts';
import { computeBucket } from '../core/bucket.ts';
import { PROTON_MASS_EV } from '../core/constants.ts';
import { planCycle } from '../core/cycle/planner.ts';
import { insideSeparatrix } from '../core/diagnostics/index.ts';
import { MachineStepper, machineAtStart } from '../core/machine.ts';
import { parseSetup } from '../core/setup/validate.ts';
import { smallAmplitudeTune } from '../core/synchrotron.ts';
import { Tracker } from '../core/tracker.ts';

const GAMMA_T = 3;
const RATE = 1.5e11; // d(p·c)/dt [eV/s]
const PC0 = PROTON_MASS_EV * Math.sqrt(2.9 ** 2 - 1); // start at γ = 2.9
// Transition time in closed form: p·c grows linearly, and γ = γt at p·c = m·sqrt(γt² − 1).
const T_TR = (PROTON_MASS_EV * Math.sqrt(GAMMA_T ** 2 - 1) - PC0) / RATE;

function setupOf(rf: Record<string, unknown>, turns = 4000) {
  const r = parseSetup({
    version: 1,
    title: 'Test ring (fictional)',
    particle: { kind: 'proton' },
    ring: { circumference: 100, gammaT: GAMMA_T },
    energy: { start: { quantity: 'momentum', value: PC0 }, ramp: { kind: 'momentumRate', value: RATE } },
    rf: { systems: [{ harmonic: 4, voltage: 500e3 }], ...rf },
    beam: { distribution: { kind: 'matched', shape: 'parabolic', size: { by: 'emittance', convention: 'contour', value: 0.02 } }, particles: 2000, seed: 3 },
    run: { turns, drift: 'exact', momentumAperture: 0.05 },
  });
  if (!r.ok) throw new Error(JSON.stringify(r.errors));
  return r.setup;
}

// Track the whole run; return the fraction of all particles inside the bucket of the automatic-switch machine.
function keptFraction(rf: Record<string, unknown>): { kept: number; events: string[] } {
  const s = setupOf(rf);
  const { bunch } = generateBeam(s, machineAtStart(s));
  const tr = new Tracker(s, bunch);
  tr.track(s.run.turns);
  const ref = new MachineStepper(setupOf({ slope: 'auto' }));
  while (ref.state.turn < tr.turn) ref.advance();
  const b = computeBucket(ref.state);
  if (!b.ok) throw new Error(b.reason);
  return { kept: insideSeparatrix(bunch, ref.state, b.bucket) / bunch.total, events: tr.machine.events.map((e) => e.message) };
}

describe('transition crossing', () => {
  it('the ramp crosses transition mid-run (setup check)', () => {
    const m = machineAtStart(setupOf({}));
    expect(T_TR / m.T0).toBeGreaterThan(1000);
    expect(T_TR / m.T0).toBeLessThan(3000);
  });

  it('with the automatic phase jump ≥ 99 % of a matched bunch is kept (common practice); without it the bunch is lost', () => {
    const auto = keptFraction({ slope: 'auto' });
    expect(auto.kept).toBeGreaterThanOrEqual(0.99);
    expect(auto.events.length).toBe(1);
    expect(auto.events[0]).toMatch(/stable phase switched from the rising to the falling RF slope/);
    expect(auto.events[0]).toMatch(/automatically: the slip factor changed sign .*γt = 3\)/);
    const none = keptFraction({ slope: 'rising' });
    expect(none.kept).toBeLessThan(0.2);
    console.log(`transition: kept ${auto.kept} with the jump, ${none.kept} without`);
  });

  it('a jump at the set time of transition keeps the bunch, and the message says when', () => {
    const timed = keptFraction({ slope: 'timed', switchTime: T_TR });
    expect(timed.kept).toBeGreaterThanOrEqual(0.99);
    expect(timed.events[0]).toMatch(/at the set time rf\.switchTime = /);
  });

  it('the automatic switch happens on the turn γ crosses γt (closed-form crossing time, within one turn)', () => {
    const st = new MachineStepper(setupOf({ slope: 'auto' }));
    while (st.state.events.length === 0 && st.state.turn < 4000) st.advance();
    const e = st.state.events[0];
    expect(e.kind).toBe('slopeSwitch');
    expect(Math.abs(e.time - T_TR)).toBeLessThanOrEqual(st.state.T0 * 1.0001);
  });

  it('ω_s near transition follows ω_s² = |t|/T_c³ (PHYSICS.md §10)', () => {
    const st = new MachineStepper(setupOf({ slope: 'auto' }));
    const m = st.state;
    // T_c = [πβ²Eγt³/(hω0²·ZV|cos φs|·γ̇)]^⅓ at transition; γ̇ = β·d(pc)/dt / m (dE = β·d(pc)).
    const Et = GAMMA_T * PROTON_MASS_EV;
    const bt = Math.sqrt(1 - 1 / GAMMA_T ** 2);
    const w0 = (2 * Math.PI * bt * 299792458) / 100;
    const gdot = (bt * RATE) / PROTON_MASS_EV;
    let checked = 0;
    let worst = 0;
    let Tc = NaN;
    while (m.time < T_TR + 3e-3) {
      st.advance();
      if (!Number.isFinite(Tc) && m.time > T_TR - 5e-3) {
        Tc = Math.cbrt((Math.PI * bt * bt * Et * GAMMA_T ** 3) / (4 * w0 * w0 * 500e3 * Math.abs(Math.cos(m.phiS)) * gdot));
      }
      const x = Math.abs(m.time - T_TR) / Tc;
      if (x >= 0.5 && x <= 2) {
        const ws = 2 * Math.PI * smallAmplitudeTune(m).fs;
        worst = Math.max(worst, Math.abs((ws * ws * Tc ** 3) / Math.abs(m.time - T_TR) - 1));
        checked++;
      }
    }
    // Tolerance: the formula linearizes η = 1/γt² − 1/γ² in Δγ; the next term is 3Δγ/(2γt) relative,
    // with Δγ ≤ γ̇·2T_c here, plus the change of β²E, ω0 and cos φs over the same interval (same order).
    const tol = 2 * ((3 * gdot * 2 * Tc) / (2 * GAMMA_T));
    expect(checked).toBeGreaterThan(100);
    expect(worst).toBeLessThan(tol);
    expect(tol).toBeLessThan(0.1);
    console.log(`ω_s² T_c³/|t|: worst deviation ${worst} over ${checked} turns (tolerance ${tol}), T_c = ${Tc} s`);
  });

  it('the planner flags a non-adiabatic interval of ±5^⅔·T_c around transition (α = |ω̇_s|/ω_s² = ½(T_c/|t|)^{3/2} = 0.1)', () => {
    const s = setupOf({ slope: 'auto' });
    const p = planCycle(s, { samples: 800, adiabaticLimit: 0.1 });
    expect(Math.abs(p.transitionTime - T_TR)).toBeLessThan(1e-9);
    const ni = p.intervals.filter((i) => i.kind === 'nonAdiabatic' && i.tStart < T_TR && i.tEnd > T_TR);
    expect(ni.length).toBe(1);
    const m = machineAtStart(s);
    const bt = Math.sqrt(1 - 1 / GAMMA_T ** 2);
    const w0 = (2 * Math.PI * bt * 299792458) / 100;
    const gdot = (bt * RATE) / PROTON_MASS_EV;
    const Tc = Math.cbrt((Math.PI * bt * bt * GAMMA_T * PROTON_MASS_EV * GAMMA_T ** 3) / (4 * w0 * w0 * 500e3 * Math.abs(Math.cos(m.phiS)) * gdot));
    const half = Math.cbrt(25) * Tc;
    const spacing = p.time[1] - p.time[0];
    // Tolerance: one sample spacing plus 10 % (linearization at ~3 T_c, see the test above, and differences of ω_s).
    expect(Math.abs(T_TR - ni[0].tStart - half)).toBeLessThan(0.1 * half + spacing);
    expect(Math.abs(ni[0].tEnd - T_TR - half)).toBeLessThan(0.1 * half + spacing);
  });
});
