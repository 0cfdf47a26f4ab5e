// hypot (core/kinematics.ts) replaces Math.hypot on the per-turn path because the builtin allocates on every call;
// it must not change the physics. Reference: V8's own Math.hypot (src/builtins/math.tq, MathHypot), which is what
// Node and Chromium computed before, compared bit for bit (Object.is also tells +0 from −0 and matches NaN).
import './fcSeed.ts';
import fc from 'fast-check';
import { describe, expect, it } from 'vitest';
import { PROTON_MASS_EV, ELECTRON_MASS_EV } from '../core/constants.ts';
import { hypot } from '../core/kinematics.ts';

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
