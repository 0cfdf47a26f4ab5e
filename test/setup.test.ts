// The setup document: validation messages name field, value and range; old versions migrate; docs stay current.
import { readFileSync, readdirSync } from 'node:fs';
import { describe, expect, it } from 'vitest';
import { setupReferenceMarkdown } from '../core/setup/reference.ts';
import { formatIssue, parseSetup, parseSetupText } from '../core/setup/validate.ts';

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
