// Intensity numbers for the `bucket` report, as a JSON-ready object with units in the key names.
// Units: s, C, A, V, eV, J, deg. Solves the self-consistent matched bunch when the beam is matched.
import type { MachineState } from '../machine.ts';
import type { Setup } from '../setup/schema.ts';
import { intensityModel } from './model.ts';
import { distortedWell, impedanceLoss } from './report.ts';
import { solveSelfConsistent } from './selfConsistent.ts';

const RAD2DEG = 180 / Math.PI;

/** Intensity, impedances and the self-consistent bunch at turn 0; null without intensity or impedances. */
export function intensitySummary(setup: Setup, m: MachineState): Record<string, unknown> | null {
  const model = intensityModel(setup, m);
  if (!model) return null;
  const base = {
    particlesPerBunch: model.particlesPerBunch,
    bunchCharge_C: model.bunchCharge,
    bunches: model.bunches,
    averageCurrent_A: (Math.abs(model.bunchCharge) * model.bunches) / m.T0,
    impedances: setup.impedances.map((z) => z.kind),
  };
  const sc = solveSelfConsistent(setup, m);
  if (!sc) return base;
  const s = sc.solution, g = sc.calc.grid;
  const loss = impedanceLoss(sc.calc, model.bunchCharge, model.particlesPerBunch);
  let peak = 0;
  for (const v of sc.calc.voltage) peak = Math.max(peak, Math.abs(v));
  const well = distortedWell(m, sc.calc, g.e0, g.e0 + g.nb * g.delta, 2001);
  return {
    ...base,
    selfConsistentBunch: {
      converged: s.converged,
      iterations: s.iterations,
      residual: s.residual,
      rmsLength_s: s.rmsLength,
      zeroIntensityRmsLength_s: sc.zeroIntensity.rmsLength,
      lengthRatio: s.rmsLength / sc.zeroIntensity.rmsLength,
      centroid_s: s.meanDt,
      wellBottom_s: well.bottom,
      synchronousPhaseShift_deg: well.bottom * m.omegaRf * RAD2DEG,
    },
    lossFactor_VperC: loss.lossFactor,
    energyLossPerTurn_eV: loss.lossPerParticle,
    energyLossPerTurnBunch_J: loss.lossPerBunch,
    peakInducedVoltage_V: peak,
    window: { start_s: g.e0, binWidth_s: g.delta, bins: g.nb, smoothing_bins: setup.collective.smoothing },
  };
}
