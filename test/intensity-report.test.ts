// The app's intensity report (app/intensity/report.ts) on the fictional fir example ring: a vanishing intensity
// gives back the RF well, the well with the beam stays finite and of the RF's size, and the loss numbers agree
// with each other (ΔE_bunch = N·e·ΔE_particle; k = ΔE_bunch/Q²; common practice, PHYSICS.md §12).
import { readFileSync } from 'node:fs';
import { describe, expect, it } from 'vitest';
import { intensityReport } from '../app/intensity/report.ts';
import { E_CHARGE } from '../core/constants.ts';
import { parseSetup } from '../core/setup/validate.ts';

function fir(particlesPerBunch: number) {
  const doc = JSON.parse(readFileSync(new URL('../examples/fir-intense-protons.json', import.meta.url), 'utf8'));
  doc.intensity.particlesPerBunch = particlesPerBunch;
  const r = parseSetup(doc);
  if (!r.ok) throw new Error('fir example does not validate');
  return r.setup;
}

const maxOf = (a: Float64Array) => a.reduce((m, x) => Math.max(m, x), -Infinity);

describe('intensity report', () => {
  it('a vanishing intensity gives back the RF-only well', () => {
    const r = intensityReport(fir(1)).report!;
    const depth = maxOf(r.well.Urf);
    for (let i = 0; i < r.well.U.length; i++) expect(Math.abs(r.well.U[i] - r.well.Urf[i])).toBeLessThan(1e-6 * depth);
    expect(Math.abs(r.phaseShiftDeg)).toBeLessThan(0.01);
  });

  it('with 4e12 protons the well stays finite and of the RF size, the separatrix closes', () => {
    const r = intensityReport(fir(4e12)).report!;
    expect(r.well.U.every(Number.isFinite)).toBe(true);
    const ratio = maxOf(r.well.U) / maxOf(r.well.Urf);
    expect(ratio).toBeGreaterThan(0.5);
    expect(ratio).toBeLessThan(2);
    expect(r.separatrix).not.toBeNull();
    expect(r.peakInduced).toBeGreaterThan(0);
  });

  it('loss numbers agree: per bunch = N·e·per particle, k = loss/Q², positive for a resistive impedance', () => {
    const r = intensityReport(fir(4e12)).report!;
    expect(r.lossPerParticle).toBeGreaterThan(0);
    expect(r.lossPerBunch).toBeCloseTo(r.lossPerParticle * r.particlesPerBunch * E_CHARGE, 12);
    expect(r.lossFactor * r.bunchCharge ** 2).toBeCloseTo(r.lossPerBunch, 12);
  });

  it('a setup without intensity says why there is no report', () => {
    const s = fir(1);
    const r = intensityReport({ ...s, intensity: undefined });
    expect(r.report).toBeNull();
    expect(r.reason).toMatch(/no intensity/);
  });
});
