// hypot (core/kinematics.ts) replaces Math.hypot on the per-turn path because the builtin allocates on every call;
// it must not change the physics. Reference: V8's own Math.hypot (src/builtins/math.tq, MathHypot), which is what
// Node and Chromium computed before, compared bit for bit (Object.is also tells +0 from −0 and matches NaN).
import './fcSeed.ts';
import fc from 'fast-check';
import { describe, expect, it } from 'vitest';
import { PROTON_MASS_EV, ELECTRON_MASS_EV } from '../core/constants.ts';
import { hypot } from '../core/kinematics.ts';
import { MachineStepper, type MachineState } from '../core/machine.ts';
import { dEAtDelta, storeEnergyBounds } from '../core/elements/drift.ts';
import { parseSetup } from '../core/setup/validate.ts';

const same = (x: number, y: number) => Object.is(hypot(x, y), Math.hypot(x, y));

describe('hypot: the same bits as Math.hypot', () => {
  it('at the special values (zeros, infinities, NaN, subnormals, the largest double)', () => {
    const special = [0, -0, Infinity, -Infinity, NaN, 5e-324, -5e-324, 2.2250738585072014e-308, Number.MAX_VALUE, 1, 3, 4];
    for (const x of special) for (const y of special) expect(same(x, y), `hypot(${x}, ${y})`).toBe(true);
  });

  it('over all doubles (fast-check, fixed seed)', () => {
    fc.assert(fc.property(fc.double(), fc.double(), (x, y) => same(x, y)), { numRuns: 20_000 });
  });

  it('for E = √(pc² + m²) from 1 keV to 10 TeV momenta (protons and electrons)', () => {
    fc.assert(
      fc.property(fc.double({ min: 3, max: 13, noNaN: true }), fc.boolean(), (lg, e) => same(10 ** lg, e ? ELECTRON_MASS_EV : PROTON_MASS_EV)),
      { numRuns: 20_000 },
    );
  });
});

// The machine stepper writes E = hypot(pc, m) and φs out in place (core/machine.ts energyOf, storeSyncPhase), so
// that V8 does not box numbers across calls on every turn; the values must stay those of Math.hypot and of the
// single-harmonic closed form, turn by turn along a ramp (reference: V8's Math.hypot; φs = arcsin(ΔE_s/(ZV)) below
// transition, PHYSICS.md §4 [Lee]).
describe('the stepper\'s per-turn E and φs', () => {
  it('E is Math.hypot(pc, m) bit for bit and φs the arcsine of ΔEs/ZV over 3000 turns of a B-dot ramp', () => {
    const r = parseSetup({
      version: 1, title: 'test ring (fictional)', particle: { kind: 'proton' },
      ring: { circumference: 180, gammaT: 4.8, bendingRadius: 9.5 },
      energy: { start: { quantity: 'kinetic', value: 2e8 }, ramp: { kind: 'bDot', value: 2 } },
      rf: { systems: [{ harmonic: 4, voltage: 20e3 }] },
      beam: { distribution: { kind: 'coasting', rmsEnergySpread: 0 }, particles: 10 },
    });
    if (!r.ok) throw new Error(JSON.stringify(r.errors));
    const st = new MachineStepper(r.setup);
    let worst = 0;
    for (let t = 0; t < 3000; t++) {
      st.advance();
      const s = st.state;
      expect(Object.is(s.Es, Math.hypot(s.pc, s.particle.mass)), `turn ${s.turn}`).toBe(true);
      worst = Math.max(worst, Math.abs(s.phiS - Math.asin(s.dEs / (s.rf[0].V * Math.abs(s.particle.Z)))));
    }
    expect(worst).toBeLessThan(1e-12); // bisection to machine precision (core/synchronous.ts bisectRoot)
    expect(st.state.phiS).toBeGreaterThan(0.01); // accelerating: the phase left 0
  });
});

describe('the energy bounds of the momentum aperture, written out', () => {
  it('storeEnergyBounds gives dEAtDelta(±a) bit for bit (fast-check, fixed seed)', () => {
    const st = { pc: 0, Es: 0, particle: { mass: PROTON_MASS_EV } } as unknown as MachineState;
    const b = { aperture: 0, dEmin: 0, dEmax: 0 };
    fc.assert(
      fc.property(fc.double({ min: 3, max: 13, noNaN: true }), fc.double({ min: 1e-6, max: 0.5, noNaN: true }), fc.boolean(), (lg, a, e) => {
        const mass = e ? ELECTRON_MASS_EV : PROTON_MASS_EV, pc = 10 ** lg;
        Object.assign(st, { pc, Es: Math.hypot(pc, mass), particle: { mass } });
        b.aperture = a;
        storeEnergyBounds(b, st);
        return Object.is(b.dEmax, dEAtDelta(a, pc, st.Es, mass)) && Object.is(b.dEmin, dEAtDelta(-a, pc, st.Es, mass));
      }),
      { numRuns: 5000 },
    );
  });
});
