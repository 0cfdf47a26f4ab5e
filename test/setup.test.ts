// The setup document: validation messages name field, value and range; old versions migrate; docs stay current.
import { readFileSync, readdirSync } from 'node:fs';
import { describe, expect, it } from 'vitest';
import { setupReferenceMarkdown } from '../core/setup/reference.ts';
import { formatIssue, parseSetup, parseSetupText } from '../core/setup/validate.ts';
import { setupWarnings } from '../core/setup/warnings.ts';
import { PROTON_MASS_EV } from '../core/constants.ts';

const example = JSON.parse(readFileSync(new URL('../examples/alder-booster.json', import.meta.url), 'utf8'));
const clone = () => structuredClone(example);

describe('setup validation', () => {
  it('accepts every example file', () => {
    const dir = new URL('../examples/', import.meta.url);
    for (const f of readdirSync(dir).filter((n) => n.endsWith('.json'))) {
      const r = parseSetupText(readFileSync(new URL(f, dir), 'utf8'));
      expect(r.ok, `${f}: ${r.ok ? '' : r.errors.map(formatIssue).join('; ')}`).toBe(true);
    }
  });

  it('names the field, the value and the allowed range', () => {
    const d = clone();
    d.rf.systems[0].voltage = -5;
    const r = parseSetup(d);
    expect(r.ok).toBe(false);
    if (r.ok) return;
    expect(formatIssue(r.errors[0])).toBe('rf.systems[0].voltage = -5: must be in [0, 1e9] V');
  });

  it('rejects a non-integer harmonic number with the range', () => {
    const d = clone();
    d.rf.systems[0].harmonic = 4.5;
    const r = parseSetup(d);
    expect(!r.ok && formatIssue(r.errors[0])).toBe('rf.systems[0].harmonic = 4.5: must be an integer in [1, 1e6]');
  });

  it('rejects unknown fields, missing fields and wrong types', () => {
    const d = clone();
    d.ring.circumfrence = 3;
    delete d.beam.particles;
    d.run.drift = 'sideways';
    const r = parseSetup(d);
    expect(r.ok).toBe(false);
    if (r.ok) return;
    const lines = r.errors.map(formatIssue).join('\n');
    expect(lines).toMatch(/ring = .*unknown field\(s\): circumfrence/);
    expect(lines).toMatch(/beam\.particles = \(missing\)/);
    expect(lines).toMatch(/run\.drift = "sideways"/);
  });

  it('explains impossible combinations', () => {
    const d = clone();
    d.energy.start = { quantity: 'total', value: 5e8 };
    const r = parseSetup(d);
    expect(!r.ok && formatIssue(r.errors[0])).toMatch(/energy\.start\.value = 5e8: total energy must exceed the rest energy 9\.38272e8 eV/);
  });

  it('requires exactly one of gammaT and alpha0', () => {
    const d = clone();
    d.ring.alpha0 = 0.04;
    const r = parseSetup(d);
    expect(!r.ok && formatIssue(r.errors[0])).toMatch(/^ring\.gammaT = 4\.8: give exactly one of gammaT or alpha0/);
  });

  it('reports invalid JSON without throwing', () => {
    const r = parseSetupText('{"version": 1,');
    expect(r.ok).toBe(false);
    expect(!r.ok && r.errors[0].message).toMatch(/not valid JSON/);
  });

  it('fills defaults', () => {
    const d = clone();
    delete d.run;
    const r = parseSetup(d);
    expect(r.ok && r.setup.run).toEqual({ turns: 1000, drift: 'exact', momentumAperture: 0.02, diagnosticsEvery: 10, profileBins: 256 });
  });
});

describe('migration', () => {
  it('migrates a version-0 draft (voltages in kV, "tracking" block) instead of rejecting it', () => {
    const d = clone();
    d.version = 0;
    d.rf.systems = [{ harmonic: 4, voltage_kV: 20 }];
    d.tracking = d.run;
    delete d.run;
    const r = parseSetup(d);
    expect(r.ok).toBe(true);
    if (!r.ok) return;
    expect(r.migratedFrom).toBe(0);
    expect(r.setup.rf.systems[0].voltage).toBe(20000);
    expect(r.setup.run.turns).toBe(example.run.turns);
  });

  it('rejects a version from the future with the allowed range', () => {
    const d = clone();
    d.version = 7;
    const r = parseSetup(d);
    expect(!r.ok && formatIssue(r.errors[0])).toBe('version = 7: must be an integer in [0, 1]');
  });
});

describe('reference docs', () => {
  it('docs/setup-reference.md is generated from the current schema (run `npm run docs`)', () => {
    const doc = readFileSync(new URL('../docs/setup-reference.md', import.meta.url), 'utf8');
    expect(doc.endsWith(setupReferenceMarkdown())).toBe(true);
    expect(doc).toMatch(/\| `rf\.systems\[\]\.voltage` \| number \| V \| 0 … 1e9 \|/);
  });
});

describe('warnings along the run', () => {
  // A fictional proton ring with γt = 5, ramped through transition by a constant gain per turn from γ = 4. The
  // crossing turn follows from the definition of the transition energy, E_t = γt·m (common practice), and a
  // constant gain: n_t = (γt·m − E0)/ΔE. The warning samples the run 40 times and interpolates η0 linearly
  // between samples: within half a sample spacing of n_t.
  const m = PROTON_MASS_EV, gain = 1e5;
  const ramped = (turns: number, drift: 'linear' | 'exact') => {
    const r = parseSetup({
      version: 1, title: 'test ring (fictional)', particle: { kind: 'proton' }, ring: { circumference: 500, gammaT: 5 },
      energy: { start: { quantity: 'total', value: 4 * m }, ramp: { kind: 'gainPerTurn', value: gain } },
      rf: { systems: [{ harmonic: 10, voltage: 1e6 }] },
      beam: { distribution: { kind: 'matched', shape: 'gaussian', size: { by: 'rmsLength', value: 1e-10 } }, particles: 100 },
      run: { turns, drift, momentumAperture: 0.02, diagnosticsEvery: 10, profileBins: 64 },
    });
    if (!r.ok) throw new Error(JSON.stringify(r.errors));
    return setupWarnings(r.setup).filter((w) => w.path === 'run.drift');
  };
  const nT = (5 * m - 4 * m) / gain; // 9383 turns

  it('names the turn where a linear-drift run crosses transition (within half a sample spacing)', () => {
    const turns = 20000;
    const w = ramped(turns, 'linear');
    expect(w).toHaveLength(1);
    const at = Number(/near turn (\d+)/.exec(w[0].message)?.[1]);
    expect(Math.abs(at - nT)).toBeLessThan(turns / 40 / 2);
    expect(w[0].message).toMatch(/crosses transition \(γt = 5\).*use "exact"/);
  });

  it('says nothing when the run ends before transition, or with the exact drift', () => {
    expect(ramped(Math.floor(0.9 * nT), 'linear')).toHaveLength(0);
    expect(ramped(20000, 'exact')).toHaveLength(0);
  });
});
