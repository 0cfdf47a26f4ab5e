// The intensity report at turn 0: the self-consistent matched bunch, RF and induced voltage on its window, the
// potential well and separatrix with the beam's own field, and the energy lost to the impedance.
// Units: dt in s, voltages in V, energies in eV (per bunch in J), charge in C. Runs in the analysis worker
// (the self-consistent solve takes ~0.1 s).
import { computeBucket, dtOfPhase } from '../../core/bucket.ts';
import { distortedWell, impedanceLoss, type BeamField, intensityModel, solveSelfConsistent, voltagesOnGrid } from '../../core/collective/index.ts';
import { machineAtStart } from '../../core/machine.ts';
import type { Setup } from '../../core/setup/schema.ts';

/** Everything the intensity view draws and lists. */
export interface IntensityReport {
  dt: Float64Array;
  rf: Float64Array;
  induced: Float64Array;
  /** Line density of the self-consistent bunch [1/s]. */
  lambda: Float64Array;
  well: { dt: Float64Array; U: Float64Array; Urf: Float64Array };
  /** Separatrix with the beam's field (dt [s], dE [eV]), null if the well does not close. */
  separatrix: { dt: Float64Array; dE: Float64Array } | null;
  bottom: number;
  particlesPerBunch: number;
  bunchCharge: number;
  lossFactor: number;
  lossPerParticle: number;
  lossPerBunch: number;
  peakInduced: number;
  rmsLength: number;
  zeroIntensityRmsLength: number;
  phaseShiftDeg: number;
  converged: boolean;
  iterations: number;
}

// Samples of the well across the RF bucket, and the margin added on each side (fraction of the bucket length).
const WELL_POINTS = 801;
const WELL_MARGIN = 0.1;

/** The report, or null when the setup has no intensity, no impedance or no matched beam (with the reason). */
export function intensityReport(setup: Setup): { report: IntensityReport | null; reason: string | null } {
  const m = machineAtStart(setup);
  const model = intensityModel(setup, m);
  if (!model) return { report: null, reason: 'no intensity or no impedance in the setup' };
  const sc = solveSelfConsistent(setup, m);
  if (!sc) return { report: null, reason: 'the intensity report needs a matched beam (beam.distribution.kind = matched)' };
  const calc = sc.calc;
  const v = voltagesOnGrid(m, calc, calc.centres);
  const br = computeBucket(m);
  const g = calc.grid;
  let a = g.e0, b = g.e0 + g.nb * g.delta;
  if (br.ok) {
    const l = dtOfPhase(m, br.bucket.phiLeft), r = dtOfPhase(m, br.bucket.phiRight), w = (r - l) * WELL_MARGIN;
    a = Math.min(a, l - w); b = Math.max(b, r + w);
  }
  // Ahead of the binning window the resonators' continuation is not trusted (it grew to ~1e9 V in the fir
  // example): the beam's field counts inside the window and behind it (the wake), nothing ahead of it.
  const ahead = calc.grid.e0;
  const field: BeamField = { grid: calc.grid, voltageAt: (t: number) => (t < ahead ? 0 : calc.voltageAt(t)) };
  const withBeam = distortedWell(m, field, a, b, WELL_POINTS);
  const rfOnly = distortedWell(m, null, a, b, WELL_POINTS);
  const loss = impedanceLoss(calc, model.bunchCharge, model.particlesPerBunch);
  let peak = 0;
  for (const x of v.induced) peak = Math.max(peak, Math.abs(x));
  const s = sc.solution;
  return {
    reason: null,
    report: {
      dt: v.dt, rf: v.rf, induced: v.induced, lambda: Float64Array.from(s.lambda),
      well: { dt: withBeam.dt, U: withBeam.U, Urf: rfOnly.U },
      separatrix: withBeam.separatrix ? { dt: withBeam.separatrix.dt, dE: withBeam.separatrix.dE } : null,
      bottom: withBeam.bottom,
      particlesPerBunch: model.particlesPerBunch, bunchCharge: model.bunchCharge,
      lossFactor: loss.lossFactor, lossPerParticle: loss.lossPerParticle, lossPerBunch: loss.lossPerBunch,
      peakInduced: peak, rmsLength: s.rmsLength, zeroIntensityRmsLength: sc.zeroIntensity.rmsLength,
      phaseShiftDeg: (withBeam.bottom * m.omegaRf * 180) / Math.PI, converged: s.converged, iterations: s.iterations,
    },
  };
}
