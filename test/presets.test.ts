// Every example setup (the app's presets, read by the command line too) must validate, be labelled as an
// invented machine, and have an RF bucket at turn 0.
import { readdirSync, readFileSync } from 'node:fs';
import { join } from 'node:path';
import { describe, expect, it } from 'vitest';
import { computeBucket } from '../core/bucket.ts';
import { machineAtStart } from '../core/machine.ts';
import { formatIssue, parseSetup } from '../core/setup/validate.ts';

const dir = join(import.meta.dirname, '..', 'examples');
const files = readdirSync(dir).filter((f) => f.endsWith('.json'));

describe('example setups', () => {
  it('there are at least four', () => {
    expect(files.length).toBeGreaterThanOrEqual(4);
  });

  for (const f of files) {
    it(`${f} validates, is labelled fictional and has a bucket`, () => {
      const r = parseSetup(JSON.parse(readFileSync(join(dir, f), 'utf8')));
      if (!r.ok) throw new Error(r.errors.map(formatIssue).join('\n'));
      expect(r.setup.title).toMatch(/fictional/i);
      const b = computeBucket(machineAtStart(r.setup));
      if (!b.ok) throw new Error(b.reason);
      expect(b.bucket.area).toBeGreaterThan(0);
    });
  }

  it('the double-harmonic storage ring is stationary: φs = 0, no energy gain, a flat (zero-slope) well', () => {
    const r = parseSetup(JSON.parse(readFileSync(join(dir, 'cedar-storage.json'), 'utf8')));
    if (!r.ok) throw new Error('cedar-storage.json does not validate');
    const m = machineAtStart(r.setup);
    expect(m.dEs).toBe(0);
    expect(Math.abs(m.phiS)).toBeLessThan(1e-4);
    // V2 = V1/2 at 2h with 180°: F'(φs) = Z·(V1 − 2·V2) = 0 (bunch-lengthening condition, PHYSICS.md §8).
    const [a, b] = r.setup.rf.systems;
    expect(b.harmonic).toBe(2 * a.harmonic);
    expect(b.voltage * 2).toBe(a.voltage);
    expect(b.phase).toBe(180);
  });

  it('the transition preset starts below γt and its ramp crosses it within the run', () => {
    const r = parseSetup(JSON.parse(readFileSync(join(dir, 'birch-transition.json'), 'utf8')));
    if (!r.ok) throw new Error('birch-transition.json does not validate');
    const m = machineAtStart(r.setup);
    const gammaT = r.setup.ring.gammaT!;
    expect(m.gamma).toBeLessThan(gammaT);
    // A dipole ramp gains Z·c·ρ·Ḃ·T0 per turn; T0 ∝ 1/β changes by < 1 % here (β ≈ 0.98), so 90 % of the
    // turn-0 gain per turn is a safe lower bound.
    expect(m.Es + 0.9 * m.dEs * r.setup.run.turns).toBeGreaterThan(gammaT * m.particle.mass);
  });
});
