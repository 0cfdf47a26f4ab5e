// The command line end to end: bucket numbers against closed forms, track CSV, and exit code 2 on bad input.
import { spawnSync } from 'node:child_process';
import { mkdtempSync, readFileSync, writeFileSync } from 'node:fs';
import { tmpdir } from 'node:os';
import { join } from 'node:path';
import { describe, expect, it } from 'vitest';
import { C_LIGHT, PROTON_MASS_EV } from '../core/constants.ts';

const root = new URL('..', import.meta.url).pathname;
const dir = mkdtempSync(join(tmpdir(), 'pw-cli-'));

function cli(...args: string[]) {
  const r = spawnSync(join(root, 'node_modules/.bin/tsx'), [join(root, 'cli/main.ts'), ...args], { encoding: 'utf8' });
  return { code: r.status, out: r.stdout, err: r.stderr };
}

// A stationary proton bucket below transition (fictional ring): every number has a closed form.
const stationary = {
  version: 1,
  title: 'test ring (fictional)',
  particle: { kind: 'proton' },
  ring: { circumference: 100, gammaT: 5 },
  energy: { start: { quantity: 'kinetic', value: 1e9 } },
  rf: { systems: [{ harmonic: 2, voltage: 50e3 }] },
  beam: { distribution: { kind: 'matched', shape: 'parabolic', size: { by: 'emittance', convention: 'contour', value: 0.1 } }, particles: 2000, seed: 3 },
  run: { turns: 100, drift: 'linear' },
};

describe('phasewell bucket', () => {
  it('prints kinematics, tune and bucket that match the textbook formulas', () => {
    const f = join(dir, 'stationary.json');
    writeFileSync(f, JSON.stringify(stationary));
    const r = cli('bucket', f);
    expect(r.code).toBe(0);
    const j = JSON.parse(r.out);
    // Kinematics (PHYSICS.md §2) and slip factor η = 1/γt² − 1/γ² (§3).
    const E = 1e9 + PROTON_MASS_EV, gamma = E / PROTON_MASS_EV, beta = Math.sqrt(1 - 1 / gamma ** 2);
    const eta = 1 / 25 - 1 / gamma ** 2;
    const f0 = (beta * C_LIGHT) / 100;
    expect(j.gamma).toBeCloseTo(gamma, 12);
    expect(j.revolutionFrequency_Hz / f0).toBeCloseTo(1, 12);
    expect(j.slipFactor).toBeCloseTo(eta, 12);
    expect(j.synchronousPhase_deg).toBeCloseTo(0, 9); // stationary, below transition
    // Qs = sqrt(h|η|ZV/(2πβ²E)) (PHYSICS.md §6; S.Y. Lee, Accelerator Physics, ch. 3, from memory).
    const Qs = Math.sqrt((2 * Math.abs(eta) * 50e3) / (2 * Math.PI * beta ** 2 * E));
    expect(Math.abs(j.synchrotronTune / Qs - 1)).toBeLessThan(1e-3);
    // Stationary bucket area A0 = (8/ωrf)·sqrt(2ZVβ²E/(πh|η|)) and half-height (PHYSICS.md §7).
    const wrf = 2 * Math.PI * 2 * f0;
    const A0 = (8 / wrf) * Math.sqrt((2 * 50e3 * beta ** 2 * E) / (Math.PI * 2 * Math.abs(eta)));
    expect(Math.abs(j.bucket.area_eVs / A0 - 1)).toBeLessThan(1e-3);
    expect(Math.abs(j.bucket.halfHeight_eV / ((A0 * wrf) / 8) - 1)).toBeLessThan(1e-3);
    expect(Math.abs(j.bucket.length_s / ((2 * Math.PI) / wrf) - 1)).toBeLessThan(1e-3);
    // The contour convention reproduces the requested emittance; filling factor = contour area / bucket area.
    expect(j.matchedBunch.emittanceContour_eVs).toBeCloseTo(0.1, 9);
    expect(j.matchedBunch.fillingFactor).toBeCloseTo(0.1 / j.bucket.area_eVs, 9);
  });

  it('says plainly when the RF cannot give the energy gain (no bucket)', () => {
    const f = join(dir, 'nobucket.json');
    writeFileSync(f, JSON.stringify({ ...stationary, energy: { start: stationary.energy.start, ramp: { kind: 'gainPerTurn', value: 60e3 } } }));
    const r = cli('bucket', f);
    expect(r.code).toBe(0);
    expect(JSON.parse(r.out).noBucket).toMatch(/no bucket: the synchronous particle needs 60000 eV per turn but the RF gives at most 50000 eV/);
  });
});

describe('phasewell track', () => {
  it('writes per-turn diagnostics with units in the header and the final particles', () => {
    const f = join(dir, 'track.json');
    writeFileSync(f, JSON.stringify(stationary));
    const out = join(dir, 'd.csv'), parts = join(dir, 'p.csv');
    const r = cli('track', f, '--turns', '40', '--every', '20', '--out', out, '--particles', parts);
    expect(r.code).toBe(0);
    const lines = readFileSync(out, 'utf8').trim().split('\n');
    expect(lines[0]).toMatch(/^turn,time_s,.*rmsDt_s.*rmsDE_eV.*emittanceRms_eVs/);
    expect(lines.map((l) => l.split(',')[0])).toEqual(['turn', '0', '20', '40']);
    const p = readFileSync(parts, 'utf8').trim().split('\n');
    expect(p.length).toBe(2001);
  });
});

describe('bad input', () => {
  it('exits 2 with one line naming field, value and range', () => {
    const f = join(dir, 'bad.json');
    writeFileSync(f, JSON.stringify({ ...stationary, rf: { systems: [{ harmonic: 0, voltage: 1e3 }] } }));
    const r = cli('bucket', f);
    expect(r.code).toBe(2);
    expect(r.err.trim().split('\n')).toHaveLength(1);
    expect(r.err).toMatch(/rf\.systems\[0\]\.harmonic = 0: must be an integer in \[1, 1e6\]/);
    expect(r.err).not.toMatch(/at .*\.ts:\d+/); // no stack trace
  });

  it('exits 2 on a bad option value and an unknown command', () => {
    expect(cli('track', join(root, 'examples/alder-booster.json'), '--turns=0').code).toBe(2);
    const u = cli('frobnicate');
    expect(u.code).toBe(2);
    expect(u.err).toMatch(/unknown command "frobnicate"/);
  });
});
